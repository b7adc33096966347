import type { PlaneFit, ProfileModel, TipLine } from "./types";
import { PROFILE_FUNCTIONS, PROFILE_LABELS, extrapolateTipLinear } from "./profiles";
import { planeToWorld } from "./project";

type Frame = Pick<PlaneFit, "centroid" | "strikeVector" | "dipVector" | "normal">;

/** Minimise f by the Nelder–Mead simplex (standard coefficients). */
export function nelderMead(f: (p: number[]) => number, start: number[], steps: number[], maxIterations = 600, tolerance = 1e-10): { point: number[]; value: number } {
  const dim = start.length;
  let simplex = [start.slice()];
  for (let i = 0; i < dim; i++) {
    const p = start.slice();
    p[i] += steps[i];
    simplex.push(p);
  }
  let values = simplex.map(f);
  for (let it = 0; it < maxIterations; it++) {
    const order = values.map((_, i) => i).sort((i, j) => values[i] - values[j]);
    simplex = order.map((i) => simplex[i]);
    values = order.map((i) => values[i]);
    if (Math.abs(values[dim] - values[0]) <= tolerance * (Math.abs(values[0]) + 1e-30)) break;
    const centroid = new Array(dim).fill(0);
    for (let i = 0; i < dim; i++) for (let k = 0; k < dim; k++) centroid[k] += simplex[i][k] / dim;
    const along = (c: number) => centroid.map((v, k) => v + c * (simplex[dim][k] - v));
    const reflected = along(-1);
    const fr = f(reflected);
    if (fr < values[0]) {
      const expanded = along(-2);
      const fe = f(expanded);
      if (fe < fr) { simplex[dim] = expanded; values[dim] = fe; } else { simplex[dim] = reflected; values[dim] = fr; }
    } else if (fr < values[dim - 1]) {
      simplex[dim] = reflected;
      values[dim] = fr;
    } else {
      const contracted = fr < values[dim] ? along(-0.5) : along(0.5);
      const fc = f(contracted);
      if (fc < Math.min(fr, values[dim])) {
        simplex[dim] = contracted;
        values[dim] = fc;
      } else {
        for (let i = 1; i <= dim; i++) {
          simplex[i] = simplex[i].map((v, k) => simplex[0][k] + 0.5 * (v - simplex[0][k]));
          values[i] = f(simplex[i]);
        }
      }
    }
  }
  let best = 0;
  for (let i = 1; i <= dim; i++) if (values[i] < values[best]) best = i;
  return { point: simplex[best], value: values[best] };
}

/** log of the standard normal CDF, accurate in the far lower tail. */
export function logNormalCdf(x: number): number {
  // from x ≈ 8.29 up, 0.5·erfc(−x/√2) rounds to exactly 1 in double precision, so the log is exactly 0: skip the work
  if (x >= 8.5) return 0;
  if (x < -6) {
    const x2 = x * x;
    return -x2 / 2 - Math.log(-x) - 0.5 * Math.log(2 * Math.PI) + Math.log(1 - 1 / x2 + 3 / (x2 * x2));
  }
  return Math.log(0.5 * erfc(-x / Math.SQRT2));
}

/** Complementary error function (Numerical Recipes erfcc, relative error < 1.2e-7). */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

export interface CensoringInfo {
  /** smallest displacement that could be picked (m); picks exist only above it */
  cutoffM: number;
  /** places just outside the data outline where no pick was made, so displacement there is below the cut-off */
  absentS: Float64Array;
  absentT: Float64Array;
}

export interface ModelFit {
  model: ProfileModel;
  centre: { s: number; t: number };
  semiAxes: { sM: number; tM: number };
  dmaxM: number;
  rmsM: number;
  /** set when the censored likelihood was used; compare between models on the same data */
  negLogLikelihood?: number;
}

const MAX_FIT_POINTS = 1200;

/**
 * Deterministic, order-independent subsample: a pick is kept when a hash of its coordinates falls in the kept
 * fraction, so permuting the rows never changes the fit.
 */
