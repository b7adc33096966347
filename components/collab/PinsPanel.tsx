"use client";
// Placeholder until pinned notes land: the list of comments pinned to this fault's surface.
import type { StudyRole } from "@/db/schema";
import type { FaultDisplay } from "@/lib/analysis/display";

export function PinsPanel(_props: { studyId: string; faultId: string; role: StudyRole; currentPickSetVersion: number | null; display: FaultDisplay | null }) {
  return <p className="text-sm text-slate-500">No pinned notes yet.</p>;
}
