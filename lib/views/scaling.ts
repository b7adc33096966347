// Displacement–length (D–L) scaling: one (L, Dmax) pair per fault, power-law fits D = c·L^n in log space by ordinary
// least squares and reduced major axis, with n's 95 % confidence interval, and the published envelopes drawn behind.
import type { AnalysisReport } from "@/lib/engine/types";
import { alongStrike, commonStrikeFrame } from "./profiles";
import type { FaultScalingPoint } from "@/lib/contracts/analysis";

/** Along-strike extent of the union of the segments' polygons (world coordinates) on the mean strike. */
function unionLength(report: AnalysisReport, polygonOf: (segment: AnalysisReport["segments"][number]) => [number, number, number][]): number {
  const frame = commonStrikeFrame(report.segments);
  let lo = Infinity;
  let hi = -Infinity;
  for (const segment of report.segments) {
    for (const [x, y] of polygonOf(segment)) {
      const u = alongStrike(frame, x, y);
      lo = Math.min(lo, u);
      hi = Math.max(hi, u);
    }
  }
  return hi - lo;
}

/**
 * One fault's D–L pair from its report: the fitted Dmax (noise lifts the observed maximum) of the segment with the
 * largest, with its range; L = along-strike extent of the union of the segments' inferred tip lines on the mean
 * strike (the tip-line length for a single segment), its range from the inner and outer tip lines.
 */
export function faultScalingPoint(faultId: string, name: string, report: AnalysisReport): FaultScalingPoint | null {
  if (report.segments.length === 0) return null;
  const fitted = (s: AnalysisReport["segments"][number]) => s.max.fittedDisplacementM ?? s.max.displacementM;
  const top = report.segments.reduce((best, s) => (fitted(s) > fitted(best) ? s : best));
  const dMaxM = fitted(top);
  const dMaxRangeM: [number, number] = top.max.fittedDisplacementRangeM ?? [dMaxM, dMaxM];
  const lengthIsMinimum = report.segments.some((s) => s.tipLine.lengthIsMinimum);
  let lengthM: number;
  let lengthRangeM: [number, number | null];
  if (report.segments.length === 1) {
    const tip = report.segments[0].tipLine;
    lengthM = tip.lengthM;
    lengthRangeM = tip.lengthRangeM ?? [tip.lengthM - tip.uncertaintyM, tip.lengthM + tip.uncertaintyM];
  } else {
    lengthM = unionLength(report, (s) => s.tipLine.worldPolygon);
    const hasBand = report.segments.every((s) => s.tipLine.innerWorldPolygon?.length);
    lengthRangeM = hasBand
      ? [
          Math.min(
            lengthM,
            unionLength(report, (s) => s.tipLine.innerWorldPolygon),
          ),
          lengthIsMinimum
            ? null
            : Math.max(
                lengthM,
                unionLength(report, (s) => s.tipLine.outerWorldPolygon),
              ),
        ]
      : [lengthM, lengthM];
  }
  return { faultId, name, dMaxM, dMaxRangeM, lengthM, lengthRangeM, lengthIsMinimum, segmentCount: report.segments.length };
}

export interface LineFit {
  method: "ols" | "rma";
  /** exponent n (slope in log10–log10 space) */
  n: number;
  /** prefactor c (m^(1−n)) */
  c: number;
  log10c: number;
  /** standard error of n for OLS; null for RMA, whose exact interval is not built from a symmetric standard error */
  nStandardError: number | null;
  /** 95 % confidence interval of n (see intervalMethod); for RMA it is not symmetric about n */
  nConfidence95: [number, number];
  /** how nConfidence95 was computed, with its published source */
  intervalMethod: string;
}

export interface PowerLawFit {
  count: number;
  r: number;
  r2: number;
  /** two-sided p-value of r against no correlation (Student t, N − 2 degrees of freedom) */
  correlationPValue: number;
  ols: LineFit;
  rma: LineFit;
}

const OLS_INTERVAL = "Student t on the least-squares standard error, N − 2 degrees of freedom";
const RMA_INTERVAL = "exact interval for the standardised major axis slope (Warton et al. 2006, after Pitman 1939)";

/**
 * 95 % interval of the reduced (standardised) major axis slope b = sign(r)·s_y/s_x, exact for bivariate normal errors:
 * b·(√(B + 1) − √B) to b·(√(B + 1) + √B), B = (1 − r²)·F(0.95; 1, N − 2)/(N − 2) (Warton, Wright, Falster &
 * Westoby 2006, Biological Reviews 81, from the test of Pitman 1939 that residuals and fitted values are uncorrelated).
 * It never changes sign and widens without bound as r → 0.
 */
export function reducedMajorAxisInterval(slope: number, r: number, count: number, level = 0.95): [number, number] {
  const df = count - 2;
  const t = studentTQuantile(1 - (1 - level) / 2, df);
  const b = ((1 - r * r) * t * t) / df; // F(level; 1, df) = t², the two-sided t quantile squared
  const lower = slope * (Math.sqrt(b + 1) - Math.sqrt(b));
  const upper = slope * (Math.sqrt(b + 1) + Math.sqrt(b));
  return lower <= upper ? [lower, upper] : [upper, lower];
}