function subsample(s: ArrayLike<number>, t: ArrayLike<number>): Uint32Array {
  const n = s.length;
  if (n <= MAX_FIT_POINTS) return Uint32Array.from({ length: n }, (_, i) => i);
  const keep = MAX_FIT_POINTS / n;
  const buf = new Float64Array(2);
  const words = new Uint32Array(buf.buffer);
  const out = new Uint32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    buf[0] = s[i];
    buf[1] = t[i];
    let h = Math.imul(2166136261 ^ words[0], 16777619);
    h = Math.imul(h ^ words[1], 16777619);
    h = Math.imul(h ^ words[2], 16777619);
    h = Math.imul(h ^ words[3], 16777619);
    h ^= h >>> 15;
    h = Math.imul(h, 2246822507);
    h ^= h >>> 13;
    if ((h >>> 0) / 4294967296 < keep) out[count++] = i;
  }
  return out.slice(0, count);
}

/** The picks the profile fits use (at most MAX_FIT_POINTS, see subsample). */
interface FitSample {
  ss: Float64Array;
  tt: Float64Array;
  dd: Float64Array;
}

function sampleForFit(s: ArrayLike<number>, t: ArrayLike<number>, d: ArrayLike<number>): FitSample {
  const ids = subsample(s, t);
  const m = ids.length;
  const ss = new Float64Array(m), tt = new Float64Array(m), dd = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    ss[k] = s[ids[k]];
    tt[k] = t[ids[k]];
    dd[k] = d[ids[k]];
  }
  return { ss, tt, dd };
}

/** A least-squares fit with what a censored refinement needs to start from it without refitting. */
interface LeastSquaresFit {
  fit: ModelFit;
  model: ProfileModel;
  ss: Float64Array;
  tt: Float64Array;
  dd: Float64Array;
  point: number[];
  sse: number;
  dmax: number;
  maxD: number;
}

/**
 * Fit D(s, t) = Dmax · f(r), r = sqrt(((s − sc)/a)² + ((t − tc)/b)²), to the picks: an elliptical tip line with
 * axes along strike and down dip (Barnett et al. 1987). Dmax is solved in closed form for each geometry; centre
 * and semi-axes by Nelder–Mead on log axes.
 */
function leastSquaresFit(sample: FitSample, model: ProfileModel): LeastSquaresFit {
  const f = PROFILE_FUNCTIONS[model];
  const { ss, tt, dd } = sample;
  const m = ss.length;
  let minS = Infinity, maxS = -Infinity, minT = Infinity, maxT = -Infinity, maxD = 0;
  for (let k = 0; k < m; k++) {
    minS = Math.min(minS, ss[k]); maxS = Math.max(maxS, ss[k]);
    minT = Math.min(minT, tt[k]); maxT = Math.max(maxT, tt[k]);
    maxD = Math.max(maxD, dd[k]);
  }
  let wSum = 0, wsS = 0, wtS = 0;
  for (let k = 0; k < m; k++) {
    const w = dd[k] * dd[k];
    wSum += w; wsS += w * ss[k]; wtS += w * tt[k];
  }
  const sc0 = wSum > 0 ? wsS / wSum : (minS + maxS) / 2;
  const tc0 = wSum > 0 ? wtS / wSum : (minT + maxT) / 2;
  const a0 = Math.max(maxS - sc0, sc0 - minS, 1e-6) * 1.1;
  const b0 = Math.max(maxT - tc0, tc0 - minT, 1e-6) * 1.1;
  const fv = new Float64Array(m);
  const geometry = (p: number[]) => {
    const sc = p[0], tc = p[1];
    const perA = 1 / Math.exp(p[2]), perB = 1 / Math.exp(p[3]);
    let sff = 0, sdf = 0;
    for (let k = 0; k < m; k++) {
      const u = (ss[k] - sc) * perA, w = (tt[k] - tc) * perB;
      const r = Math.sqrt(u * u + w * w);
      const v = f(r);
      fv[k] = v;
      sff += v * v;
      sdf += v * dd[k];
    }
    const dmax = sff > 0 ? Math.max(sdf / sff, 0) : maxD;
    let sse = 0;
    for (let k = 0; k < m; k++) sse += (dd[k] - dmax * fv[k]) ** 2;
    return { sse, dmax };
  };
  const objective = (p: number[]) => geometry(p).sse;
  let best = nelderMead(objective, [sc0, tc0, Math.log(a0), Math.log(b0)], [0.1 * a0, 0.1 * b0, 0.15, 0.15]);
  for (let restart = 0; restart < 2; restart++) {
    const again = nelderMead(objective, best.point, [0.05 * Math.exp(best.point[2]), 0.05 * Math.exp(best.point[3]), 0.05, 0.05]);
    if (again.value >= best.value * (1 - 1e-9)) break;
    best = again;
  }
  const { sse, dmax } = geometry(best.point);
  return {
    fit: {
      model,
      centre: { s: best.point[0], t: best.point[1] },
      semiAxes: { sM: Math.exp(best.point[2]), tM: Math.exp(best.point[3]) },
      dmaxM: dmax,
      rmsM: Math.sqrt(sse / m),
    },
    model, ss, tt, dd, point: best.point, sse, dmax, maxD,
  };
}

