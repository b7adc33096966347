import "server-only";
import { createHash } from "node:crypto";
import { and, desc, eq, max } from "drizzle-orm";
import type { UploadOptions } from "@/lib/contracts/analysis";
import { getDb } from "@/db/client";
import { analyses, cutoffSets, faults, pickSets, segments } from "@/db/schema";
import type { PickSetProvenance } from "@/lib/contracts/seal";
import { faultKinematics } from "@/lib/fault-types";
import type { FaultKinematics } from "@/lib/engine/types";
import type { StudyAccess } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { recordAudit } from "@/lib/audit";
import { queueAnalysisJob, scheduleAnalysis } from "./runner";
import { parseUploadOffThread } from "./worker-pool";
import { checkUploadSize, UploadProblem, type UploadParseOutput } from "./upload-parse";
import { MAX_MISSING_LISTED } from "@/lib/engine/cutoff-stations";

export { MAX_ROWS, MAX_UPLOAD_BYTES } from "./upload-parse";

const PREVIEW_ROWS = 20;
export const PROBLEM_PAGE_SIZE = 50;

export interface UploadedFile {
  name: string;
  bytes: Uint8Array;
}

function checksumOf(bytes: Uint8Array) {
  return createHash("sha256").update(bytes).digest("hex");
}

/** The file read in the worker pool (lib/analysis/upload-parse.ts); its problems come back as API errors. */
async function parseUpload(file: UploadedFile, options: UploadOptions, kinematics: FaultKinematics, encode = false): Promise<UploadParseOutput> {
  try {
    checkUploadSize(file.name, file.bytes);
    // an oblique fault's cut-offs are paired along its own slip line unless the upload sets a rake
    const rakeDeg = options.rakeDeg ?? (kinematics.sense === "oblique" && kinematics.rakeDeg !== undefined ? Math.abs(kinematics.rakeDeg) : undefined);
    return await parseUploadOffThread({
      output: "parse",
      name: file.name,
      bytes: file.bytes,
      units: options.units,
      dropBadRows: options.dropBadRows,
      encode,
      kinematics,
      velocityModel: options.velocityModel,
      cutoffs: { stationSpacingM: options.stationSpacingM, rakeDeg, orderAlongStrike: options.orderAlongStrike, sense: cutoffSense(kinematics) },
    });
  } catch (error) {
    if (error instanceof UploadProblem) throw new ApiError(error.status, error.message, error.details);
    throw error;
  }
}

/** The fault's type: it decides which throws (negative only on an inverted fault) and rakes a file may hold. */
async function faultTypeOf(faultId: string): Promise<FaultKinematics> {
  const db = await getDb();
  const fault = await db.query.faults.findFirst({ where: eq(faults.id, faultId), columns: { sense: true, rakeDeg: true, inversion: true } });
  return fault ? faultKinematics(fault) : { sense: "normal" };
}

/** Which wall a cut-off file's hanging wall moved: up on a reverse fault and a reverse-oblique one (positive rake). */
function cutoffSense(kinematics: FaultKinematics): "normal" | "reverse" {
  return kinematics.sense === "reverse" || (kinematics.sense === "oblique" && (kinematics.rakeDeg ?? -90) > 0) ? "reverse" : "normal";
}

/** Parses without saving and returns what the interpreter needs to decide: a sample, every problem (paged), duplicates. */
export async function previewUpload(access: StudyAccess & { faultId: string }, file: UploadedFile, options: UploadOptions) {
  // The preview always lists every problem row next to the usable picks; the choice to drop them is made on confirm.
  const { parsed, kind, domain, cutoffs } = await parseUpload(file, { ...options, dropBadRows: true }, await faultTypeOf(access.faultId));
  const checksum = checksumOf(file.bytes);
  const db = await getDb();
  const sameFile = await db.query.pickSets.findFirst({
    where: and(eq(pickSets.faultId, access.faultId), eq(pickSets.checksum, checksum)),
    columns: { version: true, uploadedAt: true },
  });
  const { picks } = parsed;
  const sampleCount = Math.min(PREVIEW_ROWS, picks.x.length);
  const sample = Array.from({ length: sampleCount }, (_, index) => ({
    row: picks.sourceRow[index],
    x: picks.x[index],
    y: picks.y[index],
    z: picks.z[index],
    throwM: picks.throwM[index],
    segment: picks.segmentNames[picks.segment[index]],
    horizon: picks.horizon[index] >= 0 ? picks.horizonNames[picks.horizon[index]] : null,
  }));
  const start = options.problemPage * PROBLEM_PAGE_SIZE;
  return {
    fileName: file.name,
    sizeBytes: file.bytes.byteLength,
    checksum,
    units: options.units,
    rows: parsed.rows,
    accepted: parsed.accepted,
    segments: picks.segmentNames,
    horizons: picks.horizonNames,
    sample,
    problems: parsed.rejected.slice(start, start + PROBLEM_PAGE_SIZE),
    problemCount: parsed.rejected.length,
    problemsTruncated: parsed.rejectedTruncated,
    problemPage: options.problemPage,
    problemPageSize: PROBLEM_PAGE_SIZE,
    warnings: parsed.warnings,
    duplicateOfVersion: sameFile?.version ?? null,
    kind,
    domain,
    velocityModel: domain === "time" ? options.velocityModel : null,
    cutoffs: cutoffs
      ? {
          rows: cutoffs.rows,
          vertexCount: cutoffs.vertexCount,
          stationSpacingM: cutoffs.summary.stationSpacingM,
          stationSpacingSource: cutoffs.summary.stationSpacingSource,
          rakeDeg: cutoffs.summary.rakeDeg,
          horizons: cutoffs.summary.horizons,
          missingStations: cutoffs.summary.missingStations,
          missing: cutoffs.summary.missing.slice(0, 50),
        }
      : null,
  };
}

