// `npm run dev`: the worker bundles (analysis engine, database thread, job worker) built first and rebuilt whenever a
// source they include changes, then `next dev`. Without this the server would run whatever dist/ last held (engine edits
// silently ignored) or, on a clean clone, find no database thread at all.
import { spawn } from "node:child_process";
import { watchWorkers } from "./build-worker.mjs";

const watchers = await watchWorkers();
const next = spawn(process.execPath, ["node_modules/next/dist/bin/next", "dev", ...process.argv.slice(2)], { stdio: "inherit" });

async function stop(signal) {
  await Promise.all(watchers.map((context) => context.dispose()));
  if (next.exitCode === null) next.kill(signal);
}
process.on("SIGINT", () => void stop("SIGINT"));
process.on("SIGTERM", () => void stop("SIGTERM"));
next.on("exit", async (code) => {
  await Promise.all(watchers.map((context) => context.dispose()));
  process.exit(code ?? 0);
});
