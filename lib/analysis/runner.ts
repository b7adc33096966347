import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, base64Bytes, pickSets } from "@/db/schema";
import { existsSync } from "node:fs";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { ENGINE_VERSION, type PipelineResult } from "@/lib/engine/pipeline";
import { lruCache } from "@/lib/lru";
import type { AnalysisReport } from "@/lib/engine/types";
import { computeAnalysis, computeFullResolution, type AnalysisJob, type AnalysisOutput } from "./compute";
import { parseUploadedFile, readMultipart, UploadProblem, type MultipartJob, type MultipartOutput, type UploadParseJob, type UploadParseOutput } from "./upload-parse";

const queue: string[] = [];
let active = 0;
const MAX_PARALLEL = Math.max(1, Number(process.env.SLIPFIELD_ANALYSIS_WORKERS ?? 1));
const timeLimitMs = () => Number(process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS ?? 10 * 60_000);
// built by scripts/build-worker.mjs; kept out of the Next bundle on purpose (it runs in its own thread)
const WORKER_FILE = path.join(/*turbopackIgnore: true*/ process.cwd(), "dist", "analysis-worker.mjs");

/** Analyses run in order, at most MAX_PARALLEL at once, off the request that queued them. */
export function scheduleAnalysis(analysisId: string) {
  queue.push(analysisId);
  setImmediate(drainQueue);
}

function drainQueue() {
  while (active < MAX_PARALLEL && queue.length > 0) {
    const next = queue.shift()!;
    active++;
    runAnalysis(next)
      .catch((error) => console.error(`[slipfield] analysis ${next} could not be recorded:`, error))
      .finally(() => {
        active--;
        drainQueue();
      });
  }
}

class AnalysisTimeout extends Error {}

/**
 * Compute in a worker thread when the bundled worker exists (production), so the web server's event loop stays free
 * and a runaway analysis can be stopped; in-process otherwise (tests, development without a worker build).
 */
function compute(job: AnalysisJob, onStage: (stage: string, fraction: number) => void): Promise<AnalysisOutput> {
  return runJob({ ...job, output: "display" }, onStage, () => computeAnalysis(job, onStage));
}

/** An uploaded file read and checked (and encoded for storage) off the web server's thread, like an analysis. */
export function parseUploadOffThread(job: UploadParseJob): Promise<UploadParseOutput> {
  return runJob(job, () => {}, () => parseUploadedFile(job), PARSE_TIME_LIMIT_MS);
}

/** A multipart upload body taken apart off the web server's thread; the body's buffer moves to the worker (not copied). */
export function readMultipartOffThread(job: MultipartJob): Promise<MultipartOutput> {
  return runJob(job, () => {}, () => readMultipart(job), PARSE_TIME_LIMIT_MS, [job.body.buffer as ArrayBuffer]);
}

/** Full-resolution engine grids of a stored pick set (exports), computed off the web server's thread like an analysis. */
export function computeGridsOffThread(job: AnalysisJob): Promise<PipelineResult> {
  return runJob({ ...job, output: "grids" }, () => {}, () => computeFullResolution(job));
}

/**
 * Warm worker threads, kept between jobs: a fresh thread would load the engine bundle and run it cold (unoptimised)
 * on every analysis. A thread that timed out, crashed or failed to start is discarded, never reused; idle threads are
 * unref'd (they never keep the process alive) and closed after a few idle minutes to give their memory back.
 */
const idleWorkers: Worker[] = [];
const IDLE_CLOSE_MS = 5 * 60_000;
const idleTimers = new WeakMap<Worker, NodeJS.Timeout>();
let workerStarts = 0;
/**
 * A larger young generation than V8's default: the engine makes many short-lived arrays (contour rings, fit vectors),
 * and fewer scavenges measured 10–20 % faster warm analyses (bench/pipeline.ts runs with the same setting).
 */
export const YOUNG_GENERATION_MB = 96;

function takeWorker(): Worker {
  const warm = idleWorkers.pop();
  if (warm) {
    clearTimeout(idleTimers.get(warm));
    warm.ref();
    return warm;
  }
  workerStarts++;
  const worker = new Worker(/*turbopackIgnore: true*/ WORKER_FILE, { resourceLimits: { maxOldGenerationSizeMb: 3072, maxYoungGenerationSizeMb: YOUNG_GENERATION_MB } });
  // a thread that dies while waiting idle is simply forgotten (a running job's own handlers report its failure)
  worker.on("error", () => discardIdle(worker));
  worker.on("exit", () => discardIdle(worker));
  return worker;
}

/** How many worker threads were started so far and how many wait warm (for tests). */
export function analysisWorkerCounts() {
  return { started: workerStarts, idle: idleWorkers.length };
}