/** Saves the pick set, its segments, a queued analysis and its job in one transaction, then wakes the workers. */
export async function confirmUpload(access: StudyAccess & { faultId: string }, file: UploadedFile, options: UploadOptions) {
  const { parsed, encoded, kind, domain, cutoffs } = await parseUpload(file, options, await faultTypeOf(access.faultId), true);
  if (parsed.rejected.length > 0 && !options.dropBadRows) {
    throw new ApiError(422, `${parsed.rejected.length}${parsed.rejectedTruncated ? "+" : ""} rows have problems. Fix them, or choose to drop the bad rows.`, {
      rejected: parsed.rejected.slice(0, PROBLEM_PAGE_SIZE),
    });
  }
  const checksum = checksumOf(file.bytes);
  const velocityModel = domain === "time" ? (options.velocityModel ?? null) : null;
  const derivedFrom: PickSetProvenance | null = cutoffs
    ? {
        kind: "cutoffs",
        fileName: file.name.slice(0, 255),
        checksum,
        stationSpacingM: cutoffs.summary.stationSpacingM,
        stationSpacingSource: cutoffs.summary.stationSpacingSource,
        rakeDeg: cutoffs.summary.rakeDeg,
      }
    : null;
  const db = await getDb();
  // the pick set, its cut-off set (for a cut-off file), the analysis and its job land together or not at all
  const { pickSet, analysis } = await db.transaction(async (tx) => {
    // uploads to one fault take their version numbers one at a time (on a PostgreSQL server they arrive concurrently,
    // through several web processes)
    await tx.select({ id: faults.id }).from(faults).where(eq(faults.id, access.faultId)).for("update");
    const [{ latest }] = await tx
      .select({ latest: max(pickSets.version) })
      .from(pickSets)
      .where(eq(pickSets.faultId, access.faultId));
    for (const name of parsed.picks.segmentNames) {
      await tx.insert(segments).values({ faultId: access.faultId, name }).onConflictDoNothing();
    }
    const [pickSet] = await tx
      .insert(pickSets)
      .values({
        faultId: access.faultId,
        version: Number(latest ?? 0) + 1,
        fileName: file.name.slice(0, 255),
        checksum,
        sizeBytes: file.bytes.byteLength,
        rowCount: parsed.accepted,
        droppedRows: parsed.rejected.length,
        units: options.units,
        segmentNames: parsed.picks.segmentNames,
        horizonNames: parsed.picks.horizonNames,
        picks: encoded!,
        velocityModel,
        derivedFrom,
        uploadedBy: access.user.id,
      })
      .returning({ id: pickSets.id, version: pickSets.version });
    if (cutoffs) {
      await tx.insert(cutoffSets).values({
        faultId: access.faultId,
        pickSetId: pickSet.id,
        fileName: file.name.slice(0, 255),
        checksum,
        sizeBytes: file.bytes.byteLength,
        vertexCount: cutoffs.vertexCount,
        domain,
        velocityModel,
        stationSpacingM: cutoffs.summary.stationSpacingM,
        rakeDeg: cutoffs.summary.rakeDeg,
        vertices: cutoffs.encodedVertices!,
        summary: { ...cutoffs.summary, missing: cutoffs.summary.missing.slice(0, MAX_MISSING_LISTED) },
        uploadedBy: access.user.id,
      });
    }
    const [analysis] = await tx.insert(analyses).values({ pickSetId: pickSet.id }).returning({ id: analyses.id });
    await queueAnalysisJob(tx, analysis.id);
    return { pickSet, analysis };
  });
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "pickset.upload",
    target: `${file.name} (v${pickSet.version})`,
    details: {
      faultId: access.faultId,
      rows: parsed.accepted,
      dropped: parsed.rejected.length,
      checksum,
      ...(kind === "cutoffs" ? { derivedFrom: "cutoffs" } : {}),
      ...(velocityModel ? { depthConverted: true } : {}),
    },
  });
  scheduleAnalysis(analysis.id);
  return { pickSetId: pickSet.id, version: pickSet.version, analysisId: analysis.id };
}

export async function listPickSets(faultId: string) {
  const db = await getDb();
  return db
    .select({
      id: pickSets.id,
      version: pickSets.version,
      fileName: pickSets.fileName,
      checksum: pickSets.checksum,
      sizeBytes: pickSets.sizeBytes,
      rowCount: pickSets.rowCount,
      droppedRows: pickSets.droppedRows,
      units: pickSets.units,
      velocityModel: pickSets.velocityModel,
      derivedFrom: pickSets.derivedFrom,
      uploadedAt: pickSets.uploadedAt,
      uploadedBy: pickSets.uploadedBy,
    })
    .from(pickSets)
    .where(eq(pickSets.faultId, faultId))
    .orderBy(desc(pickSets.version));
}
