import "server-only";
import { and, count, eq, gt, inArray, lt, lte, sql } from "drizzle-orm";
import { getDb, type Database } from "@/db/client";
import { jobs, jobWorkers, type Job } from "@/db/schema";
import { config } from "@/lib/config";

/**
 * The durable job queue: one row per job in PostgreSQL (or the embedded PGlite), claimed with
 * `FOR UPDATE SKIP LOCKED` and held by a lease that the worker renews while it works (its heartbeat).
 *
 * Why not pg-boss: its releases for Node 20 (10.x, the last before 11 and 12 moved to Node ≥ 22) hold a job only by a
 * fixed expiry set when the job is sent, with no way to renew it. An analysis may run up to its time limit (10 min by
 * default), so that expiry would have to be as long: a worker killed mid-analysis would leave its job untouched for
 * ten minutes; a shorter expiry hands a long analysis to a second worker while the first still computes it. Heartbeats
 * arrived in pg-boss 12 (`heartbeatSeconds`), which needs Node ≥ 22.12. (pg-boss 10.4 itself ran on PGlite here.)
 *
 * The rules, all enforced in SQL so that any number of processes may share one queue:
 * - a job is claimed by exactly one worker (`SKIP LOCKED`, then the row says who holds it and until when);
 * - the holder renews its lease every third of the lease; a holder that cannot renew gives the job up itself before
 *   the lease runs out (lib/jobs/processor.ts), so a job is never computed by two workers at once;
 * - a lease that ran out (its worker died) is taken back by any worker's sweep: queued again after a back-off that
 *   doubles with each attempt, or failed after `maxAttempts` claims;
 * - finishing is fenced: only the current holder can mark a job done or failed, in the same transaction as the job's
 *   result (`finishJob`), so a late result from a worker that lost its lease is never written.
 */

export type JobKind = "analysis" | "export";

export interface ClaimedJob {
  id: string;
  kind: JobKind;
  subjectId: string;
  payload: Record<string, unknown>;
  attempts: number;
  maxAttempts: number;
}

type Executor = Pick<Database, "select" | "insert" | "update" | "delete" | "execute">;

export const leaseSeconds = () => config().SLIPFIELD_JOB_LEASE_SECONDS;
const retryBaseSeconds = () => config().SLIPFIELD_JOB_RETRY_SECONDS;
const RETRY_CAP_SECONDS = 300;
export const defaultMaxAttempts = () => config().SLIPFIELD_JOB_ATTEMPTS;

const secondsFromNow = (seconds: number) => sql`now() + ${seconds}::float8 * interval '1 second'`;

function claimed(row: Job): ClaimedJob {
  return { id: row.id, kind: row.kind as JobKind, subjectId: row.subjectId, payload: row.payload, attempts: row.attempts, maxAttempts: row.maxAttempts };
}

/**
 * Adds a job (inside the caller's transaction when `db` is one, so that the job exists exactly when what it works on
 * does). A live job for the same subject is joined instead: its id is returned.
 */
export async function enqueueJob(
  db: Executor,
  job: { kind: JobKind; subjectId: string; payload?: Record<string, unknown>; maxAttempts?: number },
): Promise<string> {
  const [added] = await db
    .insert(jobs)
    .values({ kind: job.kind, subjectId: job.subjectId, payload: job.payload ?? {}, maxAttempts: job.maxAttempts ?? defaultMaxAttempts() })
    .onConflictDoNothing({ target: [jobs.kind, jobs.subjectId], where: sql`${jobs.state} in ('queued', 'running')` })
    .returning({ id: jobs.id });
  if (added) return added.id;
  const [live] = await db
    .select({ id: jobs.id })
    .from(jobs)
    .where(and(eq(jobs.kind, job.kind), eq(jobs.subjectId, job.subjectId), inArray(jobs.state, ["queued", "running"])));
  if (!live) return enqueueJob(db, job); // the live one finished in between: add a new one
  return live.id;
}

/** Claims the oldest due job of one of `kinds` for `owner`, or null when none is due. */
export async function claimNextJob(owner: string, kinds: JobKind[]): Promise<ClaimedJob | null> {
  if (kinds.length === 0) return null;
  const db = await getDb();
  const due = db
    .select({ id: jobs.id })
    .from(jobs)
    .where(and(eq(jobs.state, "queued"), inArray(jobs.kind, kinds), lte(jobs.runAfter, sql`now()`)))
    .orderBy(jobs.runAfter, jobs.createdAt)
    .limit(1)
    .for("update", { skipLocked: true });
  // `id = (scalar subquery)` runs the subquery once; with `id in (…)` PostgreSQL may re-run it for each row it scans
  // and claim several jobs at once
  const [row] = await db
    .update(jobs)
    .set(claimColumns(owner))
    .where(and(eq(jobs.id, sql`(${due})`), eq(jobs.state, "queued")))
    .returning();
  return row ? claimed(row) : null;
}

