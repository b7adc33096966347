import type { RelayResult, SegmentResult, RegularGrid } from "./types";
import { sampleGrid, STRICT_BILINEAR } from "@/lib/display/grid-sampler";

const DEG = 180 / Math.PI;

/** Along-strike ramp dip from throw transferred over the overlap: ψ = atan(ΔT / O) (geometry after Peacock & Sanderson 1991). */
export function rampDipDeg(throwTransferM: number, overlapM: number): { dipDeg: number; flag: "ok" | "approaching breaching" | "breaching likely" } {
  const dipDeg = Math.atan2(throwTransferM, overlapM) * DEG;
  // ramp slopes of ~10–15° at the onset of breaching (Fossen & Rotevatn 2016)
  const flag = dipDeg >= 15 ? "breaching likely" : dipDeg >= 10 ? "approaching breaching" : "ok";
  return { dipDeg, flag };
}

export const LONG_IMBER_MEAN_OS = 4.2;
export const ACOCELLA_MEAN_OS = 3.5;

export function overlapToSeparationNote(ratio: number): string {
  const band = ratio < 1 ? "low" : ratio > 10 ? "high" : "typical";
  return `O/S = ${ratio.toFixed(2)} (${band}); published means: ${LONG_IMBER_MEAN_OS} globally (Long & Imber 2011), ${ACOCELLA_MEAN_OS} for Icelandic rift relays (Acocella et al. 2000).`;
}

interface Horizontal {
  ux: number;
  uy: number;
}

/** The basis of the linkage labels, as the fault sheet and the relay view state it. */
export const LINKAGE_BASIS =
  "Stages after Peacock & Sanderson (1994): soft-linked while no connecting structure is mapped across the relay ramp, breached once picks or a segment cross the ramp from one segment to the other with throw continuous through it, hard-linked once the segments merge into one surface. The summed displacement profile describes the transfer; it is not used to set the label.";

/** Segments further apart in strike than this are not treated as a relay pair (sub-parallel; common practice, no source). */
export const MAX_RELAY_STRIKE_DIFFERENCE_DEG = 30;

/** Picks of the analysed fault, as far as the relay evidence needs them. */
export interface RelayPicks {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  z: ArrayLike<number>;
  throwM: ArrayLike<number>;
  segment: ArrayLike<number>;
  segmentNames: string[];
}

function tracePoint(seg: SegmentResult, zRef: number): [number, number] {
  // point of the segment's plane at elevation zRef on the down-dip line through the centroid
  const [cx, cy, cz] = seg.plane.centroid;
  const [dx, dy, dz] = seg.plane.dipVector;
  const t = dz !== 0 ? (zRef - cz) / dz : 0;
  return [cx + t * dx, cy + t * dy];
}

/**
 * Overlap along mean strike between inferred tip lines, separation perpendicular to strike between the segments'
 * traces at a common elevation, the summed strike profile across the relay, and a linkage label from mapped evidence
 * (LINKAGE_BASIS). Pairs that are not sub-parallel, or do not overlap, are no relay. Without `picks` only a merge can
 * be seen, so no pair is labelled breached.
 */
export function analyzeRelays(segments: SegmentResult[], grids: Record<string, RegularGrid>, picks?: RelayPicks): RelayResult[] {
  const out: RelayResult[] = [];
  const bySegment = new Map<string, number[]>();
  if (picks) {
    for (let i = 0; i < picks.segment.length; i++) {
      const name = picks.segmentNames[picks.segment[i]];
      if (!bySegment.has(name)) bySegment.set(name, []);
      bySegment.get(name)!.push(i);
    }
  }
  for (let i = 0; i < segments.length; i++) {
    for (let j = i + 1; j < segments.length; j++) {
      const r = relayBetween(segments[i], segments[j], grids, segments, picks ? { picks, bySegment } : null);
      if (r) out.push(r);
    }
  }
  return out;
}

