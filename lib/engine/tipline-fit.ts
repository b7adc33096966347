// The heavy part of the tip-line inference, run on a helper thread: each candidate displacement profile fitted to
// the picks by maximum likelihood with the resolution cut-off as censoring, compared by an information criterion,
// and its parameter uncertainty turned into random draws of the whole fault model.
import { EigenvalueDecomposition, Matrix } from "ml-matrix";
import type { ProfileModel } from "./types";
import { PROFILE_CANDIDATES, PUBLISHED_PROFILES, modelDisplacement, visibleRadius, writeProfile } from "./profiles";
import { gaussian, mulberry32 } from "./optimize";
import type { TipLineInputs } from "./tipline-inputs";

/**
 * A fault model on the plane: displacement Dmax·f(r) about a centre, where r is an elliptical radius whose
 * semi-axis differs on each side (strike start/end, up/down dip), so the maximum can sit off centre and the tip
 * line is four quarter-ellipses joined smoothly.
 */
export interface TipModel {
  model: ProfileModel;
  centre: { s: number; t: number };
  /** distance from the centre to the tip line along strike (towards lower and higher s) and down dip (up, down) */
  reach: { strikeStartM: number; strikeEndM: number; upDipM: number; downDipM: number };
  /** superellipse exponent of the tip line (2: an ellipse) */
  exponent: number;
  dmaxM: number;
  noiseM: number;
  /** the shape numbers, unbounded (see PROFILE_CANDIDATES) */
  shape: number[];
}

export interface CandidateFit {
  best: TipModel;
  /** −log likelihood at the optimum */
  negLogLikelihood: number;
  /** small-sample Akaike information criterion (Burnham & Anderson 2002) */
  aicc: number;
  /** Akaike weight among the candidates tried */
  weight: number;
  /** weight in the central estimate: Akaike weight among the published profiles */
  centralWeight: number;
  parameters: number;
  rmsM: number;
  /** models drawn from the fit's parameter uncertainty */
  draws: TipModel[];
}

export interface TipLineFits {
  candidates: CandidateFit[];
  /** data outline and inputs the assembly needs */
  inputs: Pick<
    TipLineInputs,
    "outlineS" | "outlineT" | "outlineD" | "outlineOpen" | "cutoffM" | "cutoffSource" | "noiseM" | "steepGradientPerM" | "ends" | "spacing"
  >;
  /** observations in the fits (picks, places beyond the edges) */
  observations: { picks: number; absent: number };
}

const GEOMETRY = 9; // centre (2), four log reaches, log Dmax, log noise, tip-line exponent
/** the tip line's superellipse exponent, from an unbounded number: 1.2 (diamond-like) to 10 (box-like), 2 an ellipse */
const EXPONENT_LOW = 1.2;
const EXPONENT_HIGH = 10;
const exponentOf = (x: number) => EXPONENT_LOW + (EXPONENT_HIGH - EXPONENT_LOW) / (1 + Math.exp(-x));
const exponentSlope = (x: number) => {
  const s = 1 / (1 + Math.exp(-x));
  return (EXPONENT_HIGH - EXPONENT_LOW) * s * (1 - s);
};
/** the unbounded number of an ellipse (exponent 2) */
const ELLIPSE = -Math.log((EXPONENT_HIGH - 2) / (2 - EXPONENT_LOW));
const DRAWS = 150;

interface Problem {
  /** observations in scaled units: picks first, then places beyond the edges */
  u: Float64Array;
  v: Float64Array;
  d: Float64Array;
  w: Float64Array;
  picks: number;
  /** outline vertices that must stay inside the tip line */
  hullU: Float64Array;
  hullV: Float64Array;
  cutoff: number;
  origin: { s: number; t: number };
  scale: number;
}