function refineProfileFit(ls: LeastSquaresFit, censoring?: CensoringInfo, noiseM?: number): ModelFit {
  const { ss, tt, dd, model, point, sse, dmax, maxD } = ls;
  const m = ss.length;
  if (censoring && m >= 8) return refineCensored(ss, tt, dd, PROFILE_FUNCTIONS[model], model, [...point, Math.log(Math.max(dmax, 1e-9))], censoring, Math.max(noiseM ?? Math.sqrt(sse / m), 1e-3 * maxD, 1e-6));
  return ls.fit;
}

/**
 * Maximum-likelihood refinement that knows picks stop at a cut-off: each pick's likelihood is a normal truncated
 * at the cut-off (removing the outward bias of keeping only picks that noise lifted above it), and places just
 * outside the data where nothing was picked count as "displacement below the cut-off" (censored observations).
 */
function refineCensored(ss: Float64Array, tt: Float64Array, dd: Float64Array, f: (r: number) => number, model: ProfileModel, start: number[], c: CensoringInfo, sigma: number): ModelFit {
  const m = ss.length;
  const na = c.absentS.length;
  // where the model is exactly zero (beyond the tip line) the censored terms are constants: computed once
  const zeroPick = logNormalCdf((0 - c.cutoffM) / sigma);
  const zeroPlace = logNormalCdf((c.cutoffM - 0) / sigma);
  const { cutoffM, absentS, absentT } = c;
  // reciprocals: multiplications in the hot loops instead of divisions
  const perSigma = 1 / sigma;
  const nll = (p: number[]) => {
    const sc = p[0], tc = p[1];
    const perA = 1 / Math.exp(p[2]), perB = 1 / Math.exp(p[3]), dmax = Math.exp(p[4]);
    let total = 0;
    for (let k = 0; k < m; k++) {
      const u = (ss[k] - sc) * perA, w = (tt[k] - tc) * perB;
      const mu = dmax * f(Math.sqrt(u * u + w * w));
      const z = (dd[k] - mu) * perSigma;
      total += 0.5 * z * z + (mu === 0 ? zeroPick : logNormalCdf((mu - cutoffM) * perSigma));
    }
    for (let k = 0; k < na; k++) {
      const u = (absentS[k] - sc) * perA, w = (absentT[k] - tc) * perB;
      const mu = dmax * f(Math.sqrt(u * u + w * w));
      total -= mu === 0 ? zeroPlace : logNormalCdf((cutoffM - mu) * perSigma);
    }
    return total;
  };
  const a0 = Math.exp(start[2]), b0 = Math.exp(start[3]);
  let best = nelderMead(nll, start, [0.03 * a0, 0.03 * b0, 0.05, 0.05, 0.05], 1500);
  for (let restart = 0; restart < 3; restart++) {
    const again = nelderMead(nll, best.point, [0.02 * Math.exp(best.point[2]), 0.02 * Math.exp(best.point[3]), 0.02, 0.02, 0.02], 1500);
    if (again.value >= best.value - 1e-9 * Math.abs(best.value)) break;
    best = again;
  }
  const p = best.point;
  const a = Math.exp(p[2]), b = Math.exp(p[3]), dmax = Math.exp(p[4]);
  let sse = 0;
  for (let k = 0; k < m; k++) sse += (dd[k] - dmax * f(Math.hypot((ss[k] - p[0]) / a, (tt[k] - p[1]) / b))) ** 2;
  return { model, centre: { s: p[0], t: p[1] }, semiAxes: { sM: a, tM: b }, dmaxM: dmax, rmsM: Math.sqrt(sse / m), negLogLikelihood: best.value };
}