/** Claims the queued job of one subject (the demo seed and tests run an analysis at once this way). */
export async function claimJobOf(owner: string, kind: JobKind, subjectId: string): Promise<ClaimedJob | null> {
  const db = await getDb();
  const [row] = await db
    .update(jobs)
    .set(claimColumns(owner))
    .where(and(eq(jobs.kind, kind), eq(jobs.subjectId, subjectId), eq(jobs.state, "queued")))
    .returning();
  return row ? claimed(row) : null;
}

function claimColumns(owner: string) {
  return {
    state: "running" as const,
    attempts: sql`${jobs.attempts} + 1`,
    leaseOwner: owner,
    leaseUntil: secondsFromNow(leaseSeconds()),
    heartbeatAt: sql`now()`,
    startedAt: sql`now()`,
    lastError: null,
  };
}

/** The heartbeat: extends the lease; false when `owner` no longer holds the job (it must stop working on it). */
export async function renewLease(jobId: string, owner: string): Promise<boolean> {
  const db = await getDb();
  const renewed = await db
    .update(jobs)
    .set({ leaseUntil: secondsFromNow(leaseSeconds()), heartbeatAt: sql`now()` })
    .where(and(eq(jobs.id, jobId), eq(jobs.leaseOwner, owner), eq(jobs.state, "running")))
    .returning({ id: jobs.id });
  return renewed.length === 1;
}

/**
 * Marks the job done or failed if `owner` still holds it; call it inside the transaction that writes the job's result,
 * first, so that the result is written only together with the job's end (and the row stays locked until the commit).
 */
export async function finishJob(tx: Executor, jobId: string, owner: string, outcome: { state: "done" | "failed"; error?: string }): Promise<boolean> {
  const finished = await tx
    .update(jobs)
    .set({ state: outcome.state, lastError: outcome.error ?? null, leaseOwner: null, leaseUntil: null, finishedAt: sql`now()` })
    .where(and(eq(jobs.id, jobId), eq(jobs.leaseOwner, owner), eq(jobs.state, "running")))
    .returning({ id: jobs.id });
  return finished.length === 1;
}

/** A job the holder could not finish for a passing reason (e.g. the database was unreachable): queued again after the back-off, or failed when its attempts are used up. */
export async function retryJobLater(tx: Executor, jobId: string, owner: string, error: string): Promise<"queued" | "failed" | null> {
  const [row] = await tx
    .update(jobs)
    .set(retryColumns(error))
    .where(and(eq(jobs.id, jobId), eq(jobs.leaseOwner, owner), eq(jobs.state, "running")))
    .returning({ state: jobs.state });
  return (row?.state as "queued" | "failed" | undefined) ?? null;
}

function retryColumns(error: string) {
  return {
    state: sql`case when ${jobs.attempts} >= ${jobs.maxAttempts} then 'failed'::job_state else 'queued'::job_state end`,
    runAfter: sql`now() + least(${retryBaseSeconds()}::float8 * power(2, greatest(${jobs.attempts} - 1, 0)), ${RETRY_CAP_SECONDS}) * interval '1 second'`,
    leaseOwner: null,
    leaseUntil: null,
    lastError: error,
    finishedAt: sql`case when ${jobs.attempts} >= ${jobs.maxAttempts} then now() end`,
  };
}

/** Gives a job back without counting the attempt (a draining worker that could not finish it in time): queued for any worker at once. */
export async function releaseJob(tx: Executor, jobId: string, owner: string): Promise<boolean> {
  const released = await tx
    .update(jobs)
    .set({ state: "queued", attempts: sql`greatest(${jobs.attempts} - 1, 0)`, runAfter: sql`now()`, leaseOwner: null, leaseUntil: null })
    .where(and(eq(jobs.id, jobId), eq(jobs.leaseOwner, owner), eq(jobs.state, "running")))
    .returning({ id: jobs.id });
  return released.length === 1;
}

export interface InterruptedJob {
  id: string;
  kind: JobKind;
  subjectId: string;
  state: "queued" | "failed";
  attempts: number;
}

/**
 * Takes back jobs whose lease ran out (their worker died or lost the database): each is queued again after the
 * back-off, or failed once its attempts are used up. `onInterrupted` runs in the same transaction, so what the job
 * works on (an analysis's status) changes together with the job. Any worker may sweep; a row is taken back once.
 */
