import { execFileSync } from "node:child_process";

/**
 * vitest globalSetup: bundle the worker-thread entries once, before any test file runs, so every file uses the same
 * finished dist/analysis-worker.mjs and dist/database-worker.mjs (the database tests run PGlite on its thread, as the
 * server does).
 */
export default function buildWorkers() {
  execFileSync(process.execPath, ["scripts/build-worker.mjs"], { stdio: "ignore" });
}
