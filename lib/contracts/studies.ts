// Studies, their faults and their people: what the forms send (checked by the route handlers) and what the API answers.
import { z } from "zod";
import { isoTime } from "./json";
import { emailSchema } from "./people";
import { faultSenseSchema, studyRoleSchema, type FaultSense } from "./roles";
import { faultTypeFieldErrors } from "@/lib/fault-types";
import type { CoordinateReference } from "@/lib/crs";

export const studyInputSchema = z.object({
  name: z.string().trim().min(2, "Use at least 2 characters.").max(120, "Use at most 120 characters."),
  description: z.string().trim().max(2000, "Use at most 2000 characters.").default(""),
});
const coordinateReferenceInputSchema = z.object({
  epsg: z
    .number({ error: "The EPSG code must be a whole number, e.g. 32631." })
    .int("The EPSG code must be a whole number, e.g. 32631.")
    .min(1024, "EPSG codes of coordinate systems start at 1024.")
    .max(999_999, "That is not an EPSG code."),
  verticalEpsg: z
    .number({ error: "The vertical EPSG code must be a whole number, e.g. 5714." })
    .int("The vertical EPSG code must be a whole number, e.g. 5714.")
    .min(1024, "That is not an EPSG code of a vertical system.")
    .max(999_999, "That is not an EPSG code of a vertical system.")
    .optional(),
  verticalDatum: z.string().trim().max(120, "Name the vertical datum in at most 120 characters.").optional(),
});
export const studyPatchSchema = studyInputSchema.partial().extend({
  /** the study's coordinate reference (EPSG codes), or null to clear it */
  coordinateReference: coordinateReferenceInputSchema.nullable().optional(),
});
export type StudyInput = z.infer<typeof studyInputSchema>;
export type StudyPatch = z.infer<typeof studyPatchSchema>;

const faultFields = z.object({
  name: z
    .string()
    .trim()
    .min(1, "Enter a name.")
    .max(80, "Use at most 80 characters.")
    .regex(/^[\w .\-/()]+$/, "Use letters, digits, spaces and . - / ( ) only."),
  description: z.string().trim().max(2000, "Use at most 2000 characters."),
  sense: faultSenseSchema,
  rakeDeg: z
    .number({ error: "The rake must be a number of degrees." })
    .finite()
    .min(-180, "The rake lies between −180° and 180°.")
    .max(180, "The rake lies between −180° and 180°.")
    .nullable()
    .optional(),
  inversion: z.boolean({ error: "Inversion is true or false." }),
});

/** The fault type's own rules (an oblique fault needs its rake, not near strike-slip), as field errors. */
function checkFaultType(value: { sense?: FaultSense; rakeDeg?: number | null }, context: z.RefinementCtx) {
  for (const { field, message } of faultTypeFieldErrors({ sense: value.sense ?? "normal", rakeDeg: value.rakeDeg }))
    context.addIssue({ code: "custom", path: [field], message });
}

export const faultInputSchema = faultFields
  .extend({
    description: faultFields.shape.description.default(""),
    sense: faultFields.shape.sense.default("normal"),
    inversion: faultFields.shape.inversion.default(false),
  })
  .superRefine(checkFaultType);
// no defaults: a patch changes only the fields it names
export const faultPatchSchema = faultFields.partial();
export type FaultInput = z.infer<typeof faultInputSchema>;

export const memberInputSchema = z.object({ email: emailSchema, role: studyRoleSchema });
export const rolePatchSchema = z.object({ role: studyRoleSchema });

// ---- answers -------------------------------------------------------------------------------------------------

const studyRecord = z.strictObject({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  /** the projected CRS and vertical reference, as checked (lib/crs.ts); null: not recorded */
  coordinateReference: z.custom<CoordinateReference>().nullable(),
  createdBy: z.string().nullable(),
  createdAt: isoTime,
});
const faultRecord = z.strictObject({
  id: z.string(),
  studyId: z.string(),
  name: z.string(),
  description: z.string(),
  sense: faultSenseSchema,
  rakeDeg: z.number().nullable(),
  inversion: z.boolean(),
  createdBy: z.string().nullable(),
  createdAt: isoTime,
});
export type FaultRecord = z.infer<typeof faultRecord>;

/** GET /api/studies */
export const studiesResponseSchema = z.strictObject({
  studies: z.array(
    z.strictObject({ id: z.string(), name: z.string(), description: z.string(), createdAt: isoTime, role: studyRoleSchema, faultCount: z.number().int() }),
  ),
});
export type StudiesResponse = z.infer<typeof studiesResponseSchema>;

/** POST /api/studies, PATCH /api/studies/:id */
export const studyResponseSchema = z.strictObject({ study: studyRecord });

/** One fault as the study lists it, with its newest analysis in brief. */
export const faultSummarySchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  sense: faultSenseSchema,
  createdAt: isoTime,
  latestVersion: z.number().int().nullable(),
  pickSetCount: z.number().int(),
  analysis: z
    .strictObject({ status: z.string(), dMaxM: z.number().nullable(), lengthM: z.number().nullable(), segmentCount: z.number().int().nullable() })
    .nullable(),
});

export const memberSchema = z.strictObject({ userId: z.string(), name: z.string(), email: z.string(), role: studyRoleSchema, since: isoTime });

/** A piece of an activity sentence: text, linked where it names something in the study. */
export const activityPartSchema = z.strictObject({ text: z.string(), href: z.string().optional() });
export const activityItemSchema = z.strictObject({ id: z.string(), createdAt: isoTime, actor: z.string(), parts: z.array(activityPartSchema) });

/** GET /api/studies/:id */
export const studyOverviewSchema = z.strictObject({
  study: studyRecord,
  role: studyRoleSchema,
  faults: z.array(faultSummarySchema),
  people: z.array(memberSchema),
  activity: z.array(activityItemSchema),
});
export type StudyOverview = z.infer<typeof studyOverviewSchema>;

/** GET /api/studies/:id/faults */
export const faultsResponseSchema = z.strictObject({ faults: z.array(faultSummarySchema) });
/** POST /api/studies/:id/faults, GET and PATCH /api/faults/:id */
export const faultResponseSchema = z.strictObject({ fault: faultRecord });

const invitationSchema = z.strictObject({ id: z.string(), email: z.string(), role: studyRoleSchema, expiresAt: isoTime });
/** GET /api/studies/:id/members (pending invitations for owners only) */
export const membersResponseSchema = z.strictObject({ members: z.array(memberSchema), invitations: z.array(invitationSchema) });
/** POST /api/studies/:id/members */
export const invitationResponseSchema = z.strictObject({ invitation: invitationSchema });
/** PATCH /api/studies/:id/members/:userId */
export const okResponseSchema = z.strictObject({ ok: z.literal(true) });