function problemOf(inputs: TipLineInputs): Problem {
  const { ss, tt, dd, ww, absentS, absentT, outlineS, outlineT, cutoffM, centreGuess } = inputs;
  let scale = 0;
  for (let k = 0; k < outlineS.length; k++) scale = Math.max(scale, Math.abs(outlineS[k] - centreGuess.s), Math.abs(outlineT[k] - centreGuess.t));
  for (let k = 0; k < ss.length; k++) scale = Math.max(scale, Math.abs(ss[k] - centreGuess.s), Math.abs(tt[k] - centreGuess.t));
  scale ||= 1;
  const m = ss.length;
  const na = absentS.length;
  const u = new Float64Array(m + na),
    v = new Float64Array(m + na),
    d = new Float64Array(m + na),
    w = new Float64Array(m + na);
  for (let k = 0; k < m; k++) {
    u[k] = (ss[k] - centreGuess.s) / scale;
    v[k] = (tt[k] - centreGuess.t) / scale;
    d[k] = dd[k];
    w[k] = ww[k];
  }
  // the places beyond the edges together weigh as much as the outermost tenth of the picks would
  const absentWeight = na ? Math.min(1, (0.1 * m) / na) : 0;
  for (let k = 0; k < na; k++) {
    u[m + k] = (absentS[k] - centreGuess.s) / scale;
    v[m + k] = (absentT[k] - centreGuess.t) / scale;
    d[m + k] = NaN;
    w[m + k] = absentWeight;
  }
  const stride = Math.max(1, Math.ceil(outlineS.length / 400));
  const hu: number[] = [];
  const hv: number[] = [];
  for (let k = 0; k < outlineS.length; k += stride) {
    hu.push((outlineS[k] - centreGuess.s) / scale);
    hv.push((outlineT[k] - centreGuess.t) / scale);
  }
  return { u, v, d, w, picks: m, hullU: Float64Array.from(hu), hullV: Float64Array.from(hv), cutoff: cutoffM, origin: centreGuess, scale };
}

const SQRT_2PI = Math.sqrt(2 * Math.PI);
/** log Φ(x) and φ(x)/Φ(x) (the inverse Mills ratio, the derivative of log Φ) from one evaluation, left in NORMAL_TAIL. */
const NORMAL_TAIL = { logCdf: 0, mills: 0 };

/**
 * Fills NORMAL_TAIL for x: the complementary error function of Numerical Recipes (erfcc, relative error < 1.2e-7)
 * written out so the log and the ratio share its exponential; an asymptotic series below −6.
 */
function normalTail(x: number): void {
  if (x >= 8.5) {
    NORMAL_TAIL.logCdf = 0;
    NORMAL_TAIL.mills = 0;
    return;
  }
  if (x < -6) {
    const x2 = x * x;
    const series = 1 - 1 / x2 + 3 / (x2 * x2);
    NORMAL_TAIL.logCdf = -x2 / 2 - Math.log(-x) - 0.5 * Math.log(2 * Math.PI) + Math.log(series);
    NORMAL_TAIL.mills = -x / series;
    return;
  }
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.5 * z);
  const poly =
    -1.26551223 +
    t *
      (1.00002368 +
        t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277))))))));
  if (x < 0) {
    // Φ(x) = ½·erfc(z) = ½·t·exp(−z² + poly); φ(x) = exp(−z²)/√(2π)
    NORMAL_TAIL.logCdf = Math.log(0.5 * t) - z * z + poly;
    NORMAL_TAIL.mills = 1 / (SQRT_2PI * 0.5 * t * Math.exp(poly));
  } else {
    const e = Math.exp(-z * z);
    const upper = 0.5 * t * e * Math.exp(poly);
    NORMAL_TAIL.logCdf = Math.log1p(-upper);
    NORMAL_TAIL.mills = e / SQRT_2PI / (1 - upper);
  }
}

/** Outline vertices outside the model's tip line cost heavily: the tip line must enclose the data. */
const HULL_LIMIT = 0.999;
/** f, df/dr and the shape slopes of the profile at one radius (scratch, reused) */
const PROFILE_OUT = new Float64Array(4);

/**
 * The −log likelihood of parameters p and, when asked, its gradient (`gradient`) and each observation's gradient
 * (`scores[j][k]`, unweighted). Picks count as normal about the model truncated at the cut-off (only values above it
 * could be picked); places beyond the closed edges count as "below the cut-off" (censored). Observations and
 * parameters are in the problem's scaled units; the hull penalty is added when `withHull`.
 */
