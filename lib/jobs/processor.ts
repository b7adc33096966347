import "server-only";
import { randomBytes } from "node:crypto";
import os from "node:os";
import { getDatabaseHandle, getDb } from "@/db/client";
import { publish, startListening, subscribe } from "@/db/notifications";
import {
  claimNextJob,
  forgetSilentWorkers,
  forgetWorker,
  leaseSeconds,
  recordWorkerHeartbeat,
  releaseJob,
  renewLease,
  retryJobLater,
  sweepExpiredLeases,
  takeBackJobsOfPreviousRun,
  type ClaimedJob,
  type InterruptedJob,
  type JobKind,
} from "./queue";
import { config } from "@/lib/config";

/**
 * Works the job queue in this process: claims due jobs while it has free slots, holds each by renewing its lease (the
 * heartbeat), sweeps leases that ran out, and on shutdown drains (takes nothing new; running jobs finish or are given
 * back). A web process on the embedded database runs one of these (as `npm start` always did); `npm run worker` is a
 * process that runs only this.
 */

type Executor = Parameters<typeof sweepExpiredLeases>[0] extends (tx: infer T, jobs: InterruptedJob[]) => Promise<void> ? T : never;

export interface JobContext {
  job: ClaimedJob;
  /** the lease holder's id: every write about the job is fenced by it (lib/jobs/queue.ts `finishJob`) */
  owner: string;
  /** aborted when the lease is lost or the process gives the job back while draining: stop computing at once */
  signal: AbortSignal;
}

export interface JobHandler {
  /** Does the job and ends it with `finishJob` in the transaction that writes its result. A throw is a passing failure: the job is retried after the back-off. */
  run(context: JobContext): Promise<void>;
  /** Runs in the transaction that queued again or failed jobs of this kind whose worker stopped (or that were given back). */
  interrupted?(tx: Executor, jobs: InterruptedJob[]): Promise<void>;
}

export type JobHandlers = Partial<Record<JobKind, JobHandler>>;

export class LeaseLost extends Error {
  constructor() {
    super("Another worker holds this job now (this worker's lease ran out).");
  }
}

const ABORT_LOST = "lease-lost";
const ABORT_DRAIN = "drain";

/** This process's own tag, in every worker id it makes (a restarted process, even with the same pid, has another). */
const processTag = ((globalThis as unknown as { slipfieldProcessTag?: string }).slipfieldProcessTag ??= randomBytes(4).toString("hex"));

/** A new worker id: role, host, pid, this process's tag and a random part. */
export function newWorkerId(role: string) {
  return `${role}-${os.hostname()}-${process.pid}-${processTag}${randomBytes(2).toString("hex")}`;
}

/** A part of every worker id this process makes, and of no other process's. */
export function thisProcessMark() {
  return `-${process.pid}-${processTag}`;
}

/**
 * Holds `job` for `owner` while `work` runs: renews the lease every third of it, and aborts `work` when the lease is
 * lost, or when it could not be renewed for so long that it may run out (then another worker may claim the job, and
 * this one must have stopped by that time).
 */
export async function holdWhileRunning<T>(job: ClaimedJob, owner: string, work: (signal: AbortSignal) => Promise<T>, outer?: AbortSignal): Promise<T> {
  const leaseMs = leaseSeconds() * 1000;
  const abort = new AbortController();
  const giveUp = (reason: string) => {
    if (!abort.signal.aborted) abort.abort(reason);
  };
  const onOuter = () => giveUp(String(outer?.reason ?? ABORT_DRAIN));
  outer?.addEventListener("abort", onOuter, { once: true });
  let renewedAt = Date.now();
  let renewing = false;
  const heartbeat = setInterval(
    () => {
      // unrenewed for most of a lease (the database is unreachable or stalled): stop before another worker may claim it
      if (Date.now() - renewedAt > leaseMs * (5 / 6)) giveUp(ABORT_LOST);
      if (renewing) return;
      renewing = true;
      const sentAt = Date.now();
      renewLease(job.id, owner)
        .then((held) => {
          if (held) renewedAt = sentAt;
          else giveUp(ABORT_LOST);
        })
        .catch(() => {
          // the database is unreachable: the next beat tries again (and gives up once the lease may have run out)
        })
        .finally(() => (renewing = false));
    },
    Math.max(500, leaseMs / 3),
  );
  heartbeat.unref();
  try {
    return await work(abort.signal);
  } finally {
    clearInterval(heartbeat);
    outer?.removeEventListener("abort", onOuter);
  }
}

interface Running {
  job: ClaimedJob;
  drain: AbortController;
  settled: Promise<void>;
}

