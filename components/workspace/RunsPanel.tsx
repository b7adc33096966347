"use client";
// Runs of the analysis of one pick set, kept beside each other: which one the workspace shows, the interpreter's
// settings for another run, and two runs picked for a side-by-side comparison.
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import { analysisSettingsSchema, describeSettings } from "@/lib/contracts/analysis-settings";
import { AUTOMATIC_CANDIDATES } from "@/lib/engine/profiles";
import type { AnalysisRunsResponse } from "@/lib/contracts/analysis";
import type { AnalysisSettings } from "@/lib/contracts/analysis-settings";
import type { AnalysisReport, TipEndSide } from "@/lib/contracts/report";
import { metres, metresWithRange, MODEL_NAMES } from "@/lib/format";

export function useRuns(faultId: string, pickSetId: string | undefined) {
  return useQuery({
    queryKey: ["runs", faultId, pickSetId ?? "latest"],
    queryFn: () => apiFetch<AnalysisRunsResponse>(`/api/faults/${faultId}/analysis/runs${pickSetId ? `?pickSet=${pickSetId}` : ""}`),
    refetchInterval: (query) => (query.state.data?.runs.some((run) => run.status === "queued" || run.status === "running") ? 1000 : false),
  });
}

const SIDES: [TipEndSide, string][] = [
  ["strike-start", "Strike start"],
  ["strike-end", "Strike end"],
  ["up-dip", "Up dip"],
  ["down-dip", "Down dip"],
];

/** The form's text fields as settings: blank means "the default". */
function settingsFromForm(form: FormState): AnalysisSettings {
  const number = (text: string) => (text.trim() === "" ? undefined : Number(text));
  const ends: AnalysisSettings["ends"] = {};
  for (const [side] of SIDES) if (form.ends[side] !== "detect") ends[side] = form.ends[side] as "open" | "inferred";
  return {
    throwCutoffM: number(form.cutoff),
    profiles: form.profile === "auto" ? undefined : [form.profile as (typeof AUTOMATIC_CANDIDATES)[number]],
    ends: Object.keys(ends).length ? ends : undefined,
    intervalM: number(form.interval),
    smoothingM: number(form.smoothing),
  };
}

interface FormState {
  cutoff: string;
  profile: string;
  ends: Record<TipEndSide, string>;
  interval: string;
  smoothing: string;
}

function formFrom(settings: AnalysisSettings | null | undefined): FormState {
  return {
    cutoff: settings?.throwCutoffM?.toString() ?? "",
    profile: settings?.profiles?.length === 1 ? settings.profiles[0] : "auto",
    ends: {
      "strike-start": settings?.ends?.["strike-start"] ?? "detect",
      "strike-end": settings?.ends?.["strike-end"] ?? "detect",
      "up-dip": settings?.ends?.["up-dip"] ?? "detect",
      "down-dip": settings?.ends?.["down-dip"] ?? "detect",
    },
    interval: settings?.intervalM?.toString() ?? "",
    smoothing: settings?.smoothingM?.toString() ?? "",
  };
}

