// The stress state a user enters for reactivation screening: validation (shared by the form and the API),
// Andersonian regime presets and a default. Pure; usable on the server and in the browser.
import { z } from "zod";
import type { StressParameters } from "@/db/schema";

export type StressRegime = StressParameters["regime"];

/** One saved stress-state version as the API returns it (fault's own or the study default). */
export interface StressStateView {
  id: string;
  version: number;
  scope: "fault" | "study";
  parameters: StressParameters;
  source: string;
  setBy: { id: string; name: string; email: string } | null;
  createdAt: string;
}


/**
 * Illustrative gradients (MPa/km) that reproduce the Andersonian ordering of each regime (Anderson 1951, from
 * memory): normal Sv ≥ SHmax ≥ Shmin, strike-slip SHmax ≥ Sv ≥ Shmin, reverse SHmax ≥ Shmin ≥ Sv. Magnitudes are
 * generic (common practice, no source); the normal preset at 2.5 km gives the worked state of docs/check-values.md
 * (Sv 60, SHmax 45, Shmin 35, Pp 25 MPa). They are starting points to be replaced by site data.
 */
export const REGIME_PRESETS: Record<Exclude<StressRegime, "custom">, Pick<StressParameters, "verticalGradient" | "maxHorizontalGradient" | "minHorizontalGradient" | "porePressureGradient">> = {
  normal: { verticalGradient: 24, maxHorizontalGradient: 18, minHorizontalGradient: 14, porePressureGradient: 10 },
  "strike-slip": { verticalGradient: 24, maxHorizontalGradient: 32, minHorizontalGradient: 16, porePressureGradient: 10 },
  reverse: { verticalGradient: 24, maxHorizontalGradient: 38, minHorizontalGradient: 30, porePressureGradient: 10 },
};

export const REGIME_LABELS: Record<StressRegime, string> = {
  normal: "Normal faulting (Sv ≥ SHmax ≥ Shmin)",
  "strike-slip": "Strike-slip (SHmax ≥ Sv ≥ Shmin)",
  reverse: "Reverse faulting (SHmax ≥ Shmin ≥ Sv)",
  custom: "Custom (any ordering)",
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

/** True when the gradients follow the ordering the named regime requires (custom accepts any). */
export function regimeOrderingHolds(p: Pick<StressParameters, "regime" | "verticalGradient" | "maxHorizontalGradient" | "minHorizontalGradient">): boolean {
  const { verticalGradient: v, maxHorizontalGradient: H, minHorizontalGradient: h } = p;
  if (p.regime === "normal") return v >= H && H >= h;
  if (p.regime === "strike-slip") return H >= v && v >= h;
  if (p.regime === "reverse") return H >= h && h >= v;
  return true;
}

const number = (what: string, unit: string, min: number, max: number) =>
  z
    .number({ error: `${what} must be a number (${unit})` })
    .refine(Number.isFinite, { message: `${what} must be a finite number (${unit})` })
    .refine((x) => x >= min && x <= max, { message: `${what} must be between ${min} and ${max} ${unit}` });

const gradient = (what: string) => number(what, "MPa/km", 0.1, 100);

export const stressParametersSchema = z
  .object({
    regime: z.enum(["normal", "strike-slip", "reverse", "custom"], { error: "regime must be normal, strike-slip, reverse or custom" }),
    verticalGradient: gradient("Vertical stress gradient"),
    minHorizontalGradient: gradient("Minimum horizontal stress gradient"),
    maxHorizontalGradient: gradient("Maximum horizontal stress gradient"),
    maxHorizontalAzimuthDeg: number("Azimuth of SHmax", "° from north", 0, 360),
    porePressureGradient: number("Pore-pressure gradient", "MPa/km", 0, 100),
    frictionLow: number("Lower friction coefficient", "(dimensionless)", 0.05, 1.5),
    frictionHigh: number("Upper friction coefficient", "(dimensionless)", 0.05, 1.5),
    cohesionMPa: number("Cohesion", "MPa", 0, 100),
    referenceDepthM: number("Reference depth", "m", 1, 20_000),
  })
  .superRefine((p, ctx) => {
    if (p.minHorizontalGradient > p.maxHorizontalGradient) {
      ctx.addIssue({ code: "custom", path: ["minHorizontalGradient"], message: `Minimum horizontal stress gradient (${p.minHorizontalGradient} MPa/km) must not exceed the maximum (${p.maxHorizontalGradient} MPa/km)` });
    }
    if (p.frictionLow > p.frictionHigh) {
      ctx.addIssue({ code: "custom", path: ["frictionHigh"], message: `Upper friction coefficient (${p.frictionHigh}) must be at least the lower one (${p.frictionLow})` });
    }
    if (p.minHorizontalGradient <= p.maxHorizontalGradient && !regimeOrderingHolds(p)) {
      ctx.addIssue({ code: "custom", path: ["regime"], message: `The gradients do not follow the ${REGIME_LABELS[p.regime]} ordering; fix them or choose "custom"` });
    }
  });

export const stressStateInputSchema = z
  .object({
    parameters: stressParametersSchema,
    source: z.string({ error: "source must be text" }).trim().max(2000, { message: "source must be at most 2000 characters" }).default(""),
    /** true: the study-wide default; false: this fault only */
    studyWide: z.boolean({ error: "studyWide must be true or false" }).default(false),
  });

export type StressStateInput = z.infer<typeof stressStateInputSchema>;

export const DEFAULT_THRESHOLDS_MPA = [1, 2, 5];

/** "1, 2, 5" → [1, 2, 5]; null when any entry is not a number in 0–1000 MPa. */
export function parseThresholds(text: string | null | undefined): number[] | null {
  if (text === null || text === undefined || text.trim() === "") return [...DEFAULT_THRESHOLDS_MPA];
  const parts = text.split(",").map((part) => part.trim()).filter(Boolean);
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