export interface ProcessorOptions {
  role: "web" | "worker";
  handlers: JobHandlers;
  /** jobs of each kind this process runs at once */
  slots: Partial<Record<JobKind, number>>;
  /** how often to look for due jobs besides being woken (ms) */
  pollMs?: number;
  log?: (line: string) => void;
}

export class JobProcessor {
  readonly id: string;
  private readonly running = new Map<string, Running>();
  private draining = false;
  private filling = false;
  private refill = false;
  private timers: NodeJS.Timeout[] = [];
  private unsubscribe: () => void = () => {};
  private readonly log: (line: string) => void;

  constructor(private readonly options: ProcessorOptions) {
    this.id = newWorkerId(options.role);
    this.log = options.log ?? (() => {});
  }

  get kinds(): JobKind[] {
    return (Object.keys(this.options.slots) as JobKind[]).filter((kind) => (this.options.slots[kind] ?? 0) > 0 && this.options.handlers[kind]);
  }

  get runningCount() {
    return this.running.size;
  }

  async start() {
    const handle = await getDatabaseHandle();
    if (handle.kind === "pglite") {
      const interrupted = await takeBackJobsOfPreviousRun(thisProcessMark(), (tx, jobs) => this.interrupted(tx, jobs));
      if (interrupted.length > 0) this.log(`queued again ${interrupted.length} job(s) the previous run left unfinished`);
    } else {
      await startListening();
      this.unsubscribe = subscribe("slipfield_jobs", () => this.wake());
    }
    await this.beat();
    const leaseMs = leaseSeconds() * 1000;
    const every = (ms: number, task: () => Promise<unknown> | void) => {
      const timer = setInterval(() => void Promise.resolve(task()).catch((error) => this.log(`background task failed: ${(error as Error).message}`)), ms);
      timer.unref();
      this.timers.push(timer);
    };
    every(this.options.pollMs ?? (handle.kind === "pglite" ? 5000 : 1000), () => this.wake());
    every(Math.max(1000, leaseMs / 2), () => this.sweep());
    every(Math.max(1000, leaseMs / 3), () => this.beat());
    await this.sweep();
    this.wake();
  }

  /** Looks for due jobs now (a job was added, or a slot came free). */
  wake() {
    if (this.draining) return;
    if (this.filling) {
      this.refill = true;
      return;
    }
    this.filling = true;
    void this.fill()
      .catch((error) => this.log(`could not claim a job: ${(error as Error).message}`))
      .finally(() => {
        this.filling = false;
        if (this.refill) {
          this.refill = false;
          this.wake();
        }
      });
  }

  private freeKinds(): JobKind[] {
    return this.kinds.filter((kind) => [...this.running.values()].filter((entry) => entry.job.kind === kind).length < (this.options.slots[kind] ?? 0));
  }

  private async fill() {
    for (;;) {
      if (this.draining) return;
      const kinds = this.freeKinds();
      if (kinds.length === 0) return;
      const job = await claimNextJob(this.id, kinds);
      if (!job) return;
      if (this.draining) {
        await releaseJob(await getDb(), job.id, this.id);
        return;
      }
      this.begin(job);
    }
  }

  private begin(job: ClaimedJob) {
    const handler = this.options.handlers[job.kind]!;
    const drain = new AbortController();
    const started = Date.now();
    this.log(`${job.kind} ${job.subjectId}: started (attempt ${job.attempts} of ${job.maxAttempts})`);
    const settled = holdWhileRunning(job, this.id, (signal) => handler.run({ job, owner: this.id, signal }), drain.signal)
      .then(() => this.log(`${job.kind} ${job.subjectId}: finished in ${Date.now() - started} ms`))
      .catch((error: unknown) => this.afterFailure(job, drain.signal, error))
      .finally(() => {
        this.running.delete(job.id);
        this.wake();
      });
    this.running.set(job.id, { job, drain, settled });
  }