/** Places just outside the data outline (1.5 and 3 pick spacings beyond each outline vertex, away from the centre). */
export function absentPlaces(outline: [number, number][], centre: { s: number; t: number }, spacingM: number): { s: Float64Array; t: Float64Array } {
  const stride = Math.max(1, Math.ceil(outline.length / 240));
  const ps: number[] = [];
  const pt: number[] = [];
  for (let k = 0; k < outline.length; k += stride) {
    const [os, ot] = outline[k];
    const dx = os - centre.s, dy = ot - centre.t;
    const len = Math.hypot(dx, dy);
    if (!(len > 0)) continue;
    for (const step of [1.5, 3]) {
      ps.push(os + (dx / len) * step * spacingM);
      pt.push(ot + (dy / len) * step * spacingM);
    }
  }
  return { s: Float64Array.from(ps), t: Float64Array.from(pt) };
}

export interface GradientTips {
  /** tip positions found by extrapolating near-tip gradients to zero (s or t, m) */
  strikeStartM: number;
  strikeEndM: number;
  upDipM: number;
  downDipM: number;
  /** |gradient| of displacement near each tip (m/m) */
  strikeStartPerM: number;
  strikeEndPerM: number;
  upDipPerM: number;
  downDipPerM: number;
}

/**
 * Near-tip gradient extrapolation (common practice; Barnett et al. 1987 endorse extrapolating gradients):
 * along a band through the centre, a least-squares line through the outermost quarter of picks on each side is
 * extended to zero displacement. Falls back to the outermost pick where the gradient does not point to a tip.
 */
export function gradientTips(s: ArrayLike<number>, t: ArrayLike<number>, d: ArrayLike<number>, centre: { s: number; t: number }, semiAxes: { sM: number; tM: number }): GradientTips {
  // one pass over the picks collects the four bands (in pick order, as four separate passes would)
  const bandT = 0.2 * semiAxes.tM;
  const bandS = 0.2 * semiAxes.sM;
  const sides = [0, 1, 2, 3].map(() => ({ xs: [] as number[], ds: [] as number[], far: 0 }));
  const [sStart, sEnd, tUp, tDown] = sides;
  for (let i = 0; i < s.length; i++) {
    const si = s[i], ti = t[i], di = d[i];
    if (!(Math.abs(ti - centre.t) > bandT)) {
      const back = (si - centre.s) * -1;
      if (!(back <= 0)) { sStart.xs.push(back); sStart.ds.push(di); sStart.far = Math.max(sStart.far, back); }
      const ahead = (si - centre.s) * 1;
      if (!(ahead <= 0)) { sEnd.xs.push(ahead); sEnd.ds.push(di); sEnd.far = Math.max(sEnd.far, ahead); }
    }
    if (!(Math.abs(si - centre.s) > bandS)) {
      const up = (ti - centre.t) * -1;
      if (!(up <= 0)) { tUp.xs.push(up); tUp.ds.push(di); tUp.far = Math.max(tUp.far, up); }
      const down = (ti - centre.t) * 1;
      if (!(down <= 0)) { tDown.xs.push(down); tDown.ds.push(di); tDown.far = Math.max(tDown.far, down); }
    }
  }
  const side = ({ xs, ds, far }: { xs: number[]; ds: number[]; far: number }, c: number, sign: 1 | -1) => {
    const nx: number[] = [];
    const nd: number[] = [];
    for (let k = 0; k < xs.length; k++) if (xs[k] >= 0.75 * far) { nx.push(xs[k]); nd.push(ds[k]); }
    if (nx.length < 3) return { tip: c + sign * far, gradient: NaN };
    const fit = extrapolateTipLinear(nx, nd);
    const tip = fit.slopePerM < 0 && fit.tipM > far ? fit.tipM : far;
    return { tip: c + sign * tip, gradient: Math.abs(fit.slopePerM) };
  };
  const ss = side(sStart, centre.s, -1);
  const se = side(sEnd, centre.s, 1);
  const up = side(tUp, centre.t, -1);
  const dn = side(tDown, centre.t, 1);
  return {
    strikeStartM: ss.tip, strikeEndM: se.tip, upDipM: up.tip, downDipM: dn.tip,
    strikeStartPerM: ss.gradient, strikeEndPerM: se.gradient, upDipPerM: up.gradient, downDipPerM: dn.gradient,
  };
}

export function ellipsePolygon(centre: { s: number; t: number }, semiAxes: { sM: number; tM: number }, vertices = 96): [number, number][] {
  const out: [number, number][] = [];
  for (let k = 0; k <= vertices; k++) {
    const a = (2 * Math.PI * (k % vertices)) / vertices;
    out.push([centre.s + semiAxes.sM * Math.cos(a), centre.t + semiAxes.tM * Math.sin(a)]);
  }
  return out;
}

