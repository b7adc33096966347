import "server-only";
import { and, count, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, faults, memberships, pickSets, studies, users } from "@/db/schema";
import type { StudyRole } from "@/lib/contracts/roles";
import { changingRoles, type StudyAccess } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { studyActivity } from "@/lib/activity/load";
import { recordAudit } from "@/lib/audit";
import type { SessionUser } from "@/lib/auth/users";
import type { FaultInput, StudyInput, StudyPatch } from "@/lib/contracts/studies";
import { faultTypeFieldErrors } from "@/lib/fault-types";
import { checkCoordinateReference, CoordinateReferenceError, type CoordinateReference } from "@/lib/crs";

export async function listStudiesFor(user: SessionUser) {
  const db = await getDb();
  const rows = await db
    .select({
      id: studies.id,
      name: studies.name,
      description: studies.description,
      createdAt: studies.createdAt,
      role: memberships.role,
    })
    .from(memberships)
    .innerJoin(studies, eq(studies.id, memberships.studyId))
    .where(eq(memberships.userId, user.id))
    .orderBy(desc(studies.createdAt));
  if (rows.length === 0) return [];
  const faultCounts = await db
    .select({ studyId: faults.studyId, faultCount: count() })
    .from(faults)
    .where(
      inArray(
        faults.studyId,
        rows.map((row) => row.id),
      ),
    )
    .groupBy(faults.studyId);
  const countByStudy = new Map(faultCounts.map((row) => [row.studyId, row.faultCount]));
  return rows.map((row) => ({ ...row, faultCount: countByStudy.get(row.id) ?? 0 }));
}

export async function createStudy(user: SessionUser, input: StudyInput) {
  const db = await getDb();
  const study = await changingRoles(() =>
    db.transaction(async (tx) => {
      const [created] = await tx
        .insert(studies)
        .values({ ...input, createdBy: user.id })
        .returning();
      await tx.insert(memberships).values({ studyId: created.id, userId: user.id, role: "owner" });
      return created;
    }),
  );
  await recordAudit({ studyId: study.id, userId: user.id, action: "study.create", target: study.name });
  return study;
}

export async function updateStudy(access: StudyAccess, patch: StudyPatch) {
  const db = await getDb();
  const { coordinateReference: referenceInput, ...rest } = patch;
  let coordinateReference: CoordinateReference | null | undefined = undefined;
  if (referenceInput === null) coordinateReference = null;
  else if (referenceInput) {
    try {
      coordinateReference = checkCoordinateReference(referenceInput);
    } catch (error) {
      if (!(error instanceof CoordinateReferenceError)) throw error;
      throw new ApiError(400, error.message, { fieldErrors: { [`coordinateReference.${error.field}`]: [error.message] } });
    }
  }
  const values = Object.fromEntries(
    Object.entries({ ...rest, ...(coordinateReference !== undefined ? { coordinateReference } : {}) }).filter(([, value]) => value !== undefined),
  );
  if (Object.keys(values).length === 0) throw new ApiError(400, "Nothing to change: give the study's name, description or coordinate reference.");
  const [updated] = await db.update(studies).set(values).where(eq(studies.id, access.studyId)).returning();
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "study.update", details: patch });
  return updated;
}

export async function deleteStudy(access: StudyAccess) {
  const db = await getDb();
  await changingRoles(() => db.delete(studies).where(eq(studies.id, access.studyId)));
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "study.delete" });
}

export async function getStudyOverview(access: StudyAccess) {
  const db = await getDb();
  const study = await db.query.studies.findFirst({ where: eq(studies.id, access.studyId) });
  if (!study) throw new ApiError(404, "Study not found.");
  const [faultRows, people, activity] = await Promise.all([listFaults(access.studyId), listMembers(access.studyId), studyActivity(access.studyId)]);
  return { study, role: access.role, faults: faultRows, people, activity };
}

export async function listMembers(studyId: string) {
  const db = await getDb();
  return db
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.studyId, studyId))
    .orderBy(users.name);
}

