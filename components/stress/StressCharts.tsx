"use client";
import * as Plot from "@observablehq/plot";
import { usePlotFigure } from "@/components/analysis-views/usePlotFigure";
import type { StressParameters } from "@/lib/contracts/stress";
import { X_AXIS_ROOM, X_LABEL_BELOW } from "@/components/analysis-views/PlotChart";

const COLOURS = { low: "#c2410c", high: "#247a75", guide: "#94a3b8", circle: "#7c3aed" };

/** Builds an Observable Plot figure into a div and replaces it when its inputs or the width change. */
function PlotHolder({
  build,
  deps,
  testId,
  points,
}: {
  build: (width: number) => SVGSVGElement | HTMLElement;
  deps: unknown[];
  testId: string;
  points: number;
}) {
  const { holder, error } = usePlotFigure(build, deps, { minWidth: 280 });
  return (
    <div data-testid={testId} data-points={points}>
      <div ref={holder} className="w-full text-slate-800 dark:text-slate-200" />
      {error && <p className="text-xs text-red-700 dark:text-red-300">{error}</p>}
    </div>
  );
}

export interface HistogramData {
  edgesMPa: number[];
  fractionLow: number[];
  fractionHigh: number[];
}

/** Area-weighted histogram of ΔP to failure, both ends of the friction band, with the thresholds marked. */
export function PressureHistogram({
  histogram,
  parameters,
  thresholdsMPa,
  height = 220,
}: {
  histogram: HistogramData;
  parameters: StressParameters;
  thresholdsMPa: number[];
  height?: number;
}) {
  const bins = histogram.fractionLow.map((_, i) => ({
    x1: histogram.edgesMPa[i],
    x2: histogram.edgesMPa[i + 1],
    low: 100 * histogram.fractionLow[i],
    high: 100 * histogram.fractionHigh[i],
  }));
  const lowLabel = `μ = ${parameters.frictionLow}`;
  const highLabel = `μ = ${parameters.frictionHigh}`;
  return (
    <PlotHolder
      testId="stress-histogram"
      points={bins.length}
      deps={[histogram, parameters.frictionLow, parameters.frictionHigh, thresholdsMPa.join(",")]}
      build={(width) =>
        Plot.plot({
          ...X_AXIS_ROOM,
          width,
          height,
          marginLeft: 44,
          style: { fontSize: "11px", background: "transparent" },
          x: { ...X_LABEL_BELOW, label: "ΔP to failure (MPa) →" },
          y: { label: "↑ Fault area (%)", grid: true },
          color: { legend: true, domain: [lowLabel, highLabel], range: [COLOURS.low, COLOURS.high] },
          marks: [
            Plot.rectY(bins, { x1: "x1", x2: "x2", y: "low", fill: () => lowLabel, fillOpacity: 0.55, inset: 0.5 }),
            Plot.rectY(bins, { x1: "x1", x2: "x2", y: "high", stroke: () => highLabel, fill: "none", strokeWidth: 1.5 }),
            Plot.ruleX([0], { stroke: "currentColor", strokeWidth: 1.5 }),
            Plot.ruleX(thresholdsMPa, { stroke: COLOURS.guide, strokeDasharray: "4 3" }),
            Plot.ruleY([0]),
          ],
        })
      }
    />
  );
}

export interface MohrData {
  total: number;
  effectiveNormalMPa: number[];
  shearMPa: number[];
  depthM: number[];
}

/**
 * σn′–τ plot: every screened triangle a point (deterministic subsample above 20 000), Coulomb envelopes τ = C + μσn′
 * for both ends of the friction band, and the three Mohr circles of the effective stresses at the reference depth.
 */
export function MohrPlot({
  mohr,
  parameters,
  reference,
  height = 300,
}: {
  mohr: MohrData;
  parameters: StressParameters;
  reference: { sigma1MPa: number; sigma2MPa: number; sigma3MPa: number; porePressureMPa: number; depthM: number };
  height?: number;
}) {
  const points = mohr.effectiveNormalMPa.map((x, i) => ({ x, y: mohr.shearMPa[i], depth: mohr.depthM[i] }));
  const s1 = reference.sigma1MPa - reference.porePressureMPa;
  const s2 = reference.sigma2MPa - reference.porePressureMPa;
  const s3 = reference.sigma3MPa - reference.porePressureMPa;
  let xMin = 0,
    xMaxData = s1,
    yMaxData = (s1 - s3) / 2;
  for (let i = 0; i < points.length; i++) {
    xMin = Math.min(xMin, points[i].x);
    xMaxData = Math.max(xMaxData, points[i].x);
    yMaxData = Math.max(yMaxData, points[i].y);
  }
  const xMax = xMaxData * 1.05 || 1;
  const circles = [
    [s3, s1],
    [s3, s2],
    [s2, s1],
  ].flatMap(([a, b], k) =>
    Array.from({ length: 73 }, (_, j) => {
      const angle = (Math.PI * j) / 72;
      return { circle: k, x: (a + b) / 2 + ((b - a) / 2) * Math.cos(angle), y: ((b - a) / 2) * Math.sin(angle) };
    }),
  );
  const yTop = Math.max(1, yMaxData * 1.15);
  // each envelope ends where it leaves the plot, so its label stays visible
  const envelope = (mu: number) => {
    const xEnd = Math.min(xMax, (yTop * 0.95 - parameters.cohesionMPa) / mu);
    return [
      { x: 0, y: parameters.cohesionMPa, mu: `μ = ${mu}` },
      { x: xEnd, y: parameters.cohesionMPa + mu * xEnd, mu: `μ = ${mu}` },
    ];
  };
  const low = envelope(parameters.frictionLow);
  const high = envelope(parameters.frictionHigh);
  return (
    <PlotHolder
      testId="stress-mohr"
      points={points.length}
      deps={[mohr, parameters, reference]}
      build={(width) =>
        Plot.plot({
          ...X_AXIS_ROOM,
          width,
          height,
          marginLeft: 44,
          style: { fontSize: "11px", background: "transparent" },
          x: { ...X_LABEL_BELOW, label: "Effective normal stress σn′ (MPa) →", domain: [xMin, xMax] },
          y: { label: "↑ Shear stress τ (MPa)", grid: true, domain: [0, yTop] },
          color: { legend: true, label: "Depth (m)", scheme: "cividis", reverse: true },
          marks: [
            Plot.dot(points, { x: "x", y: "y", r: 1.3, fill: "depth", fillOpacity: 0.6 }),
            Plot.line(circles, { x: "x", y: "y", z: "circle", stroke: COLOURS.circle, strokeWidth: 1 }),
            Plot.line(low, { x: "x", y: "y", stroke: COLOURS.low, strokeWidth: 1.5 }),
            Plot.line(high, { x: "x", y: "y", stroke: COLOURS.high, strokeWidth: 1.5 }),
            Plot.text([low[1], high[1]], { x: "x", y: "y", text: "mu", dy: -6, textAnchor: "end", fill: "currentColor" }),
            Plot.ruleY([0]),
            Plot.ruleX([0]),
          ],
          clip: true,
        } as Plot.PlotOptions)
      }
    />
  );
}