function returnWorker(worker: Worker) {
  if (idleWorkers.length >= MAX_PARALLEL) {
    void worker.terminate();
    return;
  }
  worker.unref();
  idleWorkers.push(worker);
  const timer = setTimeout(() => {
    discardIdle(worker);
    void worker.terminate();
  }, IDLE_CLOSE_MS);
  timer.unref();
  idleTimers.set(worker, timer);
}

function discardIdle(worker: Worker) {
  const index = idleWorkers.indexOf(worker);
  if (index >= 0) idleWorkers.splice(index, 1);
}

/** reading the largest allowed file takes seconds; the analysis time limit (SLIPFIELD_ANALYSIS_TIMEOUT_MS) is not meant for it */
const PARSE_TIME_LIMIT_MS = 5 * 60_000;

function runJob<T>(
  job: AnalysisJob | UploadParseJob | MultipartJob,
  onStage: (stage: string, fraction: number) => void,
  inline: () => T | Promise<T>,
  limitMs = timeLimitMs(),
  transfer: ArrayBuffer[] = [],
): Promise<T> {
  if (process.env.SLIPFIELD_INLINE_ANALYSIS === "1" || !existsSync(WORKER_FILE)) {
    return new Promise((resolve, reject) => setImmediate(() => {
      try {
        resolve(inline());
      } catch (error) {
        reject(error);
      }
    }));
  }
  return new Promise((resolve, reject) => {
    const worker = takeWorker();
    let settled = false;
    const onMessage = (message: { kind: string; stage?: string; fraction?: number; output?: T; message?: string; problem?: Pick<UploadProblem, "status" | "details"> }) => {
      if (message.kind === "stage") onStage(message.stage!, message.fraction!);
      else if (message.kind === "done") finish(true, () => resolve(message.output!));
      else if (message.kind === "failed") finish(true, () => reject(message.problem ? new UploadProblem(message.problem.status, message.message!, message.problem.details) : new Error(message.message)));
    };
    const onError = (error: Error) => finish(false, () => reject(error));
    const onExit = (code: number) => finish(false, () => reject(new Error(`The analysis worker stopped unexpectedly (exit code ${code}); it may have run out of memory.`)));
    const finish = (reuse: boolean, outcome: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      worker.off("message", onMessage).off("error", onError).off("exit", onExit);
      if (reuse) returnWorker(worker);
      else void worker.terminate();
      outcome();
    };
    const timer = setTimeout(() => {
      finish(false, () => reject(new AnalysisTimeout(`The analysis ran past the ${limitMs < 1000 ? `${limitMs} ms` : `${Math.round(limitMs / 1000)} s`} time limit and was stopped. Try a coarser grid (larger cell size) or fewer picks.`)));
    }, limitMs);
    worker.on("message", onMessage).on("error", onError).on("exit", onExit);
    worker.postMessage(job, transfer);
  });
}

/** Runs one analysis to the end: done with results, or failed with a message the user can read. */
export async function runAnalysis(analysisId: string) {
  const db = await getDb();
  // Claim atomically: only a queued analysis starts, so a second caller never computes it twice.
  const [analysis] = await db
    .update(analyses)
    .set({ status: "running", stage: "starting", progress: 0, startedAt: new Date(), errorMessage: null })
    .where(and(eq(analyses.id, analysisId), eq(analyses.status, "queued")))
    .returning();
  if (!analysis) return;
  const [pickSet] = await db
    .select({ picks: base64Bytes(pickSets.picks), units: pickSets.units })
    .from(pickSets)
    .where(eq(pickSets.id, analysis.pickSetId));
  if (!pickSet) return;
  let lastWrite = 0;
  const stageWrites: Promise<unknown>[] = [];
  try {
    const parameters = analysis.parameters as { intervalM?: number; cellM?: number };
    const job: AnalysisJob = { picks: pickSet.picks, units: pickSet.units, intervalM: parameters.intervalM, cellM: parameters.cellM };
    const { report, display } = await compute(job, (stage, fraction) => {
      const now = Date.now();
      if (now - lastWrite < 150) return;
      lastWrite = now;
      stageWrites.push(db.update(analyses).set({ stage, progress: fraction }).where(eq(analyses.id, analysisId)));
    });
    await Promise.allSettled(stageWrites);
    await db
      .update(analyses)
      .set({ status: "done", stage: "done", progress: 1, result: report, display, engineVersion: ENGINE_VERSION, finishedAt: new Date() })
      .where(eq(analyses.id, analysisId));
  } catch (error) {
    await Promise.allSettled(stageWrites);
    const message = error instanceof Error ? error.message : "The analysis failed.";
    console.error(`[slipfield] analysis ${analysisId} failed:`, error);
    await db.update(analyses).set({ status: "failed", stage: "failed", errorMessage: message, finishedAt: new Date() }).where(eq(analyses.id, analysisId));
  }
}