export async function listFaults(studyId: string) {
  const db = await getDb();
  const latestPickSet = db
    .select({
      faultId: pickSets.faultId,
      latestVersion: sql<number>`max(${pickSets.version})`.as("latest_version"),
      pickSetCount: count().as("pick_set_count"),
    })
    .from(pickSets)
    .groupBy(pickSets.faultId)
    .as("latest_pick_set");
  const rows = await db
    .select({
      id: faults.id,
      name: faults.name,
      description: faults.description,
      sense: faults.sense,
      createdAt: faults.createdAt,
      latestVersion: latestPickSet.latestVersion,
      pickSetCount: latestPickSet.pickSetCount,
    })
    .from(faults)
    .leftJoin(latestPickSet, eq(latestPickSet.faultId, faults.id))
    .where(eq(faults.studyId, studyId))
    .orderBy(faults.name);
  const summaries = await latestAnalysisSummaries(rows.map((row) => row.id));
  return rows.map((row) => ({
    ...row,
    latestVersion: row.latestVersion === null ? null : Number(row.latestVersion),
    pickSetCount: Number(row.pickSetCount ?? 0),
    analysis: summaries.get(row.id) ?? null,
  }));
}

interface AnalysisSummary {
  status: string;
  dMaxM: number | null;
  lengthM: number | null;
  segmentCount: number | null;
}

async function latestAnalysisSummaries(faultIds: string[]): Promise<Map<string, AnalysisSummary>> {
  const summaries = new Map<string, AnalysisSummary>();
  if (faultIds.length === 0) return summaries;
  const db = await getDb();
  const rows = await db
    .select({
      faultId: pickSets.faultId,
      version: pickSets.version,
      status: analyses.status,
      createdAt: analyses.createdAt,
      dMaxM: sql<number | null>`(select max((seg->'max'->>'displacementM')::float8) from jsonb_array_elements(${analyses.result}->'segments') seg)`,
      lengthM: sql<number | null>`(select max((seg->'tipLine'->>'lengthM')::float8) from jsonb_array_elements(${analyses.result}->'segments') seg)`,
      segmentCount: sql<number | null>`jsonb_array_length(${analyses.result}->'segments')`,
    })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .where(inArray(pickSets.faultId, faultIds))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt));
  for (const row of rows) {
    if (summaries.has(row.faultId)) continue;
    summaries.set(row.faultId, {
      status: row.status,
      dMaxM: row.dMaxM === null ? null : Number(row.dMaxM),
      lengthM: row.lengthM === null ? null : Number(row.lengthM),
      segmentCount: row.segmentCount === null ? null : Number(row.segmentCount),
    });
  }
  return summaries;
}

export async function createFault(access: StudyAccess, input: FaultInput) {
  const db = await getDb();
  if (input.sense !== "oblique") input = { ...input, rakeDeg: null };
  const clash = await db.query.faults.findFirst({ where: and(eq(faults.studyId, access.studyId), eq(faults.name, input.name)) });
  if (clash) throw new ApiError(409, "A fault with this name already exists in the study.", { fieldErrors: { name: ["Name already used in this study."] } });
  const [fault] = await db
    .insert(faults)
    .values({ ...input, studyId: access.studyId, createdBy: access.user.id })
    .returning();
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "fault.create", target: fault.name, details: { faultId: fault.id } });
  return fault;
}

export async function getFault(faultId: string) {
  const db = await getDb();
  const fault = await db.query.faults.findFirst({ where: eq(faults.id, faultId) });
  if (!fault) throw new ApiError(404, "Fault not found.");
  return fault;
}

