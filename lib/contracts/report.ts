// The analysis report: what the engine makes of a pick set (lib/engine), what the command line prints with --json, what
// the database stores (analyses.result) and what the workspace, the link page and the printable report read. Coordinates:
// x East, y North, z Up (m). Fault-plane coordinates per segment: s along strike (right-hand-rule strike direction), t
// down dip (positive downward), origin at the segment's pick centroid. Measures that may be missing are NaN in memory and
// null in JSON (see maybeNumber).
import { z } from "zod";
import { finite, maybeNumber, planePoint, vec3 } from "./json";
import { LENGTH_UNITS, PROFILE_MODELS, TIP_END_SIDES } from "./names";

export { LENGTH_UNITS, PROFILE_MODELS, TIP_END_SIDES };

export const lengthUnitSchema = z.enum(LENGTH_UNITS, { error: "Units are m or ft." });
export type LengthUnit = z.infer<typeof lengthUnitSchema>;

/** The displacement profiles a tip line can be fitted with (lib/engine/profile-models.ts), in the order they are offered. */
export const profileModelSchema = z.enum(PROFILE_MODELS, { error: `The profile must be one of ${PROFILE_MODELS.join(", ")}` });
export type ProfileModel = z.infer<typeof profileModelSchema>;

/** The four ends of a fault: along strike towards lower / higher s, and up dip (shallower) / down dip. */
export const tipEndSideSchema = z.enum(TIP_END_SIDES);
export type TipEndSide = z.infer<typeof tipEndSideSchema>;

export const rejectedRowSchema = z.strictObject({
  /** 1-based data row number as the user sees it in a spreadsheet (header is row 1, first data row is 2) */
  row: z.number().int(),
  column: z.string(),
  reason: z.string(),
});
export type RejectedRow = z.infer<typeof rejectedRowSchema>;

export const tipEndSchema = z.strictObject({
  side: tipEndSideSchema,
  /** inferred: displacement falls toward the cut-off there and a tip is inferred beyond; open: the data stop first */
  status: z.enum(["inferred", "open"]),
  /** detected from the picks, or set by the interpreter */
  source: z.enum(["detected", "set"]),
});
export type TipEnd = z.infer<typeof tipEndSchema>;

/** The fault model of the profile that carries most weight: Dmax·f(r) with a reach to the tip on each side. */
export const tipProfileModelSchema = z.strictObject({
  model: profileModelSchema,
  /** shape numbers as fitted (unbounded) */
  shape: z.array(finite),
  centre: z.strictObject({ s: finite, t: finite }),
  reach: z.strictObject({ strikeStartM: maybeNumber, strikeEndM: maybeNumber, upDipM: maybeNumber, downDipM: maybeNumber }),
  /** superellipse exponent of the tip line: 2 an ellipse, larger boxier (layer-bound faults), smaller more pointed */
  exponent: finite,
  dmaxM: finite,
});
export type TipProfileModel = z.infer<typeof tipProfileModelSchema>;

/** A 5–95 % range whose upper end is null where an end is open (the value is then a minimum). */
const openRange = z.tuple([maybeNumber, z.number().nullable()]);

export const tipLineSchema = z.strictObject({
  /** central estimate, along strike and down dip (m) */
  lengthM: finite,
  heightM: finite,
  lengthRangeM: openRange,
  heightRangeM: openRange,
  lengthIsMinimum: z.boolean(),
  heightIsMinimum: z.boolean(),
  aspectRatio: maybeNumber,
  areaM2: maybeNumber,
  /** where the weighted fits put the displacement maximum; the tip lines are built around it */
  centre: z.strictObject({ s: finite, t: finite }),
  /** half the length and height */
  semiAxes: z.strictObject({ sM: finite, tM: finite }),
  /** the profile with most weight */
  model: profileModelSchema,
  profile: tipProfileModelSchema,
  /** every profile tried, most weight first */
  candidates: z.array(
    z.strictObject({
      model: profileModelSchema,
      weight: maybeNumber,
      aicc: maybeNumber,
      rmsM: maybeNumber,
      lengthM: maybeNumber,
      heightM: maybeNumber,
      dmaxM: maybeNumber,
    }),
  ),
  /** how well each candidate model fitted, rms misfit in m */
  modelMisfits: z.partialRecord(profileModelSchema, maybeNumber),
  /** half the wider of the length and height ranges (m) */
  uncertaintyM: maybeNumber,
  /** displacement below which nothing could be picked */
  cutoff: z.strictObject({ displacementM: finite, source: z.enum(["estimated", "set"]) }),
  /** interpretation noise near the edges (m) */
  noiseM: maybeNumber,
  ends: z.array(tipEndSchema),
  /** per polygon vertex (ray from the centre), 1 where the line follows an open data edge */
  openRays: z.array(z.number().int()),
  /** which profiles were compared, how, and what carried the weight, in a sentence */
  selection: z.string(),
  method: z.string(),
  /** central tip line in (s, t), closed */
  polygon: z.array(planePoint),
  /** 5 % and 95 % tip lines in (s, t), closed, with the same vertex directions */
  innerPolygon: z.array(planePoint),
  outerPolygon: z.array(planePoint),
  worldPolygon: z.array(vec3),
  innerWorldPolygon: z.array(vec3),
  outerWorldPolygon: z.array(vec3),
});
export type TipLine = z.infer<typeof tipLineSchema>;

