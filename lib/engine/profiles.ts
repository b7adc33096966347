// Normalised displacement profiles of an isolated fault, r = distance from the maximum / distance to the tip
// (0 ≤ r ≤ 1). Every profile is 1 at r = 0, falls monotonically and is exactly 0 from r = 1 on.
import { PROFILE_MODELS } from "@/lib/contracts/names";
import type { ProfileModel, TipProfileModel } from "./types";

/** Walsh & Watterson (1987): D = 2·Dmax·(1 − r)·sqrt(((1 + r)/2)² − r²); zero gradient at the tip. */
export function walshWattersonProfile(r: number): number {
  if (!(r < 1)) return 0;
  const ra = Math.abs(r);
  const q = ((1 + ra) / 2) ** 2 - ra * ra;
  return q > 0 ? 2 * (1 - ra) * Math.sqrt(q) : 0;
}

/** Elliptical crack under uniform driving stress (Pollard & Segall 1987): D = Dmax·sqrt(1 − r²); infinite tip gradient. */
export function ellipticalCrackProfile(r: number): number {
  if (!(r < 1)) return 0;
  return Math.sqrt(1 - r * r);
}

/** Linear taper, a constant gradient out to the tip (Muraoka & Kamata 1983; Dawers et al. 1993). */
export function linearProfile(r: number): number {
  if (!(r < 1)) return 0;
  return 1 - Math.abs(r);
}

/** Parabolic (bell) profile: D = Dmax·(1 − r²), its gradient steepest at the tip (common practice, no single source). */
export function parabolicProfile(r: number): number {
  if (!(r < 1)) return 0;
  return 1 - r * r;
}

// The flat-topped profile with steep tips (restricted faults, Nicol et al. 1996): full displacement out to a plateau
// radius, then a linear taper to the tip. The flexible family (1 − r^p)^q contains the linear (p = q = 1), parabolic
// (p = 2, q = 1) and elliptical (p = 2, q = ½) profiles and approaches flat-topped ones as p grows (common practice,
// no single source). Both are defined by their candidates below, with their derivatives for the fit.

/** A candidate profile for the tip-line fit: how many shape numbers it has, where they start, how to report them. */
export interface ProfileCandidate {
  model: ProfileModel;
  /** numeric kind used by writeProfile */
  kind: number;
  /** how many shape parameters the fit adjusts beyond the tip line and Dmax (at most two) */
  shapeParameters: number;
  /** the shape numbers in their own units, for reports (e.g. the plateau's fraction of the radius) */
  describe: (x: ArrayLike<number>) => Record<string, number>;
  /** starting shape numbers (unbounded; each is mapped into its allowed range) */
  start: number[];
}

const logistic = (x: number, lo: number, hi: number) => lo + (hi - lo) / (1 + Math.exp(-x));
/** d/dx of logistic(x, lo, hi) */
const logisticSlope = (x: number, lo: number, hi: number) => {
  const e = 1 / (1 + Math.exp(-x));
  return (hi - lo) * e * (1 - e);
};
/** the elliptical profile's slope is infinite at the tip; the fit only needs it large */
const STEEPEST = 1e3;
const PLATEAU_MAX = 0.9;
const FLEX_P = [0.6, 8] as const;
const FLEX_Q = [0.3, 3] as const;

export const PROFILE_CANDIDATES: Record<ProfileModel, ProfileCandidate> = {
  "walsh-watterson-1987": { model: "walsh-watterson-1987", kind: 0, shapeParameters: 0, describe: () => ({}), start: [] },
  "elliptical-crack": { model: "elliptical-crack", kind: 1, shapeParameters: 0, describe: () => ({}), start: [] },
  linear: { model: "linear", kind: 2, shapeParameters: 0, describe: () => ({}), start: [] },
  parabolic: { model: "parabolic", kind: 3, shapeParameters: 0, describe: () => ({}), start: [] },
  "flat-topped": { model: "flat-topped", kind: 4, shapeParameters: 1, describe: (x) => ({ plateauFraction: logistic(x[0], 0, PLATEAU_MAX) }), start: [0] },
  flexible: {
    model: "flexible",
    kind: 5,
    shapeParameters: 2,
    describe: (x) => ({ p: logistic(x[0], ...FLEX_P), q: logistic(x[1], ...FLEX_Q) }),
    // p = 2, q = 1 (parabolic)
    start: [Math.log((2 - FLEX_P[0]) / (FLEX_P[1] - 2)), Math.log((1 - FLEX_Q[0]) / (FLEX_Q[1] - 1))],
  },
};

