"use client";
import * as Plot from "@observablehq/plot";
import { useQuery } from "@tanstack/react-query";
import { useMemo } from "react";
import { apiFetch } from "@/lib/api/client";
import { toCsv } from "@/lib/views/csv";
import { fitPowerLaw, powerLawLine, SCALING_GUIDES, type PowerLawFit } from "@/lib/views/scaling";
import type { FaultScalingPoint, ScalingResponse } from "@/lib/contracts/analysis";
import { placeLabels, textWidthPx } from "@/lib/views/labels";
import { CHART, PlotChart, X_AXIS_ROOM, X_LABEL_BELOW } from "./PlotChart";

/**
 * Log-axis tick labels as plain numbers at 1, 2 and 5 of each decade (the default SI labels print 0.2 m as "200m",
 * which reads as 200 metres; labelling every tick crowds the upper end of each decade).
 */
function logTickLabel(value: number) {
  const mantissa = value / 10 ** Math.floor(Math.log10(value) + 1e-9);
  return [1, 2, 5].some((shown) => Math.abs(mantissa - shown) < 1e-6) ? value.toLocaleString("en-US", { maximumFractionDigits: 3 }) : "";
}

const LABEL_FONT_PX = 12;

/**
 * Fault names placed where they overlap no other name or point (this fault's first), in data coordinates for the
 * chart; labels moved away from their point get a leader line from the point's edge.
 */
function faultLabels(points: FaultScalingPoint[], currentFaultId: string, frame: Plot.PlotOptions) {
  const probe = Plot.plot({ ...frame, marks: [] });
  const x = probe.scale("x")!;
  const y = probe.scale("y")!;
  const [left, right] = x.range as [number, number];
  const [bottom, top] = y.range as [number, number];
  const ordered = [...points].sort((a, b) => Number(b.faultId === currentFaultId) - Number(a.faultId === currentFaultId));
  const pixels = ordered.map((p) => ({ x: x.apply(p.lengthM) as number, y: y.apply(p.dMaxM) as number }));
  const placed = placeLabels(
    ordered.map((p, k) => ({ ...pixels[k], width: textWidthPx(p.name, LABEL_FONT_PX), height: LABEL_FONT_PX + 2 })),
    { x0: left, x1: right, y0: Math.min(top, bottom), y1: Math.max(top, bottom) },
    { radius: 5, gap: 3 },
  );
  return placed.map((label, k) => {
    // the leader runs from the point towards the nearest point of the label's box
    const nearX = Math.min(Math.max(pixels[k].x, label.box.x0), label.box.x1);
    const nearY = Math.min(Math.max(pixels[k].y, label.box.y0), label.box.y1);
    return {
      name: ordered[k].name,
      anchor: label.anchor,
      leader: label.leader,
      x: x.invert!(label.x) as number,
      y: y.invert!(label.y) as number,
      pointX: ordered[k].lengthM,
      pointY: ordered[k].dMaxM,
      leaderX: x.invert!(nearX) as number,
      leaderY: y.invert!(nearY) as number,
    };
  });
}

export function useStudyScaling(faultId: string) {
  return useQuery({
    queryKey: ["scaling", faultId],
    queryFn: () => apiFetch<ScalingResponse>(`/api/faults/${faultId}/export/scaling.json`),
  });
}

