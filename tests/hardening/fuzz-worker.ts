// Runs one engine call per message in its own thread, so the fuzz test can stop an input that hangs.
import { parentPort } from "node:worker_threads";
import { parsePickCsv, PickInputError } from "../../lib/engine/csv";
import { analyzeCsv } from "../../lib/engine/pipeline";

export interface FuzzRequest {
  id: number;
  kind: "parse" | "analyze";
  text: string;
  options: { dropBadRows?: boolean; dedupe?: "reject" | "average"; units?: "m" | "ft" };
}

export type FuzzReply =
  | { id: number; outcome: "result"; accepted: number; allFinite: boolean; throwsNonNegative: boolean; segments?: number }
  | { id: number; outcome: "input-error"; message: string; rejected: { row: unknown; column: unknown; reason: unknown }[] }
  | { id: number; outcome: "crash"; name: string; message: string; stack?: string };

function finite(values: Float64Array) {
  for (let index = 0; index < values.length; index++) if (!Number.isFinite(values[index])) return false;
  return true;
}

parentPort!.on("message", (request: FuzzRequest) => {
  let reply: FuzzReply;
  try {
    if (request.kind === "parse") {
      const parsed = parsePickCsv(request.text, request.options);
      const { picks } = parsed;
      reply = {
        id: request.id,
        outcome: "result",
        accepted: parsed.accepted,
        allFinite: finite(picks.x) && finite(picks.y) && finite(picks.z) && finite(picks.throwM),
        throwsNonNegative: picks.throwM.every((value) => value >= 0),
      };
    } else {
      const { report } = analyzeCsv(request.text, { ...request.options, intervalM: 5 });
      reply = {
        id: request.id,
        outcome: "result",
        accepted: report.input.accepted,
        allFinite: true,
        throwsNonNegative: true,
        segments: report.segments.length,
      };
    }
  } catch (error) {
    if (error instanceof PickInputError) {
      reply = {
        id: request.id,
        outcome: "input-error",
        message: error.message,
        rejected: error.rejected.map((r) => ({ row: r.row, column: r.column, reason: r.reason })),
      };
    } else {
      const e = error as Error;
      reply = { id: request.id, outcome: "crash", name: e?.name ?? typeof error, message: String(e?.message ?? error), stack: e?.stack };
    }
  }
  parentPort!.postMessage(reply);
});
