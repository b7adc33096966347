"use client";
// Two runs of one pick set side by side: their tip lines (central and 5–95 % lines) over each other on the plane,
// and their fault sheets.
import { useQueries } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import { describeSettings } from "@/lib/contracts/analysis-settings";
import type { AnalysisResponse } from "@/lib/contracts/analysis";
import type { AnalysisReport, SegmentResult } from "@/lib/contracts/report";
import { FaultSheet } from "./FaultSheet";

const RUN_COLOURS = ["#f08c00", "#2563eb"] as const;

/** One plane map per segment with both runs' lines: the same (s, t) frame, since both runs read the same picks. */
function OverlayMap({ segmentId, runs }: { segmentId: string; runs: SegmentResult[] }) {
  const all = runs.flatMap((segment) => [...segment.tipLine.outerPolygon, ...segment.mappedLimit.polygon]);
  const sMin = Math.min(...all.map((p) => p[0]));
  const sMax = Math.max(...all.map((p) => p[0]));
  const tMin = Math.min(...all.map((p) => p[1]));
  const tMax = Math.max(...all.map((p) => p[1]));
  const pad = 0.04 * Math.max(sMax - sMin, tMax - tMin);
  const path = (polygon: [number, number][]) => polygon.map(([s, t], k) => `${k ? "L" : "M"}${s.toFixed(1)} ${t.toFixed(1)}`).join("") + "Z";
  return (
    <figure className="rounded border border-slate-200 p-2 dark:border-slate-800" data-testid="compare-map">
      <figcaption className="mb-1 text-xs font-medium">Segment {segmentId}: tip lines on the fault plane (s along strike, t down dip, m)</figcaption>
      <svg
        viewBox={`${sMin - pad} ${tMin - pad} ${sMax - sMin + 2 * pad} ${tMax - tMin + 2 * pad}`}
        className="h-64 w-full"
        preserveAspectRatio="xMidYMid meet"
      >
        <path
          d={path(runs[0].mappedLimit.polygon)}
          fill="none"
          stroke="currentColor"
          strokeDasharray="6 4"
          strokeWidth={1.2}
          vectorEffect="non-scaling-stroke"
        />
        {runs.map((segment, k) => (
          <g key={k} fill="none" stroke={RUN_COLOURS[k]} data-testid={`compare-run-${k + 1}`}>
            <path d={path(segment.tipLine.innerPolygon)} strokeWidth={1} vectorEffect="non-scaling-stroke" strokeOpacity={0.7} />
            <path d={path(segment.tipLine.outerPolygon)} strokeWidth={1} vectorEffect="non-scaling-stroke" strokeOpacity={0.7} />
            <path d={path(segment.tipLine.polygon)} strokeWidth={3} vectorEffect="non-scaling-stroke" />
          </g>
        ))}
      </svg>
      <p className="text-xs text-slate-500">
        Dashed: mapped limit. Bold: central tip line; thin: its 5–95 % lines.{" "}
        {runs.map((segment, k) => (
          <span key={k} style={{ color: RUN_COLOURS[k] }}>
            Run {k === 0 ? "A" : "B"}: L {segment.tipLine.lengthM.toFixed(0)} m, H {segment.tipLine.heightM.toFixed(0)} m.{" "}
          </span>
        ))}
      </p>
    </figure>
  );
}

export function RunComparison({ faultId, ids, onClose }: { faultId: string; ids: [string, string]; onClose: () => void }) {
  const queries = useQueries({
    queries: ids.map((id) => ({
      queryKey: ["analysis-run", faultId, id],
      staleTime: Infinity,
      queryFn: () => apiFetch<AnalysisResponse>(`/api/faults/${faultId}/analysis?contours=0&analysis=${id}`),
    })),
  });
  const reports = queries.map((query) => query.data?.analysis?.result ?? null);
  const ready = reports.every((report): report is AnalysisReport => report !== null && report.segments.every((segment) => segment.tipLine.innerPolygon));
  return (
    <section className="card mb-4 p-4" data-testid="run-comparison">
      <div className="mb-3 flex items-center justify-between">
        <h2 className="font-semibold">Two runs compared</h2>
        <button className="btn-quiet" onClick={onClose}>
          Close
        </button>
      </div>
      {!ready ? (
        <p className="text-sm text-slate-500">{queries.some((query) => query.isError) ? "One of the runs could not be read." : "Loading both runs…"}</p>
      ) : (
        <>
          <div className="grid gap-3 md:grid-cols-2">
            {reports[0].segments.map((segment) => {
              const other = reports[1].segments.find((candidate) => candidate.id === segment.id);
              return other ? <OverlayMap key={segment.id} segmentId={segment.id} runs={[segment, other]} /> : null;
            })}
          </div>
          <div className="mt-4 grid gap-4 md:grid-cols-2">
            {reports.map((report, k) => (
              <div key={ids[k]} data-testid={`compare-sheet-${k + 1}`}>
                <h3 className="mb-2 text-sm font-semibold" style={{ color: RUN_COLOURS[k] }}>
                  Run {k === 0 ? "A" : "B"}: {describeSettings(report.settings)}
                </h3>
                <FaultSheet report={report} />
              </div>
            ))}
          </div>
        </>
      )}
    </section>
  );
}
