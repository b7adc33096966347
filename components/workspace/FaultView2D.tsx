"use client";
// The flat contour map in fault-plane coordinates: the fallback when WebGL is missing, and a view of its own.
import { useMemo } from "react";
import type { DisplaySegment, FaultDisplay } from "@/lib/contracts/display";
import { buildContourMap, toReferenceFrame } from "@/scene/map2d";
import { legendTicks, niceTicks, parseCssColor, surfaceInterpolator } from "@/scene/geometry";
import type { ScalarField } from "@/lib/contracts/display";
import { worldToPlane } from "@/lib/display/frame";
import type { ScenePin } from "@/scene/FaultScene";
import { useSceneSettings } from "@/scene/sceneSettingsStore";
import { inSentence, metres } from "@/lib/format";

/**
 * A colour field (e.g. shale gouge ratio) of one segment as an image of one pixel per display-grid node, with the
 * matrix that puts pixel (i, j) at node (i, j) in the map's frame: the segment's plane coordinates map affinely onto
 * the reference segment's. Transparent where the field has no value.
 */
function fieldRaster(
  segment: DisplaySegment,
  field: ScalarField,
  reference: DisplaySegment["frame"],
): { href: string; matrix: string; columns: number; rows: number } | null {
  const values = field.bySegment[segment.id];
  const { grid } = segment;
  if (!values || typeof document === "undefined") return null;
  const canvas = document.createElement("canvas");
  canvas.width = grid.columns;
  canvas.height = grid.rows;
  const context = canvas.getContext("2d");
  if (!context) return null;
  const image = context.createImageData(grid.columns, grid.rows);
  const [low, high] = field.range;
  const span = high - low || 1;
  for (let node = 0; node < values.length; node++) {
    const value = values[node];
    if (!Number.isFinite(value)) continue;
    const fraction = Math.min(1, Math.max(0, (value - low) / span));
    const [r, g, b] = parseCssColor(surfaceInterpolator(field.reversed ? 1 - fraction : fraction));
    image.data.set([r, g, b, 235], node * 4);
  }
  context.putImageData(image, 0, 0);
  const project = (s: number, t: number) => toReferenceFrame(segment.frame, reference, s, t);
  const [ox, oy] = project(grid.s0, grid.t0);
  const [sx, sy] = project(grid.s0 + grid.cellM, grid.t0);
  const [tx, ty] = project(grid.s0, grid.t0 + grid.cellM);
  return {
    href: canvas.toDataURL("image/png"),
    matrix: `matrix(${sx - ox} ${sy - oy} ${tx - ox} ${ty - oy} ${ox} ${oy})`,
    columns: grid.columns,
    rows: grid.rows,
  };
}

const WIDTH = 900;
const MARGIN = { left: 64, right: 20, top: 24, bottom: 48 };

