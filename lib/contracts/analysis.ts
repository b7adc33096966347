// Analyses of a fault and the uploads that start them: what the workspace sends and what the API answers. The report
// itself is ./report.ts; the run settings ./analysis-settings.ts.
import { z } from "zod";
import { analysisSettingsSchema } from "./analysis-settings";
import { finite, isoTime, maybeNumber } from "./json";
import { analysisReportSchema, lengthUnitSchema, rejectedRowSchema } from "./report";
import { pickSetProvenanceSchema, rakeField, stationSpacingField, velocityModelField, velocityModelSchema } from "./seal";

export const ANALYSIS_STATUSES = ["queued", "running", "done", "failed"] as const;
export const analysisStatusSchema = z.enum(ANALYSIS_STATUSES);
export type AnalysisStatus = z.infer<typeof analysisStatusSchema>;

/** The analysis stages in the order a run goes through them (the progress the workspace shows). */
export const ANALYSIS_STAGES = ["parse", "plane", "triangulate", "grid", "contours", "tipline", "metrics", "relays"] as const;

/** One analysis of a pick set with the pick set's provenance: its result once done. */
export const analysisStateSchema = z.strictObject({
  id: z.string(),
  status: analysisStatusSchema,
  stage: z.string(),
  progress: finite,
  errorMessage: z.string().nullable(),
  engineVersion: z.string().nullable(),
  parameters: analysisSettingsSchema,
  createdAt: isoTime,
  finishedAt: isoTime.nullable(),
  pickSetId: z.string(),
  version: z.number().int(),
  fileName: z.string(),
  checksum: z.string(),
  uploadedAt: isoTime,
  /** how the pick set's times were converted to depth (null for a file in depth) */
  velocityModel: velocityModelSchema.nullable(),
  /** set when the pick set was derived from a cut-off line file */
  derivedFrom: pickSetProvenanceSchema.nullable(),
  result: analysisReportSchema.nullable(),
});
export type AnalysisState = z.infer<typeof analysisStateSchema>;

/** GET /api/faults/:id/analysis (?pickSet=, ?analysis=, ?contours=0: the report with its levels but without rings) */
export const analysisResponseSchema = z.strictObject({ analysis: analysisStateSchema.nullable() });
export type AnalysisResponse = z.infer<typeof analysisResponseSchema>;

/** One run of a pick set's analysis, with the headline numbers to compare runs at a glance. */
export const analysisRunSchema = z.strictObject({
  id: z.string(),
  status: analysisStatusSchema,
  createdAt: isoTime,
  finishedAt: isoTime.nullable(),
  engineVersion: z.string().nullable(),
  settings: analysisSettingsSchema.nullable(),
  segments: z.array(
    z.strictObject({
      id: z.string(),
      lengthM: finite,
      lengthRangeM: z.tuple([z.number().nullable(), z.number().nullable()]).nullable(),
      heightM: finite,
      heightRangeM: z.tuple([z.number().nullable(), z.number().nullable()]).nullable(),
      fittedDmaxM: z.number().nullable(),
      model: z.string(),
      cutoffM: z.number().nullable(),
    }),
  ),
});
export type AnalysisRun = z.infer<typeof analysisRunSchema>;

/** GET /api/faults/:id/analysis/runs */
export const analysisRunsResponseSchema = z.strictObject({ pickSetId: z.string().nullable(), runs: z.array(analysisRunSchema) });
export type AnalysisRunsResponse = z.infer<typeof analysisRunsResponseSchema>;

/** POST /api/faults/:id/analysis/rerun */
export const rerunInputSchema = z.object({ pickSetId: z.string().min(1), settings: analysisSettingsSchema.optional() });
export const rerunResponseSchema = z.strictObject({ analysisId: z.string() });

/** GET /api/faults/:id/pick-sets */
export const pickSetsResponseSchema = z.strictObject({
  pickSets: z.array(
    z.strictObject({
      id: z.string(),
      version: z.number().int(),
      fileName: z.string(),
      checksum: z.string(),
      sizeBytes: z.number().int(),
      rowCount: z.number().int(),
      droppedRows: z.number().int(),
      units: lengthUnitSchema,
      uploadedAt: isoTime,
      uploadedBy: z.string().nullable(),
      velocityModel: velocityModelSchema.nullable(),
      derivedFrom: pickSetProvenanceSchema.nullable(),
    }),
  ),
});
export type PickSetsResponse = z.infer<typeof pickSetsResponseSchema>;

// ---- uploads -----------------------------------------------------------------------------------------------------