function evaluate(
  problem: Problem,
  kind: number,
  shapeCount: number,
  p: ArrayLike<number>,
  gradient: Float64Array | null,
  scores: Float64Array[] | null = null,
  withHull = true,
): number {
  const { u, v, d, w, picks, cutoff } = problem;
  const uc = p[0],
    vc = p[1];
  const perS0 = Math.exp(-p[2]),
    perS1 = Math.exp(-p[3]),
    perT0 = Math.exp(-p[4]),
    perT1 = Math.exp(-p[5]);
  const dmax = Math.exp(p[6]);
  const logSigma = p[7];
  const perSigma = Math.exp(-logSigma);
  const e = exponentOf(p[8]);
  const eSlope = exponentSlope(p[8]);
  const x0 = shapeCount > 0 ? p[GEOMETRY] : 0;
  const x1 = shapeCount > 1 ? p[GEOMETRY + 1] : 0;
  const fo = PROFILE_OUT;
  const wantGradient = gradient !== null || scores !== null;
  let g0 = 0,
    g1 = 0,
    g2 = 0,
    g3 = 0,
    g4 = 0,
    g5 = 0,
    g6 = 0,
    g7 = 0,
    g8 = 0,
    g9 = 0,
    g10 = 0;
  let total = 0;
  const n = u.length;
  const hullCount = withHull ? problem.hullU.length : 0;
  for (let q = 0; q < n + hullCount; q++) {
    const isHull = q >= n;
    const du = (isHull ? problem.hullU[q - n] : u[q]) - uc;
    const dv = (isHull ? problem.hullV[q - n] : v[q]) - vc;
    const perS = du < 0 ? perS0 : perS1;
    const perT = dv < 0 ? perT0 : perT1;
    const A = du < 0 ? -du * perS : du * perS;
    const B = dv < 0 ? -dv * perT : dv * perT;
    // superellipse radius r = (A^e + B^e)^(1/e): an ellipse at e = 2, boxier as e grows
    const lnA = A > 0 ? Math.log(A) : 0;
    const lnB = B > 0 ? Math.log(B) : 0;
    const Ae = A > 0 ? Math.exp(e * lnA) : 0;
    const Be = B > 0 ? Math.exp(e * lnB) : 0;
    const S = Ae + Be;
    const lnS = S > 0 ? Math.log(S) : 0;
    const r = S > 0 ? Math.exp(lnS / e) : 0;
    let byR: number;
    let byMu = 0;
    let bySigma = 0;
    let mu = 0;
    if (isHull) {
      const excess = r - HULL_LIMIT;
      if (!(excess > 0)) continue;
      total += 1e3 * excess + 1e5 * excess * excess;
      if (!gradient) continue;
      byR = 1e3 + 2e5 * excess;
    } else {
      writeProfile(kind, r, x0, x1, fo);
      mu = dmax * fo[0];
      let value: number;
      if (q < picks) {
        const z = (d[q] - mu) * perSigma;
        const x = (mu - cutoff) * perSigma;
        normalTail(x);
        value = 0.5 * z * z + logSigma + NORMAL_TAIL.logCdf;
        byMu = (-z + NORMAL_TAIL.mills) * perSigma;
        bySigma = -z * z + 1 - NORMAL_TAIL.mills * x;
      } else {
        const y = (cutoff - mu) * perSigma;
        normalTail(y);
        value = -NORMAL_TAIL.logCdf;
        byMu = NORMAL_TAIL.mills * perSigma;
        bySigma = NORMAL_TAIL.mills * y;
      }
      total += w[q] * value;
      if (!wantGradient) continue;
      byR = byMu * dmax * fo[1];
    }
    // chain rule through r: ∂r/∂A = A^(e−1)·r^(1−e), A = |du|/reach; ∂ln r/∂e = −ln S/e² + (A^e ln A + B^e ln B)/(e·S)
    let c0 = 0,
      c1 = 0,
      cS = 0,
      cT = 0,
      cE = 0;
    if (r > 0) {
      const rPow = Math.exp((lnS * (1 - e)) / e);
      const dA = A > 0 ? (Ae / A) * rPow : 0;
      const dB = B > 0 ? (Be / B) * rPow : 0;
      c0 = byR * dA * (du < 0 ? perS : -perS);
      c1 = byR * dB * (dv < 0 ? perT : -perT);
      cS = byR * -A * dA;
      cT = byR * -B * dB;
      cE = byR * r * (-lnS / (e * e) + (Ae * lnA + Be * lnB) / (e * S)) * eSlope;
    }
    const cD = byMu * mu;
    const c9 = byMu * dmax * fo[2];
    const c10 = byMu * dmax * fo[3];
    if (gradient) {
      const weight = isHull ? 1 : w[q];
      g0 += weight * c0;
      g1 += weight * c1;
      if (du < 0) g2 += weight * cS;
      else g3 += weight * cS;
      if (dv < 0) g4 += weight * cT;
      else g5 += weight * cT;
      g8 += weight * cE;
      if (!isHull) {
        g6 += weight * cD;
        g7 += weight * bySigma;
        g9 += weight * c9;
        g10 += weight * c10;
      }
    }
    if (scores && !isHull) {
      scores[0][q] = c0;
      scores[1][q] = c1;
      scores[2][q] = du < 0 ? cS : 0;
      scores[3][q] = du < 0 ? 0 : cS;
      scores[4][q] = dv < 0 ? cT : 0;
      scores[5][q] = dv < 0 ? 0 : cT;
      scores[6][q] = cD;
      scores[7][q] = bySigma;
      scores[8][q] = cE;
      if (shapeCount > 0) scores[9][q] = c9;
      if (shapeCount > 1) scores[10][q] = c10;
    }
  }
  if (gradient) {
    gradient[0] = g0;
    gradient[1] = g1;
    gradient[2] = g2;
    gradient[3] = g3;
    gradient[4] = g4;
    gradient[5] = g5;
    gradient[6] = g6;
    gradient[7] = g7;
    gradient[8] = g8;
    if (shapeCount > 0) gradient[9] = g9;
    if (shapeCount > 1) gradient[10] = g10;
  }
  return total;
}

