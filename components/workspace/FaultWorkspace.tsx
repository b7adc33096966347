"use client";
import Link from "next/link";
import { useSearchParams } from "next/navigation";
import { useState } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import { decodeFaultDisplay } from "@/lib/display/payload";
import { ANALYSIS_STAGES, type AnalysisResponse, type PickSetsResponse } from "@/lib/contracts/analysis";
import type { StudyRole } from "@/lib/contracts/roles";
import { useAnnotationStore } from "@/scene/annotationStore";
import { AnalysisViews } from "@/components/analysis-views/AnalysisViews";
import { PinsPanel } from "@/components/collab/PinsPanel";
import { StressPanel } from "@/components/stress/StressPanel";
import { StressSheetSummary } from "@/components/stress/StressSheetSummary";
import { ViewpointsBar } from "@/components/collab/ViewpointsBar";
import { SealFields } from "@/components/seal/SealFields";
import { FaultSheet } from "./FaultSheet";
import { FaultTypeEditor } from "./FaultTypeEditor";
import { FaultViewer } from "./FaultViewer";
import { UploadPanel } from "./UploadPanel";
import { RunComparison } from "./RunComparison";
import { RunsPanel } from "./RunsPanel";

/** the analysis stages in words */
const STAGE_WORDS: Record<string, string> = {
  queued: "waiting to start",
  parse: "reading the picks",
  plane: "fitting the fault plane",
  triangulate: "triangulating",
  grid: "gridding",
  contours: "contouring",
  tipline: "inferring the tip line",
  metrics: "measuring",
  relays: "relays between segments",
  done: "done",
};

type SideTab = "sheet" | "runs" | "pins" | "stress";

