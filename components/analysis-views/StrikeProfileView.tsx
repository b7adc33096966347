"use client";
import { planeToWorld } from "@/lib/display/frame";
import * as Plot from "@observablehq/plot";
import { useMemo, useRef, useState } from "react";
import type { DisplaySegment, FaultDisplay } from "@/lib/contracts/display";
import type { AnalysisReport, SegmentResult } from "@/lib/engine/types";
import { toCsv } from "@/lib/views/csv";
import {
  columnMaxProfile,
  commonStrikeFrame,
  modelStrikeProfile,
  overlapZone,
  alongStrike,
  profileAlongLine,
  strikeProfileAtT,
  sumProfiles,
  tipExtent,
  toCommonProfile,
  type GridLike,
  type Profile,
  type StrikeProfileMode,
} from "@/lib/views/profiles";
import { mainSvg } from "./download";
import { CHART, PlotChart, X_AXIS_ROOM, X_LABEL_BELOW } from "./PlotChart";

type Mode = StrikeProfileMode;
type Quantity = "displacement" | "throw";

const MODE_LABELS: Record<Mode, string> = {
  "centre-line": "Centre line (through Dmax)",
  "column-max": "Maximum over each column",
  line: "Along a line drawn on the map",
};

interface Row {
  series: string;
  x: number;
  value: number;
  s: number;
  t: number;
}

