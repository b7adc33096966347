// Strike and down-dip profiles read off a segment's displacement grid, the fitted model profile, and profiles of
// several segments placed in one common along-strike coordinate and summed (displacement transfer across a relay).
// Pure: used by the browser views, the export routes and the tests.
import { planeToWorld } from "@/lib/display/frame";
import { EDGE_TOLERANT_BILINEAR, sampleGrid } from "@/lib/display/grid-sampler";
import { PROFILE_LABELS, modelRadius, profileFunction } from "@/lib/engine/profiles";
import type { SegmentResult } from "@/lib/engine/types";
import { offsetFromReportGrid } from "@/lib/engine/fault-surface";

export interface GridLike {
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
  displacementM: ArrayLike<number>;
  throwM: ArrayLike<number>;
}

/** One profile: positions in the segment's plane (s, t), the distance along the profile, and the values (NaN = no data). */
export interface Profile {
  distanceM: number[];
  s: number[];
  t: number[];
  displacementM: number[];
  throwM: number[];
}

export type StrikeProfileMode = "centre-line" | "column-max" | "line";

const emptyProfile = (): Profile => ({ distanceM: [], s: [], t: [], displacementM: [], throwM: [] });

/** Values along the straight segment a→b in (s, t), `samples` evenly spaced points (bilinear between grid nodes). */
export function profileAlongLine(grid: GridLike, a: [number, number], b: [number, number], samples = 200): Profile {
  const out = emptyProfile();
  const length = Math.hypot(b[0] - a[0], b[1] - a[1]);
  const n = Math.max(2, Math.round(samples));
  for (let k = 0; k < n; k++) {
    const f = k / (n - 1);
    const s = a[0] + f * (b[0] - a[0]);
    const t = a[1] + f * (b[1] - a[1]);
    out.distanceM.push(f * length);
    out.s.push(s);
    out.t.push(t);
    out.displacementM.push(sampleGrid(grid, grid.displacementM, s, t, EDGE_TOLERANT_BILINEAR));
    out.throwM.push(sampleGrid(grid, grid.throwM, s, t, EDGE_TOLERANT_BILINEAR));
  }
  return out;
}

/** The along-strike line through the node nearest to t (the row through Dmax for the centre line), one value per column. */
export function strikeProfileAtT(grid: GridLike, t: number): Profile {
  const out = emptyProfile();
  const row = Math.min(grid.rows - 1, Math.max(0, Math.round((t - grid.t0) / grid.cellM)));
  const rowT = grid.t0 + row * grid.cellM;
  for (let column = 0; column < grid.columns; column++) {
    const s = grid.s0 + column * grid.cellM;
    out.distanceM.push(s);
    out.s.push(s);
    out.t.push(rowT);
    out.displacementM.push(grid.displacementM[row * grid.columns + column]);
    out.throwM.push(grid.throwM[row * grid.columns + column]);
  }
  return out;
}

/** Maximum displacement in each grid column (and the throw at that node); NaN for columns without data. */
export function columnMaxProfile(grid: GridLike): Profile {
  const out = emptyProfile();
  for (let column = 0; column < grid.columns; column++) {
    let best = -1;
    let bestValue = -Infinity;
    for (let row = 0; row < grid.rows; row++) {
      const value = grid.displacementM[row * grid.columns + column];
      if (value > bestValue) {
        bestValue = value;
        best = row;
      }
    }
    const s = grid.s0 + column * grid.cellM;
    out.distanceM.push(s);
    out.s.push(s);
    out.t.push(best < 0 ? NaN : grid.t0 + best * grid.cellM);
    out.displacementM.push(best < 0 ? NaN : bestValue);
    out.throwM.push(best < 0 ? NaN : grid.throwM[best * grid.columns + column]);
  }
  return out;
}

/** The down-dip line through the column nearest to s (the column through Dmax), one value per row; distance = t. */
export function dipProfileAtS(grid: GridLike, s: number): Profile {
  const out = emptyProfile();
  const column = Math.min(grid.columns - 1, Math.max(0, Math.round((s - grid.s0) / grid.cellM)));
  const columnS = grid.s0 + column * grid.cellM;
  for (let row = 0; row < grid.rows; row++) {
    const t = grid.t0 + row * grid.cellM;
    out.distanceM.push(t);
    out.s.push(columnS);
    out.t.push(t);
    out.displacementM.push(grid.displacementM[row * grid.columns + column]);
    out.throwM.push(grid.throwM[row * grid.columns + column]);
  }
  return out;
}