/** Quasi-Newton minimisation (BFGS, Nocedal & Wright 2006, with a backtracking Armijo line search). */
export function bfgs(
  f: (x: Float64Array, gradient: Float64Array) => number,
  start: ArrayLike<number>,
  maxIterations = 300,
  settled = 1e-9,
  inverseHessian: Float64Array | null = null,
): { point: Float64Array; value: number; iterations: number; inverseHessian: Float64Array | null } {
  const k = start.length;
  let x = Float64Array.from(start);
  let g = new Float64Array(k);
  let fx = f(x, g);
  // inverse Hessian, row-major: from an earlier fit of nearly the same objective when given
  let H: Float64Array | null = inverseHessian ? Float64Array.from(inverseHessian) : null;
  const trial = new Float64Array(k);
  const gTrial = new Float64Array(k);
  const direction = new Float64Array(k);
  let it = 0;
  let stalled = 0;
  for (; it < maxIterations; it++) {
    for (let i = 0; i < k; i++) {
      let sum = 0;
      for (let j = 0; j < k; j++) sum += (H ? H[i * k + j] : i === j ? 1 : 0) * g[j];
      direction[i] = -sum;
    }
    let slope = 0;
    for (let i = 0; i < k; i++) slope += g[i] * direction[i];
    if (!(slope < 0)) {
      H = null;
      for (let i = 0; i < k; i++) direction[i] = -g[i];
      slope = -g.reduce((acc, gi) => acc + gi * gi, 0);
      if (slope === 0) break;
    }
    // without curvature yet, the first step moves the largest parameter by at most 0.1
    let step = 1;
    if (!H) {
      let largest = 0;
      for (let i = 0; i < k; i++) largest = Math.max(largest, Math.abs(direction[i]));
      step = Math.min(1, 0.1 / (largest || 1));
    }
    let fTrial = NaN;
    let accepted = false;
    for (let tries = 0; tries < 40; tries++) {
      for (let i = 0; i < k; i++) trial[i] = x[i] + step * direction[i];
      fTrial = f(trial, gTrial);
      if (Number.isFinite(fTrial) && fTrial <= fx + 1e-4 * step * slope) {
        accepted = true;
        break;
      }
      step *= 0.5;
    }
    if (!accepted) break;
    const sVec = new Float64Array(k);
    const yVec = new Float64Array(k);
    let sy = 0,
      yy = 0;
    for (let i = 0; i < k; i++) {
      sVec[i] = trial[i] - x[i];
      yVec[i] = gTrial[i] - g[i];
      sy += sVec[i] * yVec[i];
      yy += yVec[i] * yVec[i];
    }
    const change = fx - fTrial;
    x = Float64Array.from(trial);
    g = Float64Array.from(gTrial);
    fx = fTrial;
    if (sy > 1e-12 * Math.sqrt(yy)) {
      if (!H) {
        H = new Float64Array(k * k);
        for (let i = 0; i < k; i++) H[i * k + i] = sy / yy;
      }
      // H ← (I − ρ s yᵀ) H (I − ρ y sᵀ) + ρ s sᵀ
      const rho = 1 / sy;
      const Hy = new Float64Array(k);
      for (let i = 0; i < k; i++) {
        let sum = 0;
        for (let j = 0; j < k; j++) sum += H[i * k + j] * yVec[j];
        Hy[i] = sum;
      }
      let yHy = 0;
      for (let i = 0; i < k; i++) yHy += yVec[i] * Hy[i];
      for (let i = 0; i < k; i++) {
        for (let j = 0; j < k; j++) {
          H[i * k + j] += -rho * (Hy[i] * sVec[j] + sVec[i] * Hy[j]) + (rho * rho * yHy + rho) * sVec[i] * sVec[j];
        }
      }
    }
    let gMax = 0;
    for (let i = 0; i < k; i++) gMax = Math.max(gMax, Math.abs(g[i]));
    if (gMax < 1e-4) break;
    // stop once the value changes by less than `settled` twice running (a profile with an infinite tip gradient never
    // gets a small gradient)
    stalled = change <= settled ? stalled + 1 : 0;
    if (stalled >= 2) break;
  }

  return { point: x, value: fx, iterations: it, inverseHessian: H };
}

