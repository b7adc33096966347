"use client";
// Placeholder until saved viewpoints land: save / restore / share camera views of this fault.
import type { StudyRole } from "@/db/schema";

export function ViewpointsBar(_props: { faultId: string; role: StudyRole }) {
  return null;
}
