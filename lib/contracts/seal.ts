// Contracts for what an interpreter gives about the rock: a velocity model for files in two-way time, the
// options of pairing cut-offs, and a study's stratigraphy table. Client-safe: the upload form and the stratigraphy
// editor use the same schemas and messages.
import { z } from "zod";
import { VELOCITY_LIMITS } from "@/lib/engine/time-depth";

const velocity = (what: string) =>
  z
    .number({ error: `${what} must be a number of m/s` })
    .finite()
    .min(VELOCITY_LIMITS.minMPerS, { error: `${what} must be at least ${VELOCITY_LIMITS.minMPerS} m/s` })
    .max(VELOCITY_LIMITS.maxMPerS, { error: `${what} must be at most ${VELOCITY_LIMITS.maxMPerS.toLocaleString("en")} m/s` });

export const velocityModelSchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("linear"),
    v0MPerS: velocity("v0"),
    kPerS: z
      .number({ error: "k must be a number of 1/s" })
      .finite()
      .min(-VELOCITY_LIMITS.maxGradientPerS, { error: `k must be at least −${VELOCITY_LIMITS.maxGradientPerS} 1/s` })
      .max(VELOCITY_LIMITS.maxGradientPerS, { error: `k must be at most ${VELOCITY_LIMITS.maxGradientPerS} 1/s` }),
  }),
  z.object({
    kind: z.literal("intervals"),
    intervals: z
      .array(
        z.object({
          horizon: z.string().trim().min(1, { error: "Name the horizon at the base of each interval" }).max(200),
          velocityMPerS: velocity("Each interval velocity"),
        }),
      )
      .min(1, { error: "Give at least one horizon with its interval velocity" })
      .max(50)
      .refine((list) => new Set(list.map((i) => i.horizon.toLowerCase())).size === list.length, { error: "Each horizon may be listed once" }),
  }),
]);

export type VelocityModelInput = z.infer<typeof velocityModelSchema>;

/** Where a derived pick set came from: the cut-off file (name, checksum) and how its walls were paired. */
export const pickSetProvenanceSchema = z.strictObject({
  kind: z.literal("cutoffs"),
  fileName: z.string(),
  checksum: z.string(),
  stationSpacingM: z.number(),
  stationSpacingSource: z.enum(["data", "set"]),
  rakeDeg: z.number(),
});
export type PickSetProvenance = z.infer<typeof pickSetProvenanceSchema>;

/** A form's text field holding the model as JSON: absent or blank means none. */
export const velocityModelField = z
  .string()
  .max(20_000)
  .optional()
  .transform((text, context) => {
    if (!text?.trim()) return null;
    let value: unknown;
    try {
      value = JSON.parse(text);
    } catch {
      context.addIssue({ code: "custom", message: "The velocity model is not valid JSON." });
      return z.NEVER;
    }
    const result = velocityModelSchema.safeParse(value);
    if (!result.success) {
      for (const issue of result.error.issues) context.addIssue({ code: "custom", message: issue.message });
      return z.NEVER;
    }
    return result.data;
  });

/** An optional number given in a form's text field. */
const optionalNumberField = (what: string, check: (value: number) => boolean, range: string) =>
  z
    .string()
    .optional()
    .transform((text, context) => {
      if (!text?.trim()) return undefined;
      const value = Number(text);
      if (!Number.isFinite(value) || !check(value)) {
        context.addIssue({ code: "custom", message: `${what} must be ${range} (got "${text}")` });
        return z.NEVER;
      }
      return value;
    });

export const stationSpacingField = optionalNumberField("The station spacing", (v) => v >= 1 && v <= 10_000, "between 1 and 10,000 m");
export const rakeField = optionalNumberField("The rake", (v) => v > 0 && v < 180, "between 0° and 180° (90° is pure dip slip)");

export const UNIT_KINDS = ["reservoir", "seal", "other"] as const;

export const stratigraphyUnitSchema = z.object({
  name: z.string().trim().min(1, { error: "Give each unit a name" }).max(120),
  topHorizon: z.string().trim().min(1, { error: "Name the horizon at each unit's top" }).max(200),
  kind: z.enum(UNIT_KINDS, { error: "A unit is a reservoir, a seal or other" }),
  clayFraction: z
    .number({ error: "The clay fraction must be a number from 0 to 1" })
    .finite()
    .min(0, { error: "The clay fraction must be at least 0" })
    .max(1, { error: "The clay fraction must be at most 1 (a fraction, not a percentage)" })
    .nullable(),
});

export const stratigraphySchema = z.object({
  units: z
    .array(stratigraphyUnitSchema)
    .max(50, { error: "At most 50 units" })
    .refine((units) => new Set(units.map((u) => u.name.toLowerCase())).size === units.length, { error: "Each unit name may be used once" })
    .refine((units) => new Set(units.map((u) => u.topHorizon.toLowerCase())).size === units.length, { error: "Each horizon can be the top of one unit only" }),
});