export const CANDIDATE_MODELS: ProfileModel[] = ["walsh-watterson-1989", "elliptical-crack"];

export interface TipLineOptions {
  /** the data outline (mapped limit) in (s, t); enables the censored fit */
  outline?: [number, number][];
  /** typical pick spacing (m) */
  spacingM?: number;
  models?: ProfileModel[];
}

/**
 * Everything the profile fits need, small and self-contained (typed arrays and numbers), so the fits can run in
 * another thread while the caller grids and contours.
 */
export interface TipLineFitInputs extends FitSample {
  models: ProfileModel[];
  /** set when the censored fit applies: smallest displacement picked, data outline and pick spacing */
  censoring: { cutoffM: number; outline: [number, number][]; spacingM: number } | null;
}

export function tipLineFitInputs(s: ArrayLike<number>, t: ArrayLike<number>, d: ArrayLike<number>, options: TipLineOptions = {}): TipLineFitInputs {
  let censoring: TipLineFitInputs["censoring"] = null;
  if (options.outline && options.outline.length >= 3 && options.spacingM && options.spacingM > 0 && s.length >= 8) {
    let cutoffM = Infinity;
    for (let i = 0; i < d.length; i++) cutoffM = Math.min(cutoffM, d[i]);
    censoring = { cutoffM, outline: options.outline, spacingM: options.spacingM };
  }
  return { ...sampleForFit(s, t, d), models: options.models ?? CANDIDATE_MODELS, censoring };
}

/** Each candidate profile fitted (least squares, then the censored likelihood when it applies); the heavy part. */
export function fitTipLineModels(inputs: TipLineFitInputs): ModelFit[] {
  const { models, censoring } = inputs;
  const leastSquares = models.map((m) => leastSquaresFit(inputs, m));
  const plain = leastSquares.map((ls) => ls.fit);
  if (!censoring) return plain;
  const noiseM = Math.min(...plain.map((f) => f.rmsM));
  return models.map((_model, k) => {
    const places = absentPlaces(censoring.outline, plain[k].centre, censoring.spacingM);
    return refineProfileFit(leastSquares[k], { cutoffM: censoring.cutoffM, absentS: places.s, absentT: places.t }, noiseM);
  });
}

/**
 * The inferred tip line: where displacement reaches zero beyond the last picks, from the fitted candidates
 * (fitTipLineModels). The profile with least misfit is kept; uncertainty is half the largest difference between the
 * chosen tip line and the near-tip gradient extrapolation.
 */
export function tipLineFromFits(s: ArrayLike<number>, t: ArrayLike<number>, d: ArrayLike<number>, frame: Frame, fits: ModelFit[]): TipLine & { gradientTips: GradientTips; fits: ModelFit[] } {
  const score = (f: ModelFit) => f.negLogLikelihood ?? f.rmsM;
  let best = fits[0];
  for (const f of fits) if (score(f) < score(best)) best = f;
  const tips = gradientTips(s, t, d, best.centre, best.semiAxes);
  const lengthM = 2 * best.semiAxes.sM;
  const heightM = 2 * best.semiAxes.tM;
  const gradLength = tips.strikeEndM - tips.strikeStartM;
  const gradHeight = tips.downDipM - tips.upDipM;
  const uncertaintyM = Math.max(Math.abs(gradLength - lengthM), Math.abs(gradHeight - heightM)) / 2;
  const polygon = ellipsePolygon(best.centre, best.semiAxes);
  const modelMisfits: Partial<Record<ProfileModel, number>> = {};
  for (const f of fits) modelMisfits[f.model] = f.rmsM;
  return {
    lengthM,
    heightM,
    aspectRatio: lengthM / heightM,
    areaM2: Math.PI * best.semiAxes.sM * best.semiAxes.tM,
    centre: best.centre,
    semiAxes: best.semiAxes,
    model: best.model,
    modelMisfits,
    uncertaintyM,
    method: `elliptical tip line fitted with the ${PROFILE_LABELS[best.model]} (least misfit of ${fits.length} published profiles${best.negLogLikelihood !== undefined ? ", picks treated as truncated at the resolution cut-off" : ""}); uncertainty = half the difference from near-tip gradient extrapolation`,
    polygon,
    worldPolygon: polygon.map(([ps, pt]) => planeToWorld(ps, pt, frame)),
    gradientTips: tips,
    fits,
  };
}