export function StrikeProfileView({ report, display, stem }: { report: AnalysisReport; display: FaultDisplay; stem: string }) {
  const [mode, setMode] = useState<Mode>("centre-line");
  const [quantity, setQuantity] = useState<Quantity>("displacement");
  const [lineSegment, setLineSegment] = useState(0);
  const [line, setLine] = useState<[[number, number], [number, number]] | null>(null);
  const multi = report.segments.length > 1;
  const frame = useMemo(() => commonStrikeFrame(report.segments), [report]);

  const chart = useMemo(() => {
    const rows: Row[] = [];
    const modelRows: Row[] = [];
    const tips: { series: string; x: number }[] = [];
    const openEnds: { series: string; x: number }[] = [];
    const bands: { series: string; x1: number; x2: number }[] = [];
    const segmentPairs = report.segments.map((segment, index) => ({
      segment,
      grid: display.segments.find((s) => s.id === segment.id)?.grid ?? display.segments[index].grid,
    }));
    const used = mode === "line" ? [segmentPairs[Math.min(lineSegment, segmentPairs.length - 1)]] : segmentPairs;
    const commons = [];
    for (const { segment, grid } of used) {
      const profile = profileFor(mode, segment, grid, line);
      // single segment or drawn line: plane coordinate s (or distance); several segments: the common along-strike coordinate
      const common = multi && mode !== "line";
      const values = quantity === "throw" ? profile.throwM : profile.displacementM;
      if (common) {
        const cp = toCommonProfile(segment.id, segment.plane, profile, frame);
        commons.push(cp);
        cp.u.forEach((u, k) => rows.push({ series: segment.id, x: u, value: (quantity === "throw" ? cp.throwM : cp.displacementM)[k], s: NaN, t: NaN }));
      } else {
        profile.distanceM.forEach((x, k) => rows.push({ series: segment.id, x, value: values[k], s: profile.s[k], t: profile.t[k] }));
      }
      if (mode !== "line") {
        const model = modelStrikeProfile(segment, segment.max.t, { columnMax: mode === "column-max" });
        if (model) {
          const factor = quantity === "throw" ? Math.sin((segment.plane.dipDeg * Math.PI) / 180) : 1;
          const rowT = mode === "column-max" ? segment.tipLine.profile.centre.t : segment.max.t;
          const toX = (s: number) => (common ? alongStrike(frame, ...(planeToWorld(segment.plane, s, rowT).slice(0, 2) as [number, number])) : s);
          model.s.forEach((s, k) => modelRows.push({ series: `${segment.id}: ${model.name}`, x: toX(s), value: model.displacementM[k] * factor, s, t: rowT }));
          if (model.tipsS) {
            const [start, end] = model.tipsS;
            (model.openS.start ? openEnds : tips).push({ series: segment.id, x: toX(start) });
            (model.openS.end ? openEnds : tips).push({ series: segment.id, x: toX(end) });
          }
          if (model.bandS) {
            if (!model.openS.start) bands.push({ series: segment.id, x1: toX(model.bandS.start[0]), x2: toX(model.bandS.start[1]) });
            if (!model.openS.end) bands.push({ series: segment.id, x1: toX(model.bandS.end[0]), x2: toX(model.bandS.end[1]) });
          }
        }
      }
    }
    let sum: { x: number; value: number; contributors: number }[] = [];
    let overlap: [number, number] | null = null;
    if (multi && mode !== "line") {
      const summed = sumProfiles(commons, 240);
      sum = summed.u.map((x, k) => ({ x, value: (quantity === "throw" ? summed.throwM : summed.displacementM)[k], contributors: summed.contributors[k] }));
      const extents = report.segments.map((segment) => tipExtent(segment, frame));
      overlap = overlapZone(extents[0], extents[1]);
    }
    // the sum is drawn only where two or more segments have data: elsewhere it is the one segment's own line
    const sumLine = sum.map((r) => ({ x: r.x, value: r.contributors >= 2 ? r.value : NaN }));
    const sumVisible = sumLine.some((r) => Number.isFinite(r.value));
    return {
      rows: rows.filter((r) => Number.isFinite(r.value)),
      allRows: rows,
      modelRows,
      tips,
      openEnds,
      bands,
      sum,
      sumLine: sumVisible ? sumLine : [],
      overlap,
    };
  }, [report, display, mode, quantity, lineSegment, line, multi, frame]);

  const xLabel = mode === "line" ? "Distance along the drawn line (m)" : multi ? "Along strike, common mean-strike coordinate (m)" : "Along strike, s (m)";
  const yLabel = quantity === "throw" ? "Throw (m)" : "Displacement (m)";
  const modelName = modelStrikeProfileName(report.segments);

  return (
    <div className="space-y-3" data-testid="strike-profile-view">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <label className="flex items-center gap-1">
          Profile
          <select className="field w-auto py-1 text-sm" value={mode} onChange={(event) => setMode(event.target.value as Mode)} data-testid="profile-mode">
            {(Object.keys(MODE_LABELS) as Mode[]).map((key) => (
              <option key={key} value={key}>
                {MODE_LABELS[key]}
              </option>
            ))}
          </select>
        </label>
        <label className="flex items-center gap-1">
          Quantity
          <select
            className="field w-auto py-1 text-sm"
            value={quantity}
            onChange={(event) => setQuantity(event.target.value as Quantity)}
            data-testid="profile-quantity"
          >
            <option value="displacement">Displacement</option>
            <option value="throw">Throw</option>
          </select>
        </label>
        {mode === "line" && multi && (
          <label className="flex items-center gap-1">
            Segment
            <select
              className="field w-auto py-1 text-sm"
              value={lineSegment}
              onChange={(event) => {
                setLineSegment(Number(event.target.value));
                setLine(null);
              }}
            >
              {report.segments.map((segment, index) => (
                <option key={segment.id} value={index}>
                  {segment.id}
                </option>
              ))}
            </select>
          </label>
        )}
      </div>
      <div className={mode === "line" ? "grid gap-4 lg:grid-cols-[minmax(260px,340px)_1fr]" : ""}>
        {mode === "line" && (
          <LineMap
            segment={report.segments[Math.min(lineSegment, report.segments.length - 1)]}
            displaySegment={display.segments[Math.min(lineSegment, display.segments.length - 1)]}
            line={line}
            onLine={setLine}
          />
        )}
        <PlotChart
          testId="strike-profile-chart"
          title={`Strike profile — ${quantity}${mode === "line" && !line ? " (drag a line on the map)" : ""}`}
          fileStem={`${stem}-strike-profile-${mode}-${quantity}`}
          points={chart.rows.length}
          deps={[chart, xLabel, yLabel]}
          csv={() =>
            toCsv(
              ["series", mode === "line" ? "distance_m" : multi ? "along_strike_m" : "s_m", "s_m", "t_m", `${quantity}_m`],
              [
                ...chart.allRows.map((r) => [r.series, r.x, r.s, r.t, r.value]),
                ...chart.sum.map((r) => ["sum", r.x, NaN, NaN, r.value]),
                ...chart.modelRows.map((r) => [r.series, r.x, r.s, r.t, r.value]),
              ],
            )
          }
          build={(width) => {
            if (chart.rows.length === 0) return null;
            const series = [...new Set(chart.rows.map((r) => r.series))];
            const domain = [...series, ...(chart.sumLine.length ? ["sum of segments"] : []), ...(chart.modelRows.length ? ["fitted model"] : [])];
            const range = [
              ...series.map((_, i) => CHART.segments[i % CHART.segments.length]),
              ...(chart.sumLine.length ? [CHART.sum] : []),
              ...(chart.modelRows.length ? [CHART.model] : []),
            ];
            return Plot.plot({
              ...X_AXIS_ROOM,
              width,
              height: 320,
              marginLeft: 56,
              style: { fontSize: "12px", background: "transparent" },
              x: { ...X_LABEL_BELOW, label: xLabel, grid: true },
              y: { label: yLabel, grid: true, zero: true },
              color: { legend: true, domain, range },
              marks: [
                chart.overlap
                  ? Plot.rect([chart.overlap], { x1: (d: [number, number]) => d[0], x2: (d: [number, number]) => d[1], fill: CHART.overlap, fillOpacity: 0.15 })
                  : null,
                chart.overlap
                  ? Plot.text([chart.overlap], {
                      x: (d: [number, number]) => (d[0] + d[1]) / 2,
                      frameAnchor: "top",
                      dy: 6,
                      text: () => "overlap (relay)",
                      fill: CHART.tip,
                    })
                  : null,
                Plot.rect(chart.bands, {
                  x1: "x1",
                  x2: "x2",
                  fill: CHART.tip,
                  fillOpacity: 0.22,
                  className: "tip-band",
                  title: (d: { series: string; x1: number; x2: number }) =>
                    `${d.series}: the tip lies between ${Math.min(d.x1, d.x2).toFixed(0)} and ${Math.max(d.x1, d.x2).toFixed(0)} m (5–95 %)`,
                }),
                Plot.ruleY([0]),
                chart.sumLine.length
                  ? Plot.line(chart.sumLine, { x: "x", y: "value", stroke: () => "sum of segments", strokeWidth: 4, strokeOpacity: 0.5 })
                  : null,
                Plot.line(chart.modelRows, { x: "x", y: "value", z: "series", stroke: () => "fitted model", strokeDasharray: "6 4", strokeWidth: 1.5 }),
                Plot.line(chart.rows, { x: "x", y: "value", z: "series", stroke: "series", strokeWidth: 1.5 }),
                Plot.dot(chart.rows, { x: "x", y: "value", fill: "series", r: 1.8, className: "profile-point" }),
                Plot.dot(chart.tips, {
                  x: "x",
                  y: () => 0,
                  symbol: "diamond",
                  r: 5,
                  fill: CHART.tip,
                  stroke: "white",
                  title: (d: { series: string; x: number }) => `inferred tip of ${d.series} at ${d.x.toFixed(0)} m`,
                }),
                Plot.dot(chart.openEnds, {
                  x: "x",
                  y: () => 0,
                  symbol: "square",
                  r: 5,
                  fill: CHART.open,
                  stroke: "white",
                  className: "open-end",
                  title: (d: { series: string; x: number }) =>
                    `open end of ${d.series} at ${d.x.toFixed(0)} m: the picks stop while displacement is still high, no tip inferred`,
                }),
                Plot.tip(
                  [
                    ...chart.rows,
                    ...chart.sumLine
                      .filter((r) => Number.isFinite(r.value))
                      .map((r) => ({ series: "sum of segments", x: r.x, value: r.value, s: NaN, t: NaN })),
                  ],
                  Plot.pointerX({
                    x: "x",
                    y: "value",
                    title: (r: Row) =>
                      `${r.series}\n${xLabel.replace(/ \(m\)$/, "")}: ${r.x.toFixed(0)} m\n${yLabel.replace(/ \(m\)$/, "")}: ${r.value.toFixed(1)} m`,
                  }),
                ),
              ],
            });
          }}
          note={
            <>
              Inferred tip positions marked ◆ at zero (amber); the shaded strip at each end is where the tip lies with 5–95 % confidence.
              {chart.openEnds.length > 0 && " ■ (blue) marks an open end: the picks stop there while displacement is still high, so no tip is inferred."}{" "}
              Dashed: {modelName}, at its fitted Dmax.
              {multi &&
                mode !== "line" &&
                chart.sumLine.length > 0 &&
                " Broad grey: the sum of the segments where two or more have resolvable data (displacement transfer across the relay); the overlap of the inferred tip lines is shaded."}
              {multi && mode !== "line" && chart.sumLine.length === 0 && (
                <span data-testid="no-sum-note">
                  {" "}
                  No position along strike has resolvable data on two segments at once, so their sum is each segment&apos;s own line (no separate sum is drawn;
                  the CSV has it). The overlap of the inferred tip lines is shaded.
                </span>
              )}{" "}
              Values from the display grid; the Export tab gives the full-resolution profile.
            </>
          }
        />
      </div>
    </div>
  );
}

