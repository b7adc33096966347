import "server-only";
import { existsSync, statSync } from "node:fs";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { PipelineResult } from "@/lib/engine/pipeline";
import { computeAnalysis, computeFullResolution, type AnalysisJob, type AnalysisOutput } from "./compute";
import {
  parseUploadedFile,
  readMultipart,
  UploadProblem,
  type MultipartJob,
  type MultipartOutput,
  type UploadParseJob,
  type UploadParseOutput,
} from "./upload-parse";
import { config } from "@/lib/config";
import { computeFaultScreen, type FaultScreenResult, type StressScreenJob } from "@/lib/stress/screen-compute";

/**
 * The worker pool: warm worker threads (dist/analysis-worker.mjs) that run analyses, export grids, upload parsing and
 * multipart forms off the process's event loop, so a web server keeps answering and a job worker keeps its lease
 * renewed while they compute. Without the bundled worker (tests, development without a worker build) jobs run
 * in-process.
 */

/** Threads kept warm: analyses run at most this many at once per process (SLIPFIELD_ANALYSIS_WORKERS). */
const poolSize = () => config().SLIPFIELD_ANALYSIS_WORKERS;
export const analysisTimeLimitMs = () => config().SLIPFIELD_ANALYSIS_TIMEOUT_MS;
// built by scripts/build-worker.mjs; kept out of the Next bundle on purpose (it runs in its own thread)
const WORKER_FILE = path.join(/*turbopackIgnore: true*/ process.cwd(), "dist", "analysis-worker.mjs");
/** reading the largest allowed file takes seconds; the analysis time limit (SLIPFIELD_ANALYSIS_TIMEOUT_MS) is not meant for it */
const PARSE_TIME_LIMIT_MS = 5 * 60_000;

export class AnalysisTimeout extends Error {}
/** The job was given up by the one who asked for it (its lease was lost, or the process is draining). */
export class ComputeAborted extends Error {
  name = "ComputeAborted";
}

/** An analysis's report and display payload, computed in a worker thread; `signal` stops the thread at once. */
export function computeAnalysisOffThread(job: AnalysisJob, onStage: (stage: string, fraction: number) => void, signal?: AbortSignal): Promise<AnalysisOutput> {
  return runJob({ ...job, output: "display" }, onStage, () => computeAnalysis(job, onStage), analysisTimeLimitMs(), [], signal);
}

/** An uploaded file read and checked (and encoded for storage) off the web server's thread, like an analysis. */
export function parseUploadOffThread(job: UploadParseJob): Promise<UploadParseOutput> {
  return runJob(
    job,
    () => {},
    () => parseUploadedFile(job),
    PARSE_TIME_LIMIT_MS,
  );
}

/** A multipart upload body taken apart off the web server's thread; the body's buffer moves to the worker (not copied). */
export function readMultipartOffThread(job: MultipartJob): Promise<MultipartOutput> {
  return runJob(
    job,
    () => {},
    () => readMultipart(job),
    PARSE_TIME_LIMIT_MS,
    [job.body.buffer as ArrayBuffer],
  );
}

/** Full-resolution engine grids of a stored pick set (exports), computed off the event loop like an analysis. */
export function computeGridsOffThread(job: AnalysisJob, signal?: AbortSignal): Promise<PipelineResult> {
  return runJob(
    { ...job, output: "grids" },
    () => {},
    () => computeFullResolution(job),
    analysisTimeLimitMs(),
    [],
    signal,
  );
}

/** A fault's reactivation screen from its analysis' stored results, off the event loop like an analysis. */
export function screenFaultOffThread(job: StressScreenJob): Promise<FaultScreenResult> {
  return runJob(
    job,
    () => {},
    () => computeFaultScreen(job),
    analysisTimeLimitMs(),
  );
}

/**
 * Warm worker threads, kept between jobs: a fresh thread would load the engine bundle and run it cold (unoptimised)
 * on every analysis. A thread that timed out, crashed, was aborted or failed to start is discarded, never reused; idle
 * threads are unref'd (they never keep the process alive) and closed after a few idle minutes to give their memory back.
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

/** the worker bundle's modification time when each thread started it */
const bundleTimes = new WeakMap<Worker, number>();
const bundleTime = () => (existsSync(WORKER_FILE) ? statSync(WORKER_FILE).mtimeMs : 0);