/**
 * Writes f(r), df/dr and df/dx for each shape number (x0, x1: unbounded) of the profile of the given kind into out.
 * One function with a switch, so the fit's inner loop calls a single, predictable function.
 */
export function writeProfile(kind: number, r: number, x0: number, x1: number, out: Float64Array): void {
  if (!(r < 1)) {
    out[0] = out[1] = out[2] = out[3] = 0;
    return;
  }
  switch (kind) {
    case 0: {
      // (1 − r)^1.5·(1 + 3r)^0.5, slope −6r·sqrt(1 − r)/sqrt(1 + 3r)
      const root = Math.sqrt((1 - r) * (1 + 3 * r));
      out[0] = (1 - r) * root;
      out[1] = (-6 * r * Math.sqrt(1 - r)) / Math.sqrt(1 + 3 * r);
      return;
    }
    case 1: {
      const root = Math.sqrt(1 - r * r);
      out[0] = root;
      out[1] = root > r / STEEPEST ? -r / root : -STEEPEST;
      return;
    }
    case 2:
      out[0] = 1 - r;
      out[1] = -1;
      return;
    case 3:
      out[0] = 1 - r * r;
      out[1] = -2 * r;
      return;
    case 4: {
      const plateau = logistic(x0, 0, PLATEAU_MAX);
      if (r <= plateau) {
        out[0] = 1;
        out[1] = out[2] = 0;
        return;
      }
      out[0] = (1 - r) / (1 - plateau);
      out[1] = -1 / (1 - plateau);
      out[2] = ((1 - r) / (1 - plateau) ** 2) * logisticSlope(x0, 0, PLATEAU_MAX);
      return;
    }
    default: {
      if (r <= 0) {
        out[0] = 1;
        out[1] = out[2] = out[3] = 0;
        return;
      }
      const p = logistic(x0, ...FLEX_P);
      const q = logistic(x1, ...FLEX_Q);
      const rp = Math.pow(r, p);
      const base = 1 - rp;
      const f = Math.pow(base, q);
      out[0] = f;
      out[1] = Math.max((-q * p * rp * f) / (r * base), -STEEPEST);
      out[2] = ((-q * f * rp * Math.log(r)) / base) * logisticSlope(x0, ...FLEX_P);
      out[3] = f * Math.log(base) * logisticSlope(x1, ...FLEX_Q);
    }
  }
}

/** Profiles tried when the interpreter leaves the choice to the fit. */
export const AUTOMATIC_CANDIDATES: ProfileModel[] = [...PROFILE_MODELS];

/**
 * Profiles with a mechanical or observational basis. The central tip line is averaged over these only: the flexible
 * family can match the picks above the cut-off with many tails, so it widens the range but does not set the centre.
 */
export const PUBLISHED_PROFILES: ProfileModel[] = ["walsh-watterson-1987", "elliptical-crack", "linear", "parabolic", "flat-topped"];

/** A profile with its shape numbers (as fitted) as a plain function of r. */
export function profileFunction(model: ProfileModel, shape: ArrayLike<number> = []): (r: number) => number {
  const candidate = PROFILE_CANDIDATES[model];
  const x = shape.length ? shape : candidate.start;
  const x0 = x[0] ?? 0;
  const x1 = x[1] ?? 0;
  const out = new Float64Array(4);
  return (r) => {
    writeProfile(candidate.kind, Math.abs(r), x0, x1, out);
    return out[0];
  };
}