function modelStrikeProfileName(segments: SegmentResult[]): string {
  const names = [...new Set(segments.map((segment) => modelStrikeProfile(segment, segment.max.t, { samples: 2 })?.name).filter(Boolean))];
  return `fitted model (${names.join("; ")})`;
}

/** [sMin, sMax, tMin, tMax] of points in the plane, widened by `margin` of the span on each side. */
function planExtent(points: ArrayLike<number>[], margin: number): [number, number, number, number] {
  let sMin = Infinity,
    sMax = -Infinity,
    tMin = Infinity,
    tMax = -Infinity;
  for (const point of points) {
    if (!Number.isFinite(point[0]) || !Number.isFinite(point[1])) continue;
    sMin = Math.min(sMin, point[0]);
    sMax = Math.max(sMax, point[0]);
    tMin = Math.min(tMin, point[1]);
    tMax = Math.max(tMax, point[1]);
  }
  const sPad = (sMax - sMin) * margin;
  const tPad = (tMax - tMin) * margin;
  return [sMin - sPad, sMax + sPad, tMin - tPad, tMax + tPad];
}

function profileFor(mode: Mode, segment: SegmentResult, grid: GridLike, line: [[number, number], [number, number]] | null): Profile {
  if (mode === "column-max") return columnMaxProfile(grid);
  if (mode === "line") return line ? profileAlongLine(grid, line[0], line[1], 160) : { distanceM: [], s: [], t: [], displacementM: [], throwM: [] };
  return strikeProfileAtT(grid, segment.max.t);
}