export interface ModelProfile {
  name: string;
  s: number[];
  displacementM: number[];
  /** central inferred tip positions (s) on this line, where the tip line crosses it */
  tipsS: [number, number] | null;
  /** where the inner and outer tip lines cross this line: the band each tip may lie in */
  bandS: { start: [number, number]; end: [number, number] } | null;
  /** which ends of this line stop at an open data edge (no tip inferred there) */
  openS: { start: boolean; end: boolean };
  /** model amplitude: the fitted maximum displacement (m) */
  amplitudeM: number;
}

/** Where a closed polygon in (s, t) crosses the line t = const (axis "t") or s = const (axis "s"): the span along the line, or null. */
export function polygonSpan(polygon: [number, number][], axis: "s" | "t", value: number): [number, number] | null {
  const across = axis === "t" ? 1 : 0;
  const along = 1 - across;
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k + 1 < polygon.length; k++) {
    const a0 = polygon[k][across],
      a1 = polygon[k + 1][across];
    const b0 = polygon[k][along],
      b1 = polygon[k + 1][along];
    if ((a0 <= value && value <= a1) || (a1 <= value && value <= a0)) {
      const b = a1 === a0 ? Math.min(b0, b1) : b0 + ((value - a0) / (a1 - a0)) * (b1 - b0);
      lo = Math.min(lo, b, a1 === a0 ? b1 : b);
      hi = Math.max(hi, b, a1 === a0 ? b0 : b);
    }
  }
  return lo <= hi ? [lo, hi] : null;
}

/** Where a closed polygon in (s, t) crosses the line t = const: the smallest and largest s, or null. */
export function polygonSpanAtT(polygon: [number, number][], t: number): [number, number] | null {
  return polygonSpan(polygon, "t", t);
}

/** Whether the tip line's ray nearest to a direction from its centre follows an open data edge. */
function openToward(tipLine: SegmentResult["tipLine"], angle: number): boolean {
  const rays = tipLine.openRays ?? [];
  if (!rays.length) return false;
  const q = Math.round(((angle + Math.PI) / (2 * Math.PI)) * rays.length) % rays.length;
  return rays[q] === 1;
}

export interface TipBandOnLine {
  /** central tips on the line (start: lower coordinate) */
  tips: [number, number];
  /** [outer, inner] at the start, [inner, outer] at the end: where each tip lies, 5–95 % */
  start: [number, number];
  end: [number, number];
  /** ends of the line that stop at an open data edge */
  open: { start: boolean; end: boolean };
}

/**
 * The central tip positions and the 5–95 % bands where a line of constant t (an along-strike profile) or constant s
 * (a down-dip profile) crosses the tip lines. Null for reports made before the range existed.
 */
export function tipBandOnLine(segment: SegmentResult, axis: "s" | "t", value: number): TipBandOnLine | null {
  const { tipLine } = segment;
  if (!tipLine.innerPolygon || !tipLine.outerPolygon) return null;
  const tips = polygonSpan(tipLine.polygon, axis, value);
  const inner = polygonSpan(tipLine.innerPolygon, axis, value);
  const outer = polygonSpan(tipLine.outerPolygon, axis, value);
  if (!tips || !inner || !outer) return null;
  // along strike the line runs toward ±s (angles π and 0); down dip toward −t (up, −π/2) and +t (down, π/2)
  const open =
    axis === "t"
      ? { start: openToward(tipLine, Math.PI), end: openToward(tipLine, 0) }
      : { start: openToward(tipLine, -Math.PI / 2), end: openToward(tipLine, Math.PI / 2) };
  return { tips, start: [outer[0], inner[0]], end: [inner[1], outer[1]], open };
}

/**
 * The fitted fault model (from the report: the profile with most weight, its reach to the tip on each side and its
 * Dmax) along strike at down-dip position t, with the central tip positions and the band between the inner and outer
 * tip lines on that line. `columnMax` evaluates along the row through the model's maximum instead.
 */