export function RunsPanel(props: {
  faultId: string;
  pickSetId: string;
  report: AnalysisReport;
  shownId: string;
  canEdit: boolean;
  onShow: (analysisId: string) => void;
  onCompare: (ids: [string, string]) => void;
}) {
  const { faultId, pickSetId, report, shownId, canEdit } = props;
  const runs = useRuns(faultId, pickSetId);
  const queryClient = useQueryClient();
  const [form, setForm] = useState<FormState>(() => formFrom(report.settings));
  const [picked, setPicked] = useState<string[]>([]);
  const [problem, setProblem] = useState<string | null>(null);
  const rerun = useMutation({
    mutationFn: (settings: AnalysisSettings) =>
      apiFetch<{ analysisId: string }>(`/api/faults/${faultId}/analysis/rerun`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ pickSetId, settings }),
      }),
    onSuccess: ({ analysisId }) => {
      void queryClient.invalidateQueries({ queryKey: ["runs", faultId] });
      props.onShow(analysisId);
    },
    onError: (error: Error) => setProblem(error.message),
  });
  const estimatedCutoff = report.segments
    .map((segment) => (segment.tipLine.cutoff ? segment.tipLine.cutoff.displacementM * Math.sin((segment.plane.dipDeg * Math.PI) / 180) : NaN))
    .filter(Number.isFinite);

  function submit(event: React.FormEvent) {
    event.preventDefault();
    const parsed = analysisSettingsSchema.safeParse(settingsFromForm(form));
    if (!parsed.success) {
      setProblem(parsed.error.issues.map((issue) => issue.message).join("; "));
      return;
    }
    setProblem(null);
    rerun.mutate(parsed.data);
  }
  const togglePick = (id: string) => setPicked((now) => (now.includes(id) ? now.filter((x) => x !== id) : [...now.slice(-1), id]));
  const list = runs.data?.runs ?? [];

  return (
    <div className="space-y-4 text-sm" data-testid="runs-panel">
      <section>
        <h3 className="mb-1 font-semibold">Runs of this pick set</h3>
        <p className="mb-2 text-xs text-slate-500">Every run is kept. Show one, or tick two to compare their tip lines and fault sheets side by side.</p>
        <ol className="space-y-2">
          {list.map((run, index) => (
            <li
              key={run.id}
              className={`rounded border p-2 ${run.id === shownId ? "border-slip-500" : "border-slate-200 dark:border-slate-800"}`}
              data-testid="run-row"
            >
              <div className="flex items-center justify-between gap-2">
                <label className="flex items-center gap-2">
                  <input
                    type="checkbox"
                    checked={picked.includes(run.id)}
                    onChange={() => togglePick(run.id)}
                    disabled={run.status !== "done"}
                    data-testid="run-pick"
                  />
                  <span className="font-medium">Run {list.length - index}</span>
                  <span className="text-xs text-slate-500">{new Date(run.createdAt).toLocaleString()}</span>
                </label>
                {run.id === shownId ? (
                  <span className="text-xs text-slip-700 dark:text-slip-300">shown</span>
                ) : (
                  <button
                    className="text-xs text-slip-700 underline dark:text-slip-300"
                    onClick={() => props.onShow(run.id)}
                    disabled={run.status !== "done"}
                    data-testid="run-show"
                  >
                    {run.status === "done" ? "Show" : run.status}
                  </button>
                )}
              </div>
              <p className="mt-1 text-xs text-slate-600 dark:text-slate-300">{describeSettings(run.settings)}</p>
              {run.segments.map((segment) => (
                <p key={segment.id} className="num text-xs text-slate-500">
                  {segment.id}: L {segment.lengthRangeM ? metresWithRange(segment.lengthM, segment.lengthRangeM, 0) : metres(segment.lengthM, 0)}, fitted Dmax{" "}
                  {metres(segment.fittedDmaxM)}, {MODEL_NAMES[segment.model] ?? segment.model}
                </p>
              ))}
            </li>
          ))}
        </ol>
        <button
          className="btn-quiet mt-2"
          disabled={picked.length !== 2}
          onClick={() => props.onCompare(picked as [string, string])}
          data-testid="runs-compare"
        >
          Compare the two ticked runs
        </button>
      </section>

      {canEdit && (
        <form onSubmit={submit} className="space-y-2 border-t border-slate-200 pt-3 dark:border-slate-800" data-testid="run-settings">
          <h3 className="font-semibold">Run again with these settings</h3>
          <label className="block">
            <span className="text-xs text-slate-500">
              Resolution cut-off, as a throw (m). Blank: estimated from the picks
              {estimatedCutoff.length ? ` (this run: ${estimatedCutoff.map((v) => v.toFixed(1)).join(", ")} m)` : ""}.
            </span>
            <input
              className="field mt-0.5"
              inputMode="decimal"
              value={form.cutoff}
              onChange={(e) => setForm({ ...form, cutoff: e.target.value })}
              data-testid="setting-cutoff"
            />
          </label>
          <label className="block">
            <span className="text-xs text-slate-500">Tip-line profile</span>
            <select className="field mt-0.5" value={form.profile} onChange={(e) => setForm({ ...form, profile: e.target.value })} data-testid="setting-profile">
              <option value="auto">Automatic: compare every candidate</option>
              {AUTOMATIC_CANDIDATES.map((model) => (
                <option key={model} value={model}>
                  Only the {MODEL_NAMES[model]}
                </option>
              ))}
            </select>
          </label>
          <fieldset className="grid grid-cols-2 gap-2">
            <legend className="text-xs text-slate-500">
              Ends: detected from the picks, or your word (open where the survey or a crossing fault stops the data)
            </legend>
            {SIDES.map(([side, label]) => (
              <label key={side} className="block text-xs">
                {label}
                <select
                  className="field mt-0.5 py-1 text-xs"
                  value={form.ends[side]}
                  onChange={(e) => setForm({ ...form, ends: { ...form.ends, [side]: e.target.value } })}
                  data-testid={`setting-end-${side}`}
                >
                  <option value="detect">Detect</option>
                  <option value="open">Open</option>
                  <option value="inferred">Inferred tip</option>
                </select>
              </label>
            ))}
          </fieldset>
          <div className="grid grid-cols-2 gap-2">
            <label className="block">
              <span className="text-xs text-slate-500">Contour interval (m), blank: automatic</span>
              <input
                className="field mt-0.5"
                inputMode="decimal"
                value={form.interval}
                onChange={(e) => setForm({ ...form, interval: e.target.value })}
                data-testid="setting-interval"
              />
            </label>
            <label className="block">
              <span className="text-xs text-slate-500">Grid smoothing (m), blank: none</span>
              <input
                className="field mt-0.5"
                inputMode="decimal"
                value={form.smoothing}
                onChange={(e) => setForm({ ...form, smoothing: e.target.value })}
                data-testid="setting-smoothing"
              />
            </label>
          </div>
          {problem && (
            <p className="text-xs text-red-700 dark:text-red-300" data-testid="run-settings-problem">
              {problem}
            </p>
          )}
          <button className="btn-primary" type="submit" disabled={rerun.isPending} data-testid="run-again">
            {rerun.isPending ? "Starting…" : "Run again"}
          </button>
        </form>
      )}
    </div>
  );
}
