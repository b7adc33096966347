import { describe, expect, it, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { check as checkGeoJson } from "@placemarkio/check-geojson";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { generateSyntheticPicks, toCsv } from "@/lib/engine/synthetic";
import { faultGeoJson } from "@/lib/views/geojson";
import { gridCsv } from "@/lib/views/grid-csv";

const root = path.resolve(__dirname, "../..");
// the command as people run it: the bin entry, which runs the bundled dist/slipfield-cli.cjs
const bin = path.join(root, "bin/slipfield.cjs");
const run = (...args: string[]) => spawnSync(process.execPath, [bin, "analyze", ...args], { encoding: "utf8", cwd: root });
const runIn = (cwd: string, input: string | undefined, ...args: string[]) => spawnSync(process.execPath, [bin, "analyze", ...args], { encoding: "utf8", cwd, input });

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

  it("writes the same report as the engine: --json, and through npm run analyze", () => {
    const file = path.join(dir, "same.csv");
    const text = toCsv(generateSyntheticPicks({ seed: 11, pickCount: 500 }).picks);
    writeFileSync(file, text);
    const expected = JSON.parse(JSON.stringify(analyzeCsv(text).report));
    const r = run(file, "--json");
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.trim().split("\n")).toHaveLength(1);
    expect(JSON.parse(r.stdout)).toEqual(expected);
    const npm = spawnSync("npm", ["run", "--silent", "analyze", "--", file, "--json"], { encoding: "utf8", cwd: root });
    expect(npm.status, npm.stderr).toBe(0);
    expect(JSON.parse(npm.stdout)).toEqual(expected);
    // with the tip-line fits on the helper thread (the bundle started as a worker), the same report
    const threaded = spawnSync(process.execPath, [bin, "analyze", file, "--json"], { encoding: "utf8", cwd: root, env: { ...process.env, SLIPFIELD_TIPLINE_THREAD: "on" } });
    expect(threaded.status, threaded.stderr).toBe(0);
    expect(threaded.stderr).toBe(""); // it says so when the helper could not be used
    expect(JSON.parse(threaded.stdout)).toEqual(expected);
  });

  it("reads standard input with -, and writes the grid as CSV and the lines as GeoJSON", () => {
    const text = toCsv(generateSyntheticPicks({ seed: 12, pickCount: 400 }).picks);
    const result = analyzeCsv(text);
    const csv = runIn(dir, text, "-", "--format", "csv");
    expect(csv.status, csv.stderr).toBe(0);
    expect(csv.stdout).toBe(`${gridCsv(result).trimEnd()}\n`);
    expect(csv.stdout.split("\n")[0]).toBe("segment,s,t,x,y,z,displacement,throw");
    const geojson = runIn(dir, text, "-", "--format=geojson");
    expect(geojson.status, geojson.stderr).toBe(0);
    const collection = JSON.parse(geojson.stdout);
    expect(collection).toEqual(JSON.parse(JSON.stringify(faultGeoJson("stdin", result.report))));
    expect(() => checkGeoJson(geojson.stdout)).not.toThrow();
    expect(collection.features.map((feature: { properties: { kind: string } }) => feature.properties.kind)).toEqual(expect.arrayContaining(["contour", "tip-line", "mapped-limit"]));
  });

  it("several files or a glob: one JSON object per line, each naming its file; a bad file is reported and the rest still run", () => {
    const folder = path.join(dir, "batch");
    mkdirSync(folder, { recursive: true });
    for (const seed of [21, 22, 23]) writeFileSync(path.join(folder, `f${seed}.csv`), toCsv(generateSyntheticPicks({ seed, pickCount: 300 }).picks));
    writeFileSync(path.join(folder, "g-bad.csv"), "x,y,z,throw\n1,2,3,oops\n");
    writeFileSync(path.join(folder, "notes.txt"), "not a pick file");
    const globbed = runIn(dir, undefined, "batch/f*.csv", "--json");
    expect(globbed.status, globbed.stderr).toBe(0);
    const lines = globbed.stdout.trim().split("\n").map((line) => JSON.parse(line));
    expect(lines.map((line) => line.file)).toEqual(["batch/f21.csv", "batch/f22.csv", "batch/f23.csv"]);
    for (const line of lines) {
      const alone = JSON.parse(JSON.stringify(analyzeCsv(readFileSync(path.join(dir, line.file), "utf8")).report));
      const { file, ...report } = line;
      expect(file).toMatch(/^batch\//);
      expect(report).toEqual(alone);
    }
    const mixed = runIn(dir, undefined, "batch/*.csv", "--json");
    expect(mixed.status).toBe(2);
    const mixedLines = mixed.stdout.trim().split("\n").map((line) => JSON.parse(line));
    expect(mixedLines.map((line) => line.file)).toEqual(["batch/f21.csv", "batch/f22.csv", "batch/f23.csv", "batch/g-bad.csv"]);
    expect(mixedLines[3]).toMatchObject({ error: "the pick file cannot be used", problems: [{ row: 2, column: "throw" }] });
    expect(mixed.stderr).toContain("batch/g-bad.csv cannot be used");
    const csv = runIn(dir, undefined, "batch/f21.csv", "batch/f22.csv", "--format", "csv");
    expect(csv.status, csv.stderr).toBe(0);
    const rows = csv.stdout.trim().split("\n");
    expect(rows[0]).toBe("file,segment,s,t,x,y,z,displacement,throw");
    expect(new Set(rows.slice(1).map((row) => row.split(",")[0]))).toEqual(new Set(["batch/f21.csv", "batch/f22.csv"]));
  });

  it("refuses unknown options, formats and missing files with exit 2 and a message", () => {
    expect(run("--format", "xml", "a.csv").stderr).toContain('--format must be one of text, json, csv, geojson, got "xml"');
    expect(run("--json", "--format", "csv", "a.csv").stderr).toContain("choose one output format");
    expect(run("--frobnicate", "a.csv").status).toBe(2);
    const missing = run(path.join(dir, "no-such.csv"));
    expect(missing.status).toBe(2);
    expect(missing.stderr).toContain("cannot read");
    expect(runIn(dir, undefined, "nothing-*.csv").stderr).toContain('no file matches "nothing-*.csv"');
    const help = run("--help");
    expect(help.status).toBe(0);
    expect(help.stdout).toContain("--format F");
  });
});