/** A closed line in a segment's (s, t) frame. */
export const ringSchema = z.array(planePoint);
export type Ring = z.infer<typeof ringSchema>;

/** A plane's frame: its centroid and unit strike, dip and normal vectors (ENU, m); lib/display/frame.ts places points with it. */
export const planeFrameShape = { centroid: vec3, strikeVector: vec3, dipVector: vec3, normal: vec3 };

export const segmentPlaneSchema = z.strictObject({
  strikeDeg: finite,
  dipDeg: finite,
  dipDirectionDeg: finite,
  rmsM: finite,
  planarityWarning: z.string().nullable(),
  ...planeFrameShape,
});
export type SegmentPlane = z.infer<typeof segmentPlaneSchema>;

/** A smoothed fault surface resampled on a coarse grid that covers the tip lines: w everywhere (no NaN), m. */
export const surfaceOffsetGridSchema = z.strictObject({
  s0: finite,
  t0: finite,
  cellM: finite,
  columns: z.number().int(),
  rows: z.number().int(),
  /** row-major w (m), continued beyond the data along the tangent plane of the data's edge */
  offsetM: z.array(finite),
});
export type SurfaceOffsetGrid = z.infer<typeof surfaceOffsetGridSchema>;

/** How far the fault surface departs from its reference plane, and what that changes. */
export const surfaceSummarySchema = z.strictObject({
  /** largest and RMS distance of the surface from the reference plane within the mapped area (m) */
  maxOffsetM: maybeNumber,
  rmsOffsetM: maybeNumber,
  /** the Gaussian length scale at which the surface was smoothed to read its local dip (m) */
  lengthScaleM: maybeNumber,
  /** 5th and 95th percentile of the local dip over the mapped area (degrees) */
  localDipRangeDeg: z.tuple([maybeNumber, maybeNumber]),
  /** displacement from the local dip against displacement from the plane's dip: 5th and 95th percentile of the ratio */
  displacementRatioRange: z.tuple([maybeNumber, maybeNumber]),
  /** length and height of the tip line measured on the reference plane (projection), for comparison (m) */
  projectedLengthM: maybeNumber,
  projectedHeightM: maybeNumber,
  /** true when the surface departs from the plane enough to change displacement or size by more than the threshold */
  matters: z.boolean(),
  /** one sentence for the fault sheet */
  note: z.string(),
  /** the surface itself, coarse, for positions anywhere on it (exports, views) */
  grid: surfaceOffsetGridSchema,
});
export type SurfaceSummary = z.infer<typeof surfaceSummarySchema>;

export const segmentResultSchema = z.strictObject({
  id: z.string(),
  pickCount: z.number().int(),
  plane: segmentPlaneSchema,
  /** observed maximum (biased upward by noise) and the fitted one with its 5–95 % range */
  max: z.strictObject({
    displacementM: finite,
    throwM: finite,
    s: finite,
    t: finite,
    x: finite,
    y: finite,
    z: finite,
    fittedDisplacementM: finite,
    fittedDisplacementRangeM: z.tuple([maybeNumber, maybeNumber]),
  }),
  mappedLimit: z.strictObject({ lengthM: finite, heightM: finite, polygon: z.array(planePoint), worldPolygon: z.array(vec3) }),
  tipLine: tipLineSchema,
  gradients: z.strictObject({
    meanPerM: maybeNumber,
    maxPerM: maybeNumber,
    tips: z.strictObject({ strikeStartPerM: maybeNumber, strikeEndPerM: maybeNumber, upDipPerM: maybeNumber, downDipPerM: maybeNumber }),
  }),
  /** displacement-weighted centroid (s, t), weighted by surface area */
  centroidOfDisplacement: z.strictObject({ s: maybeNumber, t: maybeNumber }),
  /** where Dmax sits between the tip line's ends, measured along the surface: 0 in the middle, ±1 at an end */
  asymmetry: z.strictObject({ alongStrike: maybeNumber, downDip: maybeNumber }),
  /** the fault surface against its reference plane (absent in reports made before the surface was read) */
  surface: surfaceSummarySchema.optional(),
  scaling: z.strictObject({ dOverL: maybeNumber, note: z.string(), plausible: z.boolean() }),
  contourIntervalM: finite,
  /**
   * One entry per contour level. The rings are in the report the engine makes (and the command line prints); the stored
   * report keeps the levels with empty rings, since the display payload holds the rings once (lib/display).
   */
  contours: z.array(z.strictObject({ levelM: finite, rings: z.array(ringSchema) })),
});
export type SegmentResult = z.infer<typeof segmentResultSchema>;