/**
 * Fits log10 D = log10 c + n·log10 L. OLS slope = Sxy/Sxx with SE = sqrt(SSE/(N−2)/Sxx) and a Student t interval;
 * RMA slope = sign(r)·s_y/s_x (appropriate when both D and L carry error; Kim & Sanderson 2005 on errors in both) with
 * the exact interval of Warton et al. (2006). Needs at least 3 positive pairs; returns null otherwise.
 */
export function fitPowerLaw(lengthM: number[], dMaxM: number[]): PowerLawFit | null {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < lengthM.length; i++) {
    if (lengthM[i] > 0 && dMaxM[i] > 0 && Number.isFinite(lengthM[i]) && Number.isFinite(dMaxM[i])) {
      xs.push(Math.log10(lengthM[i]));
      ys.push(Math.log10(dMaxM[i]));
    }
  }
  const k = xs.length;
  if (k < 3) return null;
  const mx = xs.reduce((a, b) => a + b, 0) / k;
  const my = ys.reduce((a, b) => a + b, 0) / k;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < k; i++) {
    sxx += (xs[i] - mx) ** 2;
    syy += (ys[i] - my) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  if (!(sxx > 0)) return null;
  const r = syy > 0 ? sxy / Math.sqrt(sxx * syy) : 1;
  const df = k - 2;
  const tCrit = studentTQuantile(0.975, df);
  const olsN = sxy / sxx;
  const sse = Math.max(0, syy - olsN * sxy);
  const olsSe = Math.sqrt(sse / df / sxx);
  const rmaN = (r < 0 ? -1 : 1) * Math.sqrt(syy / sxx);
  const line = (method: "ols" | "rma", n: number, se: number | null, interval: [number, number], intervalMethod: string): LineFit => {
    const log10c = my - n * mx;
    return { method, n, c: 10 ** log10c, log10c, nStandardError: se, nConfidence95: interval, intervalMethod };
  };
  const tOfR = Math.abs(r) < 1 ? Math.abs(r) * Math.sqrt(df / (1 - r * r)) : Infinity;
  return {
    count: k,
    r,
    r2: r * r,
    correlationPValue: 2 * (1 - studentTCdf(tOfR, df)),
    ols: line("ols", olsN, olsSe, [olsN - tCrit * olsSe, olsN + tCrit * olsSe], OLS_INTERVAL),
    rma: line("rma", rmaN, null, reducedMajorAxisInterval(rmaN, r, k), RMA_INTERVAL),
  };
}

// ---- Student t quantile (regularised incomplete beta, continued fraction after Press et al., Numerical Recipes) --------

function logGamma(x: number): number {
  const g = [76.18009172947146, -86.50532032941677, 24.01409824083091, -1.231739572450155, 0.1208650973866179e-2, -0.5395239384953e-5];
  let y = x;
  const tmp = x + 5.5 - (x + 0.5) * Math.log(x + 5.5);
  let ser = 1.000000000190015;
  for (const coefficient of g) ser += coefficient / ++y;
  return -tmp + Math.log((2.5066282746310005 * ser) / x);
}

function betaContinuedFraction(a: number, b: number, x: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 300; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) break;
  }
  return h;
}

function regularizedBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  return x < (a + 1) / (a + b + 2) ? (front * betaContinuedFraction(a, b, x)) / a : 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

/** Cumulative Student t distribution with df degrees of freedom. */
export function studentTCdf(t: number, df: number): number {
  const x = df / (df + t * t);
  const tail = 0.5 * regularizedBeta(x, df / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

/** Quantile of the Student t distribution (bisection on the CDF; p in (0, 1)). */
export function studentTQuantile(p: number, df: number): number {
  let lo = -1e4;
  let hi = 1e4;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (studentTCdf(mid, df) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

// ---- published envelopes -----------------------------------------------------------------------------------------

export interface ScalingGuide {
  kind: "ratio" | "line" | "box";
  label: string;
  source: string;
  /** D = c·L^n for lines; for ratio lines n = 1 */
  c?: number;
  n?: number;
  box?: { lengthM: [number, number]; dMaxM: [number, number] };
}

export const SCALING_GUIDES: ScalingGuide[] = [
  { kind: "ratio", label: "D/L = 0.001", c: 0.001, n: 1, source: "lower bound of isolated faults, Barnett et al. 1987" },
  { kind: "ratio", label: "D/L = 0.01", c: 0.01, n: 1, source: "constant-ratio guide" },
  { kind: "ratio", label: "D/L = 0.1", c: 0.1, n: 1, source: "upper bound of isolated faults, Barnett et al. 1987" },
  { kind: "line", label: "D = 0.03 L", c: 0.03, n: 1, source: "Schlische et al. 1996, 201 faults, Danville basin" },
  {
    kind: "box",
    label: "Canyonlands grabens",
    source: "Cartwright, Trudgill & Mansfield 1995: 97 faults, L 100–6500 m, D 1.5–155 m",
    box: { lengthM: [100, 6500], dMaxM: [1.5, 155] },
  },
];

/** Points of D = c·L^n for L between lo and hi (log-spaced), for drawing. */
export function powerLawLine(c: number, n: number, loM: number, hiM: number, samples = 24): { lengthM: number; dMaxM: number }[] {
  const out: { lengthM: number; dMaxM: number }[] = [];
  const a = Math.log10(loM);
  const b = Math.log10(hiM);
  for (let k = 0; k < samples; k++) {
    const lengthM = 10 ** (a + ((b - a) * k) / (samples - 1));
    out.push({ lengthM, dMaxM: c * lengthM ** n });
  }
  return out;
}
