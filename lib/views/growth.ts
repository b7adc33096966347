// Growth clues from horizon picks: throw per horizon along strike, throw–depth (T–z) at a chosen position with a
// reading stated as a hint, throw backstripping, and the expansion index (Thorsen 1963) per interval.
import type { AnalysisReport, PickColumns } from "@/lib/engine/types";
import type { HorizonBin } from "@/lib/contracts/analysis";

/** Optional per-pick interval thicknesses (m) beside the pick columns; NaN where absent. */
export type PicksWithThickness = PickColumns & { hwThicknessM?: Float64Array; fwThicknessM?: Float64Array };

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
};
const mean = (values: number[]) => (values.length ? values.reduce((a, b) => a + b, 0) / values.length : NaN);

/** Bins each segment's horizon picks along strike (`bins` equal bins over the segment's pick range in s). */
export function horizonThrowBins(picks: PicksWithThickness, report: AnalysisReport, bins = 40): HorizonBin[] {
  if (picks.horizonNames.length === 0) return [];
  const out: HorizonBin[] = [];
  for (const segment of report.segments) {
    const segmentIndex = picks.segmentNames.indexOf(segment.id);
    if (segmentIndex < 0) continue;
    const { centroid, strikeVector } = segment.plane;
    const members: { s: number; i: number }[] = [];
    for (let i = 0; i < picks.x.length; i++) {
      if (picks.segment[i] !== segmentIndex || picks.horizon[i] < 0) continue;
      const s = (picks.x[i] - centroid[0]) * strikeVector[0] + (picks.y[i] - centroid[1]) * strikeVector[1] + (picks.z[i] - centroid[2]) * strikeVector[2];
      members.push({ s, i });
    }
    if (members.length === 0) continue;
    let lo = Infinity;
    let hi = -Infinity;
    for (const m of members) {
      lo = Math.min(lo, m.s);
      hi = Math.max(hi, m.s);
    }
    const width = (hi - lo) / bins || 1;
    const groups = new Map<string, number[]>();
    for (const m of members) {
      const bin = Math.min(bins - 1, Math.floor((m.s - lo) / width));
      const key = `${picks.horizon[m.i]}:${bin}`;
      const list = groups.get(key) ?? [];
      list.push(m.i);
      groups.set(key, list);
    }
    for (const [key, indices] of groups) {
      const [horizon, bin] = key.split(":").map(Number);
      const finite = (column: Float64Array | undefined) => (column ? indices.map((i) => column[i]).filter(Number.isFinite) : []);
      out.push({
        segment: segment.id,
        horizon: picks.horizonNames[horizon],
        s: lo + (bin + 0.5) * width,
        throwM: median(indices.map((i) => picks.throwM[i])),
        z: mean(indices.map((i) => picks.z[i])),
        count: indices.length,
        hwThicknessM: mean(finite(picks.hwThicknessM)),
        fwThicknessM: mean(finite(picks.fwThicknessM)),
      });
    }
  }
  return out.sort((a, b) => a.segment.localeCompare(b.segment) || a.horizon.localeCompare(b.horizon) || a.s - b.s);
}

export interface ThrowDepthPoint {
  horizon: string;
  z: number;
  throwM: number;
  hwThicknessM: number;
  fwThicknessM: number;
}

/** Throw–depth points at along-strike position s of one segment: each horizon's bin nearest to s (within maxGapM). */
export function throwDepthAt(bins: HorizonBin[], segment: string, s: number, maxGapM = Infinity): ThrowDepthPoint[] {
  const byHorizon = new Map<string, HorizonBin>();
  for (const bin of bins) {
    if (bin.segment !== segment || Math.abs(bin.s - s) > maxGapM) continue;
    const current = byHorizon.get(bin.horizon);
    if (!current || Math.abs(bin.s - s) < Math.abs(current.s - s)) byHorizon.set(bin.horizon, bin);
  }
  return [...byHorizon.values()]
    .map(({ horizon, z, throwM, hwThicknessM, fwThicknessM }) => ({ horizon, z, throwM, hwThicknessM, fwThicknessM }))
    .sort((a, b) => b.z - a.z);
}

