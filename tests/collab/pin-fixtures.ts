import { getDb } from "@/db/client";
import { analyses, pickSets, pins } from "@/db/schema";
import type { StudyRole } from "@/lib/contracts/roles";
import type { AnalysisReport } from "@/lib/contracts/report";

/** Gives a fault a finished analysis (pick set vN with the named segments), as pins need one. */
export async function giveFaultDoneAnalysis(faultId: string, { version = 1, segments = ["north", "south"] } = {}) {
  const db = await getDb();
  const [pickSet] = await db
    .insert(pickSets)
    .values({
      faultId,
      version,
      fileName: `picks-v${version}.csv`,
      checksum: `checksum-${faultId}-${version}`,
      sizeBytes: 10,
      rowCount: 1,
      units: "m",
      segmentNames: segments,
      horizonNames: [],
      picks: new Uint8Array([0]),
    })
    .returning();
  await db.insert(analyses).values({
    pickSetId: pickSet.id,
    status: "done",
    stage: "done",
    progress: 1, // a stub report: pins need only the segment names
    result: { segments: segments.map((id) => ({ id })) } as unknown as AnalysisReport,
  });
  return pickSet;
}

export const pinBody = (body = "Throw jumps here: mis-pick?") => ({ x: 462_400, y: 6_731_800, z: -2_150, s: 120, t: 340, segmentId: "north", body });

/** A pin written straight to the database by `authorId` (for tests of what others may do with it). */
export async function insertPin(faultId: string, authorId: string, body = "A note") {
  const db = await getDb();
  const [pin] = await db.insert(pins).values({ faultId, authorId, x: 1, y: 2, z: 3, s: 4, t: 5, segmentName: "north", pickSetVersion: 1, body }).returning();
  return pin;
}

export const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];
