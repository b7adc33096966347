"use client";
// The juxtaposition diagram (after Allan 1989) on the fault plane: hanging-wall and footwall horizon traces in
// (along strike, depth), the units between them, and the areas where a unit of one wall faces a unit of the other,
// coloured by what meets what; reservoir against reservoir is drawn as a possible cross-fault pathway. Exports a PNG
// of the diagram and a CSV of the areas.
import { useMemo, useRef, useState } from "react";
import { downloadDataUrl, downloadText, figurePngDataUrl } from "@/components/analysis-views/download";
import type { StationSegment } from "@/lib/engine/cutoff-stations";
import { areasByPair, juxtapose, juxtapositionCsv, PAIR_WORDS, UNDESCRIBED, type Band, type Juxtaposition, type PairKind } from "@/lib/engine/juxtaposition";
import { describeVelocityModel, DEPTH_CONVERSION_CAUTION } from "@/lib/engine/time-depth";
import { bandPolygons, juxtapositionTraces, tracePolylines } from "@/lib/views/seal";
import { niceTicks } from "@/scene/geometry";
import { metres } from "@/lib/format";
import { StratigraphyEditor } from "./StratigraphyEditor";
import { SealCaution } from "./SealCaution";
import { useCutoffSet, useStratigraphy } from "./useSealData";

/** Our colours for what meets what: the pathway strong and warm, the juxtaposition seal cool, the rest quiet. */
export const PAIR_COLOURS: Record<PairKind, string> = {
  "reservoir-reservoir": "#c2364a",
  "reservoir-seal": "#2f8f83",
  "reservoir-other": "#e6c36a",
  "no-reservoir": "#d5dbe3",
};
const KIND_COLOURS: Record<Band["kind"], string> = { reservoir: "#f2cf5b", seal: "#5f6b52", other: "#c9bfb3", undescribed: "#eef2f6" };
const HW_TRACE = "#7c2d12";
const FW_TRACE = "#0f172a";

type Fill = "pairs" | "hw" | "fw";
const FILL_WORDS: Record<Fill, string> = { pairs: "what meets what", hw: "hanging-wall units", fw: "footwall units" };

const WIDTH = 900;
const MARGIN = { left: 70, right: 178, top: 16, bottom: 44 };