/** The scaling chart: log–log Dmax against L for every analysed fault of the study, over published envelopes. */
export function ScalingChart({
  points,
  currentFaultId,
  stem,
  height = 360,
}: {
  points: FaultScalingPoint[];
  currentFaultId: string;
  stem: string;
  height?: number;
}) {
  const fit = useMemo(
    () =>
      fitPowerLaw(
        points.map((p) => p.lengthM),
        points.map((p) => p.dMaxM),
      ),
    [points],
  );
  const lo = Math.min(100, ...points.map((p) => p.lengthRangeM[0] / 3).filter((v) => v > 0));
  const hi = Math.max(20000, ...points.map((p) => p.lengthM * 3));
  return (
    <PlotChart
      testId="scaling-chart"
      title="Scaling chart — Dmax against L (log–log)"
      fileStem={`${stem}-scaling-chart`}
      points={points.length}
      deps={[points, fit, currentFaultId]}
      csv={() =>
        toCsv(
          ["fault", "length_m", "length_p05_m", "length_p95_m", "length_is_minimum", "dmax_fitted_m", "dmax_p05_m", "dmax_p95_m", "d_over_l", "segments"],
          points.map((p) => [
            p.name,
            p.lengthM,
            p.lengthRangeM[0],
            p.lengthRangeM[1] ?? NaN,
            p.lengthIsMinimum ? "yes" : "no",
            p.dMaxM,
            p.dMaxRangeM[0],
            p.dMaxRangeM[1],
            p.dMaxM / p.lengthM,
            p.segmentCount,
          ]),
        )
      }
      build={(width) => {
        const guides = SCALING_GUIDES.filter((g) => g.kind !== "box").flatMap((g) =>
          powerLawLine(g.c!, g.n!, lo, hi).map((p) => ({ ...p, guide: `${g.label} (${g.source})` })),
        );
        const box = SCALING_GUIDES.find((g) => g.kind === "box")!;
        const fits = fit
          ? (["ols", "rma"] as const).flatMap((m) =>
              powerLawLine(fit[m].c, fit[m].n, Math.min(...points.map((p) => p.lengthM)) / 1.5, Math.max(...points.map((p) => p.lengthM)) * 1.5).map((p) => ({
                ...p,
                guide: `${m.toUpperCase()} fit: D = ${fit[m].c.toPrecision(3)}·L^${fit[m].n.toFixed(2)} (this study, N = ${fit.count})`,
              })),
            )
          : [];
        const guideNames = [...new Set(guides.map((g) => g.guide))];
        const fitNames = [...new Set(fits.map((g) => g.guide))];
        const boxName = `${box.label} (${box.source})`;
        const frame = {
          ...X_AXIS_ROOM,
          width,
          height,
          marginLeft: 56,
          style: { fontSize: "12px", background: "transparent" },
          x: { ...X_LABEL_BELOW, type: "log", label: "Fault length L, inferred tip line (m)", domain: [lo, hi], grid: true, tickFormat: logTickLabel },
          y: {
            type: "log",
            label: "Maximum displacement Dmax (m)",
            tickFormat: logTickLabel,
            domain: [Math.min(0.1, lo * 0.001), Math.max(1000, hi * 0.1)],
            grid: true,
          },
        } satisfies Plot.PlotOptions;
        const labels = faultLabels(points, currentFaultId, frame);
        return Plot.plot({
          ...frame,
          color: {
            legend: true,
            domain: [...guideNames, boxName, ...fitNames],
            range: [CHART.guide, CHART.guide, CHART.guide, "#64748b", CHART.overlap, CHART.model, CHART.slip].slice(0, guideNames.length + 1 + fitNames.length),
          },
          marks: [
            Plot.rect([box.box!], {
              x1: (b: NonNullable<typeof box.box>) => b.lengthM[0],
              x2: (b: NonNullable<typeof box.box>) => b.lengthM[1],
              y1: (b: NonNullable<typeof box.box>) => b.dMaxM[0],
              y2: (b: NonNullable<typeof box.box>) => b.dMaxM[1],
              fill: () => boxName,
              fillOpacity: 0.12,
            }),
            Plot.line(
              guides.filter((g) => g.guide.startsWith("D/L")),
              { x: "lengthM", y: "dMaxM", z: "guide", stroke: "guide", strokeDasharray: "2 3" },
            ),
            Plot.line(
              guides.filter((g) => !g.guide.startsWith("D/L")),
              { x: "lengthM", y: "dMaxM", z: "guide", stroke: "guide", strokeDasharray: "6 3" },
            ),
            Plot.line(fits, { x: "lengthM", y: "dMaxM", z: "guide", stroke: "guide", strokeWidth: 1.5 }),
            // error bars both ways: the 5–95 % range of L and of the fitted Dmax; an open end draws L's bar as an arrow
            Plot.link(
              points.filter((p) => p.lengthRangeM[1] !== null),
              {
                x1: (p: FaultScalingPoint) => Math.max(lo, p.lengthRangeM[0]),
                x2: (p: FaultScalingPoint) => p.lengthRangeM[1],
                y1: "dMaxM",
                y2: "dMaxM",
                stroke: "currentColor",
                strokeWidth: 1.2,
                className: "length-bar",
              },
            ),
            Plot.link(
              points.filter((p) => p.lengthRangeM[1] === null),
              {
                x1: (p: FaultScalingPoint) => Math.max(lo, p.lengthRangeM[0]),
                x2: (p: FaultScalingPoint) => p.lengthM * 1.6,
                y1: "dMaxM",
                y2: "dMaxM",
                stroke: "currentColor",
                strokeWidth: 1.2,
                markerEnd: "arrow",
                className: "length-bar",
              },
            ),
            Plot.link(points, {
              x1: "lengthM",
              x2: "lengthM",
              y1: (p: FaultScalingPoint) => p.dMaxRangeM[0],
              y2: (p: FaultScalingPoint) => p.dMaxRangeM[1],
              stroke: "currentColor",
              strokeWidth: 1.2,
              className: "dmax-bar",
            }),
            Plot.dot(points, {
              x: "lengthM",
              y: "dMaxM",
              r: 5,
              fill: (p: FaultScalingPoint) => (p.faultId === currentFaultId ? CHART.tip : CHART.slip),
              stroke: "white",
              className: "fault-point",
            }),
            Plot.link(
              labels.filter((label) => label.leader),
              { x1: "pointX", y1: "pointY", x2: "leaderX", y2: "leaderY", stroke: "currentColor", strokeOpacity: 0.6 },
            ),
            ...(["start", "middle", "end"] as const).map((anchor) =>
              Plot.text(
                labels.filter((label) => label.anchor === anchor),
                { x: "x", y: "y", text: "name", textAnchor: anchor, lineAnchor: "middle", fontWeight: 600, fontSize: LABEL_FONT_PX, className: "fault-label" },
              ),
            ),
            Plot.tip(
              points,
              Plot.pointer({
                x: "lengthM",
                y: "dMaxM",
                title: (p: FaultScalingPoint) =>
                  `${p.name}\nL = ${p.lengthIsMinimum ? "at least " : ""}${p.lengthM.toFixed(0)} m (5–95 %: ${p.lengthRangeM[0].toFixed(0)}–${p.lengthRangeM[1] === null ? "open" : p.lengthRangeM[1].toFixed(0)} m)\nDmax (fitted) = ${p.dMaxM.toFixed(1)} m (${p.dMaxRangeM[0].toFixed(1)}–${p.dMaxRangeM[1].toFixed(1)} m)\nD/L = ${(p.dMaxM / p.lengthM).toPrecision(3)}`,
              }),
            ),
          ],
        });
      }}
      note={<FitSummary fit={fit} count={points.length} />}
    />
  );
}

