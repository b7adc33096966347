// npm run worker — a job worker: runs analyses and exports from the job queue in the PostgreSQL database named by
// DATABASE_URL, on this machine or another, beside any number of web processes and other workers. Bundled as
// dist/job-worker.mjs by scripts/build-worker.mjs (run it from the project folder: `node dist/job-worker.mjs`).
//   SLIPFIELD_ANALYSIS_WORKERS (1)   analyses (and, apart, exports) this process runs at once, each in its own thread
//   SLIPFIELD_JOB_LEASE_SECONDS (30) how long a job stays held without a heartbeat (renewed every third of it)
//   SLIPFIELD_DRAIN_SECONDS (8)      on SIGTERM/SIGINT: time for running jobs to finish before they are given back
import { getDatabaseHandle } from "../db/client";
import { startListening, stopListening } from "../db/notifications";
import { jobHandlers } from "../lib/jobs/local";
import { configuredSlots, JobProcessor } from "../lib/jobs/processor";
import { drainDeadlineMs } from "../lib/shutdown";
import { config } from "../lib/config";

const log = (line: string) => console.log(`slipfield worker: ${line}`);

async function main() {
  if (!config().DATABASE_URL) {
    console.error(
      "slipfield worker: DATABASE_URL is not set. A worker shares a PostgreSQL server with the web processes; the embedded database is opened by `npm start` alone, which runs analyses itself.",
    );
    process.exit(2);
  }
  const slots = configuredSlots();
  if (slots.analysis < 1) {
    console.error("slipfield worker: SLIPFIELD_ANALYSIS_WORKERS must be at least 1 for a worker.");
    process.exit(2);
  }
  const handle = await getDatabaseHandle();
  await startListening();
  const processor = new JobProcessor({ role: "worker", handlers: jobHandlers, slots, log });
  await processor.start();
  log(`${processor.id} running up to ${slots.analysis} analyses and ${slots.export} exports at once (pid ${process.pid})`);

  let stopping = false;
  const stop = async (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: draining (no new jobs; running ones get ${drainDeadlineMs() / 1000} s to finish, then go back to the queue)`);
    await processor.drain(drainDeadlineMs());
    await stopListening();
    await handle.close();
    log("stopped");
    process.exit(0);
  };
  process.on("SIGTERM", (signal) => void stop(signal));
  process.on("SIGINT", (signal) => void stop(signal));
  // the processor's timers are unref'd: keep the process alive until it is told to stop
  setInterval(() => {}, 1 << 30);
}

main().catch((error: unknown) => {
  console.error(`slipfield worker: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
