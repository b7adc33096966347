// Area-weighted summaries of a screen: minimum ΔP to failure (each end of the friction band, the more critical end per
// element, and its range over the orientation uncertainty), area fractions below thresholds,
// histogram bins, a deterministic subsample for the Mohr plot, and the plain summary sentence. Pure.
import type { Histogram, ScreenSummary, StressParameters } from "@/lib/contracts/stress";
import type { TriangleScreen } from "./surface";
import { maxSlipTendency, orderedPrincipal, stressesAtDepth } from "./tensor";

/** A round step (1, 2 or 5 × 10^k) giving about `target` bins over the span (common practice, no source). */
export function niceStep(span: number, target = 20): number {
  if (!(span > 0)) return 1;
  const raw = span / target;
  const power = 10 ** Math.floor(Math.log10(raw));
  const m = raw / power;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * power;
}

export function areaHistogram(valuesLow: ArrayLike<number>, valuesHigh: ArrayLike<number>, areas: ArrayLike<number>, targetBins = 20): Histogram {
  let lo = Infinity,
    hi = -Infinity,
    total = 0;
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

/** Area-weighted median of the finite values (NaN when there are none). */
function areaMedian(values: ArrayLike<number>, areas: ArrayLike<number>): number {
  const order = Array.from({ length: values.length }, (_, i) => i)
    .filter((i) => Number.isFinite(values[i]))
    .sort((i, j) => values[i] - values[j]);
  const total = order.reduce((sum, i) => sum + areas[i], 0);
  let running = 0;
  for (const i of order) {
    running += areas[i];
    if (running >= total / 2) return values[i];
  }
  return NaN;
}

export function summarizeScreen(screen: TriangleScreen, parameters: StressParameters, thresholdsMPa: number[], targetBins = 20): ScreenSummary {
  let area = 0,
    minLow = Infinity,
    minHigh = Infinity,
    minCritical = Infinity,
    minRangeLow = Infinity,
    minRangeHigh = Infinity;
  let failCritical = 0,
    failBoth = 0,
    failRange = 0;
  let tsMax = -Infinity,
    tsRangeMax = -Infinity,
    tsSum = 0,
    tsArea = 0,
    tdMax = -Infinity,
    tdSum = 0,
    tdArea = 0,
    tensile = 0;
  let depthMin = Infinity,
    depthMax = -Infinity;
  const below = thresholdsMPa.map(() => ({ critical: 0, both: 0 }));
  for (let i = 0; i < screen.count; i++) {
    const a = screen.areaM2[i];
    area += a;
    const low = screen.pressureToFailureLowMPa[i];
    const high = screen.pressureToFailureHighMPa[i];
    const critical = screen.pressureToFailureCriticalMPa[i];
    const leastCritical = Math.max(low, high);
    minLow = Math.min(minLow, low);
    minHigh = Math.min(minHigh, high);
    minCritical = Math.min(minCritical, critical);
    minRangeLow = Math.min(minRangeLow, screen.pressureToFailureMinMPa[i]);
    minRangeHigh = Math.min(minRangeHigh, screen.pressureToFailureMaxMPa[i]);
    if (critical < 0) failCritical += a;
    if (leastCritical < 0) failBoth += a;
    if (screen.pressureToFailureMinMPa[i] < 0) failRange += a;
    thresholdsMPa.forEach((threshold, k) => {
      if (critical < threshold) below[k].critical += a;
      if (leastCritical < threshold) below[k].both += a;
    });
    const ts = screen.slipTendency[i];
    if (Number.isFinite(ts)) {
      tsMax = Math.max(tsMax, ts);
      tsSum += ts * a;
      tsArea += a;
    } else tensile++;
    if (Number.isFinite(screen.slipTendencyMax[i])) tsRangeMax = Math.max(tsRangeMax, screen.slipTendencyMax[i]);
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
  const any = screen.count > 0;
  const referenceStresses = stressesAtDepth(parameters, parameters.referenceDepthM);
  const [s1, s2, s3] = orderedPrincipal(referenceStresses);
  const pp = referenceStresses.porePressureMPa;
  const summary: Omit<ScreenSummary, "sentence"> = {
    triangleCount: screen.count,
    areaM2: area,
    depthRangeM: [depthMin, depthMax],
    minPressureToFailureMPa: {
      low: any ? minLow : NaN,
      high: any ? minHigh : NaN,
      critical: any ? minCritical : NaN,
      criticalRange: [any ? minRangeLow : NaN, any ? minRangeHigh : NaN],
    },
    failingFraction: { critical: frac(failCritical), bothEnds: frac(failBoth), withinOrientationRange: frac(failRange) },
    thresholds: thresholdsMPa.map((thresholdMPa, k) => ({ thresholdMPa, fractionCritical: frac(below[k].critical), fractionBothEnds: frac(below[k].both) })),
    slipTendency: {
      max: tsArea > 0 ? tsMax : NaN,
      areaMean: tsArea > 0 ? tsSum / tsArea : NaN,
      maxWithinOrientationRange: Number.isFinite(tsRangeMax) ? tsRangeMax : NaN,
    },
    dilationTendency: { max: tdArea > 0 ? tdMax : NaN, areaMean: tdArea > 0 ? tdSum / tdArea : NaN },
    orientation: {
      medianUncertaintyDeg: areaMedian(screen.orientationUncertaintyDeg, screen.areaM2),
      medianSlopeScatterDeg: areaMedian(screen.slopeScatterDeg, screen.areaM2),
    },
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
  const [rangeLow, rangeHigh] = s.minPressureToFailureMPa.criticalRange;
  const parts = [
    `Over ${fmt(areaKm2, 2)} km² of fault surface between ${fmt(s.depthRangeM[0], 0)} and ${fmt(s.depthRangeM[1], 0)} m depth, the smallest pore-pressure increase to failure is ${fmt(s.minPressureToFailureMPa.low)} MPa at μ = ${p.frictionLow} and ${fmt(s.minPressureToFailureMPa.high)} MPa at μ = ${p.frictionHigh}; taking the more critical end for each part of the surface, ${fmt(s.minPressureToFailureMPa.critical)} MPa (${fmt(rangeLow)} to ${fmt(rangeHigh)} MPa within the orientation uncertainty).`,
  ];
  if (firstThreshold) {
    parts.push(
      `Between ${pct(firstThreshold.fractionBothEnds)} (both ends of the friction band) and ${pct(firstThreshold.fractionCritical)} (the more critical end) of the area would reach failure with less than ${firstThreshold.thresholdMPa} MPa of added pore pressure.`,
    );
  }
  if (s.failingFraction.critical > 0) {
    parts.push(
      `${pct(s.failingFraction.critical)} of the area is already at or past failure at the more critical end of μ ${p.frictionLow}–${p.frictionHigh} under these inputs.`,
    );
  } else if (s.failingFraction.withinOrientationRange > 0) {
    parts.push(
      `No part is at failure with its fitted orientation, but ${pct(s.failingFraction.withinOrientationRange)} of the area could be within its orientation uncertainty.`,
    );
  }
  parts.push(
    `Slip tendency reaches ${fmt(s.slipTendency.max, 2)} (area mean ${fmt(s.slipTendency.areaMean, 2)}); dilation tendency reaches ${fmt(s.dilationTendency.max, 2)}.`,
  );
  return parts.join(" ");
}

/** Deterministic, evenly spaced subsample of at most `max` indices out of `count` (for plotting). */
export function evenSubsample(count: number, max = 20_000): Uint32Array {
  if (count <= max) return Uint32Array.from({ length: count }, (_, i) => i);
  return Uint32Array.from({ length: max }, (_, j) => Math.floor((j * count) / max));
}
