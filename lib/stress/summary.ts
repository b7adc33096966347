// Area-weighted summaries of a triangle screen: minimum ΔP to failure, area fractions below thresholds,
// histogram bins, a deterministic subsample for the Mohr plot, and the plain summary sentence. Pure.
import type { StressParameters } from "@/db/schema";
import type { TriangleScreen } from "./surface";
import { maxSlipTendency, orderedPrincipal, stressesAtDepth } from "./tensor";

export interface ThresholdFraction {
  thresholdMPa: number;
  /** area fraction with ΔP below the threshold at the lower friction coefficient */
  fractionLow: number;
  fractionHigh: number;
}

export interface Histogram {
  /** bin edges, MPa; bins = edges.length − 1 */
  edgesMPa: number[];
  /** area fraction per bin, ΔP at the lower and the upper friction coefficient */
  fractionLow: number[];
  fractionHigh: number[];
}

export interface ScreenSummary {
  triangleCount: number;
  areaM2: number;
  depthRangeM: [number, number];
  minPressureToFailureMPa: { low: number; high: number };
  /** area fraction where failure is already predicted (ΔP < 0) */
  failingFraction: { low: number; high: number };
  thresholds: ThresholdFraction[];
  slipTendency: { max: number; areaMean: number };
  dilationTendency: { max: number; areaMean: number };
  /** triangles with σn′ ≤ 0 (slip tendency undefined) */
  tensileCount: number;
  histogram: Histogram;
  reference: {
    depthM: number;
    sigma1MPa: number;
    sigma2MPa: number;
    sigma3MPa: number;
    porePressureMPa: number;
    /** largest effective slip tendency of any cohesionless plane at the reference depth */
    maxPossibleSlipTendency: number;
  };
  sentence: string;
}

/** A round step (1, 2 or 5 × 10^k) giving about `target` bins over the span (common practice, no source). */
export function niceStep(span: number, target = 20): number {
  if (!(span > 0)) return 1;
  const raw = span / target;
  const power = 10 ** Math.floor(Math.log10(raw));
  const m = raw / power;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * power;
}