export function FaultWorkspace(props: { studyId: string; studyName: string; faultId: string; faultName: string; canEdit: boolean; role: StudyRole }) {
  const { faultId, canEdit } = props;
  // links from pin e-mails carry ?pin=<id>: open the notes tab on that thread
  const linkedPin = useSearchParams().get("pin");
  const [sideTab, setSideTab] = useState<SideTab>(linkedPin ? "pins" : "sheet");
  const pins = useAnnotationStore((state) => state.pins);
  const placing = useAnnotationStore((state) => state.placing);
  const setPendingHit = useAnnotationStore((state) => state.setPendingHit);
  const queryClient = useQueryClient();
  const [pickSetId, setPickSetId] = useState<string | undefined>(undefined);
  const [showUpload, setShowUpload] = useState(false);
  // a run chosen in the Runs tab (default: the newest run of the pick set), and two runs being compared
  const [runId, setRunId] = useState<string | undefined>(undefined);
  const [comparing, setComparing] = useState<[string, string] | null>(null);

  const analysis = useQuery({
    queryKey: ["analysis", faultId, pickSetId ?? "latest", runId ?? "newest"],
    queryFn: () =>
      apiFetch<AnalysisResponse>(`/api/faults/${faultId}/analysis?contours=0${pickSetId ? `&pickSet=${pickSetId}` : ""}${runId ? `&analysis=${runId}` : ""}`),
    refetchInterval: (query) => {
      const status = query.state.data?.analysis?.status;
      return status === "queued" || status === "running" ? 700 : false;
    },
  });
  const pickSets = useQuery({ queryKey: ["pick-sets", faultId], queryFn: () => apiFetch<PickSetsResponse>(`/api/faults/${faultId}/pick-sets`) });
  const current = analysis.data?.analysis ?? null;
  const display = useQuery({
    queryKey: ["display", faultId, current?.id],
    enabled: current?.status === "done",
    staleTime: Infinity,
    queryFn: async () => {
      const response = await fetch(`/api/faults/${faultId}/analysis/display?analysis=${current!.id}`);
      if (!response.ok) throw new Error("Could not load the display surface.");
      return decodeFaultDisplay(new Uint8Array(await response.arrayBuffer()));
    },
  });

  function onSaved() {
    setShowUpload(false);
    setPickSetId(undefined);
    setRunId(undefined);
    setComparing(null);
    void queryClient.invalidateQueries({ queryKey: ["analysis", faultId] });
    void queryClient.invalidateQueries({ queryKey: ["pick-sets", faultId] });
  }

  const report = current?.status === "done" ? current.result : null;
  return (
    <div className="mx-auto max-w-[1600px] px-4 py-5">
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div>
          <nav className="text-sm text-slate-500">
            <Link href="/studies" className="hover:underline">
              Studies
            </Link>{" "}
            /{" "}
            <Link href={`/studies/${props.studyId}`} className="hover:underline">
              {props.studyName}
            </Link>
          </nav>
          <h1 className="text-2xl font-semibold" data-testid="fault-title">
            {props.faultName}
          </h1>
          <FaultTypeEditor faultId={faultId} canEdit={canEdit} />
          {current && (
            <p className="text-xs text-slate-500">
              Pick set v{current.version} · {current.fileName}
              {current.derivedFrom ? " (derived from cut-off lines)" : ""} · uploaded {new Date(current.uploadedAt).toLocaleString()} · engine{" "}
              {current.engineVersion ?? "—"}
            </p>
          )}
        </div>
        <div className="flex items-center gap-2">
          {pickSets.data && pickSets.data.pickSets.length > 1 && (
            <select
              className="field w-auto py-1.5 text-sm"
              aria-label="Pick set version"
              value={pickSetId ?? ""}
              onChange={(event) => {
                setPickSetId(event.target.value || undefined);
                setRunId(undefined);
                setComparing(null);
              }}
              data-testid="pick-set-select"
            >
              <option value="">Latest version</option>
              {pickSets.data.pickSets.map((set) => (
                <option key={set.id} value={set.id}>
                  v{set.version} · {set.fileName} ({set.rowCount.toLocaleString("en")} picks{set.derivedFrom ? " from cut-offs" : ""})
                </option>
              ))}
            </select>
          )}
          {canEdit && current && (
            <button className="btn-primary" onClick={() => setShowUpload((open) => !open)} data-testid="open-upload">
              {showUpload ? "Close upload" : "Upload pick set"}
            </button>
          )}
        </div>
      </div>

      {canEdit && showUpload && (
        <div className="card mb-4 p-4">
          <UploadPanel faultId={faultId} onSaved={onSaved} />
        </div>
      )}

      {current && (current.status === "queued" || current.status === "running") && (
        <div className="card mb-4 p-4" data-testid="analysis-progress">
          <div className="mb-2 flex justify-between text-sm">
            <span>
              Analysing pick set v{current.version}: <span className="font-medium">{STAGE_WORDS[current.stage] ?? "working"}</span>
            </span>
            <span className="num text-slate-500">{Math.round(current.progress * 100)}%</span>
          </div>
          <div className="h-2 overflow-hidden rounded bg-slate-200 dark:bg-slate-800">
            <div className="h-full bg-slip-500 transition-all" style={{ width: `${Math.max(3, current.progress * 100)}%` }} />
          </div>
          <ol className="mt-2 flex flex-wrap gap-2 text-xs text-slate-500">
            {ANALYSIS_STAGES.map((stage) => (
              <li key={stage} className={stage === current.stage ? "font-semibold text-slip-700 dark:text-slip-300" : ""}>
                {STAGE_WORDS[stage]}
              </li>
            ))}
          </ol>
        </div>
      )}
      {current?.status === "failed" && (
        <div className="card mb-4 border-red-300 p-4 text-sm text-red-800 dark:text-red-200" data-testid="analysis-failed">
          The analysis failed: {current.errorMessage}
        </div>
      )}
      {analysis.isSuccess && !current && (
        <div className={`card ${canEdit ? "p-5" : "p-10 text-center"}`} data-testid="no-picks">
          <h2 className="font-semibold">No picks yet</h2>
          {canEdit ? (
            <>
              <p className="mb-4 mt-1 text-sm text-slate-500">
                Upload the throw picks of {props.faultName} to build its displacement surface, tip line and fault sheet.
              </p>
              <UploadPanel faultId={faultId} onSaved={onSaved} withExamples />
            </>
          ) : (
            <p className="mt-2 text-sm text-slate-500">An interpreter has not uploaded picks for this fault yet.</p>
          )}
        </div>
      )}

      {comparing && <RunComparison faultId={faultId} ids={comparing} onClose={() => setComparing(null)} />}
      {report && (
        <>
          <SealFields studyId={props.studyId} faultId={faultId} pickSetId={current!.pickSetId} display={display.data ?? null} />
          <div className="grid items-start gap-4 xl:grid-cols-[1fr_400px]">
            <div className="card overflow-hidden" data-testid="viewer-card">
              {display.data ? (
                <FaultViewer
                  display={display.data}
                  pins={pins}
                  onSurfaceClick={placing ? setPendingHit : undefined}
                  hint={placing ? "Click a place on the surface to pin a comment there" : undefined}
                  toolbarExtra={<ViewpointsBar faultId={faultId} role={props.role} />}
                />
              ) : (
                <div className="flex h-[600px] items-center justify-center text-sm text-slate-500">
                  {display.isError ? display.error.message : "Loading surface…"}
                </div>
              )}
            </div>
            <aside className="card max-h-[calc(100vh-7rem)] overflow-auto xl:sticky xl:top-4" data-testid="side-panel">
              <div className="sticky top-0 z-10 flex border-b border-slate-200 bg-white dark:border-slate-800 dark:bg-slate-900" role="tablist">
                {(
                  [
                    ["sheet", "Fault sheet"],
                    ["runs", "Runs"],
                    ["pins", "Pinned notes"],
                    ["stress", "Stress screen"],
                  ] as const
                ).map(([tab, label]) => (
                  <button
                    key={tab}
                    role="tab"
                    aria-selected={sideTab === tab}
                    onClick={() => setSideTab(tab)}
                    data-testid={`side-tab-${tab}`}
                    className={`flex-1 px-3 py-2 text-sm font-medium ${sideTab === tab ? "border-b-2 border-slip-600 text-slip-800 dark:text-slip-200" : "text-slate-500 hover:text-slate-800 dark:hover:text-slate-200"}`}
                  >
                    {label}
                  </button>
                ))}
              </div>
              <div className="p-4" data-testid="fault-sheet" hidden={sideTab !== "sheet"}>
                <FaultSheet report={report} velocityModel={current!.velocityModel ?? null} derivedFrom={current!.derivedFrom ?? null} />
                <StressSheetSummary faultId={faultId} analysisId={current!.id} />
              </div>
              <div className="p-4" hidden={sideTab !== "runs"}>
                {sideTab === "runs" && (
                  <RunsPanel
                    faultId={faultId}
                    pickSetId={current!.pickSetId}
                    report={report}
                    shownId={current!.id}
                    canEdit={canEdit}
                    onShow={setRunId}
                    onCompare={setComparing}
                  />
                )}
              </div>
              <div className="p-4" hidden={sideTab !== "stress"}>
                <StressPanel studyId={props.studyId} faultId={faultId} role={props.role} display={display.data ?? null} analysisId={current!.id} />
              </div>
              <div className="p-4" hidden={sideTab !== "pins"}>
                <PinsPanel
                  studyId={props.studyId}
                  faultId={faultId}
                  role={props.role}
                  currentPickSetVersion={current?.version ?? null}
                  display={display.data ?? null}
                  linkedPinId={linkedPin}
                />
              </div>
            </aside>
          </div>
          <section className="mt-4" data-testid="analysis-views">
            <AnalysisViews
              studyId={props.studyId}
              faultId={faultId}
              faultName={props.faultName}
              report={report}
              display={display.data ?? null}
              analysisId={current!.id}
              pickSetId={current!.pickSetId}
              canEdit={canEdit}
            />
          </section>
        </>
      )}
    </div>
  );
}
