// Starting values for the stress state a user enters (its check is the contract in lib/contracts/stress.ts): Andersonian
// regime presets, a default, and the screen's own query parameters. Pure; usable on the server and in the browser.
import type { StressParameters, StressRegime } from "@/lib/contracts/stress";

/**
 * Illustrative gradients (MPa/km) that reproduce the Andersonian ordering of each regime (Anderson 1951, from
 * memory): normal Sv ≥ SHmax ≥ Shmin, strike-slip SHmax ≥ Sv ≥ Shmin, reverse SHmax ≥ Shmin ≥ Sv. Magnitudes are
 * generic (common practice, no source); the normal preset at 2.5 km gives the worked state of docs/check-values.md
 * (Sv 60, SHmax 45, Shmin 35, Pp 25 MPa). They are starting points to be replaced by site data.
 */
export const REGIME_PRESETS: Record<
  Exclude<StressRegime, "custom">,
  Pick<StressParameters, "verticalGradient" | "maxHorizontalGradient" | "minHorizontalGradient" | "porePressureGradient">
> = {
  normal: { verticalGradient: 24, maxHorizontalGradient: 18, minHorizontalGradient: 14, porePressureGradient: 10 },
  "strike-slip": { verticalGradient: 24, maxHorizontalGradient: 32, minHorizontalGradient: 16, porePressureGradient: 10 },
  reverse: { verticalGradient: 24, maxHorizontalGradient: 38, minHorizontalGradient: 30, porePressureGradient: 10 },
};

export const DEFAULT_STRESS_PARAMETERS: StressParameters = {
  regime: "normal",
  ...REGIME_PRESETS.normal,
  maxHorizontalAzimuthDeg: 0,
  frictionLow: 0.6,
  frictionHigh: 0.8,
  cohesionMPa: 0,
  referenceDepthM: 2500,
};

export function applyPreset(parameters: StressParameters, regime: StressRegime): StressParameters {
  return regime === "custom" ? { ...parameters, regime } : { ...parameters, regime, ...REGIME_PRESETS[regime] };
}

export const DEFAULT_THRESHOLDS_MPA = [1, 2, 5];

/** "1, 2, 5" → [1, 2, 5]; null when any entry is not a number in 0–1000 MPa. */
export function parseThresholds(text: string | null | undefined): number[] | null {
  if (text === null || text === undefined || text.trim() === "") return [...DEFAULT_THRESHOLDS_MPA];
  const parts = text
    .split(",")
    .map((part) => part.trim())
    .filter(Boolean);
  if (parts.length === 0 || parts.length > 10) return null;
  const values = parts.map(Number);
  if (values.some((v) => !Number.isFinite(v) || v < -1000 || v > 1000)) return null;
  return [...new Set(values)].sort((a, b) => a - b);
}

/** Smoothing lengths the screen accepts for the fault surface's orientation (m). */
export const LENGTH_SCALE_LIMITS_M = [10, 5000] as const;

/** "250" → 250; null for an absent value (use the default), NaN for one that is not a length within the limits. */
export function parseLengthScale(text: string | null | undefined): number | null {
  if (text === null || text === undefined || text.trim() === "") return null;
  const value = Number(text);
  return Number.isFinite(value) && value >= LENGTH_SCALE_LIMITS_M[0] && value <= LENGTH_SCALE_LIMITS_M[1] ? value : NaN;
}
