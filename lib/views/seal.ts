// The fault-seal views' pure parts, run in the browser: the shale gouge ratio at every display-grid node of the
// shown surface (a colour field of the 3D view and the plane map), and the juxtaposition traces of a cut-off set's
// segment. SGR takes the node's throw from the shown analysis and the footwall column from the cut-off stations: each
// node is placed along strike on the cut-off set's reference frame by its world position.
import type { DisplayGrid, FaultDisplay } from "@/lib/contracts/display";
import type { CutoffSummary, StationSegment } from "@/lib/engine/cutoff-stations";
import type { JuxtapositionTraces, StratigraphyUnit } from "@/lib/engine/juxtaposition";
import { sgrAtPoint, SGR_SOURCE, SGR_THRESHOLD, type ColumnUnit } from "@/lib/engine/sgr";

export const SGR_FIELD_KEY = "seal:sgr";

/** What the SGR colour mode tells beside the surface: the guide and the containment caution. */
export const SGR_NOTE = `Shale gouge ratio (${SGR_SOURCE}): the share of shale in the rock that slipped past each point, from the throw here and the footwall units of the study's stratigraphy table (where a horizon's cut-offs end, the unit above the next horizon is taken to reach above the throw window). About 20 % is the published threshold between little and significant sealing capacity: a screening guide, not a verdict. Seal and containment decisions (CO2 storage, injection, well placement) need site-specific study, local regulation and licensed professionals.`;

/** The cut-off segment that describes a surface segment: same name, or the only one there is. */
export function cutoffSegmentFor(summary: CutoffSummary, segmentId: string): StationSegment | null {
  return summary.segments.find((segment) => segment.name === segmentId) ?? (summary.segments.length === 1 ? summary.segments[0] : null);
}

/** The traces of a cut-off segment as the juxtaposition diagram takes them. */
export function juxtapositionTraces(segment: StationSegment): JuxtapositionTraces {
  return { stationsS: segment.stationsS, dipDeg: segment.frame.dipDeg, horizons: segment.horizons.map(({ name, hwZ, fwZ }) => ({ name, hwZ, fwZ })) };
}

/** A trace's value at s, linear between stations; NaN outside them or next to a missing station. */
export function traceAt(stationsS: number[], values: (number | null)[], s: number): number {
  const n = stationsS.length;
  if (n === 0 || s < stationsS[0] || s > stationsS[n - 1]) return NaN;
  if (n === 1) return values[0] ?? NaN;
  const step = stationsS[1] - stationsS[0];
  const k = Math.min(n - 2, Math.max(0, Math.floor((s - stationsS[0]) / step)));
  const a = values[k];
  const b = values[k + 1];
  if (a === null || b === null || a === undefined || b === undefined) return NaN;
  const f = (s - stationsS[k]) / (stationsS[k + 1] - stationsS[k]);
  return a + f * (b - a);
}

/**
 * The footwall column at s: each unit of the table from its top horizon down to the next unit's top, the last without
 * a base. Where the cut-offs of the table's first horizons end, the column starts at the first horizon left and the
 * unit above it (the table's previous one) is taken to reach above the throw window; null where none is left, or one
 * between others is missing.
 */
export function footwallColumnAt(segment: StationSegment, units: StratigraphyUnit[], s: number): ColumnUnit[] | null {
  const placed = units
    .map((unit) => ({ unit, trace: segment.horizons.find((h) => h.name.trim().toLowerCase() === unit.topHorizon.trim().toLowerCase()) }))
    .filter((entry) => entry.trace);
  const tops = placed.map((entry) => traceAt(segment.stationsS, entry.trace!.fwZ, s));
  const first = tops.findIndex(Number.isFinite);
  if (first < 0) return null;
  let last = first;
  while (last + 1 < tops.length && Number.isFinite(tops[last + 1])) last++;
  if (tops.slice(last + 1).some(Number.isFinite)) return null;
  const column: ColumnUnit[] = [];
  if (first > 0) column.push({ topZ: Infinity, baseZ: tops[first], clayFraction: placed[first - 1].unit.clayFraction });
  for (let i = first; i <= last; i++) column.push({ topZ: tops[i], baseZ: i < last ? tops[i + 1] : -Infinity, clayFraction: placed[i].unit.clayFraction });
  return column;
}