export function FaultView2D({ display, reason, pins = [] }: { display: FaultDisplay; reason?: string; pins?: ScenePin[] }) {
  const map = useMemo(() => buildContourMap(display), [display]);
  const reference = display.segments[0].frame;
  const field = useSceneSettings((state) => state.fields.find((candidate) => candidate.key === state.colourMode));
  const rasters = useMemo(
    () => (field ? display.segments.map((segment) => ({ id: segment.id, raster: fieldRaster(segment, field, reference) })) : []),
    [display, field, reference],
  );
  const pinPoints = pins.map((pin) => {
    const [s, t] = worldToPlane(reference, pin.x - display.origin[0], pin.y - display.origin[1], pin.z - display.origin[2]);
    return { ...pin, s, t };
  });
  const { sMin, sMax, tMin, tMax } = map.bounds;
  const padS = (sMax - sMin) * 0.04 || 1;
  const padT = (tMax - tMin) * 0.06 || 1;
  const spanS = sMax - sMin + 2 * padS;
  const spanT = tMax - tMin + 2 * padT;
  const plotWidth = WIDTH - MARGIN.left - MARGIN.right;
  const scale = plotWidth / spanS;
  const plotHeight = spanT * scale;
  const scaleT = scale;
  const height = plotHeight + MARGIN.top + MARGIN.bottom;
  const x = (s: number) => MARGIN.left + (s - sMin + padS) * scale;
  const y = (t: number) => MARGIN.top + (t - tMin + padT) * scaleT;
  const transform = `translate(${x(0)} ${y(0)}) scale(${scale} ${scaleT})`;
  const [low, high] = display.displacementRangeM;
  const colourFor = (level: number) => surfaceInterpolator(high > low ? (level - low) / (high - low) : 0.5);
  const sTicks = niceTicks(sMin, sMax, 8);
  const tTicks = niceTicks(tMin, tMax, 5);
  const levels = [...new Set(map.contours.map((contour) => contour.levelM))].sort((a, b) => a - b);

  return (
    <figure className="p-3" data-testid="fault-map-2d">
      {reason && (
        <p className="mb-2 rounded bg-amber-50 px-3 py-2 text-sm text-amber-900 dark:bg-amber-950 dark:text-amber-100" data-testid="fallback-reason">
          {reason}
        </p>
      )}
      <svg
        viewBox={`0 0 ${WIDTH} ${height}`}
        className="h-auto w-full text-slate-600 dark:text-slate-300"
        role="img"
        aria-label="Contour map of displacement on the fault plane, along strike against down dip"
      >
        <rect x={MARGIN.left} y={MARGIN.top} width={plotWidth} height={plotHeight} className="fill-slate-50 dark:fill-slate-900" />
        {sTicks.map((tick) => (
          <g key={`s${tick}`}>
            <line x1={x(tick)} x2={x(tick)} y1={MARGIN.top} y2={MARGIN.top + plotHeight} className="stroke-slate-200 dark:stroke-slate-800" />
            <text x={x(tick)} y={MARGIN.top + plotHeight + 16} textAnchor="middle" fontSize={11} fill="currentColor">
              {tick}
            </text>
          </g>
        ))}
        {tTicks.map((tick) => (
          <g key={`t${tick}`}>
            <line x1={MARGIN.left} x2={MARGIN.left + plotWidth} y1={y(tick)} y2={y(tick)} className="stroke-slate-200 dark:stroke-slate-800" />
            <text x={MARGIN.left - 6} y={y(tick) + 4} textAnchor="end" fontSize={11} fill="currentColor">
              {tick}
            </text>
          </g>
        ))}
        <text x={MARGIN.left + plotWidth / 2} y={height - 8} textAnchor="middle" fontSize={12} fill="currentColor">
          along strike s (m)
        </text>
        <text transform={`translate(16 ${MARGIN.top + plotHeight / 2}) rotate(-90)`} textAnchor="middle" fontSize={12} fill="currentColor">
          down dip t (m)
        </text>
        <g transform={transform} fill="none" strokeLinejoin="round">
          {rasters.map(({ id, raster }) =>
            raster ? (
              <image
                key={`field-${id}`}
                href={raster.href}
                x={-0.5}
                y={-0.5}
                width={raster.columns}
                height={raster.rows}
                preserveAspectRatio="none"
                transform={raster.matrix}
                style={{ imageRendering: "pixelated" }}
                data-testid="map-field"
              />
            ) : null,
          )}
          {map.mappedLimits.map((path) => (
            <path
              key={`limit-${path.segmentId}`}
              d={path.d}
              stroke="#334155"
              strokeWidth={1.5}
              strokeDasharray="6 4"
              vectorEffect="non-scaling-stroke"
              data-testid="map-mapped-limit"
            />
          ))}
          {map.contours.map((contour, index) => (
            <path
              key={index}
              d={contour.d}
              stroke={field ? "#1e293b" : colourFor(contour.levelM)}
              strokeWidth={field ? 1 : 1.6}
              vectorEffect="non-scaling-stroke"
              data-testid="map-contour"
            >
              <title>{`Segment ${contour.segmentId}: ${metres(contour.levelM)} displacement`}</title>
            </path>
          ))}
          {map.tipBands.map((path, index) => (
            <path
              key={`band-${path.segmentId}-${index}`}
              d={path.d}
              stroke="#f7b955"
              strokeWidth={1.2}
              vectorEffect="non-scaling-stroke"
              data-testid="map-tip-band"
            />
          ))}
          {map.tipLines.map((path) => (
            <path key={`tip-${path.segmentId}`} d={path.d} stroke="#f08c00" strokeWidth={3.5} vectorEffect="non-scaling-stroke" data-testid="map-tip-line" />
          ))}
          {map.openEdges.map((path) => (
            <path
              key={`open-${path.segmentId}`}
              d={path.d}
              className="stroke-cyan-700 dark:stroke-cyan-300"
              strokeWidth={3}
              strokeDasharray="8 5"
              vectorEffect="non-scaling-stroke"
              data-testid="map-open-edge"
            >
              <title>Open edge: the picks stop here while displacement is still well above the cut-off; no tip is inferred</title>
            </path>
          ))}
        </g>
        {map.peaks.map((peak) => (
          <g key={`peak-${peak.segmentId}`} transform={`translate(${x(peak.s)} ${y(peak.t)})`}>
            <path d="M0 -7L7 0L0 7L-7 0Z" fill="#ffffff" stroke="#0f172a" strokeWidth={2} />
            <text x={10} y={4} fontSize={11} className="fill-slate-900 dark:fill-slate-100">
              Peak {metres(peak.displacementM)}
            </text>
          </g>
        ))}
        {pinPoints.map((pin) => (
          <g key={`pin-${pin.id}`} transform={`translate(${x(pin.s)} ${y(pin.t)})`} data-testid="map-pin">
            <circle r={6} fill={pin.resolved ? "#94a3b8" : "#2f978f"} stroke="#0f172a" strokeWidth={2} />
          </g>
        ))}
        {map.labels.map((label) => (
          <text
            key={`label-${label.segmentId}`}
            x={x(label.s)}
            y={y(label.t) - 8}
            textAnchor="middle"
            fontSize={12}
            fontWeight={600}
            className="fill-slate-800 dark:fill-slate-100"
          >
            Segment {label.segmentId}
          </text>
        ))}
      </svg>
      <figcaption className="mt-2 flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-slate-600 dark:text-slate-300">
        {field && <FieldScale field={field} />}
        {field ? (
          <span>Displacement contours: dark lines at {levels.join(", ")} m</span>
        ) : (
          <span className="flex items-center gap-1">
            Contours:
            {levels.map((level) => (
              <span key={level} className="num inline-flex items-center gap-0.5">
                <span className="inline-block h-2 w-3 rounded-sm" style={{ background: colourFor(level) }} />
                {level}
              </span>
            ))}
            <span>m</span>
          </span>
        )}
        <span className="flex items-center gap-1">
          <span className="inline-block h-1 w-5 rounded bg-tip-500" /> inferred tip line
        </span>
        <span className="flex items-center gap-1">
          <span className="inline-block w-5 border-t-2 border-dashed border-slate-700 dark:border-slate-300" /> mapped limit
        </span>
        <span>Fault-plane coordinates of segment {display.segments[0].id}; 1:1 in metres.</span>
      </figcaption>
    </figure>
  );
}