export const PROFILE_LABELS: Record<ProfileModel, string> = {
  "walsh-watterson-1987": "tapered profile of Walsh & Watterson (1987)",
  "elliptical-crack": "elliptical-crack profile (Pollard & Segall 1987)",
  linear: "linear taper (Muraoka & Kamata 1983; Dawers et al. 1993)",
  parabolic: "parabolic profile",
  "flat-topped": "flat-topped profile with steep tips (Nicol et al. 1996)",
  flexible: "flexible profile (1 − r^p)^q",
};

/** Names older reports used for a profile. */
export const PROFILE_ALIASES: Record<string, ProfileModel> = { "walsh-watterson-1989": "walsh-watterson-1987" };

/** Radius r at which a profile falls to fraction f of Dmax (the visible part above a throw cut-off). */
export function visibleRadius(model: ProfileModel, fractionOfDmax: number, shape: ArrayLike<number> = []): number {
  const f = profileFunction(model, shape);
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (f(mid) > fractionOfDmax) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Least-squares line through (distance, displacement) picks near a tip, extrapolated to zero displacement. */
export function extrapolateTipLinear(
  distanceM: ArrayLike<number>,
  displacementM: ArrayLike<number>,
): {
  slopePerM: number;
  interceptM: number;
  tipM: number;
} {
  const n = distanceM.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += distanceM[i];
    my += displacementM[i];
  }
  mx /= n;
  my /= n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    const dx = distanceM[i] - mx;
    sxy += dx * (displacementM[i] - my);
    sxx += dx * dx;
  }
  const slopePerM = sxx > 0 ? sxy / sxx : NaN;
  const interceptM = my - slopePerM * mx;
  return { slopePerM, interceptM, tipM: slopePerM !== 0 ? -interceptM / slopePerM : NaN };
}

/**
 * Normalised radius of (s, t) in a fault model: a superellipse radius (|u/a|^e + |w/b|^e)^(1/e) about the model's
 * centre whose semi-axis is the model's reach to the tip on that side (strike start/end, up/down dip), so the tip
 * line (r = 1) is four quarter-superellipses joined smoothly, an ellipse when e = 2 (common practice, no source).
 */
export function modelRadius(m: Pick<TipProfileModel, "centre" | "reach" | "exponent">, s: number, t: number): number {
  const u = s - m.centre.s;
  const w = t - m.centre.t;
  const a = u < 0 ? m.reach.strikeStartM : m.reach.strikeEndM;
  const b = w < 0 ? m.reach.upDipM : m.reach.downDipM;
  const e = m.exponent;
  return Math.pow(Math.pow(Math.abs(u / a), e) + Math.pow(Math.abs(w / b), e), 1 / e);
}

/** A fault model's tip line as a closed polygon in (s, t), `vertices` points counter-clockwise from strike end. */
export function modelTipPolygon(m: Pick<TipProfileModel, "centre" | "reach" | "exponent">, vertices = 240): [number, number][] {
  const out: [number, number][] = [];
  const power = 2 / m.exponent;
  for (let k = 0; k <= vertices; k++) {
    const phi = (2 * Math.PI * (k % vertices)) / vertices;
    const c = Math.cos(phi);
    const s = Math.sin(phi);
    const a = c < 0 ? m.reach.strikeStartM : m.reach.strikeEndM;
    const b = s < 0 ? m.reach.upDipM : m.reach.downDipM;
    out.push([m.centre.s + a * Math.sign(c) * Math.pow(Math.abs(c), power), m.centre.t + b * Math.sign(s) * Math.pow(Math.abs(s), power)]);
  }
  return out;
}

/** A fault model's displacement at (s, t). */
export function modelDisplacement(m: Pick<TipProfileModel, "model" | "shape" | "centre" | "reach" | "exponent" | "dmaxM">, s: number, t: number): number {
  return m.dmaxM * profileFunction(m.model, m.shape)(modelRadius(m, s, t));
}