function toModel(problem: Problem, model: ProfileModel, p: ArrayLike<number>): TipModel {
  const { origin, scale } = problem;
  return {
    model,
    centre: { s: origin.s + p[0] * scale, t: origin.t + p[1] * scale },
    reach: { strikeStartM: Math.exp(p[2]) * scale, strikeEndM: Math.exp(p[3]) * scale, upDipM: Math.exp(p[4]) * scale, downDipM: Math.exp(p[5]) * scale },
    dmaxM: Math.exp(p[6]),
    noiseM: Math.exp(p[7]),
    exponent: exponentOf(p[8]),
    shape: Array.from(p).slice(GEOMETRY),
  };
}

/** A starting point: centre at the weighted centroid, each reach the data extent stretched by the profile's visible fraction. */
function startOf(problem: Problem, model: ProfileModel, noiseGuess: number): number[] {
  const { u, v, d, picks, cutoff } = problem;
  let wsum = 0,
    cu = 0,
    cv = 0,
    dTop = 0;
  for (let k = 0; k < picks; k++) {
    const w = d[k] * d[k];
    wsum += w;
    cu += w * u[k];
    cv += w * v[k];
    if (d[k] > dTop) dTop = d[k];
  }
  cu = wsum > 0 ? cu / wsum : 0;
  cv = wsum > 0 ? cv / wsum : 0;
  let s0 = 1e-6,
    s1 = 1e-6,
    t0 = 1e-6,
    t1 = 1e-6;
  for (let k = 0; k < problem.hullU.length; k++) {
    const du = problem.hullU[k] - cu,
      dv = problem.hullV[k] - cv;
    if (Math.abs(dv) <= Math.abs(du)) {
      if (du < 0) s0 = Math.max(s0, -du);
      else s1 = Math.max(s1, du);
    } else if (dv < 0) t0 = Math.max(t0, -dv);
    else t1 = Math.max(t1, dv);
  }
  const candidate = PROFILE_CANDIDATES[model];
  const visible = Math.min(0.98, Math.max(0.3, visibleRadius(model, Math.min(0.9, cutoff / Math.max(dTop, 1e-9)), candidate.start)));
  const stretch = 1.02 / visible;
  return [
    cu,
    cv,
    Math.log(s0 * stretch),
    Math.log(s1 * stretch),
    Math.log(t0 * stretch),
    Math.log(t1 * stretch),
    Math.log(Math.max(dTop, 1e-6)),
    Math.log(Math.max(noiseGuess, 1e-3 * dTop, 1e-6)),
    ELLIPSE,
    ...candidate.start,
  ];
}

/** Every k-th pick and place of a problem, weighted k-fold, for a quick first fit (k ≥ 1). */
function thinned(problem: Problem, k: number): Problem {
  if (k <= 1) return problem;
  const keep: number[] = [];
  for (let q = 0; q < problem.u.length; q += k) keep.push(q);
  const picks = keep.filter((q) => q < problem.picks).length;
  return {
    ...problem,
    u: Float64Array.from(keep, (q) => problem.u[q]),
    v: Float64Array.from(keep, (q) => problem.v[q]),
    d: Float64Array.from(keep, (q) => problem.d[q]),
    w: Float64Array.from(keep, (q) => problem.w[q] * k),
    picks,
  };
}

