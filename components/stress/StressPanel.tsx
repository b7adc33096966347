"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import { roleAllows, type StudyRole } from "@/lib/contracts/roles";
import type { FaultDisplay } from "@/lib/contracts/display";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import { REGIME_LABELS, type StressStateView } from "@/lib/contracts/stress";
import { DEFAULT_STRESS_PARAMETERS, DEFAULT_THRESHOLDS_MPA, LENGTH_SCALE_LIMITS_M, parseLengthScale, parseThresholds } from "@/lib/stress/parameters";
import { STRESS_FIELD_KEYS, stressFields, type StressFieldPayload } from "@/lib/stress/fields";
import type { ScreenSummary } from "@/lib/contracts/stress";
import { useSceneSettings } from "@/scene/sceneSettingsStore";
import { azimuth } from "@/lib/format";
import { MohrPlot, PressureHistogram, type MohrData } from "./StressCharts";
import { StressForm, type StressFormValue } from "./StressForm";

interface StateResponse {
  current: StressStateView | null;
  faultVersions: StressStateView[];
  studyVersions: StressStateView[];
}

interface ResultResponse extends StressFieldPayload {
  analysisId: string;
  pickSetVersion: number;
  state: StressStateView;
  orientation: { lengthScaleM: number; defaultLengthScaleM: number; medianPickSpacingM: number; rangeStandardErrors: number };
  summary: ScreenSummary;
  skipped: { degenerate: number; aboveDatum: number };
  mohr: MohrData;
}

// above the 3D view's HTML labels, which take z-indices up to 16 777 271 (drei <Html> default range)
const DIALOG_Z_INDEX = 16_777_300;

const fmt = (value: number | null | undefined, digits = 1) => (value === null || value === undefined || !Number.isFinite(value) ? "—" : value.toFixed(digits));
const pct = (fraction: number) => (Number.isFinite(fraction) ? `${(fraction * 100).toFixed(1)} %` : "—");

