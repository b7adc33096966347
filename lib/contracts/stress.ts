// The reactivation screen's shapes: the stress state a person enters (checked the same way by the form and the API,
// stored in stress_states.parameters), the saved versions as the API lists them, and the screening result the panel
// reads (one binary payload, lib/display/codec.ts: the per-node colour fields travel as Float32 arrays).
import { z } from "zod";
import { finite, isoTime, maybeNumber } from "./json";

export const STRESS_REGIMES = ["normal", "strike-slip", "reverse", "custom"] as const;
export type StressRegime = (typeof STRESS_REGIMES)[number];

export const REGIME_LABELS: Record<StressRegime, string> = {
  normal: "Normal faulting (Sv ≥ SHmax ≥ Shmin)",
  "strike-slip": "Strike-slip (SHmax ≥ Sv ≥ Shmin)",
  reverse: "Reverse faulting (SHmax ≥ Shmin ≥ Sv)",
  custom: "Custom (any ordering)",
};

/** True when the gradients follow the ordering the named regime requires (custom accepts any). */
export function regimeOrderingHolds(p: {
  regime: StressRegime;
  verticalGradient: number;
  maxHorizontalGradient: number;
  minHorizontalGradient: number;
}): boolean {
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

/** The stress state used for reactivation screening. Gradients in MPa/km, azimuth in degrees clockwise from north. */
export const stressParametersSchema = z
  .object({
    regime: z.enum(STRESS_REGIMES, { error: "regime must be normal, strike-slip, reverse or custom" }),
    verticalGradient: gradient("Vertical stress gradient"),
    minHorizontalGradient: gradient("Minimum horizontal stress gradient"),
    maxHorizontalGradient: gradient("Maximum horizontal stress gradient"),
    maxHorizontalAzimuthDeg: number("Azimuth of SHmax", "° from north", 0, 360),
    porePressureGradient: number("Pore-pressure gradient", "MPa/km", 0, 100),
    frictionLow: number("Lower friction coefficient", "(dimensionless)", 0.05, 1.5),
    frictionHigh: number("Upper friction coefficient", "(dimensionless)", 0.05, 1.5),
    /** MPa */
    cohesionMPa: number("Cohesion", "MPa", 0, 100),
    /** m below datum, positive down */
    referenceDepthM: number("Reference depth", "m", 1, 20_000),
  })
  .superRefine((p, ctx) => {
    if (p.minHorizontalGradient > p.maxHorizontalGradient) {
      ctx.addIssue({
        code: "custom",
        path: ["minHorizontalGradient"],
        message: `Minimum horizontal stress gradient (${p.minHorizontalGradient} MPa/km) must not exceed the maximum (${p.maxHorizontalGradient} MPa/km)`,
      });
    }
    if (p.frictionLow > p.frictionHigh) {
      ctx.addIssue({
        code: "custom",
        path: ["frictionHigh"],
        message: `Upper friction coefficient (${p.frictionHigh}) must be at least the lower one (${p.frictionLow})`,
      });
    }
    if (p.minHorizontalGradient <= p.maxHorizontalGradient && !regimeOrderingHolds(p)) {
      ctx.addIssue({
        code: "custom",
        path: ["regime"],
        message: `The gradients do not follow the ${REGIME_LABELS[p.regime]} ordering; fix them or choose "custom"`,
      });
    }
  });
export type StressParameters = z.infer<typeof stressParametersSchema>;

export const stressStateInputSchema = z.object({
  parameters: stressParametersSchema,
  source: z.string({ error: "source must be text" }).trim().max(2000, { message: "source must be at most 2000 characters" }).default(""),
  /** true: the study-wide default; false: this fault only */
  studyWide: z.boolean({ error: "studyWide must be true or false" }).default(false),
});
export type StressStateInput = z.infer<typeof stressStateInputSchema>;

/** One saved stress-state version as the API returns it (the fault's own or the study default). */
export const stressStateViewSchema = z.object({
  id: z.string(),
  version: z.number().int(),
  scope: z.enum(["fault", "study"]),
  parameters: stressParametersSchema,
  source: z.string(),
  setBy: z.object({ id: z.string(), name: z.string(), email: z.string() }).nullable(),
  createdAt: isoTime,
});
export type StressStateView = z.infer<typeof stressStateViewSchema>;

/** GET /api/faults/:id/stress: the state that applies (the fault's own latest version, else the study's) and both lists. */
export const stressStateResponseSchema = z.object({
  current: stressStateViewSchema.nullable(),
  faultVersions: z.array(stressStateViewSchema),
  studyVersions: z.array(stressStateViewSchema),
});
export type StressStateResponse = z.infer<typeof stressStateResponseSchema>;

/** POST /api/faults/:id/stress */
export const stressStateSavedSchema = z.object({ id: z.string(), version: z.number().int(), scope: z.enum(["fault", "study"]) });

export const histogramSchema = z.object({
  /** bin edges, MPa; bins = edges.length − 1 */
  edgesMPa: z.array(finite),
  /** area fraction per bin, ΔP at the lower and the upper friction coefficient */
  fractionLow: z.array(finite),
  fractionHigh: z.array(finite),
});
export type Histogram = z.infer<typeof histogramSchema>;

export const screenSummarySchema = z.object({
  triangleCount: z.number().int(),
  areaM2: finite,
  depthRangeM: z.tuple([maybeNumber, maybeNumber]),
  minPressureToFailureMPa: z.object({
    /** at each end of the friction band */
    low: maybeNumber,
    high: maybeNumber,
    /** the more critical end per element (the smaller of low and high) */
    critical: maybeNumber,
    /** the minimum again with every element's orientation anywhere in its range: [lowest, highest] */
    criticalRange: z.tuple([maybeNumber, maybeNumber]),
  }),
  /** area fraction where failure is already predicted (ΔP < 0) */
  failingFraction: z.object({ critical: maybeNumber, bothEnds: maybeNumber, withinOrientationRange: maybeNumber }),
  thresholds: z.array(z.object({ thresholdMPa: finite, fractionCritical: maybeNumber, fractionBothEnds: maybeNumber })),
  slipTendency: z.object({ max: maybeNumber, areaMean: maybeNumber, maxWithinOrientationRange: maybeNumber }),
  dilationTendency: z.object({ max: maybeNumber, areaMean: maybeNumber }),
  /** area-weighted median of the elements' orientation uncertainty and of the slope scatter in their windows (degrees) */
  orientation: z.object({ medianUncertaintyDeg: maybeNumber, medianSlopeScatterDeg: maybeNumber }),
  /** triangles with σn′ ≤ 0 (slip tendency undefined) */
  tensileCount: z.number().int(),
  histogram: histogramSchema,
  reference: z.object({
    depthM: finite,
    sigma1MPa: finite,
    sigma2MPa: finite,
    sigma3MPa: finite,
    porePressureMPa: finite,
    /** largest effective slip tendency of any cohesionless plane at the reference depth */
    maxPossibleSlipTendency: maybeNumber,
  }),
  sentence: z.string(),
});
export type ScreenSummary = z.infer<typeof screenSummarySchema>;

/** How the screen took the fault's orientation, as the panel states it. */
export const orientationBasisSchema = z.object({
  /** Gaussian standard deviation of the surface smoothing (m) */
  lengthScaleM: finite,
  /** what the screen uses when none is asked for, and the median pick spacing it came from */
  defaultLengthScaleM: finite,
  medianPickSpacingM: maybeNumber,
  /** the orientation range spans this many standard errors of each window's mean normal */
  rangeStandardErrors: finite,
});
export type OrientationBasis = z.infer<typeof orientationBasisSchema>;

const float32Values = z.instanceof(Float32Array);

/** GET /api/faults/:id/stress/result: binary (lib/display/codec.ts), decoded to this. */
export const stressResultSchema = z.object({
  analysisId: z.string(),
  pickSetVersion: z.number().int(),
  state: stressStateViewSchema,
  orientation: orientationBasisSchema,
  summary: screenSummarySchema,
  skipped: z.object({ degenerate: z.number().int(), aboveDatum: z.number().int() }),
  /** per segment, one value per display-grid node (NaN: no triangle there) */
  segments: z.array(
    z.object({ segmentId: z.string(), columns: z.number().int(), rows: z.number().int(), slip: float32Values, dilation: float32Values, dp: float32Values }),
  ),
  ranges: z.object({ slip: z.tuple([finite, finite]), dilation: z.tuple([finite, finite]), dp: z.tuple([finite, finite]) }),
  /** deterministic subsample of the triangles for the Mohr plot */
  mohr: z.object({ total: z.number().int(), effectiveNormalMPa: z.array(finite), shearMPa: z.array(finite), depthM: z.array(finite) }),
});
export type StressResult = z.infer<typeof stressResultSchema>;
