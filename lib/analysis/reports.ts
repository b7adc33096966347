import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, base64Bytes, pickSets } from "@/db/schema";
import type { AnalysisReport } from "@/lib/contracts/report";
import { decodeFaultDisplay, reportWithContourRings, withoutContourRings } from "@/lib/display/payload";
import { lruCache } from "@/lib/lru";
import type { AnalysisRun } from "@/lib/contracts/analysis";

/**
 * The read repository of analyses: what the fault page, pins, stress screening and exports read about a fault's
 * analyses, with the response caching that keeps those reads cheap.
 *
 * A finished analysis never changes (a re-run makes a new row), so its report and display payload are kept in a small
 * in-memory cache: the fault page polls them, and decoding a large jsonb/bytea value in PGlite costs the event loop
 * more than the rest of the request (measured with `npm run loadtest` and a CPU profile). Keys carry the fault id, so
 * a cached value is only ever served for the fault it belongs to.
 */
const finishedReports = lruCache<AnalysisReport>(64);
/** whole response bodies of finished analyses, serialised once (re-serialising a large report costs more than the rest of a poll) */
const finishedReportBodies = lruCache<string>(64);
const finishedDisplays = lruCache<Uint8Array>(64);

/** The newest analysis of the fault's newest pick set (or of the pick set named), or exactly the analysis named. */
export async function latestAnalysisForFault(faultId: string, pickSetId?: string, analysisId?: string) {
  const db = await getDb();
  const rows = await db
    .select({
      id: analyses.id,
      status: analyses.status,
      stage: analyses.stage,
      progress: analyses.progress,
      errorMessage: analyses.errorMessage,
      engineVersion: analyses.engineVersion,
      parameters: analyses.parameters,
      createdAt: analyses.createdAt,
      finishedAt: analyses.finishedAt,
      pickSetId: pickSets.id,
      version: pickSets.version,
      fileName: pickSets.fileName,
      checksum: pickSets.checksum,
      uploadedAt: pickSets.uploadedAt,
      velocityModel: pickSets.velocityModel,
      derivedFrom: pickSets.derivedFrom,
    })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(and(eq(pickSets.faultId, faultId), pickSetId ? eq(pickSets.id, pickSetId) : undefined, analysisId ? eq(analyses.id, analysisId) : undefined))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt))
    .limit(1);
  const row = rows[0];
  if (!row) return null;
  const key = `${faultId}:${row.id}`;
  let result = row.status === "done" ? finishedReports.get(key) : undefined;
  if (result === undefined) {
    const [stored] = await db.select({ result: analyses.result, status: analyses.status }).from(analyses).where(eq(analyses.id, row.id));
    result = stored?.result ?? undefined;
    if (stored?.status === "done" && result !== undefined) finishedReports.set(key, result);
  }
  return { ...row, result: result ?? null };
}

/**
 * The JSON body of GET /api/faults/:id/analysis ({ analysis }), with or without contour rings; serialised once per
 * finished analysis (a finished analysis and its pick set never change). The stored report keeps its contour levels
 * without rings, which live once in the display payload: the whole report puts them back from there. Next's route
 * handlers drop a Content-Encoding set by the handler, so the body cannot be kept compressed as well: next compresses
 * each response.
 */
export async function latestAnalysisResponseBody(
  faultId: string,
  options: { pickSetId?: string; analysisId?: string; contourRings?: boolean } = {},
): Promise<string> {
  const latest = await latestAnalysisForFault(faultId, options.pickSetId, options.analysisId);
  const rings = options.contourRings ?? true;
  if (!latest || latest.status !== "done" || latest.result === null)
    return JSON.stringify({ analysis: latest && { ...latest, result: latest.result && withoutContourRings(latest.result) } });
  const key = `${faultId}:${latest.id}:${rings ? "whole" : "no-rings"}`;
  let body = finishedReportBodies.get(key);
  if (body === undefined) {
    const display = rings ? await analysisDisplay(faultId, latest.id) : null;
    const result = display ? reportWithContourRings(latest.result, decodeFaultDisplay(display)) : withoutContourRings(latest.result);
    body = JSON.stringify({ analysis: { ...latest, result } });
    finishedReportBodies.set(key, body);
  }
  return body;
}

export async function analysisDisplay(faultId: string, analysisId: string) {
  const key = `${faultId}:${analysisId}`;
  const cached = finishedDisplays.get(key);
  if (cached) return cached;
  const db = await getDb();
  const [row] = await db
    .select({ display: base64Bytes(analyses.display), status: analyses.status })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(and(eq(analyses.id, analysisId), eq(pickSets.faultId, faultId)));
  if (row?.display && row.status === "done") finishedDisplays.set(key, row.display);
  return row?.display ?? null;
}

/**
 * Every run of the analysis of one pick set (the fault's newest when none is named), newest first: each run is kept
 * beside the earlier ones so that two can be compared.
 */
export async function analysisRuns(faultId: string, pickSetId?: string): Promise<{ pickSetId: string | null; runs: AnalysisRun[] }> {
  const db = await getDb();
  const [pickSet] = await db
    .select({ id: pickSets.id })
    .from(pickSets)
    .where(and(eq(pickSets.faultId, faultId), pickSetId ? eq(pickSets.id, pickSetId) : undefined))
    .orderBy(desc(pickSets.version))
    .limit(1);
  if (!pickSet) return { pickSetId: null, runs: [] };
  const rows = await db
    .select({
      id: analyses.id,
      status: analyses.status,
      createdAt: analyses.createdAt,
      finishedAt: analyses.finishedAt,
      engineVersion: analyses.engineVersion,
      parameters: analyses.parameters,
      // only the headline numbers leave the database: a whole report per run would be most of a megabyte
      segments: sql<AnalysisRun["segments"] | null>`(
        select jsonb_agg(jsonb_build_object(
          'id', s->>'id',
          'lengthM', (s->'tipLine'->>'lengthM')::float8,
          'lengthRangeM', s->'tipLine'->'lengthRangeM',
          'heightM', (s->'tipLine'->>'heightM')::float8,
          'heightRangeM', s->'tipLine'->'heightRangeM',
          'fittedDmaxM', (s->'max'->>'fittedDisplacementM')::float8,
          'model', s->'tipLine'->>'model',
          'cutoffM', (s->'tipLine'->'cutoff'->>'displacementM')::float8
        ) order by ord)
        from jsonb_array_elements(${analyses.result}->'segments') with ordinality as e(s, ord)
      )`,
    })
    .from(analyses)
    .where(eq(analyses.pickSetId, pickSet.id))
    .orderBy(desc(analyses.createdAt));
  return {
    pickSetId: pickSet.id,
    runs: rows.map(({ parameters, segments, createdAt, finishedAt, ...row }) => ({
      ...row,
      createdAt: createdAt.toISOString(),
      finishedAt: finishedAt?.toISOString() ?? null,
      settings: parameters,
      segments: segments ?? [],
    })),
  };
}