export function areaHistogram(valuesLow: ArrayLike<number>, valuesHigh: ArrayLike<number>, areas: ArrayLike<number>, targetBins = 20): Histogram {
  let lo = Infinity, hi = -Infinity, total = 0;
  for (let i = 0; i < areas.length; i++) {
    for (const v of [valuesLow[i], valuesHigh[i]]) {
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
    total += areas[i];
  }
  if (!Number.isFinite(lo)) return { edgesMPa: [], fractionLow: [], fractionHigh: [] };
  const step = niceStep(hi - lo || 1, targetBins);
  const start = Math.floor(lo / step) * step;
  const bins = Math.max(1, Math.ceil((hi - start) / step + 1e-9));
  const edgesMPa = Array.from({ length: bins + 1 }, (_, i) => +(start + i * step).toPrecision(12));
  const fractionLow = new Array<number>(bins).fill(0);
  const fractionHigh = new Array<number>(bins).fill(0);
  const binOf = (v: number) => Math.min(bins - 1, Math.max(0, Math.floor((v - start) / step)));
  for (let i = 0; i < areas.length; i++) {
    if (Number.isFinite(valuesLow[i])) fractionLow[binOf(valuesLow[i])] += areas[i] / total;
    if (Number.isFinite(valuesHigh[i])) fractionHigh[binOf(valuesHigh[i])] += areas[i] / total;
  }
  return { edgesMPa, fractionLow, fractionHigh };
}

const fmt = (value: number, digits = 1) => (Number.isFinite(value) ? value.toFixed(digits) : "—");
const pct = (fraction: number) => `${(fraction * 100).toFixed(fraction > 0 && fraction < 0.001 ? 2 : 1)} %`;

export function summarizeScreen(screen: TriangleScreen, parameters: StressParameters, thresholdsMPa: number[], targetBins = 20): ScreenSummary {
  let area = 0, minLow = Infinity, minHigh = Infinity, failLow = 0, failHigh = 0;
  let tsMax = -Infinity, tsSum = 0, tsArea = 0, tdMax = -Infinity, tdSum = 0, tdArea = 0, tensile = 0;
  let depthMin = Infinity, depthMax = -Infinity;
  const below = thresholdsMPa.map(() => ({ low: 0, high: 0 }));
  for (let i = 0; i < screen.count; i++) {
    const a = screen.areaM2[i];
    area += a;
    const low = screen.pressureToFailureLowMPa[i];
    const high = screen.pressureToFailureHighMPa[i];
    minLow = Math.min(minLow, low);
    minHigh = Math.min(minHigh, high);
    if (low < 0) failLow += a;
    if (high < 0) failHigh += a;
    thresholdsMPa.forEach((threshold, k) => {
      if (low < threshold) below[k].low += a;
      if (high < threshold) below[k].high += a;
    });
    const ts = screen.slipTendency[i];
    if (Number.isFinite(ts)) {
      tsMax = Math.max(tsMax, ts);
      tsSum += ts * a;
      tsArea += a;
    } else tensile++;
    const td = screen.dilationTendency[i];
    if (Number.isFinite(td)) {
      tdMax = Math.max(tdMax, td);
      tdSum += td * a;
      tdArea += a;
    }
    depthMin = Math.min(depthMin, screen.depthM[i]);
    depthMax = Math.max(depthMax, screen.depthM[i]);
  }
  const frac = (x: number) => (area > 0 ? x / area : NaN);
  const referenceStresses = stressesAtDepth(parameters, parameters.referenceDepthM);
  const [s1, s2, s3] = orderedPrincipal(referenceStresses);
  const pp = referenceStresses.porePressureMPa;
  const thresholds = thresholdsMPa.map((thresholdMPa, k) => ({ thresholdMPa, fractionLow: frac(below[k].low), fractionHigh: frac(below[k].high) }));
  const summary: Omit<ScreenSummary, "sentence"> = {
    triangleCount: screen.count,
    areaM2: area,
    depthRangeM: [depthMin, depthMax],
    minPressureToFailureMPa: { low: screen.count ? minLow : NaN, high: screen.count ? minHigh : NaN },
    failingFraction: { low: frac(failLow), high: frac(failHigh) },
    thresholds,
    slipTendency: { max: tsArea > 0 ? tsMax : NaN, areaMean: tsArea > 0 ? tsSum / tsArea : NaN },
    dilationTendency: { max: tdArea > 0 ? tdMax : NaN, areaMean: tdArea > 0 ? tdSum / tdArea : NaN },
    tensileCount: tensile,
    histogram: areaHistogram(screen.pressureToFailureLowMPa, screen.pressureToFailureHighMPa, screen.areaM2, targetBins),
    reference: {
      depthM: parameters.referenceDepthM,
      sigma1MPa: s1,
      sigma2MPa: s2,
      sigma3MPa: s3,
      porePressureMPa: pp,
      maxPossibleSlipTendency: maxSlipTendency(s1 - pp, s3 - pp),
    },
  };
  return { ...summary, sentence: summarySentence(summary, parameters) };
}

function summarySentence(s: Omit<ScreenSummary, "sentence">, p: StressParameters): string {
  if (s.triangleCount === 0) return "No triangles of the fault surface could be screened (none below the datum, or all degenerate).";
  const areaKm2 = s.areaM2 / 1e6;
  const firstThreshold = s.thresholds[0];
  const parts = [
    `Over ${fmt(areaKm2, 2)} km² of fault surface between ${fmt(s.depthRangeM[0], 0)} and ${fmt(s.depthRangeM[1], 0)} m depth, the smallest pore-pressure increase to failure is ${fmt(s.minPressureToFailureMPa.low)} MPa at μ = ${p.frictionLow} and ${fmt(s.minPressureToFailureMPa.high)} MPa at μ = ${p.frictionHigh}.`,
  ];
  if (firstThreshold) {
    parts.push(`Between ${pct(Math.min(firstThreshold.fractionLow, firstThreshold.fractionHigh))} and ${pct(Math.max(firstThreshold.fractionLow, firstThreshold.fractionHigh))} of the area would reach failure with less than ${firstThreshold.thresholdMPa} MPa of added pore pressure.`);
  }
  if (s.failingFraction.low > 0) {
    parts.push(`${pct(s.failingFraction.low)} of the area is already at or past failure at μ = ${p.frictionLow} under these inputs.`);
  }
  parts.push(`Slip tendency reaches ${fmt(s.slipTendency.max, 2)} (area mean ${fmt(s.slipTendency.areaMean, 2)}); dilation tendency reaches ${fmt(s.dilationTendency.max, 2)}.`);
  return parts.join(" ");
}

/** Deterministic, evenly spaced subsample of at most `max` indices out of `count` (for plotting). */
export function evenSubsample(count: number, max = 20_000): Uint32Array {
  if (count <= max) return Uint32Array.from({ length: count }, (_, i) => i);
  return Uint32Array.from({ length: max }, (_, j) => Math.floor((j * count) / max));
}