/** After a restart, analyses left queued or running are queued again (nothing half-written is visible: results land in one update). */
export async function resumeUnfinishedAnalyses() {
  const db = await getDb();
  const unfinished = await db
    .update(analyses)
    .set({ status: "queued", stage: "queued", progress: 0 })
    .where(inArray(analyses.status, ["queued", "running"]))
    .returning({ id: analyses.id });
  for (const { id } of unfinished) scheduleAnalysis(id);
  return unfinished.length;
}

/**
 * A finished analysis never changes (a re-run makes a new row), so its report and display payload are kept in a small
 * in-memory cache: the fault page polls them, and decoding a large jsonb/bytea value in PGlite costs the event loop
 * more than the rest of the request (measured with `npm run loadtest` and a CPU profile). Keys carry the fault id, so
 * a cached value is only ever served for the fault it belongs to.
 */
const finishedReports = lruCache<unknown>(64);
/** whole response bodies of finished analyses, serialised once (re-serialising a large report costs more than the rest of a poll) */
const finishedReportBodies = lruCache<string>(64);
const finishedDisplays = lruCache<Uint8Array>(64);

export async function latestAnalysisForFault(faultId: string, pickSetId?: string) {
  const db = await getDb();
  const rows = await db
    .select({
      id: analyses.id,
      status: analyses.status,
      stage: analyses.stage,
      progress: analyses.progress,
      errorMessage: analyses.errorMessage,
      engineVersion: analyses.engineVersion,
      finishedAt: analyses.finishedAt,
      pickSetId: pickSets.id,
      version: pickSets.version,
      fileName: pickSets.fileName,
      checksum: pickSets.checksum,
      uploadedAt: pickSets.uploadedAt,
    })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(pickSetId ? and(eq(pickSets.faultId, faultId), eq(pickSets.id, pickSetId)) : eq(pickSets.faultId, faultId))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt))
    .limit(1);
  const row = rows[0];
  if (!row) return null;
  const key = `${faultId}:${row.id}`;
  let result = row.status === "done" ? finishedReports.get(key) : undefined;
  if (result === undefined) {
    const [stored] = await db.select({ result: analyses.result, status: analyses.status }).from(analyses).where(eq(analyses.id, row.id));
    result = stored?.result ?? null;
    if (stored?.status === "done" && result !== null) finishedReports.set(key, result);
  }
  return { ...row, result: result as (typeof analyses.$inferSelect)["result"] };
}

/** The report without its contour rings (nine tenths of its size; the display payload carries them for drawing). */
export function withoutContourRings(report: AnalysisReport): AnalysisReport {
  return { ...report, segments: report.segments.map((segment) => ({ ...segment, contours: segment.contours.map(({ levelM }) => ({ levelM, rings: [] })) })) };
}

/**
 * The JSON body of GET /api/faults/:id/analysis ({ analysis }), whole or without contour rings; serialised once per
 * finished analysis (a finished analysis and its pick set never change). Next's route handlers drop a
 * Content-Encoding set by the handler, so the body cannot be kept compressed as well: next compresses each response.
 */
export async function latestAnalysisResponseBody(faultId: string, options: { pickSetId?: string; contourRings?: boolean } = {}): Promise<string> {
  const latest = await latestAnalysisForFault(faultId, options.pickSetId);
  const rings = options.contourRings ?? true;
  const shaped = (analysis: NonNullable<typeof latest>) => (rings || !analysis.result ? analysis : { ...analysis, result: withoutContourRings(analysis.result as AnalysisReport) });
  if (!latest || latest.status !== "done" || latest.result === null) return JSON.stringify({ analysis: latest && shaped(latest) });
  const key = `${faultId}:${latest.id}:${rings ? "whole" : "no-rings"}`;
  let body = finishedReportBodies.get(key);
  if (body === undefined) {
    body = JSON.stringify({ analysis: shaped(latest) });
    finishedReportBodies.set(key, body);
  }
  return body;
}

export async function analysisDisplay(faultId: string, analysisId: string) {
  const key = `${faultId}:${analysisId}`;
  const cached = finishedDisplays.get(key);
  if (cached) return cached;
  const db = await getDb();
  const [row] = await db
    .select({ display: base64Bytes(analyses.display), status: analyses.status })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(and(eq(analyses.id, analysisId), eq(pickSets.faultId, faultId)));
  if (row?.display && row.status === "done") finishedDisplays.set(key, row.display);
  return row?.display ?? null;
}

/** Queue a fresh analysis of a pick set (idempotent in result: same picks and parameters give the same report). */
export async function rerunAnalysis(faultId: string, pickSetId: string) {
  const db = await getDb();
  const pickSet = await db.query.pickSets.findFirst({ where: and(eq(pickSets.id, pickSetId), eq(pickSets.faultId, faultId)), columns: { id: true } });
  if (!pickSet) return null;
  const [analysis] = await db.insert(analyses).values({ pickSetId }).returning({ id: analyses.id });
  scheduleAnalysis(analysis.id);
  return analysis.id;
}
