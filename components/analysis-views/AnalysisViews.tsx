"use client";
// Placeholder until the analysis views land: profiles, scaling chart, relay view and exports.
import type { FaultDisplay } from "@/lib/analysis/display";
import type { AnalysisReport } from "@/lib/engine/types";

export function AnalysisViews(_props: { studyId: string; faultId: string; faultName: string; report: AnalysisReport; display: FaultDisplay | null; analysisId: string }) {
  return null;
}
