import "server-only";
import { parseAnalysisSettings } from "@/lib/contracts/analysis-settings";
import { and, desc, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, analysisOutputs, base64Bytes, faults, pickSets, pins, studies, users } from "@/db/schema";
import { ApiError } from "@/lib/api/errors";
import { unpackAnalysisOutputs } from "@/lib/analysis/outputs";
import { decodeFaultDisplay, reportWithContourRings } from "@/lib/display/payload";
import type { ReportWithGrids } from "@/lib/engine/pipeline";
import { computeGridsOffThread } from "@/lib/analysis/worker-pool";
import type { AnalysisReport, PickColumns } from "@/lib/engine/types";
import { decodePicks } from "@/lib/picks/codec";
import { lruCache } from "@/lib/lru";
import { faultScalingPoint } from "@/lib/views/scaling";
import type { FaultScalingPoint } from "@/lib/contracts/analysis";
import type { CoordinateReference } from "@/lib/crs";

export interface ExportSource {
  fault: { id: string; name: string; studyId: string; studyName: string };
  /** the study's coordinate reference (null: not recorded) */
  coordinateReference: CoordinateReference | null;
  analysis: { id: string; engineVersion: string | null; finishedAt: Date | null; parameters: Record<string, unknown> };
  pickSet: {
    id: string;
    version: number;
    fileName: string;
    checksum: string;
    units: "m" | "ft";
    rowCount: number;
    uploadedAt: Date;
    uploadedBy: string | null;
  };
  report: AnalysisReport;
}

/** The latest finished analysis of a fault (newest pick set first), with its provenance. 404 when none is finished. */
export async function loadExportSource(faultId: string, analysisId?: string): Promise<ExportSource> {
  const db = await getDb();
  const rows = await db
    .select({
      faultName: faults.name,
      studyId: faults.studyId,
      studyName: studies.name,
      coordinateReference: studies.coordinateReference,
      analysisId: analyses.id,
      engineVersion: analyses.engineVersion,
      finishedAt: analyses.finishedAt,
      parameters: analyses.parameters,
      result: analyses.result,
      display: base64Bytes(analyses.display),
      pickSetId: pickSets.id,
      version: pickSets.version,
      fileName: pickSets.fileName,
      checksum: pickSets.checksum,
      units: pickSets.units,
      rowCount: pickSets.rowCount,
      uploadedAt: pickSets.uploadedAt,
      uploaderName: users.name,
      uploaderEmail: users.email,
    })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .innerJoin(faults, eq(faults.id, pickSets.faultId))
    .innerJoin(studies, eq(studies.id, faults.studyId))
    .leftJoin(users, eq(users.id, pickSets.uploadedBy))
    .where(and(eq(pickSets.faultId, faultId), eq(analyses.status, "done"), analysisId ? eq(analyses.id, analysisId) : undefined))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt))
    .limit(1);
  const row = rows[0];
  if (!row || !row.result)
    throw new ApiError(
      404,
      analysisId ? "That analysis of this fault is not finished or does not exist." : "This fault has no finished analysis to export yet.",
    );
  return {
    fault: { id: faultId, name: row.faultName, studyId: row.studyId, studyName: row.studyName },
    coordinateReference: row.coordinateReference ?? null,
    analysis: { id: row.analysisId, engineVersion: row.engineVersion, finishedAt: row.finishedAt, parameters: row.parameters },
    pickSet: {
      id: row.pickSetId,
      version: row.version,
      fileName: row.fileName,
      checksum: row.checksum,
      units: row.units,
      rowCount: row.rowCount,
      uploadedAt: row.uploadedAt,
      uploadedBy: row.uploaderName ? `${row.uploaderName} <${row.uploaderEmail}>` : null,
    },
    // the stored report keeps its contour levels; the rings live once, in the display payload
    report: row.display ? reportWithContourRings(row.result, decodeFaultDisplay(row.display)) : row.result,
  };
}

/** The stored picks of the analysis' pick set (metres). */
export async function loadPicks(source: ExportSource): Promise<PickColumns> {
  const cached = fullResolutionCache.get(source.analysis.id);
  if (cached) return cached.picks;
  return decodePicks(await storedPickBytes(source));
}

