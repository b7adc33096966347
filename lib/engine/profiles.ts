// Normalised displacement profiles of an isolated fault, r = distance from centre / half-length (0 ≤ r ≤ 1).
import type { ProfileModel } from "./types";

/** Walsh & Watterson (1987/1989): D = 2·Dmax·(1 − r)·sqrt(((1 + r)/2)² − r²). */
export function walshWattersonProfile(r: number): number {
  if (!(r < 1)) return 0;
  const ra = Math.abs(r);
  const q = ((1 + ra) / 2) ** 2 - ra * ra;
  return q > 0 ? 2 * (1 - ra) * Math.sqrt(q) : 0;
}

/** Elliptical crack under uniform driving stress (Pollard & Segall 1987): D = Dmax·sqrt(1 − r²). */
export function ellipticalCrackProfile(r: number): number {
  if (!(r < 1)) return 0;
  return Math.sqrt(1 - r * r);
}

/** Linear (triangular) profile: common practice, no single source. */
export function linearProfile(r: number): number {
  if (!(r < 1)) return 0;
  return 1 - Math.abs(r);
}

export const PROFILE_FUNCTIONS: Record<ProfileModel, (r: number) => number> = {
  "walsh-watterson-1989": walshWattersonProfile,
  "elliptical-crack": ellipticalCrackProfile,
  linear: linearProfile,
};

export const PROFILE_LABELS: Record<ProfileModel, string> = {
  "walsh-watterson-1989": "Walsh & Watterson (1989) tapered profile",
  "elliptical-crack": "elliptical crack profile (Pollard & Segall 1987)",
  linear: "linear profile",
};

/** Radius r at which the profile falls to fraction f of Dmax (the visible part above a throw cut-off). */
export function visibleRadius(model: ProfileModel, fractionOfDmax: number): number {
  const f = PROFILE_FUNCTIONS[model];
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
export function extrapolateTipLinear(distanceM: ArrayLike<number>, displacementM: ArrayLike<number>): {
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
