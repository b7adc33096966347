import "server-only";
// A study's stratigraphy table and a fault's cut-off sets: what the juxtaposition diagram and the shale gouge ratio
// are drawn from.
import { and, desc, eq, sql } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { cutoffSets, pickSets, stratigraphyTables, users } from "@/db/schema";
import type { StudyAccess } from "@/lib/access";
import { recordAudit } from "@/lib/audit";
import type { StratigraphyUnit } from "@/lib/engine/juxtaposition";
import type { stratigraphySchema } from "@/lib/contracts/seal";

export interface StratigraphyView {
  units: StratigraphyUnit[];
  version: number;
  updatedAt: string | null;
  updatedBy: { name: string } | null;
}

export async function getStratigraphy(studyId: string): Promise<StratigraphyView> {
  const db = await getDb();
  const [row] = await db
    .select({ table: stratigraphyTables, name: users.name })
    .from(stratigraphyTables)
    .leftJoin(users, eq(users.id, stratigraphyTables.updatedBy))
    .where(eq(stratigraphyTables.studyId, studyId));
  if (!row) return { units: [], version: 0, updatedAt: null, updatedBy: null };
  return { units: row.table.units, version: row.table.version, updatedAt: row.table.updatedAt.toISOString(), updatedBy: row.name ? { name: row.name } : null };
}

/** Replaces the study's table (the version counts up), in one statement. */
export async function saveStratigraphy(access: StudyAccess, input: z.infer<typeof stratigraphySchema>): Promise<StratigraphyView> {
  const db = await getDb();
  const [saved] = await db
    .insert(stratigraphyTables)
    .values({ studyId: access.studyId, units: input.units, version: 1, updatedBy: access.user.id })
    .onConflictDoUpdate({
      target: stratigraphyTables.studyId,
      set: { units: input.units, version: sqlIncrement(), updatedBy: access.user.id, updatedAt: new Date() },
    })
    .returning();
  await recordAudit({
    studyId: access.studyId,
    userId: access.user.id,
    action: "stratigraphy.set",
    target: `version ${saved.version}`,
    details: { version: saved.version, units: input.units.length },
  });
  return { units: saved.units, version: saved.version, updatedAt: saved.updatedAt.toISOString(), updatedBy: { name: access.user.name } };
}

function sqlIncrement() {
  return sql`${stratigraphyTables.version} + 1`;
}

/**
 * The cut-off set behind a pick set, when it was derived from one; otherwise (or with no pick set named) the fault's
 * newest cut-off set. Null when the fault has none.
 */
export async function cutoffSetForFault(faultId: string, pickSetId?: string) {
  const db = await getDb();
  const columns = {
    id: cutoffSets.id,
    pickSetId: cutoffSets.pickSetId,
    pickSetVersion: pickSets.version,
    fileName: cutoffSets.fileName,
    checksum: cutoffSets.checksum,
    sizeBytes: cutoffSets.sizeBytes,
    vertexCount: cutoffSets.vertexCount,
    domain: cutoffSets.domain,
    velocityModel: cutoffSets.velocityModel,
    stationSpacingM: cutoffSets.stationSpacingM,
    rakeDeg: cutoffSets.rakeDeg,
    summary: cutoffSets.summary,
    uploadedAt: cutoffSets.uploadedAt,
  };
  const query = () => db.select(columns).from(cutoffSets).innerJoin(pickSets, eq(pickSets.id, cutoffSets.pickSetId));
  if (pickSetId) {
    const [own] = await query().where(and(eq(cutoffSets.faultId, faultId), eq(cutoffSets.pickSetId, pickSetId)));
    if (own) return { ...own, ofShownPickSet: true };
  }
  const [newest] = await query().where(eq(cutoffSets.faultId, faultId)).orderBy(desc(pickSets.version)).limit(1);
  return newest ? { ...newest, ofShownPickSet: newest.pickSetId === pickSetId } : null;
}