/** Small plan of the segment in (s, t): displacement raster, tip line, mapped limit; drag to draw the profile line. */
function LineMap({
  segment,
  displaySegment,
  line,
  onLine,
}: {
  segment: SegmentResult;
  displaySegment: DisplaySegment;
  line: [[number, number], [number, number]] | null;
  onLine: (line: [[number, number], [number, number]] | null) => void;
}) {
  const dragStart = useRef<[number, number] | null>(null);
  const grid = displaySegment.grid;
  const drawn = line;
  return (
    <PlotChart
      testId="profile-line-map"
      title={`Plan of segment ${segment.id} (s, t) — drag to draw a profile line`}
      fileStem={`profile-line-map-${segment.id}`}
      points={drawn ? 2 : 0}
      deps={[grid, drawn, segment]}
      build={(width) => {
        const w = Math.min(width, 340);
        const s1 = grid.s0 + (grid.columns - 1) * grid.cellM;
        const t1 = grid.t0 + (grid.rows - 1) * grid.cellM;
        // the plan spans the grid and the whole inferred tip line, which reaches beyond the data
        const [sLow, sHigh, tLow, tHigh] = planExtent([[grid.s0, grid.t0], [s1, t1], ...displaySegment.tipLine, ...displaySegment.mappedLimit], 0.04);
        const chart = Plot.plot({
          ...X_AXIS_ROOM,
          width: w,
          height: Math.max(160, Math.min(320, (w * (tHigh - tLow)) / Math.max(1, sHigh - sLow) + 60)),
          marginLeft: 50,
          style: { fontSize: "11px", background: "transparent", cursor: "crosshair", touchAction: "none" },
          x: { ...X_LABEL_BELOW, label: "s along strike (m)", domain: [sLow, sHigh] },
          y: { label: "t down dip (m)", domain: [tHigh, tLow] },
          color: { scheme: "viridis", label: "Displacement (m)", legend: true },
          marks: [
            Plot.raster(
              Array.from(grid.displacementM, (v) => (Number.isNaN(v) ? undefined : v)),
              {
                width: grid.columns,
                height: grid.rows,
                x1: grid.s0,
                x2: s1,
                y1: grid.t0,
                y2: t1,
                fill: (v: number | undefined) => v,
                imageRendering: "pixelated",
              },
            ),
            Plot.line(displaySegment.tipLine, { x: "0", y: "1", stroke: CHART.tip, strokeWidth: 2 }),
            Plot.line(displaySegment.mappedLimit, { x: "0", y: "1", stroke: "currentColor", strokeDasharray: "3 3" }),
            drawn
              ? Plot.link([drawn], {
                  x1: (d: typeof drawn) => d[0][0],
                  y1: (d: typeof drawn) => d[0][1],
                  x2: (d: typeof drawn) => d[1][0],
                  y2: (d: typeof drawn) => d[1][1],
                  stroke: "white",
                  strokeWidth: 3,
                  markerEnd: "arrow",
                })
              : null,
            drawn
              ? Plot.link([drawn], {
                  x1: (d: typeof drawn) => d[0][0],
                  y1: (d: typeof drawn) => d[0][1],
                  x2: (d: typeof drawn) => d[1][0],
                  y2: (d: typeof drawn) => d[1][1],
                  stroke: "#0f172a",
                  strokeWidth: 1.5,
                  markerEnd: "arrow",
                })
              : null,
          ],
        });
        const x = chart.scale("x")!;
        const y = chart.scale("y")!;
        // the plot's own svg, not the colour legend's
        const svg = chart instanceof SVGSVGElement ? chart : mainSvg(chart)!;
        const toPlane = (event: PointerEvent): [number, number] => {
          const box = svg.getBoundingClientRect();
          return [Number(x.invert!(event.clientX - box.left)), Number(y.invert!(event.clientY - box.top))];
        };
        // while dragging, a plain SVG line follows the pointer; the chart is rebuilt only when the line is set
        let rubber: SVGLineElement | null = null;
        svg.addEventListener("pointerdown", (event) => {
          dragStart.current = toPlane(event);
          svg.setPointerCapture(event.pointerId);
          const box = svg.getBoundingClientRect();
          rubber = document.createElementNS("http://www.w3.org/2000/svg", "line");
          rubber.setAttribute("stroke", "#0f172a");
          rubber.setAttribute("stroke-width", "2");
          rubber.setAttribute("x1", String(event.clientX - box.left));
          rubber.setAttribute("y1", String(event.clientY - box.top));
          rubber.setAttribute("x2", String(event.clientX - box.left));
          rubber.setAttribute("y2", String(event.clientY - box.top));
          svg.append(rubber);
        });
        svg.addEventListener("pointermove", (event) => {
          if (!dragStart.current || !rubber) return;
          const box = svg.getBoundingClientRect();
          rubber.setAttribute("x2", String(event.clientX - box.left));
          rubber.setAttribute("y2", String(event.clientY - box.top));
        });
        svg.addEventListener("pointerup", (event) => {
          if (!dragStart.current) return;
          const end = toPlane(event);
          const start = dragStart.current;
          dragStart.current = null;
          rubber?.remove();
          rubber = null;
          if (Math.hypot(end[0] - start[0], end[1] - start[1]) > grid.cellM) onLine([start, end]);
        });
        return chart;
      }}
      note="Amber: inferred tip line; dashed: mapped limit of the picks."
    />
  );
}
