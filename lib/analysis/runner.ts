import "server-only";
import { and, DrizzleQueryError, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, analysisOutputs, base64Bytes, faults, jobs, pickSets } from "@/db/schema";
import { faultKinematics } from "@/lib/fault-types";
import { ENGINE_VERSION } from "@/lib/engine/pipeline";
import { claimJobOf, enqueueJob, finishJob } from "@/lib/jobs/queue";
import { holdWhileRunning, LeaseLost, newWorkerId, type JobContext, type JobHandler } from "@/lib/jobs/processor";
import type { AnalysisJob } from "./compute";
import type { AnalysisSettings } from "@/lib/engine/types";
import { parseAnalysisSettings } from "@/lib/contracts/analysis-settings";
import { withoutContourRings } from "@/lib/display/payload";
import { analysisTimeLimitMs, ComputeAborted, computeAnalysisOffThread } from "./worker-pool";

/**
 * The analysis state machine: queued → running → done | failed, driven by the job queue (lib/jobs). Every change an
 * analysis goes through is written by the worker holding its job's lease, and its result lands in one transaction
 * together with the end of the job, so no one ever sees a half-written analysis or a result from a worker that lost
 * its job.
 */

type Transaction = Parameters<Parameters<Awaited<ReturnType<typeof getDb>>["transaction"]>[0]>[0];

/** Adds the job of a new analysis, inside the transaction that creates the analysis row. */
export async function queueAnalysisJob(tx: Transaction, analysisId: string) {
  await enqueueJob(tx, { kind: "analysis", subjectId: analysisId });
}

/** After the transaction that queued an analysis committed: a worker (this process's, or another's) starts it. */
export function scheduleAnalysis(_analysisId: string) {
  void import("@/lib/jobs/local").then(({ jobsAdded }) => jobsAdded()).catch((error) => console.error("[slipfield] could not wake the job workers:", error));
}

/** Still held by `owner`: the condition every write of a running analysis carries. */
const heldBy = (jobId: string, owner: string) =>
  sql`exists (select 1 from ${jobs} where ${jobs.id} = ${jobId} and ${jobs.leaseOwner} = ${owner} and ${jobs.state} = 'running')`;

/** Runs one claimed analysis job to its end: done with results, or failed with a message the user can read. */
async function runAnalysisJob({ job, owner, signal }: JobContext) {
  const db = await getDb();
  const analysisId = job.subjectId;
  const [analysis] = await db
    .update(analyses)
    .set({ status: "running", stage: "starting", progress: 0, startedAt: new Date(), errorMessage: null })
    .where(and(eq(analyses.id, analysisId), inArray(analyses.status, ["queued", "running"]), heldBy(job.id, owner)))
    .returning();
  const [pickSet] = analysis
    ? await db
        .select({ picks: base64Bytes(pickSets.picks), units: pickSets.units, sense: faults.sense, rakeDeg: faults.rakeDeg, inversion: faults.inversion })
        .from(pickSets)
        .innerJoin(faults, eq(faults.id, pickSets.faultId))
        .where(eq(pickSets.id, analysis.pickSetId))
    : [];
  if (!analysis || !pickSet) {
    // the analysis was deleted with its fault, or already ended: nothing left to do
    await db.transaction(async (tx) => {
      if (!(await finishJob(tx, job.id, owner, { state: "done" }))) throw new LeaseLost();
    });
    return;
  }
  let lastWrite = 0;
  const stageWrites: Promise<unknown>[] = [];
  try {
    const input: AnalysisJob = {
      picks: pickSet.picks,
      units: pickSet.units,
      settings: parseAnalysisSettings(analysis.parameters),
      kinematics: faultKinematics(pickSet),
    };
    const { report, display, outputs } = await computeAnalysisOffThread(
      input,
      (stage, fraction) => {
        const now = Date.now();
        if (now - lastWrite < 150) return;
        lastWrite = now;
        stageWrites.push(
          db
            .update(analyses)
            .set({ stage, progress: fraction })
            .where(and(eq(analyses.id, analysisId), eq(analyses.status, "running"), heldBy(job.id, owner))),
        );
      },
      signal,
    );
    await Promise.allSettled(stageWrites);
    await db.transaction(async (tx) => {
      if (!(await finishJob(tx, job.id, owner, { state: "done" }))) throw new LeaseLost();
      await tx
        .update(analyses)
        // the report without contour rings: the display payload holds them (once)
        .set({
          status: "done",
          stage: "done",
          progress: 1,
          result: withoutContourRings(report),
          display,
          engineVersion: ENGINE_VERSION,
          finishedAt: new Date(),
        })
        .where(eq(analyses.id, analysisId));
      await tx
        .insert(analysisOutputs)
        .values({ analysisId, body: outputs })
        .onConflictDoUpdate({ target: analysisOutputs.analysisId, set: { body: outputs } });
    });
  } catch (error) {
    await Promise.allSettled(stageWrites);
    // given up (lease lost, or the process is draining) or a failure to reach the database: the job queue decides
    if (error instanceof ComputeAborted || error instanceof LeaseLost || signal.aborted || isDatabaseError(error)) throw error;
    const message = error instanceof Error ? error.message : "The analysis failed.";
    console.error(`[slipfield] analysis ${analysisId} failed:`, error);
    await db.transaction(async (tx) => {
      if (!(await finishJob(tx, job.id, owner, { state: "failed", error: message }))) throw new LeaseLost();
      await tx.update(analyses).set({ status: "failed", stage: "failed", errorMessage: message, finishedAt: new Date() }).where(eq(analyses.id, analysisId));
    });
  }
}