export async function updateFault(access: StudyAccess, faultId: string, patch: Partial<FaultInput>) {
  const db = await getDb();
  if (patch.name) {
    const clash = await db.query.faults.findFirst({ where: and(eq(faults.studyId, access.studyId), eq(faults.name, patch.name)) });
    if (clash && clash.id !== faultId)
      throw new ApiError(409, "A fault with this name already exists in the study.", { fieldErrors: { name: ["Name already used in this study."] } });
  }
  const current = await getFault(faultId);
  const typeChanged = (["sense", "rakeDeg", "inversion"] as const).some((key) => patch[key] !== undefined && patch[key] !== current[key]);
  if (typeChanged) {
    const sense = patch.sense ?? current.sense;
    // an oblique fault keeps its rake unless a new one is given; another type takes none (one given is an error below)
    const rakeDeg = sense === "oblique" ? (patch.rakeDeg !== undefined ? patch.rakeDeg : current.rakeDeg) : (patch.rakeDeg ?? null);
    const problems = faultTypeFieldErrors({ sense, rakeDeg });
    if (problems.length) throw new ApiError(400, problems[0].message, { fieldErrors: { rakeDeg: problems.map((problem) => problem.message) } });
    patch = { ...patch, rakeDeg };
  }
  const values = Object.fromEntries(Object.entries(patch).filter(([, value]) => value !== undefined));
  if (Object.keys(values).length === 0) throw new ApiError(400, "Nothing to change: give the fault's name, description or type (sense, rakeDeg, inversion).");
  const [updated] = await db.update(faults).set(values).where(eq(faults.id, faultId)).returning();
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "fault.update", target: updated.name, details: { ...patch, faultId } });
  // a new fault type changes how throw becomes displacement: the latest pick set is analysed again with it
  if (typeChanged) await reanalyseLatestPickSet(faultId);
  return updated;
}

/** Queues a run of the fault's newest pick set with the settings of its latest run (none when it has no picks yet). */
async function reanalyseLatestPickSet(faultId: string) {
  const db = await getDb();
  const [latest] = await db
    .select({ pickSetId: pickSets.id, parameters: analyses.parameters })
    .from(pickSets)
    .leftJoin(analyses, eq(analyses.pickSetId, pickSets.id))
    .where(eq(pickSets.faultId, faultId))
    .orderBy(desc(pickSets.version), desc(analyses.createdAt))
    .limit(1);
  if (!latest) return;
  const { rerunAnalysis } = await import("@/lib/analysis/runner");
  const { parseAnalysisSettings } = await import("@/lib/contracts/analysis-settings");
  let settings = {};
  try {
    settings = parseAnalysisSettings(latest.parameters ?? {});
  } catch {
    // settings stored by an older version that no longer parse: the defaults
  }
  await rerunAnalysis(faultId, latest.pickSetId, settings);
}

export async function deleteFault(access: StudyAccess, faultId: string) {
  const db = await getDb();
  const [deleted] = await changingRoles(() => db.delete(faults).where(eq(faults.id, faultId)).returning({ name: faults.name }));
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "fault.delete", target: deleted?.name ?? "", details: { faultId } });
}

export async function changeRole(access: StudyAccess, userId: string, role: StudyRole) {
  const db = await getDb();
  await changingRoles(() =>
    db.transaction(async (tx) => {
      const current = await tx.query.memberships.findFirst({ where: and(eq(memberships.studyId, access.studyId), eq(memberships.userId, userId)) });
      if (!current) throw new ApiError(404, "That person is not a member of this study.");
      if (current.role === "owner" && role !== "owner") await assertAnotherOwner(tx, access.studyId);
      await tx
        .update(memberships)
        .set({ role })
        .where(and(eq(memberships.studyId, access.studyId), eq(memberships.userId, userId)));
    }),
  );
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "member.role", target: userId, details: { role } });
}

export async function removeMember(access: StudyAccess, userId: string) {
  const db = await getDb();
  await changingRoles(() =>
    db.transaction(async (tx) => {
      const current = await tx.query.memberships.findFirst({ where: and(eq(memberships.studyId, access.studyId), eq(memberships.userId, userId)) });
      if (!current) throw new ApiError(404, "That person is not a member of this study.");
      if (current.role === "owner") await assertAnotherOwner(tx, access.studyId);
      await tx.delete(memberships).where(and(eq(memberships.studyId, access.studyId), eq(memberships.userId, userId)));
    }),
  );
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "member.remove", target: userId });
}

type Tx = Parameters<Parameters<Awaited<ReturnType<typeof getDb>>["transaction"]>[0]>[0];

async function assertAnotherOwner(tx: Tx, studyId: string) {
  const [{ owners }] = await tx
    .select({ owners: count() })
    .from(memberships)
    .where(and(eq(memberships.studyId, studyId), eq(memberships.role, "owner")));
  if (Number(owners) <= 1) throw new ApiError(409, "A study needs at least one owner: make someone else owner first.");
}