/** The colour scale of a field drawn on the map, with its guide value marked. */
function FieldScale({ field }: { field: ScalarField }) {
  const [low, high] = field.range;
  const stops = Array.from({ length: 11 }, (_, i) => `${surfaceInterpolator(field.reversed ? 1 - i / 10 : i / 10)} ${i * 10}%`).join(", ");
  const position = (value: number) => `${(100 * (value - low)) / (high - low || 1)}%`;
  return (
    <span className="flex basis-full items-center gap-2 pb-3" data-testid="map-field-scale">
      <span>
        {inSentence(field.label)} ({field.unit}):
      </span>
      <span className="num">{low}</span>
      <span className="relative inline-block h-2.5 w-48 rounded-sm" style={{ background: `linear-gradient(to right, ${stops})` }}>
        {legendTicks(low, high, 5).map((tick) => (
          <span key={tick} className="absolute top-3 -translate-x-1/2 text-[10px]" style={{ left: position(tick) }}>
            {tick}
          </span>
        ))}
        {field.guide && (
          <span
            className="absolute -top-1 border-l-2 border-dotted border-slate-900 dark:border-slate-100"
            style={{ left: position(field.guide.value), height: 18 }}
            title={field.guide.label}
          />
        )}
      </span>
      <span className="num">{high}</span>
      {field.guide && <span>dotted: {field.guide.label}</span>}
    </span>
  );
}
