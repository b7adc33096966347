// The cost of reading the true fault surface, at 10⁵ picks (or `npx tsx bench/surface.ts 1e6`): the pieces the
// pipeline adds for it — the surface model (w on the surface grid, local quadratic fit, continuation beyond the data),
// the local dip and displacement of every pick, the surface on the 512 × 512 analysis grid, and the measures along the
// surface (tip lines, mapped limit, asymmetry, summary) — against the whole analysis of the same picks in one thread.
// Best of several runs in one process (the first is cold). Prints figures; not a test.
import { generateSyntheticPicks } from "../lib/engine/synthetic";
import { fitPlane } from "../lib/engine/plane";
import { projectToPlane } from "../lib/display/frame";
import { triangulate } from "../lib/engine/triangulate";
import { gridSpecFor, buildGrid } from "../lib/engine/grid";
import { displacementColumn } from "../lib/engine/displacement";
import { buildSurfaceModel, extentAlongSurface, localDipColumn, surfaceOnGrid } from "../lib/engine/fault-surface";
import { asymmetryAlongSurface, surfaceSummary, tipLineOnSurface } from "../lib/engine/surface-measures";
import { analyzePicks } from "../lib/engine/pipeline";

const target = Number(process.argv[2] ?? 1e5);
const RUNS = 5;
const { picks } = generateSyntheticPicks({ seed: 1, pickCount: Math.round(target / 0.72), halfLengthM: 4000, dmaxM: 120, throwCutoffM: 12, noiseM: 2 });
// geometric scatter of 3 m off the plane, so the local fit has something to smooth
let state = 42;
const uniform = () => (state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 4294967296;
for (let i = 0; i < picks.z.length; i++) picks.z[i] += 3 * (uniform() + uniform() + uniform() - 1.5) * 2;
const n = picks.x.length;
const plane = fitPlane(picks.x, picks.y, picks.z);
const { s, t, w } = projectToPlane(picks.x, picks.y, picks.z, plane);
const tri = triangulate(s, t);
const spec = gridSpecFor(s, t, tri.medianEdgeM, { gridCells: 512, square: true });

const best: Record<string, number> = {};
const keep = (name: string, ms: number) => (best[name] = Math.min(best[name] ?? Infinity, ms));
let wholeMs = Infinity;
for (let run = 0; run < RUNS; run++) {
  let mark = performance.now();
  const lap = (name: string) => {
    const now = performance.now();
    keep(name, now - mark);
    mark = now;
  };
  const model = buildSurfaceModel(s, t, w, tri.triangles, tri.medianEdgeM);
  lap("surface model");
  const dips = localDipColumn(model, plane, s, t);
  const displacement = displacementColumn(picks.throwM, picks.heaveM, dips);
  lap("local dip and displacement of every pick");
  const grid = buildGrid(s, t, displacement, picks.throwM, tri.triangles, spec);
  mark = performance.now();
  const onGrid = surfaceOnGrid(model, plane, spec, grid.displacementM);
  lap("surface on the 512² grid");
  const started = performance.now();
  const { report } = analyzePicks(picks, { gridCells: 512, square: true });
  wholeMs = Math.min(wholeMs, performance.now() - started);
  const segment = report.segments[0];
  mark = performance.now();
  const { tipLine, projected } = tipLineOnSurface(segment.tipLine, model, plane);
  extentAlongSurface(model, segment.mappedLimit.polygon, 0, 0);
  asymmetryAlongSurface(model, tipLine.polygon, tipLine.centre, segment.max.s, segment.max.t);
  surfaceSummary(
    model,
    { ...spec, displacementM: grid.displacementM, offPlaneM: onGrid.offPlaneM, localDipDeg: onGrid.localDipDeg },
    plane.dipDeg,
    tipLine,
    projected,
  );
  lap("measures along the surface");
}
const total = Object.values(best).reduce((a, b) => a + b, 0);
console.log(`${n.toLocaleString("en")} picks, grid ${spec.columns}², best of ${RUNS} runs (ms):`);
for (const [name, ms] of Object.entries(best)) console.log(`  ${name.padEnd(44)} ${ms.toFixed(1)}`);
console.log(`  ${"surface step, total".padEnd(44)} ${total.toFixed(1)}`);
console.log(`  ${"whole analysis (one thread)".padEnd(44)} ${wholeMs.toFixed(1)}  (surface step ${((100 * total) / wholeMs).toFixed(1)} %)`);