async function storedPickBytes(source: ExportSource): Promise<Uint8Array> {
  const db = await getDb();
  const [pickSet] = await db
    .select({ picks: base64Bytes(pickSets.picks) })
    .from(pickSets)
    .where(eq(pickSets.id, source.pickSet.id));
  if (!pickSet) throw new ApiError(404, "The pick set of this analysis no longer exists.");
  return pickSet.picks;
}

// Reading (or, for an older analysis, recomputing) full-resolution grids costs time on large pick sets; keep the last few.
const fullResolutionCache = lruCache<{ picks: PickColumns; result: ReportWithGrids }>(2);

/**
 * The analysis' full-resolution grids as it stored them (analysis_outputs), with its picks. An analysis made before the
 * grids were stored has them recomputed from its picks with its own settings, off the web server's thread.
 */
export async function fullResolution(source: ExportSource, signal?: AbortSignal): Promise<{ picks: PickColumns; result: ReportWithGrids }> {
  const cached = fullResolutionCache.get(source.analysis.id);
  if (cached) return cached;
  const db = await getDb();
  const [bytes, [stored]] = await Promise.all([
    storedPickBytes(source),
    db
      .select({ body: base64Bytes(analysisOutputs.body) })
      .from(analysisOutputs)
      .where(eq(analysisOutputs.analysisId, source.analysis.id)),
  ]);
  const outputs = stored ? unpackAnalysisOutputs(stored.body) : null;
  // the fault type the analysis ran with, so recomputed grids are the analysis' own
  const used = source.report.kinematics;
  const kinematics = used ? { sense: used.sense, rakeDeg: used.rakeDeg, inversion: used.inversion } : undefined;
  const result: ReportWithGrids = outputs?.pickDisplacementM
    ? { report: source.report, grids: outputs.grids, pickDisplacementM: outputs.pickDisplacementM }
    : // an analysis stored before its outputs were: seconds of work on a large pick set, off the web server's thread
      await computeGridsOffThread(
        { picks: bytes, units: source.pickSet.units, settings: parseAnalysisSettings(source.analysis.parameters), kinematics },
        signal,
      );
  const loaded = { picks: decodePicks(bytes), result };
  fullResolutionCache.set(source.analysis.id, loaded);
  return loaded;
}

/** One D–L point per fault of the study that has a finished analysis (latest pick set). */
export async function studyScalingPoints(studyId: string): Promise<FaultScalingPoint[]> {
  const db = await getDb();
  const rows = await db
    .select({ faultId: faults.id, name: faults.name, version: pickSets.version, result: analyses.result, createdAt: analyses.createdAt })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .innerJoin(faults, eq(faults.id, pickSets.faultId))
    .where(and(eq(faults.studyId, studyId), eq(analyses.status, "done")))
    .orderBy(faults.name, desc(pickSets.version), desc(analyses.createdAt));
  const seen = new Set<string>();
  const points: FaultScalingPoint[] = [];
  for (const row of rows) {
    if (seen.has(row.faultId) || !row.result) continue;
    seen.add(row.faultId);
    const point = faultScalingPoint(row.faultId, row.name, row.result as AnalysisReport);
    if (point) points.push(point);
  }
  return points;
}

export interface PinSummary {
  open: number;
  resolved: number;
  openPins: { id: string; body: string; author: string | null; segment: string | null; createdAt: Date }[];
}

export async function pinSummary(faultId: string): Promise<PinSummary> {
  const db = await getDb();
  const rows = await db
    .select({ id: pins.id, body: pins.body, state: pins.state, segment: pins.segmentName, createdAt: pins.createdAt, author: users.name })
    .from(pins)
    .leftJoin(users, eq(users.id, pins.authorId))
    .where(and(eq(pins.faultId, faultId), isNull(pins.deletedAt)))
    .orderBy(desc(pins.createdAt));
  const openPins = rows.filter((row) => row.state === "open").map(({ state: _state, ...row }) => row);
  return { open: openPins.length, resolved: rows.length - openPins.length, openPins };
}
