"use client";
// The reactivation screen's headline numbers in the fault sheet: minimum ΔP to failure and the area below the
// default thresholds. Shares its queries (and cache) with the Stress screen tab.
import { useQuery } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import { DEFAULT_THRESHOLDS_MPA } from "@/lib/stress/parameters";
import type { StressStateView } from "@/lib/contracts/stress";
import type { ScreenSummary } from "@/lib/contracts/stress";

interface StateResponse {
  current: StressStateView | null;
}

const THRESHOLDS = DEFAULT_THRESHOLDS_MPA.join(",");
const pct = (fraction: number) => (Number.isFinite(fraction) ? `${(fraction * 100).toFixed(1)} %` : "—");
const mpa = (value: number) => (Number.isFinite(value) ? `${value.toFixed(2)} MPa` : "—");

export function StressSheetSummary({ faultId, analysisId }: { faultId: string; analysisId: string }) {
  const state = useQuery({ queryKey: ["stress-state", faultId], queryFn: () => apiFetch<StateResponse>(`/api/faults/${faultId}/stress`) });
  const current = state.data?.current ?? null;
  const result = useQuery({
    // the same key as the Stress screen tab at its default smoothing length (null), so both share one request
    queryKey: ["stress-result", faultId, analysisId, current?.id, THRESHOLDS, null],
    queryFn: () =>
      apiFetch<{ summary: ScreenSummary; state: StressStateView; orientation: { lengthScaleM: number } }>(
        `/api/faults/${faultId}/stress/result?thresholds=${THRESHOLDS}`,
      ),
    enabled: Boolean(current),
  });
  return (
    <section className="mt-5" data-testid="sheet-stress">
      <h3 className="mb-2 text-sm font-semibold">Reactivation screen</h3>
      {!current ? (
        <p className="text-xs text-slate-500">{state.isLoading ? "Loading…" : "No stress state set for this fault or study yet (Stress screen tab)."}</p>
      ) : !result.data ? (
        <p className="text-xs text-slate-500">{result.isError ? result.error.message : "Screening…"}</p>
      ) : (
        <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1 text-sm">
          <dt className="text-slate-600 dark:text-slate-300">
            Min. ΔP to failure (more critical of μ {result.data.state.parameters.frictionLow}–{result.data.state.parameters.frictionHigh})
          </dt>
          <dd className="num text-right" data-testid="sheet-min-dp">
            {mpa(result.data.summary.minPressureToFailureMPa.critical)}
          </dd>
          {result.data.summary.thresholds.map((threshold) => (
            <div key={threshold.thresholdMPa} className="contents">
              <dt className="text-slate-600 dark:text-slate-300">Area with ΔP below {threshold.thresholdMPa} MPa</dt>
              <dd className="num text-right">
                {pct(threshold.fractionBothEnds)} – {pct(threshold.fractionCritical)}
              </dd>
            </div>
          ))}
        </dl>
      )}
      {current && (
        <p className="mt-2 text-xs text-slate-500">
          Stress state version {current.version}
          {result.data ? `; orientation smoothed at ${result.data.orientation.lengthScaleM} m` : ""}; screening only, see the caution in the Stress screen tab.
        </p>
      )}
    </section>
  );
}
