"use client";
import * as Plot from "@observablehq/plot";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useMemo, useState } from "react";
import { decodeFaultDisplay } from "@/lib/display/payload";
import type { FaultReportData } from "@/lib/exports/report";
import { fileStem } from "@/lib/views/csv";
import { strikeProjection } from "@/lib/views/projection";
import { CautionNote } from "@/components/workspace/CautionNote";
import { azimuth, degrees, endsSentence, metres, metresWithRange, MODEL_NAMES, plain, ratio } from "@/lib/format";
import { LINKAGE_BASIS } from "@/lib/engine/relays";
import { REPORT_PICTURE_KEY } from "./download";
import { useBrowserValue } from "@/components/hooks/useBrowserValue";
import { CHART, PlotChart, X_LABEL_BELOW } from "./PlotChart";
import { RelayTable } from "./RelayView";
import { ScalingChart } from "./ScalingView";
import { StrikeProfileView } from "./StrikeProfileView";

let openedAt: string | null = null;
/** When this page was opened, in the reader's time zone (the same value for every render of the page). */
const pageOpenedAt = () => (openedAt ??= new Date().toLocaleString());

/** The 3D picture the export tab left in local storage for this analysis (a PNG data URL), if any. */
function storedPicture(faultId: string, analysisId: string): string | null {
  try {
    const stored = localStorage.getItem(REPORT_PICTURE_KEY(faultId, analysisId));
    return stored?.startsWith("data:image/png") ? stored : null;
  } catch {
    // no storage: the report has its 2D figures only
    return null;
  }
}

