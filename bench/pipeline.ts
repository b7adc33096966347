// Pipeline benchmark: parse → plane → triangulate → grid 512² → contours (20 levels) → tip line, for 10³…10⁶
// synthetic picks, each size in its own process for a clean peak-memory figure, next to scipy griddata(linear).
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { generateSyntheticPicks, toCsv } from "../lib/engine/synthetic";
import { parsePickCsv } from "../lib/engine/csv";
import { fitPlane } from "../lib/engine/plane";
import { projectToPlane } from "../lib/engine/project";
import { displacementColumn } from "../lib/engine/displacement";
import { triangulate } from "../lib/engine/triangulate";
import { buildGrid, gridSpecFor } from "../lib/engine/grid";
import { contourGrid, contourLevels } from "../lib/engine/contours";
import { inferTipLine } from "../lib/engine/tipline";

const SIZES = [1e3, 1e4, 1e5, 1e6];
const GRID = 512;

function child(target: number) {
  const { picks } = generateSyntheticPicks({ seed: 1, pickCount: Math.round(target / 0.72), halfLengthM: 4000, dmaxM: 120, throwCutoffM: 12, noiseM: 2 });
  const csv = toCsv(picks);
  const times: Record<string, number> = {};
  let t0 = performance.now();
  const lap = (name: string) => {
    const now = performance.now();
    times[name] = now - t0;
    t0 = now;
  };
  const parsed = parsePickCsv(csv);
  lap("parse");
  const p = parsed.picks;
  const plane = fitPlane(p.x, p.y, p.z);
  const { s, t } = projectToPlane(p.x, p.y, p.z, plane);
  const d = displacementColumn(p.throwM, p.heaveM, plane.dipDeg);
  lap("plane");
  const tri = triangulate(s, t);
  lap("triangulate");
  const spec0 = gridSpecFor(s, t, tri.medianEdgeM, { gridCells: GRID });
  const extent = Math.max((spec0.columns - 1) * spec0.cellM, (spec0.rows - 1) * spec0.cellM);
  const spec = gridSpecFor(s, t, 0, { cellM: extent / (GRID - 1), gridCells: GRID });
  const grid = buildGrid(s, t, d, p.throwM, tri.triangles, spec);
  lap("grid");
  let dmax = 0;
  for (const v of d) if (v > dmax) dmax = v;
  contourGrid(spec, grid.displacementM, contourLevels(dmax, dmax / 21));
  lap("contours");
  const outline: [number, number][] = tri.outline.map((v) => [s[v], t[v]]);
  inferTipLine(s, t, d, plane, { outline, spacingM: tri.medianEdgeM });
  lap("tipline");
  const usage = process.resourceUsage();
  const dir = mkdtempSync(path.join(os.tmpdir(), "slipfield-bench-"));
  const prefix = path.join(dir, "pts");
  writeFileSync(prefix + ".s", Buffer.from(s.buffer));
  writeFileSync(prefix + ".t", Buffer.from(t.buffer));
  writeFileSync(prefix + ".v", Buffer.from(d.buffer));
  const py = spawnSync("python3", [path.join(__dirname, "griddata_time.py"), prefix, String(spec.s0), String(spec.t0), String(spec.cellM), String(spec.columns), String(spec.rows)], { encoding: "utf8" });
  rmSync(dir, { recursive: true, force: true });
  const scipySeconds = py.status === 0 ? JSON.parse(py.stdout).seconds : NaN;
  const total = Object.values(times).reduce((a, b) => a + b, 0);
  process.stdout.write(JSON.stringify({ picks: p.x.length, grid: `${spec.columns}×${spec.rows}`, times, totalMs: total, peakMB: usage.maxRSS / 1024, scipyMs: scipySeconds * 1000, scipyError: py.status === 0 ? null : py.stderr.trim().split("\n").at(-1) }));
}

function main() {
  const arg = process.argv.indexOf("--size");
  if (arg > 0) return child(Number(process.argv[arg + 1]));
  const rows: string[] = [];
  rows.push("| picks | grid | parse ms | plane ms | triangulate ms | grid ms | contours ms | tip line ms | total ms | peak RSS MB | scipy griddata ms | scipy / total |");
  rows.push("|---:|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|");
  console.log(rows.join("\n"));
  for (const n of SIZES) {
    const r = spawnSync(process.execPath, [...process.execArgv, __filename, "--size", String(n)], { encoding: "utf8", maxBuffer: 1 << 24 });
    if (r.status !== 0) {
      console.log(`| ${n} | failed: ${r.stderr.trim().split("\n").at(-1)} |`);
      continue;
    }
    const o = JSON.parse(r.stdout);
    const f = (v: number) => v.toFixed(0);
    const line = `| ${o.picks} | ${o.grid} | ${f(o.times.parse)} | ${f(o.times.plane)} | ${f(o.times.triangulate)} | ${f(o.times.grid)} | ${f(o.times.contours)} | ${f(o.times.tipline)} | ${f(o.totalMs)} | ${f(o.peakMB)} | ${Number.isFinite(o.scipyMs) ? f(o.scipyMs) : "n/a (" + o.scipyError + ")"} | ${Number.isFinite(o.scipyMs) ? (o.scipyMs / o.totalMs).toFixed(2) + "×" : "n/a"} |`;
    console.log(line);
  }
}

main();