/** Signed distance of a world point from a segment's mapped surface (its plane plus the gridded w where known), m. */
function offSurfaceM(seg: SegmentResult, grid: RegularGrid | undefined, x: number, y: number, z: number): { distanceM: number; s: number; t: number } {
  const [cx, cy, cz] = seg.plane.centroid;
  const px = x - cx,
    py = y - cy,
    pz = z - cz;
  const [sx, sy, sz] = seg.plane.strikeVector;
  const [dx, dy, dz] = seg.plane.dipVector;
  const [nx, ny, nz] = seg.plane.normal;
  const s = px * sx + py * sy + pz * sz;
  const t = px * dx + py * dy + pz * dz;
  const w = px * nx + py * ny + pz * nz;
  const surface = grid?.offPlaneM ? sampleGrid(grid, grid.offPlaneM, s, t, STRICT_BILINEAR) : NaN;
  return { distanceM: w - (Number.isFinite(surface) ? surface : 0), s, t };
}

/** A point-in-polygon test (even-odd rule) for one polygon, with its bounding box checked first. */
function insideTest(polygon: [number, number][]): (s: number, t: number) => boolean {
  let minS = Infinity,
    maxS = -Infinity,
    minT = Infinity,
    maxT = -Infinity;
  for (const [ps, pt] of polygon) {
    minS = Math.min(minS, ps);
    maxS = Math.max(maxS, ps);
    minT = Math.min(minT, pt);
    maxT = Math.max(maxT, pt);
  }
  return (s, t) => {
    if (s < minS || s > maxS || t < minT || t > maxT) return false;
    let inside = false;
    for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
      const [si, ti] = polygon[i];
      const [sj, tj] = polygon[j];
      if (ti > t !== tj > t && s < ((sj - si) * (t - ti)) / (tj - ti) + si) inside = !inside;
    }
    return inside;
  };
}

interface Connection {
  kind: NonNullable<RelayResult["connection"]>["kind"];
  via: string | null;
  pickCount: number;
  throwRangeM: [number, number] | null;
  closestApproachM: number;
  note: string;
}

/** Bins of the across-ramp position used to test that a connection has no gap (a tenth of the separation each). */
const ACROSS_BINS = 10;

