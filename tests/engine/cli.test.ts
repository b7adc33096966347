import { describe, expect, it, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { generateSyntheticPicks, toCsv } from "@/lib/engine/synthetic";

const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules/.bin/tsx");
const run = (...args: string[]) => spawnSync(tsx, [path.join(root, "scripts/analyze.ts"), ...args], { encoding: "utf8", cwd: root });

let dir = "";
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), "slipfield-cli-"));
});

describe("analyze command line", () => {
  it("prints exactly one JSON object with the documented keys and exits 0", () => {
    const file = path.join(dir, "good.csv");
    writeFileSync(file, toCsv(generateSyntheticPicks({ seed: 4, pickCount: 600 }).picks));
    const r = run(file, "--json", "--interval", "10");
    expect(r.status).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(Object.keys(report.input)).toEqual(expect.arrayContaining(["rows", "accepted", "rejected"]));
    const seg = report.segments[0];
    for (const key of ["id", "plane", "max", "mappedLimit", "tipLine", "gradients", "scaling", "contours"]) expect(seg).toHaveProperty(key);
    for (const key of ["strikeDeg", "dipDeg", "dipDirectionDeg", "rmsM"]) expect(typeof seg.plane[key]).toBe("number");
    for (const key of ["lengthM", "heightM", "aspectRatio", "areaM2", "centre", "model", "uncertaintyM", "polygon"]) expect(seg.tipLine).toHaveProperty(key);
    expect(seg.contours[0].levelM).toBe(10);
    expect(Array.isArray(report.relays)).toBe(true);
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
