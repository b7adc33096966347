"use client";
// Analysis views below the 3D viewer: strike profile, down-dip profile and growth clues, scaling chart, relays, exports.
import { useState } from "react";
import type { FaultDisplay } from "@/lib/contracts/display";
import type { AnalysisReport } from "@/lib/engine/types";
import { fileStem } from "@/lib/views/csv";
import { DipGrowthView } from "./DipGrowthView";
import { ExportView } from "./ExportView";
import { RelayView } from "./RelayView";
import { ScalingView } from "./ScalingView";
import { StrikeProfileView } from "./StrikeProfileView";
import { JuxtapositionView } from "@/components/seal/JuxtapositionView";

type Tab = "strike" | "juxtaposition" | "dip" | "scaling" | "relays" | "export";

export function AnalysisViews({
  studyId,
  faultId,
  faultName,
  report,
  display,
  analysisId,
  pickSetId,
  canEdit,
}: {
  studyId: string;
  faultId: string;
  faultName: string;
  report: AnalysisReport;
  display: FaultDisplay | null;
  analysisId: string;
  pickSetId: string;
  canEdit: boolean;
}) {
  const [tab, setTab] = useState<Tab>("strike");
  const stem = fileStem(faultName);
  const tabs: [Tab, string][] = [
    ["strike", "Strike profile"],
    ["juxtaposition", "Juxtaposition"],
    ["dip", "Down-dip & growth"],
    ["scaling", "Scaling (D–L)"],
    ...(report.segments.length >= 2 ? ([["relays", "Relays"]] as [Tab, string][]) : []),
    ["export", "Export"],
  ];
  const needsDisplay = tab === "strike" || tab === "dip" || tab === "relays";
  return (
    <div className="card" data-testid="analysis-views-panel">
      <div className="flex flex-wrap border-b border-slate-200 dark:border-slate-800" role="tablist" aria-label="Analysis views">
        {tabs.map(([key, label]) => (
          <button
            key={key}
            role="tab"
            aria-selected={tab === key}
            onClick={() => setTab(key)}
            data-testid={`view-tab-${key}`}
            className={`px-4 py-2 text-sm font-medium ${tab === key ? "border-b-2 border-slip-600 text-slip-800 dark:text-slip-200" : "text-slate-500 hover:text-slate-800 dark:hover:text-slate-200"}`}
          >
            {label}
          </button>
        ))}
      </div>
      <div className="p-4" role="tabpanel">
        {needsDisplay && !display && <p className="text-sm text-slate-500">Loading the displacement grids…</p>}
        {tab === "strike" && display && <StrikeProfileView report={report} display={display} stem={stem} />}
        {tab === "juxtaposition" && <JuxtapositionView studyId={studyId} faultId={faultId} pickSetId={pickSetId} stem={stem} canEdit={canEdit} />}
        {tab === "dip" && display && <DipGrowthView faultId={faultId} report={report} display={display} stem={stem} />}
        {tab === "scaling" && <ScalingView faultId={faultId} stem={stem} />}
        {tab === "relays" && display && <RelayView faultId={faultId} report={report} display={display} stem={stem} />}
        {tab === "export" && <ExportView studyId={studyId} faultId={faultId} faultName={faultName} stem={stem} analysisId={analysisId} />}
      </div>
    </div>
  );
}