function relayBetween(
  a: SegmentResult,
  b: SegmentResult,
  grids: Record<string, RegularGrid>,
  segments: SegmentResult[],
  mapped: { picks: RelayPicks; bySegment: Map<string, number[]> } | null,
): RelayResult | null {
  let [bx, by] = b.plane.strikeVector;
  const [ax, ay] = a.plane.strikeVector;
  if (ax * bx + ay * by < 0) {
    bx = -bx;
    by = -by;
  }
  const strikeDifferenceDeg = Math.acos(Math.min(1, Math.abs(ax * bx + ay * by) / (Math.hypot(ax, ay) * Math.hypot(bx, by) || 1))) * DEG;
  if (strikeDifferenceDeg > MAX_RELAY_STRIKE_DIFFERENCE_DEG) return null;
  const len = Math.hypot(ax + bx, ay + by) || 1;
  const strike: Horizontal = { ux: (ax + bx) / len, uy: (ay + by) / len };
  const perp: Horizontal = { ux: strike.uy, uy: -strike.ux };
  const along = (x: number, y: number) => x * strike.ux + y * strike.uy;
  const across = (x: number, y: number) => x * perp.ux + y * perp.uy;
  const extent = (seg: SegmentResult) => {
    let lo = Infinity,
      hi = -Infinity;
    for (const [x, y] of seg.tipLine.worldPolygon) {
      const u = along(x, y);
      lo = Math.min(lo, u);
      hi = Math.max(hi, u);
    }
    return [lo, hi];
  };
  const [a0, a1] = extent(a);
  const [b0, b1] = extent(b);
  const overlapM = Math.min(a1, b1) - Math.max(a0, b0);
  if (!(overlapM > 0)) return null;
  const ga = grids[a.id],
    gb = grids[b.id];
  const zRef = (a.plane.centroid[2] + b.plane.centroid[2]) / 2;
  const pa = tracePoint(a, zRef);
  const pb = tracePoint(b, zRef);
  const mid = (Math.min(a1, b1) + Math.max(a0, b0)) / 2;
  // trace lines: p + u·strike_seg; evaluate across-strike position where along-strike = mid
  const acrossAt = (p: [number, number], seg: SegmentResult) => {
    let [sx, sy] = seg.plane.strikeVector;
    if (sx * strike.ux + sy * strike.uy < 0) {
      sx = -sx;
      sy = -sy;
    }
    const rate = along(sx, sy) || 1;
    const u = (mid - along(p[0], p[1])) / rate;
    return across(p[0] + u * sx, p[1] + u * sy);
  };
  const separationM = Math.abs(acrossAt(pa, a) - acrossAt(pb, b));
  const ratio = separationM > 0 ? overlapM / separationM : Infinity;

  // summed strike profile at zRef from the displacement grids
  const lo = Math.min(a0, b0),
    hi = Math.max(a1, b1);
  const samples = 64;
  const profile: number[] = [];
  const onSeg = (seg: SegmentResult, grid: RegularGrid | undefined, u: number) => {
    if (!grid) return 0;
    const p = tracePoint(seg, zRef);
    const [cx, cy, cz] = seg.plane.centroid;
    const [sx, sy] = seg.plane.strikeVector;
    const rate = along(sx, sy);
    if (Math.abs(rate) < 1e-9) return 0;
    const du = (u - along(p[0], p[1])) / rate;
    const wx = p[0] + du * sx - cx,
      wy = p[1] + du * sy - cy,
      wz = zRef - cz;
    const [dx, dy, dz] = seg.plane.dipVector;
    const s = wx * sx + wy * sy;
    const t = wx * dx + wy * dy + wz * dz;
    const v = sampleGrid(grid, grid.displacementM, s, t, STRICT_BILINEAR);
    return Number.isFinite(v) ? v : 0;
  };
  for (let k = 0; k < samples; k++) {
    const u = lo + ((k + 0.5) / samples) * (hi - lo);
    profile.push(onSeg(a, ga, u) + onSeg(b, gb, u));
  }
  const inOverlap = profile.filter((_, k) => {
    const u = lo + ((k + 0.5) / samples) * (hi - lo);
    return u >= Math.max(a0, b0) && u <= Math.min(a1, b1);
  });
  const peak = Math.max(...profile);
  const overlapMin = inOverlap.length ? Math.min(...inOverlap) : NaN;
  const summedMinimumFraction = peak > 0 ? overlapMin / peak : NaN;
  const cell = Math.max(ga?.cellM ?? 0, gb?.cellM ?? 0);
  // two grid cells (about one pick spacing): closer than this the two surfaces are one (common practice, no source)
  const touchM = 2 * cell;
  const overlapRange: [number, number] = [Math.max(a0, b0), Math.min(a1, b1)];
  const connection = mapped ? findConnection(a, b, ga, gb, segments, mapped, along, overlapRange, separationM, touchM) : noMappedPicks(separationM);

  let linkage: RelayResult["linkage"];
  let evidence: string;
  if (connection.kind === "merged") {
    linkage = "hard";
    evidence = connection.note;
  } else if (connection.kind === "segment" || connection.kind === "picks") {
    linkage = "breached";
    evidence = connection.note;
  } else {
    linkage = "soft";
    evidence = connection.note;
  }
  const transfer = Number.isFinite(summedMinimumFraction)
    ? summedMinimumFraction >= 0.8
      ? `Summed displacement never falls below ${(summedMinimumFraction * 100).toFixed(0)} % of its peak inside the overlap: displacement is transferred across the relay.`
      : `Summed displacement dips to ${(summedMinimumFraction * 100).toFixed(0)} % of its peak inside the overlap (below 80 %): displacement is only partly transferred, or picks are missing there.`
    : "";
  return {
    segments: [a.id, b.id],
    overlapM,
    separationM,
    overlapToSeparation: ratio,
    linkage,
    evidence: transfer ? `${evidence} ${transfer}` : evidence,
    basis: LINKAGE_BASIS,
    connection: {
      kind: connection.kind,
      via: connection.via,
      pickCount: connection.pickCount,
      throwRangeM: connection.throwRangeM,
      closestApproachM: connection.closestApproachM,
    },
    summedMinimumFraction,
    comparison: overlapToSeparationNote(ratio),
    summedProfile: { alongStrikeM: profile.map((_, k) => lo + ((k + 0.5) / samples) * (hi - lo)), displacementM: profile },
  };
}

