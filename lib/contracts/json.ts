// Shared pieces of the contracts: how numbers, positions and times look on the wire (JSON) and in storage (jsonb).
import { z } from "zod";

/** A finite number (JSON has no NaN or Infinity). */
export const finite = z.number();

/**
 * A measure that may be missing: NaN in memory, null in JSON (JSON.stringify writes NaN and ±Infinity as null). Read back
 * as NaN, so code can test it with Number.isFinite whichever side of the wire it is on.
 */
export const maybeNumber = z
  .union([z.number(), z.nan(), z.null(), z.literal(Infinity), z.literal(-Infinity)])
  .transform((value) => (value === null ? NaN : value));

/** A point or direction in world metres (x East, y North, z Up), or any fixed triple. */
export const vec3 = z.tuple([finite, finite, finite]);
/** A point in a segment's fault-plane coordinates (s along strike, t down dip, m). */
export const planePoint = z.tuple([finite, finite]);

/** A time as it crosses the wire: ISO 8601 (JSON turns a Date into this). */
export const isoTime = z.iso.datetime({ offset: true });

/** The error body every route answers a failure with. */
export const apiErrorSchema = z.object({ error: z.string().min(1), details: z.record(z.string(), z.unknown()).optional() });
export type ApiErrorBody = z.infer<typeof apiErrorSchema>;
export type Vec3 = z.infer<typeof vec3>;
