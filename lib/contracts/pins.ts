// Pinned notes and their replies: what the pins panel sends and what the API answers (GET /api/faults/:id/pins and the
// pin and reply routes).
import { z } from "zod";
import { PIN_TEXT_MAX } from "@/lib/pins/text";
import { isoTime } from "./json";
import { personRefSchema } from "./people";

const bodySchema = z.string().trim().min(1, "Write something.").max(PIN_TEXT_MAX, `Use at most ${PIN_TEXT_MAX} characters.`);
const coordinate = (what: string) =>
  z
    .number({ error: `${what} must be a number (m).` })
    .finite(`${what} must be a finite number (m).`)
    .refine((value) => Math.abs(value) < 1e9, `${what} is out of range.`);

/** POST /api/faults/:id/pins: the place (world x, y, z and plane s, t on a segment) and the text */
export const pinInputSchema = z.object({
  x: coordinate("x"),
  y: coordinate("y"),
  z: coordinate("z"),
  s: coordinate("s"),
  t: coordinate("t"),
  segmentId: z.string().trim().min(1, "Name the segment the pin is on.").max(120),
  body: bodySchema,
});
export type PinInput = z.infer<typeof pinInputSchema>;

/** PATCH /api/pins/:id */
export const pinPatchSchema = z.discriminatedUnion("action", [
  z.object({ action: z.literal("edit"), body: bodySchema }),
  z.object({ action: z.literal("resolve") }),
  z.object({ action: z.literal("reopen") }),
]);
export type PinPatch = z.infer<typeof pinPatchSchema>;

/** POST /api/pins/:id/replies, PATCH /api/pins/:id/replies/:replyId */
export const replyInputSchema = z.object({ body: bodySchema });

export const pinFilterSchema = z.enum(["all", "mine", "open"]).default("all");
export type PinFilter = z.infer<typeof pinFilterSchema>;

// ---- answers -------------------------------------------------------------------------------------------------

export const replyViewSchema = z.strictObject({
  id: z.string(),
  author: personRefSchema.nullable(),
  body: z.string(),
  createdAt: isoTime,
  edited: z.boolean(),
  unread: z.boolean(),
  mine: z.boolean(),
  editableUntil: isoTime,
  can: z.strictObject({ edit: z.boolean(), delete: z.boolean() }),
});
export type ReplyView = z.infer<typeof replyViewSchema>;

export const pinViewSchema = z.strictObject({
  id: z.string(),
  x: z.number(),
  y: z.number(),
  z: z.number(),
  s: z.number(),
  t: z.number(),
  segmentName: z.string().nullable(),
  pickSetVersion: z.number().int().nullable(),
  body: z.string(),
  state: z.enum(["open", "resolved"]),
  author: personRefSchema.nullable(),
  createdAt: isoTime,
  edited: z.boolean(),
  resolvedBy: personRefSchema.nullable(),
  resolvedAt: isoTime.nullable(),
  unread: z.boolean(),
  mine: z.boolean(),
  editableUntil: isoTime,
  can: z.strictObject({ edit: z.boolean(), resolve: z.boolean(), delete: z.boolean(), reply: z.boolean() }),
  replies: z.array(replyViewSchema),
});
export type PinView = z.infer<typeof pinViewSchema>;

/** GET /api/faults/:id/pins */
export const pinListSchema = z.strictObject({
  pins: z.array(pinViewSchema),
  /** when this person last looked at the fault's pins (before this read); null for never */
  lastVisitAt: isoTime.nullable(),
  editWindowMinutes: z.number().int(),
  mentionable: z.array(z.strictObject({ name: z.string(), handle: z.string() })),
});
export type PinList = z.infer<typeof pinListSchema>;

/** POST /api/faults/:id/pins */
export const pinCreatedSchema = z.strictObject({
  pin: z.strictObject({ id: z.string(), pickSetVersion: z.number().int().nullable() }),
  mentioned: z.number().int(),
});
/** PATCH /api/pins/:id */
export const pinUpdatedSchema = z.strictObject({ pin: z.strictObject({ id: z.string(), state: z.enum(["open", "resolved"]), body: z.string() }) });
/** POST /api/pins/:id/replies */
export const replyCreatedSchema = z.strictObject({ reply: z.strictObject({ id: z.string() }) });
/** PATCH /api/pins/:id/replies/:replyId */
export const replyUpdatedSchema = z.strictObject({ reply: z.strictObject({ id: z.string(), body: z.string() }) });
/** POST /api/faults/:id/pins/visit */
export const pinsVisitedSchema = z.strictObject({ visitedAt: isoTime });
