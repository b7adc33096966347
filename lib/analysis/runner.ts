import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, pickSets } from "@/db/schema";
import { analyzePicks, ENGINE_VERSION } from "@/lib/engine/pipeline";
import { decodePicks } from "@/lib/picks/codec";
import { buildFaultDisplay, encodeFaultDisplay } from "./display";

const queue: string[] = [];
let running = false;

/** Analyses run one at a time, in order, off the request that queued them. */
export function scheduleAnalysis(analysisId: string) {
  queue.push(analysisId);
  if (!running) setImmediate(drainQueue);
}

async function drainQueue() {
  if (running) return;
  running = true;
  try {
    while (queue.length > 0) await runAnalysis(queue.shift()!);
  } finally {
    running = false;
  }
}

/** Runs one analysis to the end: done with results, or failed with a message the user can read. */
export async function runAnalysis(analysisId: string) {
  const db = await getDb();
  // Claim atomically: only a queued analysis starts, so a second caller never computes it twice.
  const [analysis] = await db
    .update(analyses)
    .set({ status: "running", stage: "starting", progress: 0, startedAt: new Date(), errorMessage: null })
    .where(and(eq(analyses.id, analysisId), eq(analyses.status, "queued")))
    .returning();
  if (!analysis) return;
  const pickSet = await db.query.pickSets.findFirst({ where: eq(pickSets.id, analysis.pickSetId) });
  if (!pickSet) return;
  let lastWrite = 0;
  const stageWrites: Promise<unknown>[] = [];
  try {
    const picks = decodePicks(pickSet.picks);
    const parameters = analysis.parameters as { intervalM?: number; cellM?: number };
    const { report, grids } = analyzePicks(picks, {
      units: pickSet.units,
      intervalM: parameters.intervalM,
      cellM: parameters.cellM,
      onStage: (stage: string, fraction: number) => {
        const now = Date.now();
        if (now - lastWrite < 150) return;
        lastWrite = now;
        stageWrites.push(db.update(analyses).set({ stage, progress: fraction }).where(eq(analyses.id, analysisId)));
      },
    });
    await Promise.allSettled(stageWrites);
    const display = encodeFaultDisplay(buildFaultDisplay({ report, grids, picks }));
    await db
      .update(analyses)
      .set({ status: "done", stage: "done", progress: 1, result: report, display, engineVersion: ENGINE_VERSION, finishedAt: new Date() })
      .where(eq(analyses.id, analysisId));
  } catch (error) {
    await Promise.allSettled(stageWrites);
    const message = error instanceof Error ? error.message : "The analysis failed.";
    console.error(`[slipfield] analysis ${analysisId} failed:`, error);
    await db.update(analyses).set({ status: "failed", stage: "failed", errorMessage: message, finishedAt: new Date() }).where(eq(analyses.id, analysisId));
  }
}

/** After a restart, analyses left queued or running are queued again (nothing half-written is visible: results land in one update). */
export async function resumeUnfinishedAnalyses() {
  const db = await getDb();
  const unfinished = await db
    .update(analyses)
    .set({ status: "queued", stage: "queued", progress: 0 })
    .where(inArray(analyses.status, ["queued", "running"]))
    .returning({ id: analyses.id });
  for (const { id } of unfinished) scheduleAnalysis(id);
  return unfinished.length;
}

export async function latestAnalysisForFault(faultId: string, pickSetId?: string) {
  const db = await getDb();
  const rows = await db
    .select({
      id: analyses.id,
      status: analyses.status,
      stage: analyses.stage,
      progress: analyses.progress,
      result: analyses.result,
      errorMessage: analyses.errorMessage,
      engineVersion: analyses.engineVersion,
      finishedAt: analyses.finishedAt,
      pickSetId: pickSets.id,
      version: pickSets.version,
      fileName: pickSets.fileName,
      checksum: pickSets.checksum,
      uploadedAt: pickSets.uploadedAt,
    })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(pickSetId ? and(eq(pickSets.faultId, faultId), eq(pickSets.id, pickSetId)) : eq(pickSets.faultId, faultId))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt))
    .limit(1);
  return rows[0] ?? null;
}

export async function analysisDisplay(faultId: string, analysisId: string) {
  const db = await getDb();
  const [row] = await db
    .select({ display: analyses.display })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(and(eq(analyses.id, analysisId), eq(pickSets.faultId, faultId)));
  return row?.display ?? null;
}

/** Queue a fresh analysis of a pick set (idempotent in result: same picks and parameters give the same report). */
export async function rerunAnalysis(faultId: string, pickSetId: string) {
  const db = await getDb();
  const pickSet = await db.query.pickSets.findFirst({ where: and(eq(pickSets.id, pickSetId), eq(pickSets.faultId, faultId)), columns: { id: true } });
  if (!pickSet) return null;
  const [analysis] = await db.insert(analyses).values({ pickSetId }).returning({ id: analyses.id });
  scheduleAnalysis(analysis.id);
  return analysis.id;
}
