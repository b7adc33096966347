import "server-only";
import { promisify } from "node:util";
import { gunzip, gzip } from "node:zlib";
import { and, eq, gt, inArray, lt, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { publish, subscribe } from "@/db/notifications";
import { base64Bytes, exportFiles, jobs, jobWorkers } from "@/db/schema";
import { ApiError } from "@/lib/api/errors";
import { analysisTimeLimitMs } from "@/lib/analysis/worker-pool";
import { enqueueJob, finishJob } from "@/lib/jobs/queue";
import { LeaseLost, type JobContext, type JobHandler } from "@/lib/jobs/processor";
import { fullResolution, loadExportSource, type ExportSource } from "./load";
import { gridCsv, picksCsv, profilesCsv } from "./tables";
import type { StrikeProfileMode } from "@/lib/views/profiles";
import { coordinateComments } from "@/lib/views/grid-csv";
import { describeCoordinateReference } from "@/lib/crs";

/**
 * Exports that recompute the full-resolution grids (seconds on a large pick set) are jobs: a worker makes the file and
 * stores it (gzip) for an hour, so any web process serves it, the same file again without recomputing it.
 */

export type ComputedExportKind = "grid.csv" | "picks.csv" | "profiles.csv";
export type ProfileMode = Exclude<StrikeProfileMode, "line">;

interface ExportPayload {
  faultId: string;
  analysisId: string;
  kind: ComputedExportKind;
  mode: ProfileMode;
  fileName: string;
}

const KEEP_FILES = "1 hour";
const POLL_MS = 1000;
const gzipAsync = promisify(gzip);
const gunzipAsync = promisify(gunzip);

/** The stored file's key: the analysis, the kind (and mode), and the study's coordinate reference its header states. */
function exportKey(analysisId: string, kind: ComputedExportKind, mode: ProfileMode, reference: ExportSource["coordinateReference"]) {
  const base = kind === "profiles.csv" ? `${analysisId}:${kind}:${mode}` : `${analysisId}:${kind}`;
  if (!reference) return base;
  return `${base}:EPSG:${reference.horizontal.epsg}+${reference.vertical.epsg ?? encodeURIComponent(reference.vertical.name)}`;
}

async function storedFile(key: string) {
  const db = await getDb();
  const [row] = await db
    .select({ body: base64Bytes(exportFiles.body) })
    .from(exportFiles)
    .where(and(eq(exportFiles.key, key), gt(exportFiles.expiresAt, sql`now()`)));
  return row ? (await gunzipAsync(row.body)).toString("utf8") : null;
}

/** Whether any process runs export jobs now (its heartbeat is recent). */
async function exportWorkerAlive() {
  const db = await getDb();
  const [row] = await db
    .select({ id: jobWorkers.id })
    .from(jobWorkers)
    .where(and(sql`'export' = any(${jobWorkers.kinds})`, gt(jobWorkers.slots, 0), gt(jobWorkers.heartbeatAt, sql`now() - interval '2 minutes'`)))
    .limit(1);
  return Boolean(row);
}

/** The export file's text: stored already, or made by a worker now (this request waits for it). */
export async function computedExport(source: ExportSource, kind: ComputedExportKind, mode: ProfileMode, fileName: string): Promise<string> {
  const key = exportKey(source.analysis.id, kind, mode, source.coordinateReference);
  const stored = await storedFile(key);
  if (stored !== null) return stored;
  const db = await getDb();
  const payload: ExportPayload = { faultId: source.fault.id, analysisId: source.analysis.id, kind, mode, fileName };
  const jobId = await enqueueJob(db, { kind: "export", subjectId: key, payload: payload as unknown as Record<string, unknown> });
  const { jobsAdded } = await import("@/lib/jobs/local");
  await jobsAdded();
  if (!(await exportWorkerAlive())) {
    throw new ApiError(
      503,
      "No worker is running to make this export. Start one (`npm run worker`), or let the web server run jobs (SLIPFIELD_ANALYSIS_WORKERS ≥ 1).",
    );
  }
  const outcome = await finishedJob(jobId, key, analysisTimeLimitMs() + 60_000);
  if (outcome.state === "failed") throw new ApiError(500, `The export could not be made: ${outcome.error ?? "unknown error"}`);
  const made = await storedFile(key);
  if (made === null) throw new ApiError(500, "The export was made but is no longer stored; ask for it again.");
  return made;
}

/** Waits for the job to end: woken by its "done" signal, and looking every second in case a signal was missed. */
async function finishedJob(jobId: string, key: string, timeoutMs: number): Promise<{ state: "done" | "failed"; error: string | null }> {
  const db = await getDb();
  const until = Date.now() + timeoutMs;
  let wake = () => {};
  const unsubscribe = subscribe("slipfield_jobs", (payload) => {
    if (payload === `done:${key}`) wake();
  });
  try {
    for (;;) {
      const [row] = await db.select({ state: jobs.state, error: jobs.lastError }).from(jobs).where(eq(jobs.id, jobId));
      if (!row || row.state === "done") return { state: "done", error: null };
      if (row.state === "failed") return { state: "failed", error: row.error };
      if (Date.now() > until) throw new ApiError(504, "Making the export took too long; try again later.");
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, POLL_MS);
        wake = () => {
          clearTimeout(timer);
          resolve();
        };
      });
    }
  } finally {
    unsubscribe();
  }
}

async function makeExport({ job, owner, signal }: JobContext) {
  const payload = job.payload as unknown as ExportPayload;
  const db = await getDb();
  let text: string;
  try {
    const source = await loadExportSource(payload.faultId, payload.analysisId);
    const { picks, result } = await fullResolution(source, signal);
    const comments = coordinateComments(source.coordinateReference ? describeCoordinateReference(source.coordinateReference) : null);
    text =
      payload.kind === "grid.csv"
        ? gridCsv(result, comments)
        : payload.kind === "picks.csv"
          ? picksCsv(picks, result, comments)
          : profilesCsv(result, payload.mode, comments);
  } catch (error) {
    if (signal.aborted || !(error instanceof ApiError)) throw error;
    // the analysis is gone or unfinished: a lasting answer, not worth retrying
    await db.transaction(async (tx) => {
      if (!(await finishJob(tx, job.id, owner, { state: "failed", error: error.message }))) throw new LeaseLost();
    });
    return;
  }
  const body = new Uint8Array(await gzipAsync(text, { level: 1 }));
  await db.transaction(async (tx) => {
    if (!(await finishJob(tx, job.id, owner, { state: "done" }))) throw new LeaseLost();
    const values = {
      key: job.subjectId,
      analysisId: payload.analysisId,
      contentType: "text/csv",
      fileName: payload.fileName,
      body,
      expiresAt: sql`now() + interval '${sql.raw(KEEP_FILES)}'`,
    };
    await tx
      .insert(exportFiles)
      .values(values)
      .onConflictDoUpdate({ target: exportFiles.key, set: { body, expiresAt: values.expiresAt, createdAt: sql`now()` } });
  });
  await publish("slipfield_jobs", `done:${job.subjectId}`).catch(() => undefined);
  // finished export jobs are only a means to the file; the file row is what stays (for an hour)
  await db.delete(jobs).where(and(eq(jobs.kind, "export"), inArray(jobs.state, ["done"]), lt(jobs.finishedAt, sql`now() - interval '1 hour'`)));
  await db.delete(exportFiles).where(lt(exportFiles.expiresAt, sql`now()`));
}

export const exportJobHandler: JobHandler = { run: makeExport };
