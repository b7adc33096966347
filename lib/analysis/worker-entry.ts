// Entry of the analysis worker thread (bundled by scripts/build-worker.mjs into dist/analysis-worker.mjs).
import { parentPort, workerData } from "node:worker_threads";
import { computeAnalysis, computeFullResolution, type AnalysisJob } from "./compute";

const job = workerData as AnalysisJob;
try {
  if (job.output === "grids") {
    parentPort!.postMessage({ kind: "done", output: computeFullResolution(job) });
  } else {
    const output = computeAnalysis(job, (stage, fraction) => parentPort!.postMessage({ kind: "stage", stage, fraction }));
    parentPort!.postMessage({ kind: "done", output }, [output.display.buffer as ArrayBuffer]);
  }
} catch (error) {
  parentPort!.postMessage({ kind: "failed", message: error instanceof Error ? error.message : String(error) });
}