export function JuxtapositionView({
  studyId,
  faultId,
  pickSetId,
  stem,
  canEdit,
}: {
  studyId: string;
  faultId: string;
  pickSetId: string;
  stem: string;
  canEdit: boolean;
}) {
  const cutoffs = useCutoffSet(faultId, pickSetId);
  const stratigraphy = useStratigraphy(studyId);
  const [segmentName, setSegmentName] = useState<string | null>(null);
  const [fill, setFill] = useState<Fill>("pairs");
  const svgRef = useRef<SVGSVGElement>(null);
  const cutoffSet = cutoffs.data?.cutoffSet ?? null;
  const segment = cutoffSet ? (cutoffSet.summary.segments.find((s) => s.name === segmentName) ?? cutoffSet.summary.segments[0]) : null;
  const units = useMemo(() => stratigraphy.data?.units ?? [], [stratigraphy.data]);
  const result = useMemo(() => (segment ? juxtapose(juxtapositionTraces(segment), units) : null), [segment, units]);

  if (cutoffs.isPending || stratigraphy.isPending) return <p className="text-sm text-slate-500">Loading the cut-offs…</p>;
  if (cutoffs.isError) return <p className="text-sm text-red-700 dark:text-red-300">{cutoffs.error.message}</p>;
  if (!cutoffSet || !segment || !result) {
    return (
      <div className="space-y-2 text-sm" data-testid="juxtaposition-none">
        <p>
          This fault has no cut-off lines yet. Upload a cut-off line file (the hanging-wall and footwall cut-offs of each horizon) with{" "}
          <span className="font-medium">Upload pick set</span> to draw the juxtaposition diagram and the shale gouge ratio.
        </p>
      </div>
    );
  }

  const horizons = cutoffSet.summary.horizons.map((h) => h.name);
  const totals = areasByPair(result.areas);
  const sameAsShown = cutoffSet.ofShownPickSet;
  const fileStem = `${stem}-juxtaposition-${segment.name}`;

  return (
    <div className="space-y-3" data-testid="juxtaposition-view">
      <p className="text-xs text-slate-600 dark:text-slate-300" data-testid="juxtaposition-source">
        From the cut-off file <span className="font-medium">{cutoffSet.fileName}</span> (pick set v{cutoffSet.pickSetVersion}
        {sameAsShown ? ", the one shown" : "; the pick set shown is another"}), stations every {metres(cutoffSet.stationSpacingM, 0)} along strike. Diagram
        after Allan (1989): the fault plane seen face-on, along strike against depth.
        {cutoffSet.velocityModel && ` Depth-converted from two-way time with ${describeVelocityModel(cutoffSet.velocityModel)}.`}
      </p>
      <div className="flex flex-wrap items-center gap-3 text-xs">
        {cutoffSet.summary.segments.length > 1 && (
          <label className="flex items-center gap-1.5">
            <span className="text-slate-500">Segment</span>
            <select
              className="field w-auto py-0.5 text-xs"
              value={segment.name}
              onChange={(event) => setSegmentName(event.target.value)}
              data-testid="juxtaposition-segment"
            >
              {cutoffSet.summary.segments.map((s) => (
                <option key={s.name} value={s.name}>
                  {s.name}
                </option>
              ))}
            </select>
          </label>
        )}
        <div className="inline-flex overflow-hidden rounded-md ring-1 ring-slate-300 dark:ring-slate-700" role="group" aria-label="Fill">
          {(Object.keys(FILL_WORDS) as Fill[]).map((option) => (
            <button
              key={option}
              type="button"
              aria-pressed={fill === option}
              onClick={() => setFill(option)}
              data-testid={`juxtaposition-fill-${option}`}
              className={`px-2.5 py-1 ${fill === option ? "bg-slip-700 text-white" : "bg-white text-slate-700 hover:bg-slate-50 dark:bg-slate-900 dark:text-slate-200"}`}
            >
              {FILL_WORDS[option]}
            </button>
          ))}
        </div>
        <div className="ml-auto flex gap-1">
          <button
            type="button"
            className="rounded border border-slate-300 px-2 py-0.5 hover:bg-slate-100 dark:border-slate-700 dark:hover:bg-slate-800"
            disabled={result.areas.length === 0}
            onClick={() => downloadText(juxtapositionCsv(segment.name, result), `${fileStem}-areas.csv`)}
            data-testid="juxtaposition-csv"
          >
            CSV of areas
          </button>
          <button
            type="button"
            className="rounded border border-slate-300 px-2 py-0.5 hover:bg-slate-100 dark:border-slate-700 dark:hover:bg-slate-800"
            onClick={async () => {
              const holder = svgRef.current?.parentElement;
              const picture = holder ? await figurePngDataUrl(holder, `Juxtaposition diagram, ${segment.name}`, false) : null;
              if (picture) downloadDataUrl(picture, `${fileStem}.png`);
            }}
            data-testid="juxtaposition-png"
          >
            PNG
          </button>
        </div>
      </div>
      <Diagram svgRef={svgRef} segment={segment} result={result} fill={fill} />
      <Legend fill={fill} totals={totals} windowAreaM2={result.windowAreaM2} hasUnits={units.length > 0} />
      {result.areas.length > 0 && <AreasTable result={result} />}
      {(result.notes.length > 0 || result.unplaced.length > 0 || cutoffSet.summary.missingStations > 0) && (
        <ul className="list-disc space-y-0.5 pl-4 text-xs text-amber-700 dark:text-amber-300" data-testid="juxtaposition-notes">
          {result.notes.map((note) => (
            <li key={note}>{note}</li>
          ))}
          {result.unplaced.length > 0 && <li>Units whose top horizon has no cut-offs on this segment are not drawn: {result.unplaced.join(", ")}.</li>}
          {cutoffSet.summary.missingStations > 0 && (
            <li>
              {cutoffSet.summary.missingStations} station{cutoffSet.summary.missingStations === 1 ? "" : "s"} with a cut-off on one wall only: left out of the
              diagram, not filled in.
            </li>
          )}
        </ul>
      )}
      {cutoffSet.velocityModel && (
        <p className="text-xs text-slate-500" data-testid="juxtaposition-depth-caution">
          {DEPTH_CONVERSION_CAUTION}
        </p>
      )}
      <SealCaution />
      {stratigraphy.data && (
        <StratigraphyEditor key={stratigraphy.data.version} studyId={studyId} table={stratigraphy.data} horizons={horizons} canEdit={canEdit} />
      )}
    </div>
  );
}

