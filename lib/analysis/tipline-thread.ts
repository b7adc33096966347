// A second thread for the tip-line profile fits, so they overlap with gridding and contouring (see TipLineFitter in
// lib/engine/pipeline.ts). The pipeline stays synchronous: the fits are posted to the helper thread, and the wait for
// their result blocks on a shared reply counter (Atomics.wait) and takes the reply with receiveMessageOnPort.
import { MessageChannel, receiveMessageOnPort, Worker, type MessagePort } from "node:worker_threads";
import type { TipLineSummary } from "@/lib/engine/tipline";
import type { TipLineInputs } from "@/lib/engine/tipline-inputs";
import { fitAndSummariseTipLine, inlineTipLineFitter, type TipLineFitter } from "@/lib/engine/pipeline";

export const TIPLINE_THREAD_ROLE = "tipline-fits";

interface HelperData {
  role: typeof TIPLINE_THREAD_ROLE;
  port: MessagePort;
  signal: SharedArrayBuffer;
}

/** Each request carries a number, so a reply nobody waited for (a job that failed between start and wait) is skipped. */
type Request = { id: number; inputs: TipLineInputs };
type Reply = { id: number } & ({ fits: TipLineSummary } | { error: string });

/**
 * Longest waits before the fits are done in this thread instead: for a helper that never came up (its error event
 * cannot arrive while this thread blocks), and for an answer.
 */
const START_LIMIT_MS = 5_000;
const WAIT_LIMIT_MS = 120_000;
// the shared words: [0] replies sent so far (the waiting thread sleeps until it changes), [1] the helper is serving
const REPLIED = 0;
const SERVING = 1;

/**
 * A fitter backed by a helper thread started from `entry` (a module that calls serveTipLineFits for this role).
 * Falls back to fitting in the calling thread if the helper cannot be reached. `close` ends the helper.
 */
export function threadedTipLineFitter(entry: string | URL): {
  fitter: TipLineFitter;
  /** starts the helper now rather than at the first fit, so its start-up overlaps other work (the command line) */
  warm: () => void;
  close: () => Promise<void>;
  counts: () => { onHelper: number; inThisThread: number };
} {
  let helper: { worker: Worker; port: MessagePort; signal: Int32Array } | null = null;
  let broken = false;
  let onHelper = 0;
  let inThisThread = 0;
  let requests = 0;
  const inline: TipLineFitter = (inputs) => {
    inThisThread++;
    return inlineTipLineFitter(inputs);
  };
  const start = () => {
    const { port1, port2 } = new MessageChannel();
    const signal = new Int32Array(new SharedArrayBuffer(8));
    const data: HelperData = { role: TIPLINE_THREAD_ROLE, port: port2, signal: signal.buffer as SharedArrayBuffer };
    const worker = new Worker(entry, { workerData: data, transferList: [port2] });
    worker.unref();
    port1.unref();
    worker.on("error", () => (broken = true));
    worker.on("exit", () => (broken = true));
    return { worker, port: port1, signal };
  };
  const fitter: TipLineFitter = (inputs) => {
    if (broken) return inline(inputs);
    try {
      helper ??= start();
    } catch {
      broken = true;
      return inline(inputs);
    }
    const { port, signal } = helper;
    const id = ++requests;
    port.postMessage({ id, inputs } satisfies Request);
    return () => {
      const startedWaiting = Date.now();
      const until = startedWaiting + WAIT_LIMIT_MS;
      for (;;) {
        const repliesSoFar = Atomics.load(signal, REPLIED);
        const received = receiveMessageOnPort(port);
        if (received) {
          const reply = received.message as Reply;
          if (reply.id !== id) continue;
          if ("error" in reply) throw new Error(reply.error);
          onHelper++;
          return reply.fits;
        }
        const now = Date.now();
        if (broken || now > until || (Atomics.load(signal, SERVING) === 0 && now - startedWaiting > START_LIMIT_MS)) {
          broken = true;
          inThisThread++;
          return fitAndSummariseTipLine(inputs);
        }
        Atomics.wait(signal, REPLIED, repliesSoFar, 200);
      }
    };
  };
  return {
    fitter,
    warm: () => {
      if (helper || broken) return;
      try {
        helper = start();
      } catch {
        broken = true;
      }
    },
    counts: () => ({ onHelper, inThisThread }),
    close: async () => {
      if (helper) await helper.worker.terminate();
      helper = null;
    },
  };
}

/** The helper thread's side: answer each set of fit inputs with the fits (or the error message). */
export function serveTipLineFits(data: unknown): boolean {
  const helper = data as HelperData | null;
  if (helper?.role !== TIPLINE_THREAD_ROLE) return false;
  const signal = new Int32Array(helper.signal);
  Atomics.store(signal, SERVING, 1);
  Atomics.notify(signal, REPLIED);
  helper.port.on("message", ({ id, inputs }: Request) => {
    let reply: Reply;
    try {
      reply = { id, fits: fitAndSummariseTipLine(inputs) };
    } catch (error) {
      reply = { id, error: error instanceof Error ? error.message : String(error) };
    }
    helper.port.postMessage(reply);
    Atomics.add(signal, REPLIED, 1);
    Atomics.notify(signal, REPLIED);
  });
  return true;
}
