import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { onFault, timeCutoffCsv } from "./cutoff-fixtures";

const root = path.resolve(__dirname, "../../..");
// exactly the command outside checks run
const analyze = (...args: string[]) => spawnSync("npm", ["run", "--silent", "analyze", "--", ...args], { encoding: "utf8", cwd: root });

let dir = "";
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), "slipfield-cutoffs-"));
});

describe('npm run --silent analyze -- cutoffs.csv --json --velocity "v0=1800,k=0.6"', () => {
  it("recognises the cut-off file by its wall column, converts the times, pairs the walls and analyses the derived picks", () => {
    const file = path.join(dir, "cutoffs.csv");
    writeFileSync(file, timeCutoffCsv());
    const r = analyze(file, "--json", "--velocity", "v0=1800,k=0.6");
    expect(r.status, r.stderr).toBe(0);
    const report = JSON.parse(r.stdout);
    // the centroid's northing is (5 × 21 × 1000 + 16 × 750) / 121 = 966.94 m, so stations every 100 m sit at
    // y = 66.94 … 1966.94 m: 20 per horizon, and the five north of 1500 m lack H3's hanging wall
    expect(report.cutoffs.horizons.map((h: { name: string; stations: number }) => [h.name, h.stations])).toEqual([
      ["H1", 20],
      ["H2", 20],
      ["H3", 15],
    ]);
    expect(report.cutoffs.missingStations).toBe(5);
    for (const [index, throwM] of [60, 70, 80].entries()) {
      expect(report.cutoffs.horizons[index].maxThrowM).toBeCloseTo(throwM, 2);
      expect(report.cutoffs.horizons[index].meanThrowM).toBeCloseTo(throwM, 2);
    }
    expect(Object.keys(report.cutoffs.horizons[0]).sort()).toEqual(["maxThrowM", "meanThrowM", "name", "stations"]);
    // analysed as usual: one segment on the plane through the derived picks (dip 60°), 55 picks
    expect(report.input.accepted).toBe(55);
    expect(report.segments[0].plane.dipDeg).toBeCloseTo(60, 2);
    expect(report.segments[0].max.throwM).toBeCloseTo(80, 2);
    expect(report.depthConversion.velocityModel).toEqual({ kind: "linear", v0MPerS: 1800, kPerS: 0.6 });
    expect(report.depthConversion.caution).toMatch(/major uncertainty in throw/);
  });

  it("refuses a file in time without --velocity (exit 2, the reason on standard error), and a bad --velocity", () => {
    const file = path.join(dir, "cutoffs-time.csv");
    writeFileSync(file, timeCutoffCsv());
    const r = analyze(file, "--json");
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/row 1, column twt: a velocity model is needed for two-way time/);
    const bad = analyze(file, "--json", "--velocity", "v0=1800");
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--velocity: a linear velocity model is "v0=<m\/s>,k=<1\/s>"/);
  });

  it("a self-crossing line is refused with its row named", () => {
    const file = path.join(dir, "crossing.csv");
    const rows = ["x,y,z,horizon,wall"];
    const put = (y: number, z: number, horizon: string, wall: string) => {
      const [x] = onFault(y, z);
      rows.push(`${x.toFixed(3)},${y},${z},${horizon},${wall}`);
    };
    put(0, -1000, "H1", "fw");
    put(400, -1000, "H1", "fw");
    put(300, -1050, "H1", "fw");
    put(200, -950, "H1", "fw");
    for (const y of [0, 400]) put(y, -1050, "H1", "hw");
    for (const y of [0, 400]) {
      put(y, -1200, "H2", "fw");
      put(y, -1250, "H2", "hw");
    }
    writeFileSync(file, `${rows.join("\n")}\n`);
    const r = analyze(file, "--json");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(
      /row 4, column x,y: the footwall cut-off of "H1" crosses itself: the piece from row 2 to row 3 crosses the piece from row 4 to row 5/,
    );
  });
});