/** The one-page printable fault report. */
export function FaultReport({ data }: { data: FaultReportData }) {
  const { fault, report, provenance, pins, scaling } = data;
  const stem = fileStem(fault.name);
  const picture = useBrowserValue(() => storedPicture(fault.id, data.analysisId));
  // read in the browser: the server's clock and the reader's time zone differ
  const printedAt = useBrowserValue(pageOpenedAt);
  const display = useQuery({
    queryKey: ["display", fault.id, data.analysisId],
    staleTime: Infinity,
    queryFn: async () => {
      const response = await fetch(`/api/faults/${fault.id}/analysis/display?analysis=${data.analysisId}`);
      if (!response.ok) throw new Error("Could not load the displacement grids.");
      return decodeFaultDisplay(new Uint8Array(await response.arrayBuffer()));
    },
  });

  return (
    <main className="fault-report mx-auto max-w-[1000px] space-y-4 p-6 text-sm print:max-w-none print:p-0" data-testid="fault-report">
      {/* one printed page: the site header and view controls stay off paper, the sheet is zoomed to fit A4 */}
      <style>
        {
          "@media print { html, body { min-height: 0 !important; height: auto !important; } body > header, body header.sticky, nextjs-portal { display: none !important; } .fault-report { zoom: 0.6; } .fault-report select, .fault-report label { display: none !important; } @page { size: A4; margin: 10mm; } }"
        }
      </style>
      <header className="flex items-start justify-between gap-4">
        <div>
          <p className="eyebrow">Slipfield fault report</p>
          <h1 className="text-2xl font-semibold" data-testid="report-title">
            {fault.name}
          </h1>
          <p className="text-xs text-slate-500">
            Study {fault.studyName} · {printedAt ? `printed ${printedAt}` : ""}
          </p>
        </div>
        <div className="flex gap-2 print:hidden">
          <Link className="btn-quiet" href={`/studies/${fault.studyId}/faults/${fault.id}`}>
            Back to the fault
          </Link>
          <button type="button" className="btn-primary" onClick={() => window.print()} data-testid="print-report">
            Print
          </button>
        </div>
      </header>

      <section className="grid gap-4 md:grid-cols-2 print:grid-cols-2">
        <div>
          <h2 className="mb-1 font-semibold">Fault sheet</h2>
          <table className="w-full text-xs" data-testid="report-sheet">
            <thead className="text-left text-slate-500">
              <tr>
                <th>Segment</th>
                <th>Dmax observed / fitted (5–95 %)</th>
                <th>L (tip line, 5–95 %)</th>
                <th>H (5–95 %)</th>
                <th>Dmax/L</th>
                <th>Strike / dip</th>
              </tr>
            </thead>
            <tbody className="num">
              {report.segments.map((segment) => (
                <tr key={segment.id} className="border-t border-slate-200 dark:border-slate-800">
                  <td>{segment.id}</td>
                  <td>
                    {metres(segment.max.displacementM)} /{" "}
                    {segment.max.fittedDisplacementM !== undefined
                      ? metresWithRange(segment.max.fittedDisplacementM, segment.max.fittedDisplacementRangeM)
                      : "—"}
                  </td>
                  <td>{metresWithRange(segment.tipLine.lengthM, segment.tipLine.lengthRangeM, 0)}</td>
                  <td>{metresWithRange(segment.tipLine.heightM, segment.tipLine.heightRangeM, 0)}</td>
                  <td>{ratio(segment.scaling.dOverL)}</td>
                  <td>
                    {azimuth(segment.plane.strikeDeg)} / {degrees(segment.plane.dipDeg)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-1 text-xs text-slate-500">
            Tip-line profile with most weight: {[...new Set(report.segments.map((s) => MODEL_NAMES[s.tipLine.model] ?? s.tipLine.model))].join("; ")}. Aspect
            ratio {report.segments.map((s) => plain(s.tipLine.aspectRatio)).join(", ")}.
            {report.segments.some((s) => s.tipLine.ends?.some((end) => end.status === "open")) &&
              ` Open ends (no tip inferred; length or height a minimum): ${report.segments
                .filter((s) => s.tipLine.ends?.some((end) => end.status === "open"))
                .map((s) => `${s.id}: ${endsSentence(s.tipLine.ends.filter((end) => end.status === "open"))}`)
                .join("; ")}.`}
          </p>
          {report.warnings.length > 0 && <p className="mt-1 text-xs text-amber-700">{report.warnings.join(" · ")}</p>}
        </div>
        <div>
          <h2 className="mb-1 font-semibold">Displacement contours</h2>
          <ContourMap data={data} stem={stem} />
        </div>
      </section>

      {picture && (
        <section className="break-inside-avoid" data-testid="report-3d">
          <h2 className="mb-1 font-semibold">3D view (as last shown in the workspace)</h2>
          {/* eslint-disable-next-line @next/next/no-img-element */}
          <img
            src={picture}
            alt={`3D view of ${fault.name}, with its colour legend, labels and scale bar`}
            className="mx-auto w-full max-w-[760px] rounded border border-slate-200 dark:border-slate-700"
            data-testid="report-picture"
          />
        </section>
      )}

      <section className="break-inside-avoid">
        <h2 className="mb-1 font-semibold">Strike profile</h2>
        {display.data ? (
          <StrikeProfileView report={report} display={display.data} stem={stem} />
        ) : (
          <p className="text-xs text-slate-500">{display.isError ? display.error.message : "Loading…"}</p>
        )}
      </section>

      <section className="grid gap-4 md:grid-cols-2 print:grid-cols-2">
        <div className="break-inside-avoid">
          <h2 className="mb-1 font-semibold">Scaling</h2>
          <ScalingChart points={scaling} currentFaultId={fault.id} stem={stem} height={300} />
        </div>
        <div className="space-y-3">
          <div>
            <h2 className="mb-1 font-semibold">Relays</h2>
            <RelayTable report={report} />
            {report.relays.map((relay) => (
              <p key={relay.segments.join("-")} className="mt-1 text-xs text-slate-500">
                {relay.segments.join(" – ")}: {relay.evidence} {relay.comparison}
              </p>
            ))}
            {report.relays.length > 0 && <p className="mt-1 text-xs text-slate-500">{report.relays[0].basis ?? LINKAGE_BASIS}</p>}
          </div>
          <div data-testid="report-pins">
            <h2 className="mb-1 font-semibold">Pins</h2>
            <p className="text-xs">
              {pins.open} open, {pins.resolved} resolved.
            </p>
            <ul className="mt-1 list-disc pl-4 text-xs">
              {pins.openPins.slice(0, 8).map((pin) => (
                <li key={pin.id}>
                  {pin.author ?? "someone"}
                  {pin.segment ? ` (segment ${pin.segment})` : ""}: {pin.body.length > 140 ? `${pin.body.slice(0, 140)}…` : pin.body}
                </li>
              ))}
              {pins.openPins.length > 8 && <li>and {pins.openPins.length - 8} more</li>}
            </ul>
          </div>
        </div>
      </section>

      <CautionNote />

      <section className="rounded border border-slate-200 p-3 text-xs dark:border-slate-800" data-testid="report-provenance">
        <h2 className="mb-1 font-semibold">Data provenance</h2>
        <dl className="grid grid-cols-[max-content_1fr] gap-x-3 gap-y-0.5">
          <dt className="text-slate-500">Pick set</dt>
          <dd>
            {provenance.fileName} (version {provenance.version}, {provenance.rowCount.toLocaleString("en")} rows, units at upload: {provenance.units})
          </dd>
          <dt className="text-slate-500">SHA-256</dt>
          <dd className="num break-all">{provenance.checksum}</dd>
          <dt className="text-slate-500">Uploaded by</dt>
          <dd>{provenance.uploadedBy}</dd>
          <dt className="text-slate-500">Uploaded at</dt>
          <dd>{new Date(provenance.uploadedAt).toISOString()}</dd>
          <dt className="text-slate-500">Engine version</dt>
          <dd className="num">{provenance.engineVersion}</dd>
          <dt className="text-slate-500">Analysed at</dt>
          <dd>{provenance.analysedAt ? new Date(provenance.analysedAt).toISOString() : "—"}</dd>
        </dl>
      </section>
    </main>
  );
}

/**
 * The fault's displacement in one picture that stands alone: every segment's contours, inferred tip line, mapped limit
 * and peak in a strike projection (along the mean strike against depth), true to scale unless it says otherwise.
 */
function ContourMap({ data, stem }: { data: FaultReportData; stem: string }) {
  const projection = useMemo(() => strikeProjection(data.report), [data.report]);
  const extent = useMemo(() => {
    const all = [...projection.tipLines, ...projection.mappedLimits, ...projection.contours];
    const us = all.map((p) => p.u);
    const depths = all.map((p) => p.depthM);
    return { u: [Math.min(...us), Math.max(...us)] as [number, number], depth: [Math.min(...depths), Math.max(...depths)] as [number, number] };
  }, [projection]);
  const azimuth = `${projection.strikeAzimuthDeg.toFixed(0).padStart(3, "0")}°`;
  const [exaggeration, setExaggeration] = useState(1);
  const levels = data.report.segments.flatMap((segment) => segment.contours.map((level) => level.levelM));
  return (
    <PlotChart
      testId="report-contour-map"
      title={`${data.fault.name}: displacement contours in strike projection (along strike ${azimuth}, depth below datum)`}
      fileStem={`${stem}-contour-map`}
      points={projection.contours.length}
      deps={[projection, extent]}
      build={(width) => {
        const margin = { left: 64, right: 16, top: 8, bottom: 44 };
        const plotWidth = width - margin.left - margin.right;
        const uSpan = extent.u[1] - extent.u[0] || 1;
        const depthSpan = extent.depth[1] - extent.depth[0] || 1;
        // true scale where it fits; otherwise the depth axis is stretched and the caption says by how much
        const trueHeight = (plotWidth * depthSpan) / uSpan;
        const plotHeight = Math.min(320, Math.max(140, trueHeight));
        const stretch = plotHeight / trueHeight;
        queueMicrotask(() => setExaggeration(stretch));
        // a halo in the page's ground colour keeps the peak labels readable over the contours
        const halo = document.documentElement.classList.contains("dark") ? "#0f172a" : "#ffffff";
        return Plot.plot({
          width,
          height: plotHeight + margin.top + margin.bottom,
          marginLeft: margin.left,
          marginRight: margin.right,
          marginTop: margin.top,
          marginBottom: margin.bottom,
          style: { fontSize: "11px", background: "transparent" },
          x: { ...X_LABEL_BELOW, label: `Along strike ${azimuth} (m)`, domain: extent.u },
          y: { label: "Depth below datum (m)", domain: extent.depth, reverse: true },
          color: { type: "linear", scheme: "viridis", label: "Displacement (m)", legend: true, domain: [0, Math.max(...levels, 1)] },
          marks: [
            Plot.line(projection.mappedLimits, { x: "u", y: "depthM", z: "segment", stroke: "currentColor", strokeDasharray: "4 3", strokeWidth: 1 }),
            Plot.line(projection.contours, { x: "u", y: "depthM", z: "line", stroke: "levelM", strokeWidth: 1 }),
            Plot.line(projection.tipLines, { x: "u", y: "depthM", z: "segment", stroke: CHART.tip, strokeWidth: 2.5 }),
            Plot.dot(projection.peaks, { x: "u", y: "depthM", symbol: "diamond", r: 5, fill: "white", stroke: "currentColor" }),
            Plot.text(projection.peaks, {
              x: "u",
              y: "depthM",
              text: (p: (typeof projection.peaks)[number]) => `${p.segment}: Dmax ${metres(p.displacementM)}`,
              dy: -12,
              fontWeight: 600,
              fill: "currentColor",
              stroke: halo,
              strokeWidth: 3,
              paintOrder: "stroke",
            }),
          ],
        });
      }}
      note={
        <span data-testid="report-contour-legend">
          <span className="mr-1 inline-block h-1 w-4 rounded bg-tip-500 align-middle" /> inferred tip line ·{" "}
          <span className="mr-1 inline-block w-4 border-t-2 border-dashed border-slate-600 align-middle dark:border-slate-300" /> mapped limit of the picks · ◆
          peak · contours every {[...new Set(data.report.segments.map((segment) => metres(segment.contourIntervalM, 0)))].join(" / ")} of displacement.{" "}
          {Math.abs(exaggeration - 1) < 0.02
            ? "True scale (depth as along strike)."
            : `Depth stretched ×${exaggeration.toFixed(1)} against distance along strike.`}{" "}
          Distances from the centre of segment {data.report.segments[0]?.id}.
        </span>
      }
    />
  );
}