export function modelStrikeProfile(segment: SegmentResult, t: number, options: { samples?: number; columnMax?: boolean } = {}): ModelProfile | null {
  const { tipLine } = segment;
  const model = tipLine.profile;
  // reports made before engine 2.0 carry no fitted model
  if (!model) return null;
  const f = profileFunction(model.model, model.shape);
  const rowT = options.columnMax ? model.centre.t : t;
  const samples = options.samples ?? 161;
  const band = tipBandOnLine(segment, "t", rowT);
  const outer = band ? ([band.start[0], band.end[1]] as [number, number]) : null;
  const lo = Math.min(model.centre.s - model.reach.strikeStartM, outer?.[0] ?? Infinity) - 0.03 * (model.reach.strikeStartM + model.reach.strikeEndM);
  const hi = Math.max(model.centre.s + model.reach.strikeEndM, outer?.[1] ?? -Infinity) + 0.03 * (model.reach.strikeStartM + model.reach.strikeEndM);
  const s: number[] = [];
  const displacementM: number[] = [];
  for (let k = 0; k < samples; k++) {
    const sk = lo + ((hi - lo) * k) / (samples - 1);
    s.push(sk);
    displacementM.push(model.dmaxM * f(modelRadius(model, sk, rowT)));
  }
  // the model's own tips on this row, so the drawn curve meets zero exactly there
  const dv = rowT - model.centre.t;
  const w = Math.abs(dv / (dv < 0 ? model.reach.upDipM : model.reach.downDipM));
  if (w < 1) {
    const along = Math.pow(1 - Math.pow(w, model.exponent), 1 / model.exponent);
    for (const tipS of [model.centre.s - model.reach.strikeStartM * along, model.centre.s + model.reach.strikeEndM * along]) {
      const at = s.findIndex((value) => value > tipS);
      if (at < 0) continue;
      s.splice(at, 0, tipS);
      displacementM.splice(at, 0, 0);
    }
  }
  return {
    name: PROFILE_LABELS[model.model],
    s,
    displacementM,
    tipsS: band?.tips ?? null,
    bandS: band ? { start: band.start, end: band.end } : null,
    openS: band?.open ?? { start: false, end: false },
    amplitudeM: model.dmaxM,
  };
}

// ---- common along-strike coordinate for several segments ---------------------------------------------------

export interface StrikeFrame {
  /** horizontal unit vector of the mean strike (East, North) */
  strike: [number, number];
  /** world (x, y) where the common coordinate is zero */
  origin: [number, number];
}

/** Mean strike of the segments (each strike flipped to agree with the first), origin at the first segment's centroid. */
export function commonStrikeFrame(segments: Pick<SegmentResult, "plane">[]): StrikeFrame {
  const first = segments[0].plane.strikeVector;
  let ex = 0;
  let ny = 0;
  for (const segment of segments) {
    let [sx, sy] = segment.plane.strikeVector;
    if (sx * first[0] + sy * first[1] < 0) {
      sx = -sx;
      sy = -sy;
    }
    ex += sx;
    ny += sy;
  }
  const length = Math.hypot(ex, ny) || 1;
  return { strike: [ex / length, ny / length], origin: [segments[0].plane.centroid[0], segments[0].plane.centroid[1]] };
}

/**
 * World position of the fault surface over plane coordinates (s, t) of a segment: the plane point moved along the
 * plane's normal by the surface's offset there (the report's coarse copy of the surface); the plane point for reports
 * made before the true surface was read.
 */
export function surfacePointToWorld(segment: Pick<SegmentResult, "plane" | "surface">, s: number, t: number): [number, number, number] {
  return planeToWorld(segment.plane, s, t, segment.surface ? offsetFromReportGrid(segment.surface.grid, s, t) : 0);
}

export function alongStrike(frame: StrikeFrame, x: number, y: number): number {
  return (x - frame.origin[0]) * frame.strike[0] + (y - frame.origin[1]) * frame.strike[1];
}

export function acrossStrike(frame: StrikeFrame, x: number, y: number): number {
  // right of strike = the dip side for right-hand-rule strike
  return (x - frame.origin[0]) * frame.strike[1] - (y - frame.origin[1]) * frame.strike[0];
}

/** A profile in the common along-strike coordinate u (m), sorted by u. */
export interface CommonProfile {
  id: string;
  u: number[];
  displacementM: number[];
  throwM: number[];
}