/** The reactivation screen: stress state (form, versions), results, charts, 3D colour modes, exports, caution. */
export function StressPanel({
  faultId,
  role,
  display,
  analysisId,
}: {
  studyId: string;
  faultId: string;
  role: StudyRole;
  display: FaultDisplay | null;
  analysisId: string;
}) {
  const queryClient = useQueryClient();
  const canEdit = roleAllows(role, "edit");
  const [editing, setEditing] = useState(false);
  const [thresholdText, setThresholdText] = useState(DEFAULT_THRESHOLDS_MPA.join(", "));
  const thresholds = parseThresholds(thresholdText);
  const [appliedThresholds, setAppliedThresholds] = useState(DEFAULT_THRESHOLDS_MPA.join(","));
  // the smoothing length of the surface's orientation: null = the server's default for this fault
  const [appliedLength, setAppliedLength] = useState<number | null>(null);
  const lengthQuery = appliedLength === null ? "" : `&lengthScaleM=${appliedLength}`;

  const state = useQuery({ queryKey: ["stress-state", faultId], queryFn: () => apiFetch<StateResponse>(`/api/faults/${faultId}/stress`) });
  const current = state.data?.current ?? null;
  const result = useQuery({
    queryKey: ["stress-result", faultId, analysisId, current?.id, appliedThresholds, appliedLength],
    queryFn: () => apiFetch<ResultResponse>(`/api/faults/${faultId}/stress/result?thresholds=${encodeURIComponent(appliedThresholds)}${lengthQuery}`),
    placeholderData: (previous) => previous,
    enabled: Boolean(current),
    retry: (count, error) => !(error instanceof ApiRequestError && error.status < 500) && count < 2,
  });

  const save = useMutation({
    mutationFn: (value: StressFormValue) => apiFetch<{ version: number }>(`/api/faults/${faultId}/stress`, { method: "POST", json: value }),
    onSuccess: async () => {
      setEditing(false);
      await queryClient.invalidateQueries({ queryKey: ["stress-state", faultId] });
    },
  });

  // register the colour modes while results are shown; remove them when the panel goes away
  const setFields = useSceneSettings((s) => s.setFields);
  const setColourMode = useSceneSettings((s) => s.setColourMode);
  const colourMode = useSceneSettings((s) => s.colourMode);
  const fields = useMemo(
    () =>
      result.data && display
        ? stressFields(result.data, { low: result.data.state.parameters.frictionLow, high: result.data.state.parameters.frictionHigh })
        : null,
    [result.data, display],
  );
  useEffect(() => {
    setFields("stress:", fields ?? []);
  }, [fields, setFields]);
  useEffect(() => () => setFields("stress:", []), [setFields]);

  if (state.isPending) return <p className="text-sm text-slate-500">Loading the stress state…</p>;
  if (state.isError) return <p className="text-sm text-red-700 dark:text-red-300">{state.error.message}</p>;

  const showForm = canEdit && (editing || !current);
  const initial: StressFormValue = { parameters: current?.parameters ?? DEFAULT_STRESS_PARAMETERS, source: current?.source ?? "", studyWide: false };

  return (
    <div className="space-y-4 text-sm" data-testid="stress-panel">
      {!current && <StressCaution />}
      <section>
        <div className="mb-2 flex items-center justify-between">
          <h3 className="font-semibold">Stress state</h3>
          {canEdit && current && !editing && (
            <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => setEditing(true)} data-testid="stress-edit">
              New version
            </button>
          )}
        </div>
        {showForm ? (
          <StressForm
            key={current?.id ?? "new"}
            initial={initial}
            saving={save.isPending}
            serverError={save.error}
            onSubmit={(value) => save.mutate(value)}
            onCancel={current ? () => setEditing(false) : undefined}
          />
        ) : current ? (
          <StateSummary state={current} />
        ) : (
          <p className="text-slate-500" data-testid="stress-none">
            No stress state has been set for this fault or its study yet. An owner or interpreter can enter one.
          </p>
        )}
      </section>

      {current && (
        <section className="space-y-3" data-testid="stress-results">
          <h3 className="font-semibold">Screening result</h3>
          <StressCaution />
          {result.isPending && <p className="text-slate-500">Screening the fault surface…</p>}
          {result.isError && (
            <p className="text-red-700 dark:text-red-300" role="alert">
              {result.error.message}
            </p>
          )}
          {result.data && (
            <ResultBody
              data={result.data}
              faultId={faultId}
              lengthQuery={lengthQuery}
              refreshing={result.isFetching}
              onLength={setAppliedLength}
              colourMode={colourMode}
              onColour={(key) => setColourMode(key)}
              canColour={Boolean(fields)}
              thresholdText={thresholdText}
              thresholdsValid={Boolean(thresholds)}
              onThresholdText={setThresholdText}
              onApplyThresholds={() => thresholds && setAppliedThresholds(thresholds.join(","))}
            />
          )}
        </section>
      )}

      {state.data && (state.data.faultVersions.length > 0 || state.data.studyVersions.length > 0) && <VersionHistory data={state.data} />}
    </div>
  );
}

/** Always visible beside the results: what the screen is, and what it cannot see. */
function StressCaution() {
  return (
    <aside
      className="rounded-lg border border-tip-400/60 bg-amber-50 px-3 py-2.5 text-xs leading-relaxed text-amber-900 dark:border-tip-600/60 dark:bg-amber-950/40 dark:text-amber-100"
      data-testid="stress-caution"
    >
      <p>
        <strong className="font-semibold">Screening only.</strong> Slip tendency, dilation tendency and ΔP to failure here come from a generic stress state you
        enter and the interpreted fault surface. They are not a probability of an earthquake and not a site-specific engineering, safety or regulatory
        assessment. Decisions on injection, CO2 storage, geothermal operations or drilling need site-specific stress and pore-pressure data, geomechanical
        modelling, monitoring plans, compliance with local regulation and permits, and review by qualified, where required licensed, professionals.
      </p>
      <p className="mt-1.5" data-testid="stress-blind-spots">
        <strong className="font-semibold">What this screen cannot see:</strong> orientation below the smoothing length (bends, steps and roughness smaller than
        it are averaged away, and pick noise at that scale is what the orientation range measures, not removes); uncertainty in the stress state and pore
        pressure (they are taken as exact; only friction is given as a band); and faults that are not mapped — smaller faults below seismic resolution and parts
        beyond the picks may be better oriented for slip than this surface.
      </p>
    </aside>
  );
}