export const relayResultSchema = z.strictObject({
  segments: z.tuple([z.string(), z.string()]),
  overlapM: maybeNumber,
  separationM: maybeNumber,
  overlapToSeparation: maybeNumber,
  linkage: z.enum(["soft", "breached", "hard"]),
  /** what the label rests on, in words (the mapped connection, or its absence), and the summed-profile transfer */
  evidence: z.string(),
  /** the published basis of the labels */
  basis: z.string().optional(),
  /** the mapped structure the label rests on: a merge, a connecting segment or picks, or none */
  connection: z
    .strictObject({
      kind: z.enum(["none", "picks", "segment", "merged"]),
      via: z.string().nullable(),
      pickCount: z.number().int(),
      throwRangeM: z.tuple([finite, finite]).nullable(),
      /** closest distance of a pick of one segment to the other's mapped surface (m) */
      closestApproachM: maybeNumber,
    })
    .optional(),
  /** smallest summed displacement inside the overlap as a fraction of the summed profile's peak */
  summedMinimumFraction: maybeNumber.optional(),
  comparison: z.string(),
  /** sum of both segments' displacement along mean strike at their mean centroid elevation */
  summedProfile: z.strictObject({ alongStrikeM: z.array(maybeNumber), displacementM: z.array(maybeNumber) }),
});
export type RelayResult = z.infer<typeof relayResultSchema>;

/** The interpreter's settings a report was made with (see ./analysis-settings.ts for the input check). */
const reportSettingsSchema = z.strictObject({
  intervalM: finite.optional(),
  cellM: finite.optional(),
  throwCutoffM: finite.optional(),
  profiles: z.array(profileModelSchema).optional(),
  ends: z.partialRecord(tipEndSideSchema, z.enum(["open", "inferred"])).optional(),
  smoothingM: finite.optional(),
});

/** The kind of fault: the sense of its offset and, for oblique slip, the rake. */
export const FAULT_KINDS = ["normal", "reverse", "oblique"] as const;
export const faultKinematicsShape = {
  sense: z.enum(FAULT_KINDS),
  /**
   * Rake of the slip vector in the fault surface, measured from the strike direction (degrees, −180…180; negative for
   * normal slip, positive for reverse: Aki & Richards 1980). Required for oblique faults; normal is −90 and reverse +90
   * when absent. A pick's own `rake` column overrides it.
   */
  rakeDeg: finite.optional(),
  /** throw of the opposite sense (negative throw in the file) is expected in places: the fault was inverted */
  inversion: z.boolean().optional(),
};

/** The fault's type as an analysis used it. */
export const kinematicsSummarySchema = z.strictObject({
  ...faultKinematicsShape,
  /** the rake used where a pick has none (degrees) */
  rakeDeg: finite,
  hangingWall: z.enum(["down", "up"]),
  /** picks with their own rake */
  picksWithRake: z.number().int(),
  /** picks with throw of the opposite sense (inversion) */
  oppositeSensePicks: z.number().int(),
  /** how throw became displacement, in a sentence for the fault sheet */
  note: z.string(),
});
export type KinematicsSummary = z.infer<typeof kinematicsSummarySchema>;

export const analysisReportSchema = z.strictObject({
  engineVersion: z.string(),
  input: z.strictObject({ rows: z.number().int(), accepted: z.number().int(), rejected: z.array(rejectedRowSchema), units: lengthUnitSchema }),
  /** how the optional quality column was used (absent in reports made before it was) */
  quality: z.strictObject({ picksBelowOne: z.number().int(), note: z.string() }).optional(),
  /** the interpreter's settings this analysis ran with (absent: every default) */
  settings: reportSettingsSchema.optional(),
  /** the fault's type as the analysis used it (absent in reports made before fault types: normal) */
  kinematics: kinematicsSummarySchema.optional(),
  segments: z.array(segmentResultSchema),
  relays: z.array(relayResultSchema),
  warnings: z.array(z.string()),
});
export type AnalysisReport = z.infer<typeof analysisReportSchema>;
