"use client";
import { planeToWorld } from "@/lib/display/frame";
import * as Plot from "@observablehq/plot";
import { useQuery } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import type { FaultDisplay } from "@/lib/contracts/display";
import { apiFetch } from "@/lib/api/client";
import type { AnalysisReport } from "@/lib/engine/types";
import { toCsv } from "@/lib/views/csv";
import { backstripThrows, expansionIndex, readThrowDepth, throwDepthAt } from "@/lib/views/growth";
import type { HorizonBin, HorizonBinsResponse } from "@/lib/contracts/analysis";
import { dipProfileAtS, tipBandOnLine } from "@/lib/views/profiles";
import { CHART, PlotChart, X_AXIS_ROOM, X_LABEL_BELOW } from "./PlotChart";

export function DipGrowthView({ faultId, report, display, stem }: { faultId: string; report: AnalysisReport; display: FaultDisplay; stem: string }) {
  const dip = useMemo(
    () =>
      report.segments.flatMap((segment, index) => {
        const grid = display.segments.find((s) => s.id === segment.id)?.grid ?? display.segments[index].grid;
        const profile = dipProfileAtS(grid, segment.max.s);
        return profile.t.map((t, k) => ({
          series: segment.id,
          t,
          z: planeToWorld(segment.plane, profile.s[k], t)[2],
          displacementM: profile.displacementM[k],
          throwM: profile.throwM[k],
        }));
      }),
    [report, display],
  );
  const plotted = dip.filter((p) => Number.isFinite(p.displacementM));
  // where each segment's up- and down-dip tips lie on this column (5–95 %), and open ends
  const tipMarks = useMemo(() => {
    const bands: { series: string; t1: number; t2: number }[] = [];
    const tips: { series: string; t: number }[] = [];
    const open: { series: string; t: number }[] = [];
    for (const segment of report.segments) {
      const band = tipBandOnLine(segment, "s", segment.max.s);
      if (!band) continue;
      (band.open.start ? open : tips).push({ series: segment.id, t: band.tips[0] });
      (band.open.end ? open : tips).push({ series: segment.id, t: band.tips[1] });
      if (!band.open.start) bands.push({ series: segment.id, t1: band.start[0], t2: band.start[1] });
      if (!band.open.end) bands.push({ series: segment.id, t1: band.end[0], t2: band.end[1] });
    }
    return { bands, tips, open };
  }, [report]);
  const horizons = useQuery({
    queryKey: ["horizons", faultId, report.engineVersion, report.input.rows],
    queryFn: () => apiFetch<HorizonBinsResponse>(`/api/faults/${faultId}/export/horizons.json`),
  });

  return (
    <div className="space-y-6" data-testid="dip-growth-view">
      <PlotChart
        testId="dip-profile-chart"
        title="Down-dip profile through Dmax"
        fileStem={`${stem}-down-dip-profile`}
        points={plotted.length}
        deps={[plotted]}
        csv={() =>
          toCsv(
            ["segment", "t_m", "z_m", "displacement_m", "throw_m"],
            dip.map((p) => [p.series, p.t, p.z, p.displacementM, p.throwM]),
          )
        }
        build={(width) =>
          Plot.plot({
            ...X_AXIS_ROOM,
            width,
            height: 300,
            marginLeft: 56,
            style: { fontSize: "12px", background: "transparent" },
            x: { ...X_LABEL_BELOW, label: "Down dip, t (m; positive downward)", grid: true },
            y: { label: "Displacement (m)", grid: true, zero: true },
            color: { legend: report.segments.length > 1, domain: report.segments.map((s) => s.id), range: CHART.segments },
            marks: [
              Plot.rect(tipMarks.bands, {
                x1: "t1",
                x2: "t2",
                fill: CHART.tip,
                fillOpacity: 0.22,
                className: "tip-band",
                title: (d: { series: string; t1: number; t2: number }) =>
                  `${d.series}: the tip lies between t = ${Math.min(d.t1, d.t2).toFixed(0)} and ${Math.max(d.t1, d.t2).toFixed(0)} m (5–95 %)`,
              }),
              Plot.ruleY([0]),
              Plot.dot(tipMarks.tips, {
                x: "t",
                y: () => 0,
                symbol: "diamond",
                r: 5,
                fill: CHART.tip,
                stroke: "white",
                title: (d: { series: string; t: number }) => `inferred tip of ${d.series} at t = ${d.t.toFixed(0)} m`,
              }),
              Plot.dot(tipMarks.open, {
                x: "t",
                y: () => 0,
                symbol: "square",
                r: 5,
                fill: CHART.open,
                stroke: "white",
                className: "open-end",
                title: (d: { series: string; t: number }) =>
                  `open end of ${d.series} at t = ${d.t.toFixed(0)} m: the picks stop while displacement is still high, no tip inferred`,
              }),
              Plot.line(plotted, { x: "t", y: "displacementM", z: "series", stroke: "series", strokeWidth: 1.5 }),
              Plot.dot(plotted, { x: "t", y: "displacementM", fill: "series", r: 1.8 }),
              Plot.tip(
                plotted,
                Plot.pointerX({
                  x: "t",
                  y: "displacementM",
                  title: (p: (typeof plotted)[number]) =>
                    `${p.series}\nt = ${p.t.toFixed(0)} m (elevation ${p.z.toFixed(0)} m)\ndisplacement ${p.displacementM.toFixed(1)} m, throw ${p.throwM.toFixed(1)} m`,
                }),
              ),
            ],
          })
        }
        note={`The column through each segment's Dmax; values from the display grid. ◆ inferred up- and down-dip tips, the shaded strips where they lie with 5–95 % confidence${tipMarks.open.length ? "; ■ an open end (the picks stop while displacement is still high, no tip inferred)" : ""}.`}
      />
      {horizons.isPending && <p className="text-sm text-slate-500">Loading horizon picks…</p>}
      {horizons.isError && <p className="text-sm text-red-700">{horizons.error.message}</p>}
      {horizons.data && horizons.data.horizons.length === 0 && (
        <p className="rounded border border-slate-200 p-3 text-sm text-slate-500 dark:border-slate-800" data-testid="no-horizons">
          This pick set has no <code>horizon</code> column, so throw per horizon, throw–depth plots and the expansion index are not available. Add{" "}
          <code>horizon</code> (and optionally <code>hw_thickness</code>, <code>fw_thickness</code> in m) to the pick CSV.
        </p>
      )}
      {horizons.data && horizons.data.horizons.length > 0 && <HorizonGrowth bins={horizons.data.bins} report={report} stem={stem} />}
    </div>
  );
}

