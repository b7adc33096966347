"use client";
import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import type { FaultDisplay } from "@/lib/contracts/display";
import { LINKAGE_BASIS, rampDipDeg } from "@/lib/engine/relays";
import type { AnalysisReport, RelayResult } from "@/lib/engine/types";
import { useQuery } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import type { HorizonBin, HorizonBinsResponse } from "@/lib/contracts/analysis";
import { horizonRampDips, relaySketch } from "@/lib/views/relay";
import { CHART, PlotChart, X_AXIS_ROOM, X_LABEL_BELOW } from "./PlotChart";

const LINKAGE_WORDS: Record<RelayResult["linkage"], string> = { soft: "soft-linked (intact relay ramp)", breached: "breached relay", hard: "hard-linked" };

/** One row per relay: overlap, separation, O/S against published ratios, linkage label. Also used on the printable report. */
export function RelayTable({ report }: { report: AnalysisReport }) {
  if (report.relays.length === 0) return <p className="text-sm text-slate-500">No overlapping segments: no relay.</p>;
  return (
    <table className="w-full text-left text-xs" data-testid="relay-table">
      <thead className="text-slate-500">
        <tr>
          <th className="py-1 pr-2">Segments</th>
          <th className="pr-2">Overlap O</th>
          <th className="pr-2">Separation S</th>
          <th className="pr-2">O/S</th>
          <th>Linkage</th>
        </tr>
      </thead>
      <tbody className="num">
        {report.relays.map((relay) => (
          <tr key={relay.segments.join("-")} className="border-t border-slate-200 dark:border-slate-800">
            <td className="py-1 pr-2">{relay.segments.join(" – ")}</td>
            <td className="pr-2">{relay.overlapM.toFixed(0)} m</td>
            <td className="pr-2">{relay.separationM.toFixed(0)} m</td>
            <td className="pr-2">{relay.overlapToSeparation.toFixed(2)}</td>
            <td>{LINKAGE_WORDS[relay.linkage]}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function RelayView({ faultId, report, display, stem }: { faultId: string; report: AnalysisReport; display: FaultDisplay; stem: string }) {
  const horizons = useQuery({
    queryKey: ["horizons", faultId, report.engineVersion, report.input.rows],
    queryFn: () => apiFetch<HorizonBinsResponse>(`/api/faults/${faultId}/export/horizons.json`),
  });
  return (
    <div className="space-y-6" data-testid="relay-view">
      <RelayTable report={report} />
      {report.relays.map((relay) => (
        <RelayPanel key={relay.segments.join("-")} relay={relay} report={report} display={display} stem={stem} bins={horizons.data?.bins ?? []} />
      ))}
    </div>
  );
}

function RelayPanel({
  relay,
  report,
  display,
  stem,
  bins,
}: {
  relay: RelayResult;
  report: AnalysisReport;
  display: FaultDisplay;
  stem: string;
  bins: HorizonBin[];
}) {
  const [a, b] = relay.segments.map((id) => report.segments.find((segment) => segment.id === id)!);
  const [ga, gb] = relay.segments.map((id) => display.segments.find((segment) => segment.id === id)?.grid);
  const sketch = useMemo(() => relaySketch(a, b, ga, gb), [a, b, ga, gb]);
  const transfer = sketch.throwTransferM.filter(Number.isFinite);
  const horizonDips = useMemo(() => horizonRampDips(a, b, bins), [a, b, bins]);
  const ramp = transfer.length && relay.overlapM > 0 ? rampDipDeg(Math.max(...transfer), relay.overlapM) : null;
  const lines = sketch.segments.flatMap((segment, i) => [
    ...segment.tipLine.map((p) => ({ ...p, series: `${segment.id} inferred tip line`, kind: "tip", index: i })),
  ]);
  const traces = sketch.segments.flatMap((segment) =>
    segment.trace.map((p) => ({ ...p, series: `${segment.id} trace at ${Math.round(sketch.referenceElevationM)} m` })),
  );
  const vTop = Math.min(...lines.map((p) => p.v)) - 40;
  const middle = sketch.overlap ? (sketch.overlap[0] + sketch.overlap[1]) / 2 : NaN;
  const traceV = (i: number) => {
    const trace = sketch.segments[i].trace;
    let best = trace[0];
    for (const p of trace) if (Math.abs(p.u - middle) < Math.abs(best.u - middle)) best = p;
    return best?.v ?? NaN;
  };
  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_340px]">
      <PlotChart
        testId="relay-sketch"
        title={`Relay ${relay.segments.join(" – ")}: map sketch in strike–normal coordinates`}
        fileStem={`${stem}-relay-${relay.segments.join("-")}`}
        points={traces.length}
        deps={[sketch]}
        build={(width) => {
          const series = [...new Set([...lines.map((p) => p.series), ...traces.map((p) => p.series)])];
          return Plot.plot({
            ...X_AXIS_ROOM,
            width,
            height: 300,
            marginLeft: 60,
            style: { fontSize: "12px", background: "transparent" },
            x: { ...X_LABEL_BELOW, label: "Along mean strike (m)", grid: true },
            y: { label: "Across strike, toward dip (m)", grid: true, reverse: true },
            color: {
              legend: true,
              domain: series,
              range: series.map((name) => (name.includes("tip line") ? CHART.tip : name.startsWith(relay.segments[0]) ? CHART.segments[0] : CHART.segments[1])),
            },
            marks: [
              sketch.overlap
                ? Plot.rect([sketch.overlap], { x1: (d: [number, number]) => d[0], x2: (d: [number, number]) => d[1], fill: CHART.overlap, fillOpacity: 0.12 })
                : null,
              Plot.line(lines, { x: "u", y: "v", z: "series", stroke: "series", strokeWidth: 2 }),
              Plot.line(traces, { x: "u", y: "v", z: "series", stroke: "series", strokeWidth: 2.5 }),
              sketch.overlap
                ? Plot.arrow([sketch.overlap], {
                    x1: (d: [number, number]) => d[0],
                    x2: (d: [number, number]) => d[1],
                    y1: () => vTop,
                    y2: () => vTop,
                    stroke: "currentColor",
                    headLength: 6,
                    bend: false,
                  })
                : null,
              sketch.overlap
                ? Plot.arrow([sketch.overlap], {
                    x1: (d: [number, number]) => d[1],
                    x2: (d: [number, number]) => d[0],
                    y1: () => vTop,
                    y2: () => vTop,
                    stroke: "currentColor",
                    headLength: 6,
                    bend: false,
                  })
                : null,
              sketch.overlap
                ? Plot.text([sketch.overlap], { x: () => middle, y: () => vTop, dy: -9, text: () => `overlap O = ${relay.overlapM.toFixed(0)} m` })
                : null,
              sketch.overlap
                ? Plot.link([0], {
                    x1: () => middle,
                    x2: () => middle,
                    y1: () => traceV(0),
                    y2: () => traceV(1),
                    stroke: "currentColor",
                    markerStart: "tick",
                    markerEnd: "tick",
                  })
                : null,
              sketch.overlap
                ? Plot.text([0], {
                    x: () => middle,
                    y: () => (traceV(0) + traceV(1)) / 2,
                    dx: 8,
                    textAnchor: "start",
                    text: () => `separation S = ${relay.separationM.toFixed(0)} m`,
                  })
                : null,
              Plot.tip(
                traces,
                Plot.pointer({
                  x: "u",
                  y: "v",
                  title: (p: { series: string; u: number; v: number; throwM: number }) =>
                    `${p.series}\nalong ${p.u.toFixed(0)} m, across ${p.v.toFixed(0)} m\nthrow ${Number.isFinite(p.throwM) ? p.throwM.toFixed(1) + " m" : "—"}`,
                }),
              ),
            ],
          });
        }}
        note="Traces: each segment's plane at the mean centroid elevation, inside its inferred tip line. Shaded: overlap along strike."
      />
      <dl className="space-y-2 text-sm" data-testid="relay-facts">
        <div>
          <dt className="text-xs text-slate-500">Overlap / separation</dt>
          <dd className="num">O/S = {relay.overlapToSeparation.toFixed(2)}</dd>
          <dd className="text-xs text-slate-500">{relay.comparison}</dd>
        </div>
        <div>
          <dt className="text-xs text-slate-500">Linkage</dt>
          <dd className="font-medium" data-testid="relay-linkage">
            {LINKAGE_WORDS[relay.linkage]}
          </dd>
          <dd className="text-xs text-slate-500" data-testid="relay-evidence">
            Evidence: {relay.evidence}
          </dd>
          <dd className="text-xs text-slate-500">{relay.basis ?? LINKAGE_BASIS}</dd>
        </div>
        <div>
          <dt className="text-xs text-slate-500">Relay ramp dip (along strike)</dt>
          {ramp ? (
            <>
              <dd className="num" data-testid="relay-ramp">
                ψ ≈ {ramp.dipDeg.toFixed(1)}° ({ramp.flag})
              </dd>
              <dd className="text-xs text-slate-500">
                ψ = atan(ΔT/O) with ΔT = {Math.max(...transfer).toFixed(1)} m, the throw change along the bounding segment across the overlap (geometry after
                Peacock &amp; Sanderson 1991), zero at the segment&apos;s own inferred tip and read from the gridded throw at{" "}
                {Math.round(sketch.referenceElevationM)} m elevation — not from horizon picks; regional dip is not included. Breaching is common once ramps
                reach about 10–15° (Fossen &amp; Rotevatn 2016).
              </dd>
            </>
          ) : (
            <dd className="text-xs text-slate-500">Not available: the gridded throw does not cover both ends of the overlap.</dd>
          )}
        </div>
        <div data-testid="relay-ramp-horizons">
          <dt className="text-xs text-slate-500">Ramp dip per horizon</dt>
          {horizonDips.length ? (
            <dd>
              <ul className="num text-xs">
                {horizonDips.map((dip) => (
                  <li key={dip.horizon}>
                    {dip.horizon}: ψ ≈ {dip.dipDeg.toFixed(1)}° (ΔT {dip.throwTransferM.toFixed(1)} m, {dip.flag})
                  </li>
                ))}
              </ul>
              <p className="text-xs text-slate-500">
                From the horizon picks on both segments; 10–15° is the common onset of breaching (Fossen &amp; Rotevatn 2016).
              </p>
            </dd>
          ) : (
            <dd className="text-xs text-slate-500">No horizon picked on both segments: the estimate above (gridded throw) is all there is.</dd>
          )}
        </div>
      </dl>
    </div>
  );
}