function StateSummary({ state }: { state: StressStateView }) {
  const p = state.parameters;
  const rows: [string, string][] = [
    ["Regime", REGIME_LABELS[p.regime]],
    ["Sv / SHmax / Shmin", `${p.verticalGradient} / ${p.maxHorizontalGradient} / ${p.minHorizontalGradient} MPa/km`],
    ["SHmax azimuth", azimuth(p.maxHorizontalAzimuthDeg, 0)],
    ["Pore pressure", `${p.porePressureGradient} MPa/km`],
    ["Friction μ", `${p.frictionLow}–${p.frictionHigh}`],
    ["Cohesion", `${p.cohesionMPa} MPa`],
    ["Reference depth", `${p.referenceDepthM} m`],
    ["Source", state.source || "not given"],
  ];
  return (
    <div data-testid="stress-state">
      <p className="mb-1 text-xs text-slate-500">
        {state.scope === "study" ? "Study-wide default" : "This fault"}, version {state.version}, set by{" "}
        {state.setBy?.name || state.setBy?.email || "a former member"} on {new Date(state.createdAt).toLocaleString()}
      </p>
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-xs">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-slate-500">{k}</dt>
            <dd className="font-mono">{v}</dd>
          </div>
        ))}
      </dl>
    </div>
  );
}

