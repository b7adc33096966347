import { execFileSync } from "node:child_process";

/**
 * vitest globalSetup: bundle the worker-thread entries and the command line once, before any test file runs, so every
 * file uses the same finished dist/analysis-worker.mjs, dist/database-worker.mjs and dist/slipfield-cli.cjs (the
 * database tests run PGlite on its thread, as the server does; the command-line tests run the bundle, as users do).
 */
export default function buildWorkers() {
  execFileSync(process.execPath, ["scripts/build-worker.mjs"], { stdio: "ignore" });
  execFileSync(process.execPath, ["scripts/build-cli.mjs", "--quiet"], { stdio: "ignore" });
}