export async function sweepExpiredLeases(onInterrupted: (tx: Executor, jobs: InterruptedJob[]) => Promise<void>): Promise<InterruptedJob[]> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const expired = tx
      .select({ id: jobs.id })
      .from(jobs)
      .where(and(eq(jobs.state, "running"), lt(jobs.leaseUntil, sql`now()`)))
      .for("update", { skipLocked: true });
    const rows = await tx
      .update(jobs)
      .set(retryColumns("The worker running this job stopped before it finished (its lease ran out)."))
      .where(and(inArray(jobs.id, expired), eq(jobs.state, "running"), lt(jobs.leaseUntil, sql`now()`)))
      .returning({ id: jobs.id, kind: jobs.kind, subjectId: jobs.subjectId, state: jobs.state, attempts: jobs.attempts });
    const interrupted = rows as InterruptedJob[];
    if (interrupted.length > 0) await onInterrupted(tx, interrupted);
    return interrupted;
  });
}

/**
 * Embedded database only: at start-up no other process can hold a job (the data folder is locked to this process),
 * so jobs left running by a killed server are queued again at once instead of waiting for their leases to run out.
 * Jobs this process already holds (their worker ids contain `ownMark`, e.g. the demo seed's) are left alone.
 */
export async function takeBackJobsOfPreviousRun(
  ownMark: string,
  onInterrupted: (tx: Executor, jobs: InterruptedJob[]) => Promise<void>,
): Promise<InterruptedJob[]> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const rows = await tx
      .update(jobs)
      .set({ ...retryColumns("The server stopped before this job finished."), runAfter: sql`now()` })
      .where(and(eq(jobs.state, "running"), sql`strpos(${jobs.leaseOwner}, ${ownMark}) = 0`))
      .returning({ id: jobs.id, kind: jobs.kind, subjectId: jobs.subjectId, state: jobs.state, attempts: jobs.attempts });
    const interrupted = rows as InterruptedJob[];
    if (interrupted.length > 0) await onInterrupted(tx, interrupted);
    return interrupted;
  });
}

/** Waiting and running jobs per kind; "delayed" are queued ones waiting out a back-off. */
export async function queueDepth(): Promise<Record<JobKind, { queued: number; delayed: number; running: number }>> {
  const db = await getDb();
  const rows = await db
    .select({ kind: jobs.kind, state: jobs.state, due: sql<boolean>`${jobs.runAfter} <= now()`, jobs: count() })
    .from(jobs)
    .where(inArray(jobs.state, ["queued", "running"]))
    .groupBy(jobs.kind, jobs.state, sql`${jobs.runAfter} <= now()`);
  const depth: Record<JobKind, { queued: number; delayed: number; running: number }> = {
    analysis: { queued: 0, delayed: 0, running: 0 },
    export: { queued: 0, delayed: 0, running: 0 },
  };
  for (const row of rows) {
    const entry = depth[row.kind as JobKind];
    if (!entry) continue;
    if (row.state === "running") entry.running += Number(row.jobs);
    else if (row.due) entry.queued += Number(row.jobs);
    else entry.delayed += Number(row.jobs);
  }
  return depth;
}

// ---- the workers' own heartbeats (for /api/health) ----------------------------------------------------------------

export interface WorkerBeat {
  id: string;
  role: "web" | "worker";
  kinds: JobKind[];
  slots: number;
  running: number;
  state: "running" | "draining";
}

export async function recordWorkerHeartbeat(beat: WorkerBeat) {
  const db = await getDb();
  await db
    .insert(jobWorkers)
    .values({ ...beat })
    .onConflictDoUpdate({ target: jobWorkers.id, set: { running: beat.running, state: beat.state, slots: beat.slots, heartbeatAt: sql`now()` } });
}

export async function forgetWorker(id: string) {
  const db = await getDb();
  await db.delete(jobWorkers).where(eq(jobWorkers.id, id));
}

/** Forgets workers not heard from for an hour (they died without draining). */
export async function forgetSilentWorkers() {
  const db = await getDb();
  await db.delete(jobWorkers).where(lt(jobWorkers.heartbeatAt, sql`now() - interval '1 hour'`));
}

/** Workers heard from in the last hour, newest heartbeat first, with the seconds since it. */
export async function workerHeartbeats() {
  const db = await getDb();
  const rows = await db
    .select({
      id: jobWorkers.id,
      role: jobWorkers.role,
      kinds: jobWorkers.kinds,
      slots: jobWorkers.slots,
      running: jobWorkers.running,
      state: jobWorkers.state,
      secondsAgo: sql<number>`extract(epoch from now() - ${jobWorkers.heartbeatAt})::float8`,
    })
    .from(jobWorkers)
    .where(gt(jobWorkers.heartbeatAt, sql`now() - interval '1 hour'`))
    .orderBy(sql`${jobWorkers.heartbeatAt} desc`);
  return rows.map((row) => ({ ...row, secondsAgo: Math.round(Number(row.secondsAgo) * 10) / 10 }));
}
