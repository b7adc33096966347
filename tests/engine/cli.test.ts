import { describe, expect, it, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { generateSyntheticPicks, syntheticRelayOptions, toCsv } from "@/lib/engine/synthetic";

const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules/.bin/tsx");
const run = (...args: string[]) => spawnSync(tsx, [path.join(root, "scripts/analyze.ts"), ...args], { encoding: "utf8", cwd: root });

let dir = "";
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), "slipfield-cli-"));
});

describe("analyze command line", () => {
  it("prints exactly one JSON object whose numbers are the picks' own: plane, maximum, contour levels, counts, no relay", () => {
    const file = path.join(dir, "good.csv");
    const { picks, truth } = generateSyntheticPicks({ seed: 4, pickCount: 600 });
    writeFileSync(file, toCsv(picks));
    const r = run(file, "--json", "--interval", "10");
    expect(r.status).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report.input).toMatchObject({ rows: picks.x.length, accepted: picks.x.length, rejected: [], units: "m" });
    expect(report.segments).toHaveLength(1);
    const seg = report.segments[0];
    for (const key of ["id", "plane", "max", "mappedLimit", "tipLine", "gradients", "scaling", "contours"]) expect(seg).toHaveProperty(key);
    // the synthetic picks lie exactly on a plane striking 030 and dipping 60° (lib/engine/synthetic.ts places them so);
    // the CSV keeps millimetres, which moves the fit by far less than 0.01°
    expect(Math.abs(seg.plane.strikeDeg - truth[0].strikeDeg)).toBeLessThan(0.01);
    expect(Math.abs(seg.plane.dipDeg - truth[0].dipDeg)).toBeLessThan(0.01);
    expect(seg.plane.rmsM).toBeLessThan(0.01);
    // Dmax is the largest pick displacement, throw / sin(dip) (Groshong 2006), computed here from the CSV's throws
    const csvThrows = toCsv(picks).trim().split("\n").slice(1).map((line) => Number(line.split(",")[3]));
    expect(seg.max.displacementM).toBeCloseTo(Math.max(...csvThrows) / Math.sin((seg.plane.dipDeg * Math.PI) / 180), 6);
    expect(seg.max.throwM).toBe(Math.max(...csvThrows));
    // --interval 10: every level is a multiple of 10 m below Dmax, none missing
    const levels = seg.contours.map((c: { levelM: number }) => c.levelM);
    expect(levels).toEqual(Array.from({ length: Math.ceil(seg.max.displacementM / 10) - 1 }, (_, k) => 10 * (k + 1)));
    expect(seg.tipLine.lengthM).toBeGreaterThan(seg.mappedLimit.lengthM);
    // one segment: no relay
    expect(report.relays).toEqual([]);
    expect(report.quality.picksBelowOne).toBe(0);
  });

  it("the readable report prints a strike due north as 0.0°, never 360.0°", () => {
    const file = path.join(dir, "north.csv");
    writeFileSync(file, toCsv(generateSyntheticPicks({ seed: 5, pickCount: 400, strikeDeg: 0 }).picks));
    const r = run(file);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/plane: strike 0\.0°, dip 60\.0° toward 90\.0°/);
    expect(r.stdout).not.toContain("360.0°");
  });

  it("two overlapping segments 120 m apart with nothing mapped between them are reported as one soft-linked relay", () => {
    const file = path.join(dir, "relay.csv");
    writeFileSync(file, toCsv(generateSyntheticPicks(syntheticRelayOptions({ seed: 3, halfLengthM: 1200, pickCount: 900 }, 500, 120)).picks));
    const report = JSON.parse(run(file, "--json").stdout);
    expect(report.relays).toHaveLength(1);
    expect(report.relays[0]).toMatchObject({ segments: ["F1", "F2"], linkage: "soft" });
    // separation is measured between the two planes' traces; the generator offsets them by exactly 120 m across strike
    expect(report.relays[0].separationM).toBeCloseTo(120, 3);
  });

  it("bad rows (non-number, negative throw, infinite, missing value, duplicate) exit 2 naming row and column", () => {
    const file = path.join(dir, "bad.csv");
    writeFileSync(file, ["x,y,z,throw", "0,0,0,10", "oops,0,0,10", "1,2,3,-4", "5,6,7,Infinity", "8,9,,3", "0,0,0,12", "0,100,-20,8"].join("\n"));
    const r = run(file, "--json");
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    for (const where of ["row 3, column x", "row 4, column throw", "row 5, column throw", "row 6, column z", "row 7, column x,y,z"]) expect(r.stderr).toContain(where);
  });

  it("too few picks in a segment and collinear picks exit 2 naming the segment", () => {
    const file = path.join(dir, "degenerate.csv");
    writeFileSync(file, ["x,y,z,throw,segment", "0,0,0,1,A", "1,0,0,1,A", "0,0,0,1,B", "1,1,-1,1,B", "2,2,-2,1,B"].join("\n"));
    const r = run(file);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('segment "A" has 2 usable picks');
    expect(r.stderr).toContain('segment "B": the points are collinear');
  });
});
