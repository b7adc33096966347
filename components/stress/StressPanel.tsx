"use client";
// Placeholder until the reactivation screen lands.
import type { StudyRole } from "@/db/schema";
import type { FaultDisplay } from "@/lib/analysis/display";

export function StressPanel(_props: { studyId: string; faultId: string; role: StudyRole; display: FaultDisplay | null; analysisId: string }) {
  return <p className="text-sm text-slate-500">No stress state yet.</p>;
}
