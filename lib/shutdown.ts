import "server-only";
import { stopListening } from "@/db/notifications";
import type { JobProcessor } from "@/lib/jobs/processor";
import { config } from "@/lib/config";

/** How long a stopping process lets its running jobs finish before it gives them back to the queue (SLIPFIELD_DRAIN_SECONDS). */
export const drainDeadlineMs = () => config().SLIPFIELD_DRAIN_SECONDS * 1000;

const state = globalThis as unknown as { slipfieldDraining?: boolean; slipfieldDrainInstalled?: boolean };

/** True once the process has been asked to stop (health answers 503 so that a proxy sends no more requests). */
export function isDraining() {
  return state.slipfieldDraining === true;
}

/**
 * SIGTERM / SIGINT on a web process: take no new jobs, let the running ones finish within the deadline and give the
 * rest back to the queue, then exit. Next's own handler (next start) closes the HTTP server and calls process.exit as
 * soon as the open requests are answered; that exit is held until the jobs are drained, since a job cut off
 * mid-write would otherwise wait for its lease to run out before another worker could take it.
 */
export function drainOnSignals(processor: JobProcessor | null) {
  if (state.slipfieldDrainInstalled) return;
  state.slipfieldDrainInstalled = true;
  const onSignal = (signal: NodeJS.Signals) => {
    if (state.slipfieldDraining) return;
    state.slipfieldDraining = true;
    console.log(
      `slipfield: ${signal}: draining (no new jobs${processor?.runningCount ? `; ${processor.runningCount} running get ${drainDeadlineMs() / 1000} s to finish` : ""})`,
    );
    const drained = (processor ? processor.drain(drainDeadlineMs()) : Promise.resolve())
      .catch((error) => console.error("slipfield: draining failed:", error))
      .then(() => stopListening());
    const exit = process.exit.bind(process);
    process.exit = ((code?: number) => {
      void drained.finally(() => exit(code));
    }) as typeof process.exit;
    // without Next's handler (NEXT_MANUAL_SIG_HANDLE), nothing else ends the process
    if (process.env.NEXT_MANUAL_SIG_HANDLE) void drained.finally(() => exit(0));
  };
  process.on("SIGTERM", onSignal);
  process.on("SIGINT", onSignal);
}