function ResultBody(props: {
  data: ResultResponse;
  faultId: string;
  lengthQuery: string;
  refreshing: boolean;
  onLength: (lengthM: number | null) => void;
  colourMode: string;
  canColour: boolean;
  onColour: (key: string) => void;
  thresholdText: string;
  thresholdsValid: boolean;
  onThresholdText: (text: string) => void;
  onApplyThresholds: () => void;
}) {
  const { summary, state, orientation } = props.data;
  const p = state.parameters;
  const [enlarged, setEnlarged] = useState(false);
  const colourButtons: [string, string][] = [
    [STRESS_FIELD_KEYS.slip, "Slip tendency"],
    [STRESS_FIELD_KEYS.dilation, "Dilation tendency"],
    [STRESS_FIELD_KEYS.dp, "ΔP to failure"],
  ];
  const dp = summary.minPressureToFailureMPa;
  const charts = (
    <>
      <figure>
        <figcaption className="text-xs font-medium">ΔP to failure over the fault area (area-weighted; dashed: thresholds)</figcaption>
        <PressureHistogram
          histogram={summary.histogram}
          parameters={p}
          thresholdsMPa={summary.thresholds.map((t) => t.thresholdMPa)}
          height={enlarged ? 320 : 220}
        />
      </figure>
      <figure>
        <figcaption className="text-xs font-medium">
          Mohr plot: {props.data.mohr.effectiveNormalMPa.length.toLocaleString()} of {props.data.mohr.total.toLocaleString()} triangles, Coulomb envelopes for μ{" "}
          {p.frictionLow} and {p.frictionHigh}, Mohr circles at {summary.reference.depthM} m
        </figcaption>
        <MohrPlot mohr={props.data.mohr} parameters={p} reference={summary.reference} height={enlarged ? 440 : 300} />
      </figure>
    </>
  );
  return (
    <>
      <LengthScaleControl key={orientation.lengthScaleM} orientation={orientation} refreshing={props.refreshing} onLength={props.onLength} />
      <p data-testid="stress-summary" className="leading-relaxed">
        {summary.sentence}
      </p>
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-xs" data-testid="stress-figures">
        <dt className="text-slate-500">Minimum ΔP to failure</dt>
        <dd className="font-mono" data-testid="stress-min-dp">
          {fmt(dp.critical, 2)} MPa at the more critical μ ({fmt(dp.criticalRange[0], 2)} to {fmt(dp.criticalRange[1], 2)} MPa within the orientation range);{" "}
          {fmt(dp.low, 2)} MPa at μ {p.frictionLow}, {fmt(dp.high, 2)} MPa at μ {p.frictionHigh}
        </dd>
        {summary.thresholds.map((t) => (
          <div key={t.thresholdMPa} className="contents">
            <dt className="text-slate-500">Area with ΔP &lt; {t.thresholdMPa} MPa</dt>
            <dd className="font-mono">
              {pct(t.fractionBothEnds)} (both μ) – {pct(t.fractionCritical)} (more critical μ)
            </dd>
          </div>
        ))}
        <dt className="text-slate-500">Max. slip tendency τ/σn′</dt>
        <dd className="font-mono">
          {fmt(summary.slipTendency.max, 3)}, up to {fmt(summary.slipTendency.maxWithinOrientationRange, 3)} within the orientation range (any plane at{" "}
          {summary.reference.depthM} m: ≤ {fmt(summary.reference.maxPossibleSlipTendency, 3)})
        </dd>
        <dt className="text-slate-500">Max. dilation tendency</dt>
        <dd className="font-mono">{fmt(summary.dilationTendency.max, 3)}</dd>
        <dt className="text-slate-500">Orientation range</dt>
        <dd className="font-mono" data-testid="stress-orientation-range">
          ±{fmt(summary.orientation.medianUncertaintyDeg, 2)}° (median; {orientation.rangeStandardErrors} standard errors); unsmoothed slopes scatter{" "}
          {fmt(summary.orientation.medianSlopeScatterDeg, 1)}° within a window
        </dd>
        <dt className="text-slate-500">At {summary.reference.depthM} m</dt>
        <dd className="font-mono">
          σ1 {fmt(summary.reference.sigma1MPa)}, σ2 {fmt(summary.reference.sigma2MPa)}, σ3 {fmt(summary.reference.sigma3MPa)}, Pp{" "}
          {fmt(summary.reference.porePressureMPa)} MPa
        </dd>
        <dt className="text-slate-500">Triangles</dt>
        <dd className="font-mono">
          {summary.triangleCount.toLocaleString()} screened
          {props.data.skipped.degenerate + props.data.skipped.aboveDatum > 0
            ? `, ${props.data.skipped.degenerate} slivers and ${props.data.skipped.aboveDatum} above the datum left out`
            : ""}
          ; pick set v{props.data.pickSetVersion}, stress v{state.version}
        </dd>
      </dl>
      {(summary.failingFraction.critical > 0 || summary.failingFraction.withinOrientationRange > 0 || summary.slipTendency.max >= 0.6) && (
        <p
          className="rounded border border-red-300 bg-red-50 px-2 py-1 text-xs text-red-800 dark:border-red-800 dark:bg-red-950/40 dark:text-red-200"
          data-testid="stress-warning"
        >
          {summary.failingFraction.critical > 0
            ? `Under these inputs failure is already predicted on ${pct(summary.failingFraction.critical)} of the area at the more critical end of μ ${p.frictionLow}–${p.frictionHigh} (${pct(summary.failingFraction.bothEnds)} at both ends).`
            : summary.failingFraction.withinOrientationRange > 0
              ? `No part is at failure with its fitted orientation, but ${pct(summary.failingFraction.withinOrientationRange)} of the area could be within its orientation range.`
              : `Slip tendency reaches ${fmt(summary.slipTendency.max, 2)} (≥ 0.6): parts of the fault are close to frictional sliding for common friction values (Byerlee 1978).`}{" "}
          Check the inputs; a ±0.1 change in μ can flip this verdict.
        </p>
      )}
      <div className="flex flex-wrap items-end gap-2 text-xs">
        <label className="font-medium">
          Thresholds (MPa, comma-separated)
          <input
            className="field mt-1 w-40 font-mono"
            value={props.thresholdText}
            onChange={(e) => props.onThresholdText(e.target.value)}
            aria-invalid={!props.thresholdsValid}
            data-testid="stress-thresholds"
          />
        </label>
        <button type="button" className="btn-quiet px-2 py-1" disabled={!props.thresholdsValid} onClick={props.onApplyThresholds}>
          Apply
        </button>
        {!props.thresholdsValid && <span className="field-error">Up to 10 numbers in MPa, e.g. 1, 2, 5</span>}
      </div>
      <div>
        <p className="mb-1 text-xs font-medium">Colour the 3D surface by</p>
        <div className="flex flex-wrap gap-1">
          {colourButtons.map(([key, label]) => (
            <button
              key={key}
              type="button"
              disabled={!props.canColour}
              aria-pressed={props.colourMode === key}
              className={`rounded border px-2 py-0.5 text-xs ${props.colourMode === key ? "border-slip-600 bg-slip-50 text-slip-800 dark:bg-slip-950 dark:text-slip-200" : "border-slate-300 hover:bg-slate-100 dark:border-slate-700 dark:hover:bg-slate-800"}`}
              onClick={() => props.onColour(key)}
              data-testid={`stress-colour-${key.slice("stress:".length)}`}
            >
              {label}
            </button>
          ))}
          <button
            type="button"
            className="rounded border border-slate-300 px-2 py-0.5 text-xs hover:bg-slate-100 dark:border-slate-700 dark:hover:bg-slate-800"
            onClick={() => props.onColour("displacement")}
          >
            Displacement
          </button>
        </div>
      </div>
      <div className="flex items-center justify-between">
        <span className="text-xs font-medium">Charts</span>
        <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => setEnlarged(true)} data-testid="stress-enlarge">
          Enlarge
        </button>
      </div>
      {!enlarged && charts}
      {enlarged && (
        <div
          className="fixed inset-0 flex items-center justify-center bg-slate-900/50 p-4"
          style={{ zIndex: DIALOG_Z_INDEX }}
          role="dialog"
          aria-modal="true"
          aria-label="Reactivation screen charts"
          onClick={() => setEnlarged(false)}
        >
          <div className="card max-h-full w-full max-w-4xl space-y-4 overflow-auto p-4" onClick={(e) => e.stopPropagation()}>
            <div className="flex items-center justify-between">
              <h3 className="font-semibold">
                Reactivation screen — pick set v{props.data.pickSetVersion}, stress v{state.version}, smoothing {orientation.lengthScaleM} m
              </h3>
              <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => setEnlarged(false)}>
                Close
              </button>
            </div>
            <StressCaution />
            {charts}
          </div>
        </div>
      )}
      <div className="flex flex-wrap gap-3 text-xs">
        <a className="underline" href={`/api/faults/${props.faultId}/stress/export?format=csv${props.lengthQuery}`} download data-testid="stress-export-csv">
          Per-triangle values (CSV)
        </a>
        <a
          className="underline"
          href={`/api/faults/${props.faultId}/stress/export?format=geojson${props.lengthQuery}`}
          download
          data-testid="stress-export-geojson"
        >
          Triangles (GeoJSON)
        </a>
      </div>
      <p className="text-xs text-slate-500">
        Per triangle of the picks&apos; triangulation, with the orientation and depth of the fault surface smoothed at {orientation.lengthScaleM} m (a local
        quadratic fitted with Gaussian weights to the picks&apos; distance from the segment&apos;s plane; Cleveland &amp; Devlin 1988), not the triangle&apos;s
        own corners, whose normal mostly follows pick noise: Cauchy traction, slip tendency τ/σn′ (Morris et al. 1996), dilation tendency (σ1 − σn)/(σ1 − σ3)
        (Ferrill et al. 1999), ΔP = σn′ − (τ − C)/μ (Coulomb) at both ends of the friction band, the smaller counted per triangle. Ranges: the same for
        orientations {orientation.rangeStandardErrors} standard errors of the smoothed normal away (the scatter of the unsmoothed slopes over √(picks in the
        window)). Stresses grow linearly from zero at the datum.
      </p>
    </>
  );
}