/** Observations in the quick first fit; the full sample then only polishes. */
const QUICK_OBSERVATIONS = 200;

function fitCandidate(problem: Problem, model: ProfileModel, noiseGuess: number): { point: number[]; value: number } {
  const candidate = PROFILE_CANDIDATES[model];
  const objectiveOf = (target: Problem) => (x: Float64Array, gradient: Float64Array) =>
    evaluate(target, candidate.kind, candidate.shapeParameters, x, gradient);
  const quickProblem = thinned(problem, Math.floor(problem.u.length / QUICK_OBSERVATIONS));
  const quickObjective = objectiveOf(quickProblem);
  const start = startOf(problem, model, noiseGuess);
  // a change of 0.001 in −log likelihood moves the parameters by a negligible fraction of their standard error
  const quick = bfgs(quickObjective, start, 300, 1e-3);
  // the thinned picks weigh k-fold, so its curvature is the whole sample's: the polish starts from it
  const best = bfgs(objectiveOf(problem), quick.point, 300, 1e-3, quick.inverseHessian);
  return { point: Array.from(best.point), value: best.value };
}

/**
 * Parameter covariance by the sandwich estimator (Huber 1967; White 1982): H⁻¹ J H⁻¹ with H the Hessian of the
 * −log likelihood (central differences of its gradient) and J the sum of each observation's score outer product.
 * It stays honest when the profile only approximates the fault's true shape, where the inverse Hessian alone would
 * be too narrow.
 */
function sandwichCovariance(problem: Problem, model: ProfileModel, point: number[]): Matrix | null {
  const candidate = PROFILE_CANDIDATES[model];
  const shapeCount = candidate.shapeParameters;
  const k = point.length;
  const n = problem.u.length;
  const gradientAt = (p: Float64Array) => {
    const g = new Float64Array(k);
    evaluate(problem, candidate.kind, shapeCount, p, g, null, false);
    return g;
  };
  // forward differences of the analytic gradient (k + 1 gradients; symmetrised below)
  const H = new Matrix(k, k);
  const g0 = gradientAt(Float64Array.from(point));
  for (let i = 0; i < k; i++) {
    const h = 1e-5 * Math.max(1, Math.abs(point[i]));
    const plus = Float64Array.from(point);
    plus[i] += h;
    const gp = gradientAt(plus);
    for (let j = 0; j < k; j++) H.set(i, j, (gp[j] - g0[j]) / h);
  }
  const symmetric = H.add(H.transpose()).mul(0.5);
  const scores = Array.from({ length: k }, () => new Float64Array(n));
  const p = Float64Array.from(point);
  evaluate(problem, candidate.kind, shapeCount, p, null, scores, false);
  const J = new Matrix(k, k);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = 0;
      const gi = scores[i],
        gj = scores[j];
      for (let q = 0; q < n; q++) sum += problem.w[q] * problem.w[q] * gi[q] * gj[q];
      J.set(i, j, sum);
      J.set(j, i, sum);
    }
  }
  const inverseH = pseudoInverse(symmetric);
  if (!inverseH) return null;
  return inverseH.mmul(J).mmul(inverseH);
}

/** Inverse of a symmetric matrix through its eigenvalues; directions without curvature get none of it (null if none). */
function pseudoInverse(m: Matrix): Matrix | null {
  if (!m.to1DArray().every(Number.isFinite)) return null;
  const e = new EigenvalueDecomposition(m, { assumeSymmetric: true });
  const values = e.realEigenvalues;
  const largest = Math.max(...values.map(Math.abs));
  if (!(largest > 0) || !values.every(Number.isFinite)) return null;
  const V = e.eigenvectorMatrix;
  const k = values.length;
  const D = Matrix.zeros(k, k);
  for (let i = 0; i < k; i++) D.set(i, i, values[i] > 1e-10 * largest ? 1 / values[i] : 0);
  return V.mmul(D).mmul(V.transpose());
}

