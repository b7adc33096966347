// The settings an interpreter gives a run of the analysis, checked at the edge (route handler, stored parameters in
// analyses.parameters). Client-safe: the workspace's form uses the same schema and describes a run with the same words.
import { z } from "zod";
import { PROFILE_MODELS, TIP_END_SIDES, type ProfileModel, type TipEndSide } from "./report";
const metres = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a number of metres` })
    .finite()
    .positive({ error: `${what} must be more than 0 m` })
    .max(max, { error: `${what} must be at most ${max.toLocaleString("en")} m` });

export const analysisSettingsSchema = z
  .object({
    intervalM: metres("The contour interval", 10_000).optional(),
    cellM: metres("The grid cell", 10_000).optional(),
    throwCutoffM: metres("The resolution cut-off", 1_000).optional(),
    profiles: z
      .array(z.enum(PROFILE_MODELS, { error: `The profile must be one of ${PROFILE_MODELS.join(", ")}` }))
      .min(1)
      .max(PROFILE_MODELS.length)
      .optional(),
    ends: z.partialRecord(z.enum(TIP_END_SIDES), z.enum(["open", "inferred"], { error: "An end is open or inferred" })).optional(),
    smoothingM: metres("The grid smoothing", 10_000).optional(),
  })
  .strict();

/** The settings an interpreter can give an analysis run; every one optional (absent: the default). */
export type AnalysisSettings = z.infer<typeof analysisSettingsSchema>;

export function parseAnalysisSettings(value: unknown): AnalysisSettings {
  return analysisSettingsSchema.parse(value ?? {});
}

const SIDE_WORDS: Record<TipEndSide, string> = { "strike-start": "strike start", "strike-end": "strike end", "up-dip": "up dip", "down-dip": "down dip" };
const PROFILE_WORDS: Record<ProfileModel, string> = {
  "walsh-watterson-1987": "tapered",
  "elliptical-crack": "elliptical crack",
  linear: "linear taper",
  parabolic: "parabolic",
  "flat-topped": "flat-topped",
  flexible: "flexible",
};

/** A run's settings in a few words: "cut-off 12 m, linear taper only, strike end open" or "defaults". */
export function describeSettings(settings: AnalysisSettings | undefined | null): string {
  if (!settings) return "defaults";
  const words: string[] = [];
  if (settings.throwCutoffM !== undefined) words.push(`cut-off ${settings.throwCutoffM} m throw`);
  if (settings.profiles?.length) words.push(`${settings.profiles.map((p) => PROFILE_WORDS[p]).join(", ")} only`);
  for (const [side, status] of Object.entries(settings.ends ?? {})) words.push(`${SIDE_WORDS[side as TipEndSide]} ${status}`);
  if (settings.intervalM) words.push(`contours every ${settings.intervalM} m`);
  if (settings.cellM) words.push(`cell ${settings.cellM} m`);
  if (settings.smoothingM) words.push(`smoothed over ${settings.smoothingM} m`);
  return words.length ? words.join(", ") : "defaults";
}