/**
 * Errors raised on the way to the database (drizzle wraps the driver's, which carry PostgreSQL's SQLSTATE or a socket
 * error code) are passing: the job is retried. The engine's errors are the analysis's own: it fails.
 */
export function isDatabaseError(error: unknown): boolean {
  if (!error || typeof error !== "object") return false;
  if (error instanceof DrizzleQueryError) return true;
  const code = (error as { code?: unknown }).code;
  if (typeof code === "string" && (/^[0-9A-Z]{5}$/.test(code) || /^E[A-Z]+$/.test(code))) return true;
  return isDatabaseError((error as { cause?: unknown }).cause);
}

export const analysisJobHandler: JobHandler = {
  run: runAnalysisJob,
  /** Jobs whose worker stopped: their analyses show as queued again, or failed once the attempts are used up. */
  async interrupted(tx, interrupted) {
    const requeued = interrupted.filter((job) => job.state === "queued").map((job) => job.subjectId);
    if (requeued.length > 0) {
      await tx
        .update(analyses)
        .set({ status: "queued", stage: "queued", progress: 0 })
        .where(and(inArray(analyses.id, requeued), inArray(analyses.status, ["queued", "running"])));
    }
    for (const job of interrupted.filter((entry) => entry.state === "failed")) {
      await tx
        .update(analyses)
        .set({
          status: "failed",
          stage: "failed",
          errorMessage: `The analysis was interrupted ${job.attempts} times (the process running it stopped each time) and was given up. Re-run it; if it stops again, try a coarser grid (larger cell size) or fewer picks.`,
          finishedAt: new Date(),
        })
        .where(and(eq(analyses.id, job.subjectId), inArray(analyses.status, ["queued", "running"])));
    }
  },
};

/**
 * Runs one queued analysis here and now, to its end (the demo seed; tests). If a worker claimed it first, waits for
 * that worker to end it.
 */
export async function runAnalysis(analysisId: string) {
  const owner = newWorkerId("direct");
  const job = await claimJobOf(owner, "analysis", analysisId);
  if (job) {
    await holdWhileRunning(job, owner, (signal) => runAnalysisJob({ job, owner, signal }));
    return;
  }
  const db = await getDb();
  const until = Date.now() + analysisTimeLimitMs() * 2;
  while (Date.now() < until) {
    const [live] = await db
      .select({ id: jobs.id })
      .from(jobs)
      .where(and(eq(jobs.kind, "analysis"), eq(jobs.subjectId, analysisId), inArray(jobs.state, ["queued", "running"])));
    if (!live) return;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** Queue a fresh analysis of a pick set (idempotent in result: same picks and parameters give the same report). */
export async function rerunAnalysis(faultId: string, pickSetId: string, settings: AnalysisSettings = {}) {
  const db = await getDb();
  const pickSet = await db.query.pickSets.findFirst({ where: and(eq(pickSets.id, pickSetId), eq(pickSets.faultId, faultId)), columns: { id: true } });
  if (!pickSet) return null;
  const analysisId = await db.transaction(async (tx) => {
    const [analysis] = await tx.insert(analyses).values({ pickSetId, parameters: settings }).returning({ id: analyses.id });
    await queueAnalysisJob(tx, analysis.id);
    return analysis.id;
  });
  scheduleAnalysis(analysisId);
  return analysisId;
}

/**
 * Analyses that are queued or running without a job: written before the job queue existed (an older version's
 * database). Each gets its job; at most one per analysis, whichever process gets there first.
 */
export async function queueAnalysesWithoutJobs(): Promise<number> {
  const db = await getDb();
  const orphans = await db
    .select({ id: analyses.id })
    .from(analyses)
    .where(
      and(
        inArray(analyses.status, ["queued", "running"]),
        sql`not exists (select 1 from ${jobs} where ${jobs.kind} = 'analysis' and ${jobs.subjectId} = ${analyses.id})`,
      ),
    );
  for (const { id } of orphans) {
    await db.transaction(async (tx) => {
      await tx.update(analyses).set({ status: "queued", stage: "queued", progress: 0 }).where(eq(analyses.id, id));
      await queueAnalysisJob(tx, id);
    });
  }
  return orphans.length;
}