export interface SgrField {
  /** SGR in per cent at each display-grid node, NaN where it cannot be computed */
  bySegment: Record<string, Float32Array>;
  range: [number, number];
  /** nodes with a value, over nodes with a throw */
  computed: number;
  withThrow: number;
}

/** SGR (%) at every node of the shown surface. */
export function sgrField(display: FaultDisplay, summary: CutoffSummary, units: StratigraphyUnit[]): SgrField {
  const bySegment: Record<string, Float32Array> = {};
  let computed = 0;
  let withThrow = 0;
  let high = 0;
  for (const segment of display.segments) {
    const values = new Float32Array(segment.grid.columns * segment.grid.rows).fill(NaN);
    bySegment[segment.id] = values;
    const cutoff = cutoffSegmentFor(summary, segment.id);
    const grid: DisplayGrid = segment.grid;
    const { frame } = segment;
    for (let row = 0; row < grid.rows; row++) {
      for (let column = 0; column < grid.columns; column++) {
        const node = row * grid.columns + column;
        const throwM = grid.throwM[node];
        if (!(throwM > 0)) continue;
        withThrow++;
        if (!cutoff) continue;
        const s = grid.s0 + column * grid.cellM;
        const t = grid.t0 + row * grid.cellM;
        const world = [0, 1, 2].map((axis) => display.origin[axis] + frame.centroid[axis] + s * frame.strikeVector[axis] + t * frame.dipVector[axis]);
        const c = cutoff.frame;
        const along =
          (world[0] - c.centroid[0]) * c.strikeVector[0] + (world[1] - c.centroid[1]) * c.strikeVector[1] + (world[2] - c.centroid[2]) * c.strikeVector[2];
        const strata = footwallColumnAt(cutoff, units, along);
        if (!strata) continue;
        const sgr = sgrAtPoint(strata, world[2], throwM);
        if (!Number.isFinite(sgr)) continue;
        values[node] = 100 * sgr;
        high = Math.max(high, 100 * sgr);
        computed++;
      }
    }
  }
  // a range that always shows the guide well inside the scale
  return { bySegment, range: [0, Math.max(40, Math.ceil(high / 10) * 10)], computed, withThrow };
}

export const SGR_GUIDE_PERCENT = 100 * SGR_THRESHOLD;

/** Closed polygons [s, z] of a band (one per run of stations where both its top and base are known). */
export function bandPolygons(stationsS: number[], topZ: number[], baseZ: number[]): [number, number][][] {
  const polygons: [number, number][][] = [];
  let run: number[] = [];
  const close = () => {
    if (run.length >= 2)
      polygons.push([
        ...run.map((k) => [stationsS[k], topZ[k]] as [number, number]),
        ...run.reverse().map((k) => [stationsS[k], baseZ[k]] as [number, number]),
      ]);
    run = [];
  };
  for (let k = 0; k < stationsS.length; k++) {
    if (Number.isFinite(topZ[k]) && Number.isFinite(baseZ[k])) run.push(k);
    else close();
  }
  close();
  return polygons;
}

/** Runs of a trace as polylines [s, z], broken where a station has no value. */
export function tracePolylines(stationsS: number[], values: (number | null)[]): [number, number][][] {
  const lines: [number, number][][] = [];
  let current: [number, number][] = [];
  stationsS.forEach((s, k) => {
    const z = values[k];
    if (z === null || z === undefined || !Number.isFinite(z)) {
      if (current.length > 1) lines.push(current);
      current = [];
    } else current.push([s, z]);
  });
  if (current.length > 1) lines.push(current);
  return lines;
}