function FitSummary({ fit, count }: { fit: PowerLawFit | null; count: number }) {
  if (!fit)
    return (
      <>
        A power-law fit D = c·L^n needs at least 3 analysed faults; this study has {count}. Points: fitted Dmax against the inferred tip-line length; error
        bars: their 5–95 % ranges (an arrow where an end is open, so L is a minimum). Amber dot: this fault.
      </>
    );
  const row = (label: string, f: PowerLawFit["ols"]) =>
    `${label}: n = ${f.n.toFixed(3)} (95 % CI ${f.nConfidence95[0].toFixed(2)}–${f.nConfidence95[1].toFixed(2)}), c = ${f.c.toPrecision(3)}`;
  const weak = fit.correlationPValue >= 0.05;
  return (
    <span data-testid="scaling-fit">
      {row("Least squares in log space", fit.ols)}; {row("reduced major axis", fit.rma)}; r² = {fit.r2.toFixed(3)}, N = {fit.count}. Intervals: Student t for
      least squares; for the reduced major axis the exact interval of Warton et al. (2006), not symmetric about n.{" "}
      {weak && (
        <strong data-testid="scaling-weak">
          The correlation is not significant at 5 % (p = {fit.correlationPValue.toFixed(2)}): these faults do not determine an exponent.{" "}
        </strong>
      )}
      Published exponents lie between 1 and 1.5 (Walsh et al. 2002); Clark &amp; Cox (1996) found a common n = 0.946 ± 0.043. Points: fitted Dmax against the
      inferred tip-line length; error bars: their 5–95 % ranges (an arrow where an end is open, so L is a minimum). Amber dot: this fault.
    </span>
  );
}

export function ScalingView({ faultId, stem }: { faultId: string; stem: string }) {
  const scaling = useStudyScaling(faultId);
  if (scaling.isPending) return <p className="text-sm text-slate-500">Loading the study&apos;s faults…</p>;
  if (scaling.isError) return <p className="text-sm text-red-700">{scaling.error.message}</p>;
  return (
    <div data-testid="scaling-view">
      <ScalingChart points={scaling.data.faults} currentFaultId={faultId} stem={stem} />
      <p className="mt-2 text-xs text-slate-500">
        One point per fault (several segments count as one fault, L spanning all of them). Published D–L scatter is about half an order of magnitude (Cartwright
        et al. 1995): a check, not a constraint.
      </p>
    </div>
  );
}
