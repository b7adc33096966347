// Entry of the analysis worker thread (bundled by scripts/build-worker.mjs into dist/analysis-worker.mjs). The thread
// is kept warm between jobs by lib/analysis/worker-pool.ts and takes one job message at a time. The same file, started with
// the tip-line role, is the helper thread that fits tip-line profiles while the analysis grids and contours.
import { readlinkSync } from "node:fs";
import os from "node:os";
import { parentPort, workerData } from "node:worker_threads";
import { computeAnalysis, computeFullResolution, type AnalysisJob } from "./compute";
import { parseUploadedFile, readMultipart, UploadProblem, type MultipartJob, type UploadParseJob } from "./upload-parse";
import { serveTipLineFits, threadedTipLineFitter } from "./tipline-thread";
import { computeFaultScreen, type StressScreenJob } from "@/lib/stress/screen-compute";

/**
 * Analyses yield the CPU to the web server: on Linux a thread has its own nice value, so this thread (and only it)
 * runs at lower priority; reads stay quick while an analysis computes on a busy machine. Elsewhere this is a no-op.
 */
function lowerThisThreadsPriority(niceness = 10) {
  try {
    const threadId = Number(readlinkSync("/proc/thread-self").split("/").pop());
    if (threadId > 0) os.setPriority(threadId, niceness);
  } catch {
    // no /proc (not Linux) or not permitted: run at normal priority
  }
}

lowerThisThreadsPriority();

if (!serveTipLineFits(workerData)) serveAnalysisJobs();

function serveAnalysisJobs() {
  const { fitter: tipLineFitter } = threadedTipLineFitter(new URL(import.meta.url));
  parentPort!.on("message", (job: AnalysisJob | UploadParseJob | MultipartJob | StressScreenJob) =>
    job.output === "multipart" ? void takeFormApart(job) : runJob(job, tipLineFitter),
  );
}

function failed(error: unknown) {
  const problem = error instanceof UploadProblem ? { status: error.status, details: error.details } : undefined;
  parentPort!.postMessage({ kind: "failed", message: error instanceof Error ? error.message : String(error), problem });
}

async function takeFormApart(job: MultipartJob) {
  try {
    const output = await readMultipart(job);
    parentPort!.postMessage({ kind: "done", output }, output.file ? [output.file.bytes.buffer as ArrayBuffer] : []);
  } catch (error) {
    failed(error);
  }
}

function runJob(job: AnalysisJob | UploadParseJob | StressScreenJob, tipLineFitter: ReturnType<typeof threadedTipLineFitter>["fitter"]) {
  try {
    if (job.output === "parse") {
      const output = parseUploadedFile(job);
      parentPort!.postMessage({ kind: "done", output }, output.encoded ? [output.encoded.buffer as ArrayBuffer] : []);
    } else if (job.output === "stress") {
      parentPort!.postMessage({ kind: "done", output: computeFaultScreen(job) });
    } else if (job.output === "grids") {
      parentPort!.postMessage({ kind: "done", output: computeFullResolution(job, { tipLineFitter }) });
    } else {
      const output = computeAnalysis(job, (stage, fraction) => parentPort!.postMessage({ kind: "stage", stage, fraction }), { tipLineFitter });
      parentPort!.postMessage({ kind: "done", output }, [output.display.buffer as ArrayBuffer, output.outputs.buffer as ArrayBuffer]);
    }
  } catch (error) {
    failed(error);
  }
}