function noMappedPicks(separationM: number): Connection {
  return {
    kind: "none",
    via: null,
    pickCount: 0,
    throwRangeM: null,
    closestApproachM: separationM,
    note: "No picks were available to look for a connecting structure, so the relay is taken as intact.",
  };
}

/**
 * The mapped evidence of linkage between segments a and b:
 * - merged: picks of one segment lie on the other's mapped surface (within `touchM`) inside its mapped limit;
 * - a connecting segment, or picks of a or b off their own surface, that cross the ramp inside the overlap from within
 *   15 % of the separation of one segment to within 15 % of the other, with picks of non-zero throw in every tenth of
 *   the way across (throw continuous through the ramp);
 * - otherwise none (and what came closest).
 */
function findConnection(
  a: SegmentResult,
  b: SegmentResult,
  ga: RegularGrid | undefined,
  gb: RegularGrid | undefined,
  segments: SegmentResult[],
  mapped: { picks: RelayPicks; bySegment: Map<string, number[]> },
  along: (x: number, y: number) => number,
  overlap: [number, number],
  separationM: number,
  touchM: number,
): Connection {
  const { picks, bySegment } = mapped;
  // merged: the closest pick of one segment to the other's surface, among picks inside that segment's mapped limit
  let closest = Infinity;
  for (const [self, other, grid] of [
    [a, b, gb],
    [b, a, ga],
  ] as const) {
    const ids = bySegment.get(self.id) ?? [];
    const placed = ids.map((i) => offSurfaceM(other, grid, picks.x[i], picks.y[i], picks.z[i]));
    // nearest first, so the (costly) outline test runs only until the first pick inside the other's mapped limit
    const order = placed.map((_, k) => k).sort((p, q) => Math.abs(placed[p].distanceM) - Math.abs(placed[q].distanceM));
    const inside = insideTest(other.mappedLimit.polygon);
    for (const k of order) {
      if (Math.abs(placed[k].distanceM) >= closest) break;
      if (inside(placed[k].s, placed[k].t)) {
        closest = Math.abs(placed[k].distanceM);
        break;
      }
    }
  }
  // when no pick lies over the other's mapped surface (e.g. the mapped parts do not overlap), the gap between the two
  // segments' nearest picks says how far apart they stay
  if (!Number.isFinite(closest)) closest = nearestPickDistanceM(bySegment.get(a.id) ?? [], bySegment.get(b.id) ?? [], picks, Math.max(separationM, touchM, 1));
  if (closest <= touchM) {
    return {
      kind: "merged",
      via: null,
      pickCount: 0,
      throwRangeM: null,
      closestApproachM: closest,
      note: `The segments merge: picks of one lie on the other's mapped surface (closest ${closest.toFixed(0)} m, within ${touchM.toFixed(0)} m, about one pick spacing), so they form one surface with a bend.`,
    };
  }
  // candidates: every other segment's picks, and picks of a or b that lie off their own surface between the two
  const margin = Math.max(touchM, 0.15 * separationM);
  const groups: { label: string; kind: "segment" | "picks"; ids: number[] }[] = segments
    .filter((seg) => seg.id !== a.id && seg.id !== b.id)
    .map((seg) => ({ label: `segment "${seg.id}"`, kind: "segment" as const, ids: bySegment.get(seg.id) ?? [] }));
  for (const [self, grid] of [
    [a, ga],
    [b, gb],
  ] as const) {
    const off = (bySegment.get(self.id) ?? []).filter((i) => Math.abs(offSurfaceM(self, grid, picks.x[i], picks.y[i], picks.z[i]).distanceM) > margin);
    if (off.length) groups.push({ label: `picks of segment "${self.id}" off its own surface`, kind: "picks", ids: off });
  }
  let best: { label: string; reach: number; gap: boolean } | null = null;
  for (const group of groups) {
    const filled = new Uint8Array(ACROSS_BINS);
    let near = Infinity,
      far = -Infinity,
      count = 0,
      minThrow = Infinity,
      maxThrow = -Infinity,
      zeroThrow = false;
    for (const i of group.ids) {
      const u = along(picks.x[i], picks.y[i]);
      if (u < overlap[0] - margin || u > overlap[1] + margin) continue;
      const fromA = offSurfaceM(a, ga, picks.x[i], picks.y[i], picks.z[i]).distanceM;
      const fromB = offSurfaceM(b, gb, picks.x[i], picks.y[i], picks.z[i]).distanceM;
      // fraction of the way from a (0) to b (1); outside the ramp when not between the two surfaces
      const fraction = fromA - fromB !== 0 ? fromA / (fromA - fromB) : NaN;
      if (!(fraction >= -0.15 && fraction <= 1.15)) continue;
      count++;
      near = Math.min(near, fraction);
      far = Math.max(far, fraction);
      minThrow = Math.min(minThrow, picks.throwM[i]);
      maxThrow = Math.max(maxThrow, picks.throwM[i]);
      if (!(picks.throwM[i] > 0)) zeroThrow = true;
      else filled[Math.min(ACROSS_BINS - 1, Math.max(0, Math.floor(fraction * ACROSS_BINS)))] = 1;
    }
    if (count === 0) continue;
    const reaches = near <= 0.15 && far >= 0.85;
    // an empty tenth between the nearest and the farthest pick is a gap in the connection
    let gap = false;
    for (let bin = Math.max(0, Math.floor(near * ACROSS_BINS)); bin <= Math.min(ACROSS_BINS - 1, Math.floor(far * ACROSS_BINS)); bin++)
      if (!filled[bin]) gap = true;
    if (reaches && !gap && !zeroThrow) {
      return {
        kind: group.kind,
        via: group.label,
        pickCount: count,
        throwRangeM: [minThrow, maxThrow],
        closestApproachM: closest,
        note: `${capitalise(group.label)} crosses the relay ramp inside the overlap, from one segment to the other (${count} picks, throw ${minThrow.toFixed(1)}–${maxThrow.toFixed(1)} m, continuous across the ramp).`,
      };
    }
    const reach = Math.max(0, Math.min(far, 1) - Math.max(near, 0));
    if (!best || reach > best.reach) best = { label: group.label, reach, gap: gap || zeroThrow };
  }
  const partial = best
    ? ` ${capitalise(best.label)} reaches into the ramp but does not connect the segments (${(best.reach * 100).toFixed(0)} % of the way across${best.gap ? ", with gaps or zero throw" : ""}).`
    : "";
  return {
    kind: "none",
    via: null,
    pickCount: 0,
    throwRangeM: null,
    closestApproachM: closest,
    note: `No picks or segment connect the relay ramp; the segments stay ${Number.isFinite(closest) ? `at least ${closest.toFixed(0)} m` : `more than ${(3 * Math.max(separationM, touchM, 1)).toFixed(0)} m`} apart.${partial}`,
  };
}

const capitalise = (text: string) => `${text.charAt(0).toUpperCase()}${text.slice(1)}`;

/**
 * The smallest 3-D distance between a pick of one list and a pick of the other, looked for within `reachM` cells of a
 * horizontal hash (each pick of `a` scans the 3 × 3 cells around it); Infinity when no pair is that close.
 */
function nearestPickDistanceM(a: number[], b: number[], picks: RelayPicks, reachM: number): number {
  const cells = new Map<string, number[]>();
  const key = (x: number, y: number) => `${Math.floor(x / reachM)},${Math.floor(y / reachM)}`;
  for (const i of b) {
    const k = key(picks.x[i], picks.y[i]);
    if (!cells.has(k)) cells.set(k, []);
    cells.get(k)!.push(i);
  }
  let best = Infinity;
  for (const i of a) {
    const cx = Math.floor(picks.x[i] / reachM),
      cy = Math.floor(picks.y[i] / reachM);
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        for (const j of cells.get(`${cx + dx},${cy + dy}`) ?? []) {
          best = Math.min(best, Math.hypot(picks.x[i] - picks.x[j], picks.y[i] - picks.y[j], picks.z[i] - picks.z[j]));
        }
      }
    }
  }
  return best;
}