  /** A run that threw: given back (draining), left to its new holder (lease lost), or retried after the back-off. */
  private async afterFailure(job: ClaimedJob, drain: AbortSignal, error: unknown) {
    const db = await getDb();
    const message = error instanceof Error ? error.message : String(error);
    try {
      if (drain.aborted) {
        await db.transaction(async (tx) => {
          if (await releaseJob(tx, job.id, this.id))
            await this.interrupted(tx, [{ id: job.id, kind: job.kind, subjectId: job.subjectId, state: "queued", attempts: job.attempts - 1 }]);
        });
        this.log(`${job.kind} ${job.subjectId}: given back to the queue (this process is stopping)`);
      } else if (error instanceof LeaseLost || (error as { name?: string }).name === "ComputeAborted" || (error as { name?: string }).name === "AbortError") {
        this.log(`${job.kind} ${job.subjectId}: stopped, ${message}`);
      } else {
        let state: "queued" | "failed" | null = null;
        await db.transaction(async (tx) => {
          state = await retryJobLater(tx, job.id, this.id, message);
          if (state) await this.interrupted(tx, [{ id: job.id, kind: job.kind, subjectId: job.subjectId, state, attempts: job.attempts }]);
        });
        this.log(`${job.kind} ${job.subjectId}: attempt ${job.attempts} failed (${message}); ${state === "queued" ? "retried after a back-off" : "given up"}`);
      }
    } catch (cleanupError) {
      // the database is unreachable: the lease runs out and a sweep takes the job back
      this.log(`${job.kind} ${job.subjectId}: could not record the failure (${(cleanupError as Error).message}); its lease will run out`);
    }
  }

  private async interrupted(tx: Executor, jobs: InterruptedJob[]) {
    for (const kind of new Set(jobs.map((job) => job.kind))) {
      await this.options.handlers[kind]?.interrupted?.(
        tx,
        jobs.filter((job) => job.kind === kind),
      );
    }
  }

  private async sweep() {
    await forgetSilentWorkers();
    const interrupted = await sweepExpiredLeases((tx, jobs) => this.interrupted(tx, jobs));
    for (const job of interrupted)
      this.log(`${job.kind} ${job.subjectId}: its worker stopped; ${job.state === "queued" ? "queued again" : "failed after " + job.attempts + " attempts"}`);
    if (interrupted.some((job) => job.state === "queued")) {
      // others may be waiting for it too once its back-off ends; the poll finds it then
      await publish("slipfield_jobs").catch(() => undefined);
    }
  }

  private async beat() {
    await recordWorkerHeartbeat({
      id: this.id,
      role: this.options.role,
      kinds: this.kinds,
      slots: this.kinds.reduce((sum, kind) => sum + (this.options.slots[kind] ?? 0), 0),
      running: this.running.size,
      state: this.draining ? "draining" : "running",
    });
  }

  /**
   * Stops taking jobs; waits up to `deadlineMs` for the running ones to finish, then gives the rest back to the queue
   * (their compute is stopped; another worker takes them at once, and the attempt does not count).
   */
  async drain(deadlineMs: number) {
    if (this.draining) return;
    this.draining = true;
    this.unsubscribe();
    for (const timer of this.timers) clearInterval(timer);
    this.timers = [];
    await this.beat().catch(() => undefined);
    const all = () => Promise.allSettled([...this.running.values()].map((entry) => entry.settled));
    let timer: NodeJS.Timeout | undefined;
    const deadline = new Promise<"late">((resolve) => (timer = setTimeout(() => resolve("late"), deadlineMs)));
    const outcome = await Promise.race([all().then(() => "done" as const), deadline]);
    clearTimeout(timer);
    if (outcome === "late") {
      for (const entry of this.running.values()) entry.drain.abort(ABORT_DRAIN);
      await all();
    }
    await forgetWorker(this.id).catch(() => undefined);
  }
}

// ---- this process's processor ------------------------------------------------------------------------------------

const local = globalThis as unknown as { slipfieldJobProcessor?: Promise<JobProcessor | null> };

/** Jobs of each kind this process runs at once: SLIPFIELD_ANALYSIS_WORKERS (default 1; 0 leaves them to `npm run worker`). */
export function configuredSlots(): Record<JobKind, number> {
  const slots = config().SLIPFIELD_ANALYSIS_WORKERS;
  return { analysis: slots, export: slots };
}

/**
 * Starts this process's processor once (a web process: at start-up, or when it first adds a job). Null when this
 * process runs no jobs.
 */
export function ensureLocalProcessor(make: () => JobProcessor | null): Promise<JobProcessor | null> {
  if (!local.slipfieldJobProcessor) {
    local.slipfieldJobProcessor = (async () => {
      const processor = make();
      if (!processor || processor.kinds.length === 0) return null;
      await processor.start();
      return processor;
    })();
    local.slipfieldJobProcessor.catch(() => (local.slipfieldJobProcessor = undefined));
  }
  return local.slipfieldJobProcessor;
}

export function localProcessor(): Promise<JobProcessor | null> | undefined {
  return local.slipfieldJobProcessor;
}

/** Tests: forget this process's processor (after draining it). */
export function forgetLocalProcessor() {
  local.slipfieldJobProcessor = undefined;
}
