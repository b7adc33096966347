// Viewpoints (a saved camera and scene settings with a title) and their links: what the viewpoints bar sends and what the
// API answers, and the one fault a link opens for anyone holding it (GET /api/v/:token).
import { z } from "zod";
import { cameraSchema } from "./camera";
import { isoTime } from "./json";
import { analysisReportSchema } from "./report";
import { faultSenseSchema } from "./roles";
import { sceneSettingsSchema } from "./scene-settings";

const title = z.string().trim().min(1, "Give the viewpoint a title.").max(120, "Use at most 120 characters.");
const note = z.string().trim().max(2000, "Use at most 2000 characters.");

/** POST /api/faults/:id/viewpoints */
export const viewpointInputSchema = z.object({ title, note: note.default(""), camera: cameraSchema, settings: sceneSettingsSchema });
export type ViewpointInput = z.infer<typeof viewpointInputSchema>;
/** PATCH /api/viewpoints/:id */
export const viewpointPatchSchema = z
  .object({ title, note })
  .partial()
  .refine((patch) => patch.title !== undefined || patch.note !== undefined, "Change the title or the note.");
export type ViewpointPatch = z.infer<typeof viewpointPatchSchema>;

/** POST /api/viewpoints/:id/links */
export const linkInputSchema = z.object({
  /** null: the link lasts until revoked */
  expiresInDays: z.number().int().min(1, "At least one day.").max(365, "At most 365 days.").nullable().default(7),
  includePins: z.boolean().default(false),
});
export type LinkInput = z.infer<typeof linkInputSchema>;

export const LINK_STATES = ["active", "expired", "revoked"] as const;
export type LinkState = (typeof LINK_STATES)[number];

// ---- answers -------------------------------------------------------------------------------------------------

export const viewpointSchema = z.strictObject({
  id: z.string(),
  faultId: z.string(),
  title: z.string(),
  note: z.string(),
  camera: cameraSchema,
  settings: sceneSettingsSchema,
  createdAt: isoTime,
  updatedAt: isoTime,
  createdById: z.string().nullable(),
  createdByName: z.string().nullable(),
  /** whether the caller may rename or delete it */
  canChange: z.boolean(),
});
export type Viewpoint = z.infer<typeof viewpointSchema>;

/** GET /api/faults/:id/viewpoints */
export const viewpointsResponseSchema = z.strictObject({ viewpoints: z.array(viewpointSchema) });
/** POST /api/faults/:id/viewpoints (the stored row plus who made it) */
export const viewpointCreatedSchema = z.strictObject({ viewpoint: viewpointSchema.extend({ createdBy: z.string().nullable() }) });
/** PATCH /api/viewpoints/:id: the stored row */
export const viewpointUpdatedSchema = z.strictObject({
  viewpoint: viewpointSchema.omit({ createdById: true, createdByName: true, canChange: true }).extend({ createdBy: z.string().nullable() }),
});

/** A link as its viewpoint's sharers see it: never its token (only a hash is stored). */
export const viewpointLinkSchema = z.strictObject({
  canRevoke: z.boolean(),
  id: z.string(),
  viewpointId: z.string(),
  includePins: z.boolean(),
  expiresAt: isoTime.nullable(),
  revokedAt: isoTime.nullable(),
  createdAt: isoTime,
  createdById: z.string().nullable(),
  state: z.enum(LINK_STATES),
});
export type ViewpointLink = z.infer<typeof viewpointLinkSchema>;

/** GET /api/viewpoints/:id/links */
export const viewpointLinksResponseSchema = z.strictObject({ links: z.array(viewpointLinkSchema) });
/** POST /api/viewpoints/:id/links: the token, once */
export const viewpointLinkCreatedSchema = z.strictObject({ link: viewpointLinkSchema.extend({ token: z.string(), path: z.string() }) });
/** DELETE /api/links/:id */
export const viewpointLinkRevokedSchema = z.strictObject({ link: viewpointLinkSchema });

/** GET /api/v/:token/state: whether a link works, and nothing else */
export const linkStateResponseSchema = z.strictObject({ state: z.enum(["not-found", ...LINK_STATES]) });

/**
 * GET /api/v/:token: everything the link page shows, and only that: one fault's name, the saved view, the surface's
 * report (without the rejected input rows and without contour rings), pins with replies if the link includes them.
 */
export const publicViewpointSchema = z.strictObject({
  fault: z.strictObject({ name: z.string(), sense: faultSenseSchema }),
  viewpoint: z.strictObject({ title: z.string(), note: z.string(), camera: cameraSchema, settings: sceneSettingsSchema }),
  link: z.strictObject({ includePins: z.boolean(), expiresAt: isoTime.nullable() }),
  analysis: z.strictObject({ pickSetVersion: z.number().int(), report: analysisReportSchema }).nullable(),
  /** with their replies; no authors: the link shows the notes, not the study's people */
  pins: z
    .array(
      z.strictObject({
        id: z.string(),
        x: z.number(),
        y: z.number(),
        z: z.number(),
        body: z.string(),
        state: z.enum(["open", "resolved"]),
        pickSetVersion: z.number().int().nullable(),
        createdAt: isoTime,
        replies: z.array(z.strictObject({ body: z.string(), createdAt: isoTime })),
      }),
    )
    .nullable(),
});
export type PublicViewpoint = z.infer<typeof publicViewpointSchema>;
