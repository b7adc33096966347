// Throw picks read in two-way time: each pick's time is the middle of its offset and its throw the offset in time,
// so its hanging-wall cut-off is at TWT + ΔTWT/2 and its footwall cut-off at TWT − ΔTWT/2 (normal sense). Each wall
// is converted to depth on its own, as the cut-off lines are (lib/engine/cutoff-stations.ts), and the throw is the
// difference of the two depths: a time throw is never scaled by one velocity.
import { strikeAxisOf, type CutoffColumns, type CutoffLine } from "./cutoffs";
import { PickInputError } from "./input-error";
import { verticesInDepth } from "./cutoff-stations";
import type { VelocityModel } from "./time-depth";
import type { PickColumns } from "./types";

/**
 * The picks in depth: z at the middle of the two converted cut-offs, throw their vertical separation (m); the original
 * time (ms) and time throw (ms) kept as `twtMs` and `throwMs`. `picks.z` is ignored, `picks.throwM` holds the time throw.
 */
export function picksToDepth(picks: PickColumns, twtMs: Float64Array, model: VelocityModel | null | undefined): { picks: PickColumns; warnings: string[] } {
  const n = picks.x.length;
  if (!model) {
    throw new PickInputError("the picks are in two-way time (twt, ms): give a velocity model to convert them to depth; metrics are computed in depth only", [
      { row: 1, column: "twt", reason: "a velocity model is needed for two-way time" },
    ]);
  }
  if (model.kind === "intervals") {
    const missing = Array.from(picks.horizon.keys()).find((i) => picks.horizon[i] < 0);
    if (missing !== undefined) {
      throw new PickInputError("interval velocities by horizon need the horizon of every pick", [
        { row: picks.sourceRow[missing], column: "horizon", reason: "horizon is missing; interval velocities are given by horizon" },
      ]);
    }
  }
  const throwMs = picks.throwM;
  // every pick as two cut-off vertices: hanging wall (k < n) and footwall (n + k)
  const columns: CutoffColumns = {
    domain: "time",
    x: new Float64Array(2 * n),
    y: new Float64Array(2 * n),
    vertical: new Float64Array(2 * n),
    horizon: new Uint32Array(2 * n),
    wall: new Uint8Array(2 * n),
    segment: new Uint32Array(2 * n),
    horizonNames: picks.horizonNames,
    segmentNames: picks.segmentNames,
    sourceRow: new Uint32Array(2 * n),
  };
  for (let k = 0; k < n; k++) {
    for (const [at, wall, sign] of [
      [k, 0, 1],
      [n + k, 1, -1],
    ] as const) {
      columns.x[at] = picks.x[k];
      columns.y[at] = picks.y[k];
      columns.vertical[at] = twtMs[k] + (sign * throwMs[k]) / 2;
      columns.horizon[at] = Math.max(0, picks.horizon[k]);
      columns.wall[at] = wall;
      columns.segment[at] = picks.segment[k];
      columns.sourceRow[at] = picks.sourceRow[k];
    }
  }
  // each horizon's hanging-wall and footwall picks as traces along strike, for interval velocities
  const lines: CutoffLine[] = [];
  const axes = picks.segmentNames.map((_, s) => strikeAxisOf(columns, s));
  const groups = new Map<string, number[]>();
  for (let at = 0; at < 2 * n; at++) {
    const key = `${columns.segment[at]}:${columns.horizon[at]}:${columns.wall[at]}`;
    let list = groups.get(key);
    if (!list) groups.set(key, (list = []));
    list.push(at);
  }
  for (const indices of groups.values()) {
    const axis = axes[columns.segment[indices[0]]];
    const u = (i: number) => (columns.x[i] - axis.cx) * axis.ux + (columns.y[i] - axis.cy) * axis.uy;
    indices.sort((a, b) => u(a) - u(b));
    const first = indices[0];
    lines.push({
      segment: columns.segment[first],
      horizon: columns.horizon[first],
      wall: columns.wall[first] === 0 ? "hw" : "fw",
      id: "",
      vertices: Uint32Array.from(indices),
      firstRow: columns.sourceRow[first],
    });
  }
  const { z, warnings } = verticesInDepth({ columns, lines }, model);
  const out: PickColumns = {
    ...picks,
    z: new Float64Array(n),
    throwM: new Float64Array(n),
    twtMs: Float64Array.from(twtMs),
    throwMs: Float64Array.from(throwMs),
  };
  for (let k = 0; k < n; k++) {
    out.z[k] = (z[k] + z[n + k]) / 2;
    // a negative time throw (offset of the opposite sense, on an inverted fault) stays negative in depth
    out.throwM[k] = (throwMs[k] < 0 ? -1 : 1) * Math.abs(z[n + k] - z[k]);
  }
  return { picks: out, warnings };
}
