import "server-only";
import { getDatabaseHandle } from "@/db/client";
import { publish } from "@/db/notifications";
import { analysisJobHandler } from "@/lib/analysis/runner";
import { exportJobHandler } from "@/lib/exports/jobs";
import { configuredSlots, ensureLocalProcessor, JobProcessor, localProcessor, type JobHandlers } from "./processor";

/** What each kind of job does. */
export const jobHandlers: JobHandlers = { analysis: analysisJobHandler, export: exportJobHandler };

/**
 * The job processor of a web process: on the embedded database it runs every job, as one process always has; on a
 * PostgreSQL server it shares the queue with the other processes, or runs none with SLIPFIELD_ANALYSIS_WORKERS=0
 * (then `npm run worker` processes do).
 */
export function startLocalJobs(log: (line: string) => void = () => {}) {
  return ensureLocalProcessor(() => new JobProcessor({ role: "web", handlers: jobHandlers, slots: configuredSlots(), log }));
}

/** After a transaction that added jobs committed: wake this process's processor and tell the other processes. */
export async function jobsAdded() {
  const handle = await getDatabaseHandle();
  if (handle.kind === "postgres") await publish("slipfield_jobs").catch(() => undefined);
  const processor = await (localProcessor() ?? startLocalJobs());
  processor?.wake();
}
