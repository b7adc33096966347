"use client";
import { usePlotFigure } from "./usePlotFigure";
import { downloadDataUrl, downloadText, figurePngDataUrl } from "./download";

/**
 * One Observable Plot chart: built in an effect into a div, replaced (and the old one removed) whenever its inputs
 * change, with a PNG button and an optional CSV button. `points` is the number of data points the chart plots; it is
 * exposed as data-points for checks.
 */
export function PlotChart(props: {
  testId: string;
  title: string;
  fileStem: string;
  build: (width: number) => (SVGSVGElement | HTMLElement) | null;
  deps: unknown[];
  points: number;
  csv?: () => string;
  onRendered?: (element: SVGSVGElement | HTMLElement) => void;
  note?: React.ReactNode;
}) {
  const { holder, error } = usePlotFigure(props.build, props.deps, { onRendered: props.onRendered });

  // the PNG stands alone: the chart's title and legends go with it
  async function png() {
    if (!holder.current) return;
    const url = await figurePngDataUrl(holder.current, props.title, document.documentElement.classList.contains("dark"));
    if (url) downloadDataUrl(url, `${props.fileStem}.png`);
  }

  return (
    <figure className="min-w-0" data-testid={props.testId} data-points={props.points}>
      <div className="mb-1 flex items-center justify-between gap-2">
        <figcaption className="text-sm font-medium text-slate-700 dark:text-slate-200">{props.title}</figcaption>
        <div className="flex gap-1">
          {props.csv && (
            <button
              type="button"
              className="rounded border border-slate-300 px-2 py-0.5 text-xs hover:bg-slate-100 dark:border-slate-700 dark:hover:bg-slate-800"
              onClick={() => downloadText(props.csv!(), `${props.fileStem}.csv`)}
              data-testid={`${props.testId}-csv`}
            >
              CSV
            </button>
          )}
          <button
            type="button"
            className="rounded border border-slate-300 px-2 py-0.5 text-xs hover:bg-slate-100 dark:border-slate-700 dark:hover:bg-slate-800"
            onClick={() => void png()}
            data-testid={`${props.testId}-png`}
          >
            PNG
          </button>
        </div>
      </div>
      <div ref={holder} className="plot-holder w-full text-slate-800 dark:text-slate-200" />
      {error && <p className="text-xs text-red-700 dark:text-red-300">{error}</p>}
      {props.note && <div className="mt-1 text-xs text-slate-500">{props.note}</div>}
    </figure>
  );
}

/** Slipfield chart colours: teal "slip" for data, amber for tip lines, slate for guides. */
export const CHART = {
  slip: "#247a75",
  slipLight: "#4bb3aa",
  tip: "#f08c00",
  // an open end (no tip inferred): the cool colour the 3D view and the map use for open edges
  open: "#0e7490",
  model: "#7c3aed",
  sum: "#64748b",
  guide: "#94a3b8",
  overlap: "#f5a524",
  segments: ["#247a75", "#2563eb", "#be185d", "#65a30d"],
};

/** Room under a chart for its x ticks and, below them, the x label (Plot's default margin lets a long label run into the ticks). */
export const X_AXIS_ROOM = { marginBottom: 44 } as const;
export const X_LABEL_BELOW = { labelOffset: 38 } as const;