/**
 * Throw accrued between successive horizons, youngest (shallowest) first: T(older) − T(younger), and the throw after
 * the youngest horizon (its own throw). Assumes the fault reached the surface of deposition (throw backstripping,
 * common practice; worked case in docs/check-values.md H2).
 */
export function backstripThrows(pointsShallowFirst: { horizon: string; throwM: number }[]): { from: string; to: string | null; accruedM: number }[] {
  const out: { from: string; to: string | null; accruedM: number }[] = [];
  if (pointsShallowFirst.length === 0) return out;
  out.push({ from: pointsShallowFirst[0].horizon, to: null, accruedM: pointsShallowFirst[0].throwM });
  for (let k = 1; k < pointsShallowFirst.length; k++) {
    out.push({
      from: pointsShallowFirst[k].horizon,
      to: pointsShallowFirst[k - 1].horizon,
      accruedM: pointsShallowFirst[k].throwM - pointsShallowFirst[k - 1].throwM,
    });
  }
  return out;
}

/** Expansion index (Thorsen 1963): hanging-wall thickness / footwall thickness of the same interval; throw accrued ≈ t_HW − t_FW. */
export function expansionIndex(hwThicknessM: number, fwThicknessM: number): { index: number; accruedThrowM: number } | null {
  if (!(hwThicknessM > 0) || !(fwThicknessM > 0)) return null;
  return { index: hwThicknessM / fwThicknessM, accruedThrowM: hwThicknessM - fwThicknessM };
}

export interface ThrowDepthReading {
  pattern: "too-few" | "constant" | "upward-decrease" | "c-shaped" | "stepped" | "irregular";
  hint: string;
  basis: string;
}

const BASIS =
  "Throw–depth plots after Cartwright et al. (1998); reactivation and growth read from throw mapping after Baudon & Cartwright (2008). A hint, not a verdict: footwall erosion, compaction, drag and picking error give similar shapes.";

/** A reading of a T–z plot (points ordered shallow to deep), with a tolerance for "constant" of 10 % of the largest throw. */
export function readThrowDepth(pointsShallowFirst: { throwM: number }[], tolerance = 0.1): ThrowDepthReading {
  const t = pointsShallowFirst.map((p) => p.throwM);
  if (t.length < 3) return { pattern: "too-few", hint: "Fewer than three horizons at this position: no reading.", basis: BASIS };
  const max = Math.max(...t);
  const tol = tolerance * max;
  const steps = t.slice(1).map((v, k) => v - t[k]);
  const flat = steps.map((d) => Math.abs(d) <= tol);
  const up = steps.map((d) => d > tol);
  const down = steps.map((d) => d < -tol);
  const peak = t.indexOf(max);
  if (flat.every(Boolean))
    return {
      pattern: "constant",
      hint: "Throw is about constant with depth: the horizons were likely deposited before faulting (pre-kinematic), with no sign of growth here.",
      basis: BASIS,
    };
  if (steps.every((d, k) => up[k] || flat[k]) && flat.some(Boolean) && up.some(Boolean))
    return {
      pattern: "stepped",
      hint: "Throw decreases upward above a constant-throw interval: a hint of syn-sedimentary growth (growth faulting) above pre-kinematic horizons, or of renewed slip after a pause. Check for hanging-wall thickening (expansion index).",
      basis: BASIS,
    };
  if (steps.every((d, k) => up[k] || flat[k]))
    return {
      pattern: "upward-decrease",
      hint: "Throw decreases steadily upward: consistent with syn-sedimentary growth, or with an upper tip propagating upward (blind fault). Hanging-wall thickening (expansion index > 1) would favour growth faulting.",
      basis: BASIS,
    };
  if (
    peak > 0 &&
    peak < t.length - 1 &&
    steps.slice(0, peak).every((d, k) => up[k] || flat[k]) &&
    steps.slice(peak).every((d, k) => down[peak + k] || flat[peak + k])
  )
    return {
      pattern: "c-shaped",
      hint: "Throw is largest at mid-depth and decreases both up and down (C-shaped): the signature of a blind, propagating fault that did not reach the surface of deposition.",
      basis: BASIS,
    };
  return {
    pattern: "irregular",
    hint: "Throw changes irregularly with depth: minima or inflections may mark reactivation or dip linkage of segments; check the picks first.",
    basis: BASIS,
  };
}
