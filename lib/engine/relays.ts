import type { RelayResult, SegmentResult, RegularGrid } from "./types";
import { sampleGrid } from "./grid";

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
  return `O/S = ${ratio.toFixed(2)} (${band}); published means: 4.2 globally (Long & Imber 2011), 3.5 for Icelandic rift relays (Acocella et al. 2000).`;
}

interface Horizontal { ux: number; uy: number }

function tracePoint(seg: SegmentResult, zRef: number): [number, number] {
  // point of the segment's plane at elevation zRef on the down-dip line through the centroid
  const [cx, cy, cz] = seg.plane.centroid;
  const [dx, dy, dz] = seg.plane.dipVector;
  const t = dz !== 0 ? (zRef - cz) / dz : 0;
  return [cx + t * dx, cy + t * dy];
}

/**
 * Overlap along mean strike between inferred tip lines, separation perpendicular to strike between the segments'
 * traces at a common elevation, the summed strike profile across the relay, and a linkage label.
 */
export function analyzeRelays(segments: SegmentResult[], grids: Record<string, RegularGrid>): RelayResult[] {
  const out: RelayResult[] = [];
  for (let i = 0; i < segments.length; i++) {
    for (let j = i + 1; j < segments.length; j++) {
      const r = relayBetween(segments[i], segments[j], grids[segments[i].id], grids[segments[j].id]);
      if (r) out.push(r);
    }
  }
  return out;
}

function relayBetween(a: SegmentResult, b: SegmentResult, ga: RegularGrid | undefined, gb: RegularGrid | undefined): RelayResult | null {
  let [bx, by] = b.plane.strikeVector;
  const [ax, ay] = a.plane.strikeVector;
  if (ax * bx + ay * by < 0) { bx = -bx; by = -by; }
  const len = Math.hypot(ax + bx, ay + by) || 1;
  const strike: Horizontal = { ux: (ax + bx) / len, uy: (ay + by) / len };
  const perp: Horizontal = { ux: strike.uy, uy: -strike.ux };
  const along = (x: number, y: number) => x * strike.ux + y * strike.uy;
  const across = (x: number, y: number) => x * perp.ux + y * perp.uy;
  const extent = (seg: SegmentResult) => {
    let lo = Infinity, hi = -Infinity;
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
  const zRef = (a.plane.centroid[2] + b.plane.centroid[2]) / 2;
  const pa = tracePoint(a, zRef);
  const pb = tracePoint(b, zRef);
  const mid = (Math.min(a1, b1) + Math.max(a0, b0)) / 2;
  // trace lines: p + u·strike_seg; evaluate across-strike position where along-strike = mid
  const acrossAt = (p: [number, number], seg: SegmentResult) => {
    let [sx, sy] = seg.plane.strikeVector;
    if (sx * strike.ux + sy * strike.uy < 0) { sx = -sx; sy = -sy; }
    const rate = along(sx, sy) || 1;
    const u = (mid - along(p[0], p[1])) / rate;
    return across(p[0] + u * sx, p[1] + u * sy);
  };
  const separationM = Math.abs(acrossAt(pa, a) - acrossAt(pb, b));
  const ratio = separationM > 0 ? overlapM / separationM : Infinity;

  // summed strike profile at zRef from the displacement grids
  const lo = Math.min(a0, b0), hi = Math.max(a1, b1);
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
    const wx = p[0] + du * sx - cx, wy = p[1] + du * sy - cy, wz = zRef - cz;
    const [dx, dy, dz] = seg.plane.dipVector;
    const s = wx * sx + wy * sy;
    const t = wx * dx + wy * dy + wz * dz;
    const v = sampleGrid(grid, grid.displacementM, s, t);
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
  const deficit = peak > 0 && overlapMin < 0.8 * peak;
  const cell = Math.max(ga?.cellM ?? 0, gb?.cellM ?? 0);
  let linkage: RelayResult["linkage"];
  let evidence: string;
  // thresholds are common practice, no single source: traces within two grid cells are treated as joined
  if (separationM <= 2 * cell) {
    linkage = "hard";
    evidence = `the segment traces meet at ${Math.round(zRef)} m elevation (separation ${separationM.toFixed(0)} m ≤ two grid cells)`;
  } else if (!deficit && ratio > 10) {
    linkage = "breached";
    evidence = `summed displacement across the relay has no deficit (minimum ${(overlapMin / peak * 100).toFixed(0)} % of peak) and the overlap is long for its separation (O/S ${ratio.toFixed(1)} > 10)`;
  } else {
    linkage = "soft";
    evidence = deficit
      ? `summed displacement dips to ${(overlapMin / peak * 100).toFixed(0)} % of peak inside the overlap (below 80 %), so displacement is only partly transferred; no connecting trace`
      : `summed displacement stays ≥ 80 % of peak across the overlap, typical of an intact relay ramp transferring displacement; the traces remain ${separationM.toFixed(0)} m apart`;
  }
  return {
    segments: [a.id, b.id],
    overlapM,
    separationM,
    overlapToSeparation: ratio,
    linkage,
    evidence,
    comparison: overlapToSeparationNote(ratio),
    summedProfile: { alongStrikeM: profile.map((_, k) => lo + ((k + 0.5) / samples) * (hi - lo)), displacementM: profile },
  };
}