/** Pixels a column of labels needs at `fontPx` (about 0.62 em per character of the app's sans), plus a small gap. */
function labelRoomPx(labels: string[], fontPx: number): number {
  const longest = labels.reduce((most, label) => Math.max(most, label.length), 0);
  return Math.ceil(longest * fontPx * 0.62) + 16;
}

function HorizonGrowth({ bins, report, stem }: { bins: HorizonBin[]; report: AnalysisReport; stem: string }) {
  const segments = [...new Set(bins.map((b) => b.segment))];
  const [segment, setSegment] = useState(segments[0]);
  const own = bins.filter((b) => b.segment === segment);
  const sValues = own.map((b) => b.s);
  const defaultS = report.segments.find((s) => s.id === segment)?.max.s ?? 0;
  const [position, setPosition] = useState<number | null>(null);
  const at = position ?? defaultS;
  const tz = throwDepthAt(bins, segment, at);
  const reading = readThrowDepth(tz);
  const steps = backstripThrows(tz);
  const ei = tz.map((p) => ({ horizon: p.horizon, ei: expansionIndex(p.hwThicknessM, p.fwThicknessM) })).filter((p) => p.ei);
  return (
    <div className="space-y-4" data-testid="horizon-growth">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        {segments.length > 1 && (
          <label className="flex items-center gap-1">
            Segment
            <select
              className="field w-auto py-1 text-sm"
              value={segment}
              onChange={(event) => {
                setSegment(event.target.value);
                setPosition(null);
              }}
            >
              {segments.map((id) => (
                <option key={id}>{id}</option>
              ))}
            </select>
          </label>
        )}
        <label className="flex items-center gap-2">
          Throw–depth at s =
          <input
            type="range"
            min={Math.min(...sValues)}
            max={Math.max(...sValues)}
            step={1}
            value={at}
            onChange={(event) => setPosition(Number(event.target.value))}
            data-testid="tz-position"
          />
          <span className="num">{at.toFixed(0)} m</span>
        </label>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <PlotChart
          testId="horizon-throw-chart"
          title="Throw per horizon along strike"
          fileStem={`${stem}-horizon-throw`}
          points={own.length}
          deps={[own, at]}
          csv={() =>
            toCsv(
              ["segment", "horizon", "s_m", "throw_m", "z_m", "picks"],
              own.map((b) => [b.segment, b.horizon, b.s, b.throwM, b.z, b.count]),
            )
          }
          build={(width) =>
            Plot.plot({
              ...X_AXIS_ROOM,
              width,
              height: 280,
              marginLeft: 50,
              style: { fontSize: "12px", background: "transparent" },
              x: { ...X_LABEL_BELOW, label: "Along strike, s (m)", grid: true },
              y: { label: "Throw (m)", grid: true, zero: true },
              color: { legend: true, type: "categorical" },
              marks: [
                Plot.ruleX([at], { stroke: CHART.tip }),
                Plot.line(own, { x: "s", y: "throwM", stroke: "horizon" }),
                Plot.dot(own, { x: "s", y: "throwM", fill: "horizon", r: 2 }),
                Plot.tip(
                  own,
                  Plot.pointer({
                    x: "s",
                    y: "throwM",
                    title: (b: HorizonBin) => `${b.horizon}\ns ${b.s.toFixed(0)} m\nthrow ${b.throwM.toFixed(1)} m (median of ${b.count})`,
                  }),
                ),
              ],
            })
          }
        />
        <PlotChart
          testId="throw-depth-chart"
          title={`Throw–depth at s = ${at.toFixed(0)} m`}
          fileStem={`${stem}-throw-depth`}
          points={tz.length}
          deps={[tz]}
          csv={() =>
            toCsv(
              ["horizon", "z_m", "throw_m"],
              tz.map((p) => [p.horizon, p.z, p.throwM]),
            )
          }
          build={(width) =>
            Plot.plot({
              ...X_AXIS_ROOM,
              // room on the right for the horizon names printed beside the deepest-reaching points
              width,
              height: 280,
              marginLeft: 60,
              marginRight: labelRoomPx(
                tz.map((p) => p.horizon),
                12,
              ),
              style: { fontSize: "12px", background: "transparent" },
              x: { ...X_LABEL_BELOW, label: "Throw (m)", grid: true, zero: true },
              y: { label: "Elevation (m, up positive)", grid: true },
              marks: [
                Plot.line(tz, { x: "throwM", y: "z", stroke: CHART.slip, sort: "z" }),
                Plot.dot(tz, { x: "throwM", y: "z", fill: CHART.slip, r: 4 }),
                Plot.text(tz, { x: "throwM", y: "z", text: "horizon", dx: 8, textAnchor: "start" }),
                Plot.tip(
                  tz,
                  Plot.pointer({
                    x: "throwM",
                    y: "z",
                    title: (p: (typeof tz)[number]) => `${p.horizon}: throw ${p.throwM.toFixed(1)} m at ${p.z.toFixed(0)} m`,
                  }),
                ),
              ],
            })
          }
        />
      </div>
      <div className="rounded border border-slate-200 p-3 text-sm dark:border-slate-800" data-testid="tz-reading">
        <p>
          <span className="font-medium">Reading (a hint, not a verdict):</span> {reading.hint}
        </p>
        <p className="mt-1 text-xs text-slate-500">Basis: {reading.basis}</p>
        {steps.length > 1 && (
          <p className="mt-1 text-xs text-slate-500">
            Throw backstripping (assumes the fault reached the depositional surface):{" "}
            {steps.map((s) => (s.to ? `${s.from}→${s.to}: ${s.accruedM.toFixed(1)} m` : `after ${s.from}: ${s.accruedM.toFixed(1)} m`)).join("; ")}.
          </p>
        )}
      </div>
      {ei.length > 0 ? (
        <PlotChart
          testId="expansion-index-chart"
          title="Expansion index per interval (Thorsen 1963)"
          fileStem={`${stem}-expansion-index`}
          points={ei.length}
          deps={[ei]}
          csv={() =>
            toCsv(
              ["interval_below_horizon", "expansion_index", "accrued_throw_m"],
              ei.map((p) => [p.horizon, p.ei!.index, p.ei!.accruedThrowM]),
            )
          }
          build={(width) =>
            Plot.plot({
              ...X_AXIS_ROOM,
              width,
              height: 220,
              marginLeft: Math.max(
                90,
                labelRoomPx(
                  ei.map((p) => p.horizon),
                  12,
                ),
              ),
              style: { fontSize: "12px", background: "transparent" },
              x: { ...X_LABEL_BELOW, label: "Expansion index = hanging-wall / footwall thickness", grid: true },
              y: { label: "Interval (below horizon)" },
              marks: [
                Plot.barX(ei, { y: "horizon", x: (p: (typeof ei)[number]) => p.ei!.index, fill: CHART.slip }),
                Plot.ruleX([1], { stroke: CHART.tip, strokeWidth: 2 }),
                Plot.tip(
                  ei,
                  Plot.pointerY({
                    y: "horizon",
                    x: (p: (typeof ei)[number]) => p.ei!.index,
                    title: (p: (typeof ei)[number]) => `EI ${p.ei!.index.toFixed(2)}; throw accrued ≈ ${p.ei!.accruedThrowM.toFixed(1)} m`,
                  }),
                ),
              ],
            })
          }
          note="EI = 1: no growth during deposition; EI > 1: syn-sedimentary slip. Footwall erosion, compaction and drag bias it."
        />
      ) : (
        <p className="text-xs text-slate-500">No hw_thickness / fw_thickness values at this position: no expansion index.</p>
      )}
    </div>
  );
}