/** The stated, adjustable smoothing length of the surface orientation the screen uses. */
function LengthScaleControl({
  orientation,
  refreshing,
  onLength,
}: {
  orientation: ResultResponse["orientation"];
  refreshing: boolean;
  onLength: (lengthM: number | null) => void;
}) {
  // the field starts from the length in use; a new length in use remounts it (keyed by the caller)
  const [text, setText] = useState(String(orientation.lengthScaleM));
  const parsed = parseLengthScale(text);
  const valid = parsed !== null && !Number.isNaN(parsed);
  const spacing = orientation.medianPickSpacingM;
  const isDefault = orientation.lengthScaleM === orientation.defaultLengthScaleM;
  return (
    <div className="rounded border border-slate-200 px-2 py-1.5 text-xs dark:border-slate-700" data-testid="stress-length-scale">
      <p>
        Orientation from the fault surface smoothed at <strong data-testid="stress-length-value">{orientation.lengthScaleM} m</strong>
        {isDefault ? " (the default" : ` (default ${orientation.defaultLengthScaleM} m`}: 200 m, or 4 median pick spacings where picks are sparser; median
        spacing here {Number.isFinite(spacing) ? `${spacing.toFixed(0)} m` : "—"}).
        {refreshing && <span className="ml-1 text-slate-500">Updating…</span>}
      </p>
      <div className="mt-1 flex flex-wrap items-end gap-2">
        <label className="font-medium">
          Smoothing length (m)
          <input
            className="field mt-1 w-24 font-mono"
            inputMode="decimal"
            value={text}
            onChange={(e) => setText(e.target.value)}
            aria-invalid={!valid}
            data-testid="stress-length-input"
          />
        </label>
        <button type="button" className="btn-quiet px-2 py-1" disabled={!valid} onClick={() => valid && onLength(parsed)} data-testid="stress-length-apply">
          Apply
        </button>
        {!isDefault && (
          <button type="button" className="btn-quiet px-2 py-1" onClick={() => onLength(null)} data-testid="stress-length-default">
            Default
          </button>
        )}
        {!valid && (
          <span className="field-error">
            A length in metres between {LENGTH_SCALE_LIMITS_M[0]} and {LENGTH_SCALE_LIMITS_M[1]}
          </span>
        )}
      </div>
      {Number.isFinite(spacing) && orientation.lengthScaleM < 2 * spacing && (
        <p className="mt-1 text-amber-700 dark:text-amber-300" data-testid="stress-length-short">
          Shorter than two pick spacings: the orientation follows single picks and their noise.
        </p>
      )}
    </div>
  );
}

function VersionHistory({ data }: { data: StateResponse }) {
  const rows = [...data.faultVersions, ...data.studyVersions];
  return (
    <details className="text-xs" data-testid="stress-versions">
      <summary className="cursor-pointer font-semibold">Version history ({rows.length})</summary>
      <ul className="mt-1 space-y-1">
        {rows.map((v) => (
          <li key={v.id} className={v.id === data.current?.id ? "font-medium" : ""}>
            {v.scope === "study" ? "Study" : "Fault"} v{v.version} · {REGIME_LABELS[v.parameters.regime].split(" (")[0]} · μ {v.parameters.frictionLow}–
            {v.parameters.frictionHigh} · {v.setBy?.name || v.setBy?.email || "former member"}, {new Date(v.createdAt).toLocaleString()}
            {v.source && <span className="block text-slate-500">Source: {v.source}</span>}
            {v.id === data.current?.id && <span className="text-slip-700"> (in use)</span>}
          </li>
        ))}
      </ul>
    </details>
  );
}
