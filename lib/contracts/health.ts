// What the service routes answer: health (public, for load balancers and tests) and the e-mail digest run.
import { z } from "zod";

const queueCounts = z.strictObject({ queued: z.number().int(), delayed: z.number().int(), running: z.number().int() });

/** GET /api/health (200 ready, 503 not ready or draining); no ids of studies, users or jobs */
export const healthStatusSchema = z.strictObject({
  ok: z.boolean(),
  database: z.string(),
  error: z.string().optional(),
  /** this process was asked to stop and is finishing its jobs */
  draining: z.boolean().optional(),
  queue: z.record(z.string(), queueCounts).optional(),
  workers: z
    .strictObject({
      live: z.number().int(),
      list: z.array(
        z.strictObject({
          id: z.string(),
          role: z.string(),
          kinds: z.array(z.string()),
          slots: z.number().int(),
          running: z.number().int(),
          state: z.string(),
          secondsAgo: z.number(),
        }),
      ),
    })
    .optional(),
});
export type HealthStatus = z.infer<typeof healthStatusSchema>;

/** POST /api/digest */
export const digestSummarySchema = z.strictObject({
  /** e-mails sent, one per person */
  emails: z.number().int(),
  /** notifications those e-mails carried */
  notifications: z.number().int(),
  /** notifications dropped because their person has turned e-mail off since */
  dropped: z.number().int(),
});
export type DigestSummary = z.infer<typeof digestSummarySchema>;