function takeWorker(): Worker {
  const current = bundleTime();
  for (let warm = idleWorkers.pop(); warm; warm = idleWorkers.pop()) {
    clearTimeout(idleTimers.get(warm));
    // a thread started from an older bundle (npm run dev rebuilds it when the engine changes) is not reused
    if (bundleTimes.get(warm) !== current) {
      void warm.terminate();
      continue;
    }
    warm.ref();
    return warm;
  }
  workerStarts++;
  const worker = new Worker(/*turbopackIgnore: true*/ WORKER_FILE, {
    resourceLimits: { maxOldGenerationSizeMb: 3072, maxYoungGenerationSizeMb: YOUNG_GENERATION_MB },
  });
  // a thread that dies while waiting idle is simply forgotten (a running job's own handlers report its failure)
  worker.on("error", () => discardIdle(worker));
  worker.on("exit", () => discardIdle(worker));
  bundleTimes.set(worker, current);
  return worker;
}

/** How many worker threads were started so far and how many wait warm (for tests). */
export function analysisWorkerCounts() {
  return { started: workerStarts, idle: idleWorkers.length };
}

function returnWorker(worker: Worker) {
  if (idleWorkers.length >= Math.max(1, poolSize())) {
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

function runJob<T>(
  job: AnalysisJob | UploadParseJob | MultipartJob | StressScreenJob,
  onStage: (stage: string, fraction: number) => void,
  inline: () => T | Promise<T>,
  limitMs: number,
  transfer: ArrayBuffer[] = [],
  signal?: AbortSignal,
): Promise<T> {
  if (signal?.aborted) return Promise.reject(new ComputeAborted("The job was given up before it started."));
  if (config().SLIPFIELD_INLINE_ANALYSIS === "1" || !existsSync(WORKER_FILE)) {
    return new Promise((resolve, reject) =>
      setImmediate(() => {
        try {
          resolve(inline());
        } catch (error) {
          reject(error);
        }
      }),
    );
  }
  return new Promise((resolve, reject) => {
    const worker = takeWorker();
    let settled = false;
    const onMessage = (message: {
      kind: string;
      stage?: string;
      fraction?: number;
      output?: T;
      message?: string;
      problem?: Pick<UploadProblem, "status" | "details">;
    }) => {
      if (message.kind === "stage") onStage(message.stage!, message.fraction!);
      else if (message.kind === "done") finish(true, () => resolve(message.output!));
      else if (message.kind === "failed")
        finish(true, () =>
          reject(message.problem ? new UploadProblem(message.problem.status, message.message!, message.problem.details) : new Error(message.message)),
        );
    };
    const onError = (error: Error) => finish(false, () => reject(error));
    const onExit = (code: number) =>
      finish(false, () => reject(new Error(`The analysis worker stopped unexpectedly (exit code ${code}); it may have run out of memory.`)));
    const onAbort = () => finish(false, () => reject(new ComputeAborted("The job was given up while it computed.")));
    const finish = (reuse: boolean, outcome: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      signal?.removeEventListener("abort", onAbort);
      worker.off("message", onMessage).off("error", onError).off("exit", onExit);
      if (reuse) returnWorker(worker);
      else void worker.terminate();
      outcome();
    };
    const timer = setTimeout(() => {
      finish(false, () =>
        reject(
          new AnalysisTimeout(
            `The analysis ran past the ${limitMs < 1000 ? `${limitMs} ms` : `${Math.round(limitMs / 1000)} s`} time limit and was stopped. Try a coarser grid (larger cell size) or fewer picks.`,
          ),
        ),
      );
    }, limitMs);
    signal?.addEventListener("abort", onAbort, { once: true });
    worker.on("message", onMessage).on("error", onError).on("exit", onExit);
    worker.postMessage(job, transfer);
  });
}