export function toCommonProfile(id: string, plane: SegmentResult["plane"], profile: Profile, frame: StrikeFrame): CommonProfile {
  const rows = profile.s.map((s, k) => {
    const [x, y] = planeToWorld(plane, s, Number.isFinite(profile.t[k]) ? profile.t[k] : 0);
    return { u: alongStrike(frame, x, y), d: profile.displacementM[k], th: profile.throwM[k] };
  });
  rows.sort((p, q) => p.u - q.u);
  return { id, u: rows.map((r) => r.u), displacementM: rows.map((r) => r.d), throwM: rows.map((r) => r.th) };
}

/** Linear interpolation of (u, value) at x; 0 outside the profile or where a neighbour has no data (no displacement there). */
export function interpolateOrZero(u: number[], values: number[], x: number): number {
  const n = u.length;
  if (n === 0 || x < u[0] || x > u[n - 1]) return 0;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (u[mid] <= x) lo = mid;
    else hi = mid;
  }
  const v0 = values[lo];
  const v1 = values[hi];
  if (u[hi] === u[lo]) return Number.isFinite(v0) ? v0 : 0;
  const f = (x - u[lo]) / (u[hi] - u[lo]);
  if (!Number.isFinite(v0) || !Number.isFinite(v1)) {
    const nearest = f < 0.5 ? v0 : v1;
    return Number.isFinite(nearest) ? nearest : 0;
  }
  return v0 + f * (v1 - v0);
}

/** Whether the profile has data at x: inside its range, with data at both neighbouring nodes or at the nearer one. */
export function hasDataAt(u: number[], values: number[], x: number): boolean {
  const n = u.length;
  if (n === 0 || x < u[0] || x > u[n - 1]) return false;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (u[mid] <= x) lo = mid;
    else hi = mid;
  }
  if (Number.isFinite(values[lo]) && Number.isFinite(values[hi])) return true;
  // one neighbour without data: the same nearest-node rule as interpolateOrZero
  const f = u[hi] === u[lo] ? 0 : (x - u[lo]) / (u[hi] - u[lo]);
  return Number.isFinite(f < 0.5 ? values[lo] : values[hi]);
}

/**
 * Sum of several segments' profiles on a common u axis of `samples` points spanning all of them. Where no segment has
 * data (below seismic resolution on every one) the sum is NaN, a gap, rather than a false zero.
 */
export function sumProfiles(profiles: CommonProfile[], samples = 200): { u: number[]; displacementM: number[]; throwM: number[]; contributors: number[] } {
  let lo = Infinity;
  let hi = -Infinity;
  for (const p of profiles) {
    if (p.u.length === 0) continue;
    lo = Math.min(lo, p.u[0]);
    hi = Math.max(hi, p.u[p.u.length - 1]);
  }
  const u: number[] = [];
  const displacementM: number[] = [];
  const throwM: number[] = [];
  const contributors: number[] = [];
  if (!(hi > lo)) return { u, displacementM, throwM, contributors };
  for (let k = 0; k < samples; k++) {
    const x = lo + ((hi - lo) * k) / (samples - 1);
    u.push(x);
    const count = profiles.reduce((n, p) => n + (hasDataAt(p.u, p.displacementM, x) ? 1 : 0), 0);
    contributors.push(count);
    const covered = count > 0;
    displacementM.push(covered ? profiles.reduce((sum, p) => sum + interpolateOrZero(p.u, p.displacementM, x), 0) : NaN);
    throwM.push(covered ? profiles.reduce((sum, p) => sum + interpolateOrZero(p.u, p.throwM, x), 0) : NaN);
  }
  return { u, displacementM, throwM, contributors };
}

/** Along-strike extent [min, max] of a segment's inferred tip line in the common coordinate. */
export function tipExtent(segment: Pick<SegmentResult, "tipLine">, frame: StrikeFrame): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const [x, y] of segment.tipLine.worldPolygon) {
    const u = alongStrike(frame, x, y);
    lo = Math.min(lo, u);
    hi = Math.max(hi, u);
  }
  return [lo, hi];
}

/** Overlap zone of two extents, or null when they do not overlap. */
export function overlapZone(a: [number, number], b: [number, number]): [number, number] | null {
  const lo = Math.max(a[0], b[0]);
  const hi = Math.min(a[1], b[1]);
  return hi > lo ? [lo, hi] : null;
}