/** A square root of a symmetric positive semi-definite matrix (negative eigenvalues from rounding set to zero). */
function symmetricRoot(m: Matrix): Matrix | null {
  if (!m.to1DArray().every(Number.isFinite)) return null;
  const e = new EigenvalueDecomposition(m, { assumeSymmetric: true });
  const V = e.eigenvectorMatrix;
  const k = e.realEigenvalues.length;
  const D = Matrix.zeros(k, k);
  for (let i = 0; i < k; i++) D.set(i, i, Math.sqrt(Math.max(0, e.realEigenvalues[i])));
  return V.mmul(D);
}

/**
 * Fit every candidate profile and draw models from each fit's uncertainty. The draws are made with a fixed seed,
 * so the same picks always give the same range.
 */
export function fitTipLine(inputs: TipLineInputs): TipLineFits {
  const problem = problemOf(inputs);
  const picks = problem.picks;
  const fitted = inputs.models.map((model) => {
    const candidate = PROFILE_CANDIDATES[model];
    const { point, value } = fitCandidate(problem, model, inputs.noiseM);
    const parameters = GEOMETRY + candidate.shapeParameters;
    const nll = evaluate(problem, candidate.kind, candidate.shapeParameters, point, null, null, false);
    const aicc = 2 * nll + 2 * parameters + (2 * parameters * (parameters + 1)) / Math.max(1, picks - parameters - 1);
    return { model, point, value, nll, aicc, parameters };
  });
  const bestAicc = Math.min(...fitted.map((f) => (Number.isFinite(f.aicc) ? f.aicc : Infinity)));
  // a fit that failed to give a finite criterion carries no weight; if none did, all weigh the same
  const finite = fitted.map((f) => Number.isFinite(f.aicc));
  const raw = finite.some(Boolean) ? fitted.map((f, k) => (finite[k] ? Math.exp(-(f.aicc - bestAicc) / 2) : 0)) : fitted.map(() => 1);
  const total = raw.reduce((a, b) => a + b, 0);
  // the weights that set the centre: Akaike weights among the published profiles alone (from their own criteria, so
  // they stay defined when the flexible family takes nearly all the weight); all candidates' when none is published
  const published = fitted.map((f) => PUBLISHED_PROFILES.includes(f.model) && Number.isFinite(f.aicc));
  const bestPublished = Math.min(...fitted.map((f, k) => (published[k] ? f.aicc : Infinity)));
  const centralRaw = published.some(Boolean) ? fitted.map((f, k) => (published[k] ? Math.exp(-(f.aicc - bestPublished) / 2) : 0)) : raw;
  const centralTotal = centralRaw.reduce((a, b) => a + b, 0);
  const candidates: CandidateFit[] = fitted.map((f, index) => {
    const best = toModel(problem, f.model, f.point);
    let sse = 0;
    for (let k = 0; k < picks; k++) {
      const s = problem.origin.s + problem.u[k] * problem.scale,
        t = problem.origin.t + problem.v[k] * problem.scale;
      sse += (problem.d[k] - modelDisplacement(best, s, t)) ** 2;
    }
    const weight = raw[index] / total;
    const draws: TipModel[] = [];
    const centralWeight = centralRaw[index] / centralTotal;
    if (weight >= 0.02 || centralWeight >= 0.05) {
      const covariance = sandwichCovariance(problem, f.model, f.point);
      const root = covariance ? symmetricRoot(covariance) : null;
      if (root) {
        const rand = mulberry32(0x5eed + index);
        const k = f.point.length;
        for (let q = 0; q < DRAWS; q++) {
          const z = Array.from({ length: k }, () => gaussian(rand));
          const p = f.point.map((x, i) => {
            let shift = 0;
            for (let j = 0; j < k; j++) shift += root.get(i, j) * z[j];
            return x + shift;
          });
          draws.push(toModel(problem, f.model, p));
        }
      }
    }
    return { best, negLogLikelihood: f.nll, aicc: f.aicc, weight, centralWeight, parameters: f.parameters, rmsM: Math.sqrt(sse / Math.max(1, picks)), draws };
  });
  const { outlineS, outlineT, outlineD, outlineOpen, cutoffM, cutoffSource, noiseM, steepGradientPerM, ends, spacing } = inputs;
  return {
    candidates,
    inputs: { outlineS, outlineT, outlineD, outlineOpen, cutoffM, cutoffSource, noiseM, steepGradientPerM, ends, spacing },
    observations: { picks, absent: inputs.absentS.length },
  };
}