function Diagram({
  svgRef,
  segment,
  result,
  fill,
}: {
  svgRef: React.RefObject<SVGSVGElement | null>;
  segment: StationSegment;
  result: Juxtaposition;
  fill: Fill;
}) {
  const s = segment.stationsS;
  let zTop = -Infinity,
    zBottom = Infinity;
  for (const h of segment.horizons)
    for (const z of [...h.hwZ, ...h.fwZ])
      if (z !== null) {
        zTop = Math.max(zTop, z);
        zBottom = Math.min(zBottom, z);
      }
  const pad = (zTop - zBottom) * 0.08 || 10;
  zTop += pad;
  zBottom -= pad;
  const sMin = s[0] ?? 0,
    sMax = s[s.length - 1] ?? 1;
  const plotWidth = WIDTH - MARGIN.left - MARGIN.right;
  const plotHeight = Math.max(220, Math.min(420, plotWidth * 0.42));
  const height = plotHeight + MARGIN.top + MARGIN.bottom;
  const x = (value: number) => MARGIN.left + ((value - sMin) / (sMax - sMin || 1)) * plotWidth;
  const y = (z: number) => MARGIN.top + ((zTop - z) / (zTop - zBottom || 1)) * plotHeight;
  const exaggeration = plotHeight / (zTop - zBottom) / (plotWidth / (sMax - sMin || 1));
  const path = (points: [number, number][], close = true) =>
    `${points.map(([ps, pz], i) => `${i ? "L" : "M"}${x(ps).toFixed(1)} ${y(pz).toFixed(1)}`).join("")}${close ? "Z" : ""}`;
  const bands = fill === "hw" ? result.hw : fill === "fw" ? result.fw : [];
  const sTicks = niceTicks(sMin, sMax, 8);
  const zTicks = niceTicks(zBottom, zTop, 6);
  return (
    <svg
      ref={svgRef}
      viewBox={`0 0 ${WIDTH} ${height}`}
      width={WIDTH}
      height={height}
      className="h-auto w-full text-slate-700 dark:text-slate-200"
      role="img"
      aria-label={`Juxtaposition diagram of segment ${segment.name}: horizon cut-offs of both walls along strike against depth`}
      data-testid="juxtaposition-diagram"
      data-areas={result.areas.length}
    >
      <rect x={MARGIN.left} y={MARGIN.top} width={plotWidth} height={plotHeight} fill="#f8fafc" />
      {zTicks.map((tick) => (
        <line key={`z${tick}`} x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={y(tick)} y2={y(tick)} stroke="#e2e8f0" />
      ))}
      {fill === "pairs" &&
        result.areas.map((area) =>
          area.polygons.map((polygon, i) => (
            <path
              key={`${area.hwUnit}|${area.fwUnit}|${i}`}
              d={path(polygon)}
              fill={PAIR_COLOURS[area.pair]}
              stroke={area.pair === "reservoir-reservoir" ? "#6b1020" : "none"}
              strokeWidth={area.pair === "reservoir-reservoir" ? 2 : 0}
              data-testid={`juxtaposition-area-${area.pair}`}
            >
              <title>{`hanging wall ${area.hwUnit} against footwall ${area.fwUnit}: ${PAIR_WORDS[area.pair]}; ${Math.round(area.areaM2).toLocaleString("en")} m² along strike × vertical`}</title>
            </path>
          )),
        )}
      {bands.map((band) =>
        bandPolygons(s, band.topZ, band.baseZ).map((polygon, i) => (
          <path key={`${band.unit}|${i}`} d={path(polygon)} fill={KIND_COLOURS[band.kind]} stroke="#ffffff" strokeWidth={0.5} data-testid="juxtaposition-unit">
            <title>{`${fill === "hw" ? "hanging wall" : "footwall"}: ${band.unit === UNDESCRIBED ? "above the table's first unit (undescribed)" : `${band.unit} (${band.kind})`}`}</title>
          </path>
        )),
      )}
      {segment.horizons.map((horizon) => (
        <g key={horizon.name}>
          {tracePolylines(s, horizon.fwZ).map((line, i) => (
            <path key={`fw${i}`} d={path(line, false)} fill="none" stroke={FW_TRACE} strokeWidth={1.8} data-testid="juxtaposition-fw-trace" />
          ))}
          {tracePolylines(s, horizon.hwZ).map((line, i) => (
            <path
              key={`hw${i}`}
              d={path(line, false)}
              fill="none"
              stroke={HW_TRACE}
              strokeWidth={1.8}
              strokeDasharray="7 4"
              data-testid="juxtaposition-hw-trace"
            />
          ))}
        </g>
      ))}
      {traceLabels(segment, y, MARGIN.top + plotHeight).map((label) => (
        <g key={label.text}>
          <line x1={x(label.s)} x2={WIDTH - MARGIN.right + 4} y1={y(label.z)} y2={label.y} stroke={label.colour} strokeWidth={0.6} opacity={0.6} />
          <text x={WIDTH - MARGIN.right + 6} y={label.y + 3.5} fontSize={10.5} fill={label.colour}>
            {label.text}
          </text>
        </g>
      ))}
      {sTicks.map((tick) => (
        <text key={`s${tick}`} x={x(tick)} y={MARGIN.top + plotHeight + 16} textAnchor="middle" fontSize={11} fill="currentColor">
          {tick}
        </text>
      ))}
      {zTicks.map((tick) => (
        <text key={`zl${tick}`} x={MARGIN.left - 6} y={y(tick) + 4} textAnchor="end" fontSize={11} fill="currentColor">
          {-tick}
        </text>
      ))}
      <rect x={MARGIN.left} y={MARGIN.top} width={plotWidth} height={plotHeight} fill="none" stroke="#94a3b8" />
      <text x={MARGIN.left + plotWidth / 2} y={height - 8} textAnchor="middle" fontSize={12} fill="currentColor">
        along strike s (m) · vertical exaggeration ×{exaggeration.toFixed(1)}
      </text>
      <text transform={`translate(16 ${MARGIN.top + plotHeight / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill="currentColor">
        depth (m)
      </text>
    </svg>
  );
}

function lastValue(stationsS: number[], values: (number | null)[]): [number, number] | null {
  for (let k = values.length - 1; k >= 0; k--) if (values[k] !== null) return [stationsS[k], values[k] as number];
  return null;
}

/** A label per trace at the right of the diagram, at its last value, moved apart so that none overlaps another. */
function traceLabels(segment: StationSegment, y: (z: number) => number, bottom: number) {
  const GAP = 12;
  const labels = segment.horizons.flatMap((horizon) =>
    (
      [
        ["fwZ", "fw", FW_TRACE],
        ["hwZ", "hw", HW_TRACE],
      ] as const
    ).flatMap(([key, wall, colour]) => {
      const end = lastValue(segment.stationsS, horizon[key]);
      return end ? [{ text: `${horizon.name} ${wall}`, s: end[0], z: end[1], y: y(end[1]), colour }] : [];
    }),
  );
  labels.sort((a, b) => a.y - b.y);
  for (let i = 1; i < labels.length; i++) labels[i].y = Math.max(labels[i].y, labels[i - 1].y + GAP);
  const overflow = labels.length ? labels[labels.length - 1].y - bottom : 0;
  if (overflow > 0) for (const label of labels) label.y -= overflow;
  return labels;
}

function Legend({ fill, totals, windowAreaM2, hasUnits }: { fill: Fill; totals: ReturnType<typeof areasByPair>; windowAreaM2: number; hasUnits: boolean }) {
  const share = (area: number) => (windowAreaM2 > 0 ? `${((100 * area) / windowAreaM2).toFixed(1)} %` : "—");
  return (
    <div className="space-y-1 text-xs text-slate-600 dark:text-slate-300" data-testid="juxtaposition-legend">
      <div className="flex flex-wrap gap-x-4 gap-y-1">
        <span className="flex items-center gap-1">
          <span className="inline-block w-5 border-t-2" style={{ borderColor: FW_TRACE }} /> footwall cut-off
        </span>
        <span className="flex items-center gap-1">
          <span className="inline-block w-5 border-t-2 border-dashed" style={{ borderColor: HW_TRACE }} /> hanging-wall cut-off
        </span>
      </div>
      {!hasUnits && (
        <p className="text-amber-700 dark:text-amber-300">Fill in the study&apos;s stratigraphy table below to colour the units and what meets what.</p>
      )}
      {hasUnits && fill === "pairs" && (
        <ul className="grid gap-1 sm:grid-cols-2">
          {(Object.keys(PAIR_WORDS) as PairKind[]).map((kind) => (
            <li
              key={kind}
              className={`flex items-center gap-1.5 ${kind === "reservoir-reservoir" ? "font-medium text-red-800 dark:text-red-300" : ""}`}
              data-testid={`juxtaposition-total-${kind}`}
            >
              <span
                className="inline-block h-3 w-4 rounded-sm"
                style={{ background: PAIR_COLOURS[kind], outline: kind === "reservoir-reservoir" ? "2px solid #6b1020" : undefined }}
              />
              {PAIR_WORDS[kind]}: <span className="num">{Math.round(totals[kind].areaM2).toLocaleString("en")} m²</span> ({share(totals[kind].areaM2)})
            </li>
          ))}
        </ul>
      )}
      {hasUnits && fill !== "pairs" && (
        <div className="flex flex-wrap gap-x-4">
          {(Object.keys(KIND_COLOURS) as Band["kind"][]).map((kind) => (
            <span key={kind} className="flex items-center gap-1">
              <span className="inline-block h-3 w-4 rounded-sm ring-1 ring-slate-300" style={{ background: KIND_COLOURS[kind] }} />{" "}
              {kind === "undescribed" ? "above the table's first unit" : kind}
            </span>
          ))}
        </div>
      )}
      <p className="text-slate-500">Areas along strike × vertical, as drawn; on the inclined fault plane they are larger by 1/sin(dip) (the CSV gives both).</p>
    </div>
  );
}

function AreasTable({ result }: { result: Juxtaposition }) {
  const rows = [...result.areas].sort(
    (a, b) => (a.pair === "reservoir-reservoir" ? -1 : 0) - (b.pair === "reservoir-reservoir" ? -1 : 0) || b.areaM2 - a.areaM2,
  );
  return (
    <div className="max-h-56 overflow-auto rounded border border-slate-200 dark:border-slate-800">
      <table className="w-full text-xs" data-testid="juxtaposition-areas">
        <thead className="sticky top-0 bg-slate-50 text-left text-slate-500 dark:bg-slate-950">
          <tr>
            <th className="px-2 py-1 font-medium">Hanging wall</th>
            <th className="px-2 py-1 font-medium">Footwall</th>
            <th className="px-2 py-1 font-medium">What meets what</th>
            <th className="px-2 py-1 text-right font-medium">Area (m²)</th>
            <th className="px-2 py-1 text-right font-medium">On the plane (m²)</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((area) => (
            <tr
              key={`${area.hwUnit}|${area.fwUnit}`}
              className={`border-t border-slate-100 dark:border-slate-800 ${area.pair === "reservoir-reservoir" ? "bg-red-50 dark:bg-red-950/40" : ""}`}
            >
              <td className="px-2 py-0.5">{area.hwUnit}</td>
              <td className="px-2 py-0.5">{area.fwUnit}</td>
              <td className="px-2 py-0.5">{PAIR_WORDS[area.pair]}</td>
              <td className="num px-2 py-0.5 text-right">{Math.round(area.areaM2).toLocaleString("en")}</td>
              <td className="num px-2 py-0.5 text-right">{Number.isFinite(area.planeAreaM2) ? Math.round(area.planeAreaM2).toLocaleString("en") : "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