/** The form fields of an upload (multipart, beside the file): units of the file, and for a direct save, bad rows */
export const uploadOptionsSchema = z.object({
  units: lengthUnitSchema.default("m"),
  dropBadRows: z
    .enum(["true", "false"])
    .default("false")
    .transform((value) => value === "true"),
  problemPage: z.coerce.number().int().min(0).max(10_000).default(0),
  /** for a file in two-way time: the velocity model as JSON (./seal.ts) */
  velocityModel: velocityModelField,
  /** for a cut-off line file: how the walls are paired */
  stationSpacingM: stationSpacingField,
  rakeDeg: rakeField,
  orderAlongStrike: z
    .enum(["true", "false"])
    .default("false")
    .transform((value) => value === "true"),
});
type ParsedUploadOptions = z.infer<typeof uploadOptionsSchema>;
/** The options as the form gives them; the time and cut-off ones may be left out by callers in code (seed, tests). */
export type UploadOptions = Omit<ParsedUploadOptions, "velocityModel" | "stationSpacingM" | "rakeDeg" | "orderAlongStrike"> &
  Partial<Pick<ParsedUploadOptions, "velocityModel" | "stationSpacingM" | "rakeDeg" | "orderAlongStrike">>;

/** What the interpreter needs to decide before saving: a sample, every problem (paged), duplicates. */
export const uploadPreviewSchema = z.strictObject({
  fileName: z.string(),
  sizeBytes: z.number().int(),
  checksum: z.string(),
  units: lengthUnitSchema,
  rows: z.number().int(),
  accepted: z.number().int(),
  segments: z.array(z.string()),
  horizons: z.array(z.string()),
  sample: z.array(
    z.strictObject({ row: z.number().int(), x: finite, y: finite, z: finite, throwM: finite, segment: z.string(), horizon: z.string().nullable() }),
  ),
  problems: z.array(rejectedRowSchema),
  problemCount: z.number().int(),
  problemsTruncated: z.boolean(),
  problemPage: z.number().int(),
  problemPageSize: z.number().int(),
  warnings: z.array(z.string()),
  duplicateOfVersion: z.number().int().nullable(),
  /** a pick file, or a cut-off line file whose derived picks are previewed */
  kind: z.enum(["picks", "cutoffs"]),
  domain: z.enum(["depth", "time"]),
  velocityModel: velocityModelSchema.nullable(),
  /** how a cut-off file's walls were paired, per horizon, and the stations where one wall is missing (first 50) */
  cutoffs: z
    .strictObject({
      rows: z.number().int(),
      vertexCount: z.number().int(),
      stationSpacingM: finite,
      stationSpacingSource: z.enum(["data", "set"]),
      rakeDeg: finite,
      horizons: z.array(
        z.strictObject({ name: z.string(), stations: z.number().int(), maxThrowM: finite, meanThrowM: finite, missingStations: z.number().int() }),
      ),
      missingStations: z.number().int(),
      missing: z.array(z.object({ segment: z.string(), horizon: z.string(), s: finite, present: z.enum(["hw", "fw"]) })),
    })
    .nullable(),
});
export type UploadPreview = z.infer<typeof uploadPreviewSchema>;

/** POST /api/faults/:id/pick-sets?step=confirm (201) */
export const uploadSavedSchema = z.strictObject({ pickSetId: z.string(), version: z.number().int(), analysisId: z.string() });
export type UploadSaved = z.infer<typeof uploadSavedSchema>;

/** GET /api/faults/:id/export/horizons.json: throw per horizon in bins along strike */
export const horizonBinsResponseSchema = z.strictObject({
  horizons: z.array(z.string()),
  bins: z.array(
    z.strictObject({
      segment: z.string(),
      horizon: z.string(),
      /** bin centre along strike (segment plane coordinate s, m) */
      s: finite,
      /** median throw of the picks in the bin (m) */
      throwM: finite,
      /** mean elevation of the picks in the bin (m, up positive) */
      z: finite,
      count: z.number().int(),
      /** mean hanging-wall and footwall thickness of the interval below the horizon where given (m) */
      hwThicknessM: maybeNumber,
      fwThicknessM: maybeNumber,
    }),
  ),
});
export type HorizonBinsResponse = z.infer<typeof horizonBinsResponseSchema>;
export type HorizonBin = HorizonBinsResponse["bins"][number];

/** One fault's point on the scaling chart (lib/charts/scaling-fit.ts makes it from a report). */
export const faultScalingPointSchema = z.strictObject({
  faultId: z.string(),
  name: z.string(),
  /** fitted Dmax (the observed maximum for reports made before the fit existed), m */
  dMaxM: finite,
  /** its 5–95 % range, m */
  dMaxRangeM: z.tuple([maybeNumber, maybeNumber]),
  /** along-strike length of the inferred tip line(s), m */
  lengthM: finite,
  /** its 5–95 % range, m; the upper end is null where an end is open (the length is then a minimum) */
  lengthRangeM: z.tuple([maybeNumber, z.number().nullable()]),
  lengthIsMinimum: z.boolean(),
  segmentCount: z.number().int(),
});
export type FaultScalingPoint = z.infer<typeof faultScalingPointSchema>;

/** GET /api/faults/:id/export/scaling.json: every fault of the study with a finished analysis */
export const scalingResponseSchema = z.strictObject({ studyId: z.string(), faults: z.array(faultScalingPointSchema) });
export type ScalingResponse = z.infer<typeof scalingResponseSchema>;
