"use client";
// The viewer card: the 3D scene (loaded only in the browser) or the 2D contour map, with the view bar, the
// colour legend, the hover readout and the scale bar as plain HTML around the canvas.
import dynamic from "next/dynamic";
import { useMemo, useState, type ReactNode } from "react";
import type { FaultDisplay } from "@/lib/contracts/display";
import type { ScenePin, SurfaceHit } from "@/scene/FaultScene";
import { useCameraStore, type CameraPreset } from "@/scene/cameraStore";
import type { CameraState } from "@/lib/contracts/camera";
import { legendTicks, NO_VALUE_COLOUR, niceStep, surfaceInterpolator } from "@/scene/geometry";
import { useOverlayStore } from "@/scene/overlayStore";
import { LAYER_NAMES, MAX_EXAGGERATION, type LayerName } from "@/lib/contracts/scene-settings";
import { useSceneSettings } from "@/scene/sceneSettingsStore";
import { FaultView2D } from "./FaultView2D";
import { placeLabels } from "@/lib/views/labels";
import { useDarkMode } from "@/scene/useDarkMode";
import { azimuth, degrees, inSentence, metres } from "@/lib/format";
import { useBrowserValue } from "@/components/hooks/useBrowserValue";

const FaultScene = dynamic(() => import("@/scene/FaultScene"), {
  ssr: false,
  loading: () => <div className="flex h-full items-center justify-center text-sm text-slate-500">Preparing the 3D view…</div>,
});

type ViewMode = "3d" | "map";

const LAYER_LABELS: Record<LayerName, string> = {
  surface: "Surface",
  contours: "Contours",
  tipLine: "Tip line",
  mappedLimit: "Mapped limit",
  picks: "Picks",
  maxMarker: "Peak",
  pins: "Pins",
};

const PRESETS: { preset: CameraPreset; label: string; title: string }[] = [
  { preset: "overview", label: "Overview", title: "Back to the opening view (reset)" },
  { preset: "map", label: "From above", title: "Map view, north up" },
  { preset: "faceOn", label: "Face-on", title: "Looking straight at the fault plane" },
  { preset: "alongStrike", label: "Along strike", title: "Looking along the strike of the fault" },
];

let webglChecked: boolean | null = null;

/** Whether this browser can draw WebGL (asked once per page: the test makes a canvas and a context). */
export function webglAvailable(): boolean {
  if (webglChecked === null) {
    try {
      const canvas = document.createElement("canvas");
      webglChecked = Boolean(canvas.getContext("webgl2") ?? canvas.getContext("webgl"));
    } catch {
      webglChecked = false;
    }
  }
  return webglChecked;
}

export interface FaultViewerProps {
  display: FaultDisplay;
  pins?: ScenePin[];
  onSurfaceClick?: (hit: SurfaceHit) => void;
  initialCamera?: CameraState;
  /** extra controls for the view bar (viewpoints, pin placement) */
  toolbarExtra?: ReactNode;
  /** a note shown over the canvas, e.g. "click the surface to place a pin" */
  hint?: string;
}

export function FaultViewer({ display, pins, onSurfaceClick, initialCamera, toolbarExtra, hint }: FaultViewerProps) {
  const webgl = useBrowserValue(webglAvailable);
  const [mode, setMode] = useState<ViewMode>("3d");
  const showMap = webgl === false || mode === "map";

  return (
    <div className="flex h-full flex-col">
      <ViewBar mode={showMap ? "map" : "3d"} webgl={webgl !== false} onMode={setMode} extra={toolbarExtra} />
      {webgl === null ? (
        <div className="flex h-[560px] items-center justify-center text-sm text-slate-500">Checking the graphics…</div>
      ) : showMap ? (
        <FaultView2D
          display={display}
          pins={pins}
          reason={
            webgl === false ? "3D graphics (WebGL) are not available in this browser, so the surface is shown as a contour map on the fault plane." : undefined
          }
        />
      ) : (
        <div
          className="relative h-[600px] bg-gradient-to-b from-slate-100 to-slate-200 dark:from-slate-900 dark:to-slate-950"
          data-testid="fault-scene"
          data-scene-frame
        >
          <FaultScene display={display} pins={pins} onSurfaceClick={onSurfaceClick} initialCamera={initialCamera} />
          <DisplacementLegend display={display} />
          <HoverReadout />
          <ScaleBar />
          <OrientationMarker />
          {hint && (
            <div
              className="pointer-events-none absolute left-1/2 top-3 -translate-x-1/2 rounded bg-slip-700 px-3 py-1 text-xs font-medium text-white shadow"
              data-testid="viewer-hint"
            >
              {hint}
            </div>
          )}
        </div>
      )}
      <FieldNote />
    </div>
  );
}

/** What the active colour field needs said beside it (its source and caution), under the view. */
function FieldNote() {
  const note = useSceneSettings((state) => state.fields.find((candidate) => candidate.key === state.colourMode)?.note);
  if (!note) return null;
  return (
    <p
      className="border-t border-tip-400/60 bg-amber-50 px-3 py-2 text-xs leading-relaxed text-amber-900 dark:border-tip-600/60 dark:bg-amber-950/40 dark:text-amber-100"
      data-testid="field-note"
    >
      {note}
    </p>
  );
}

function ViewBar({ mode, webgl, onMode, extra }: { mode: ViewMode; webgl: boolean; onMode: (mode: ViewMode) => void; extra?: ReactNode }) {
  const layers = useSceneSettings((state) => state.layers);
  const toggleLayer = useSceneSettings((state) => state.toggleLayer);
  const colourMode = useSceneSettings((state) => state.colourMode);
  const setColourMode = useSceneSettings((state) => state.setColourMode);
  const fields = useSceneSettings((state) => state.fields);
  const exaggeration = useSceneSettings((state) => state.exaggeration);
  const setExaggeration = useSceneSettings((state) => state.setExaggeration);
  const applyPreset = useCameraStore((state) => state.applyPreset);
  return (
    <div className="flex flex-wrap items-center gap-x-4 gap-y-2 border-b border-slate-200 px-3 py-2 text-xs dark:border-slate-800" data-testid="view-bar">
      <div className="inline-flex overflow-hidden rounded-md ring-1 ring-slate-300 dark:ring-slate-700" role="group" aria-label="View">
        {(["3d", "map"] as const).map((option) => (
          <button
            key={option}
            type="button"
            disabled={option === "3d" && !webgl}
            aria-pressed={mode === option}
            onClick={() => onMode(option)}
            className={`px-2.5 py-1 font-medium ${mode === option ? "bg-slip-700 text-white" : "bg-white text-slate-700 hover:bg-slate-50 dark:bg-slate-900 dark:text-slate-200"} disabled:opacity-40`}
            data-testid={`view-mode-${option}`}
          >
            {option === "3d" ? "3D surface" : "Plane map"}
          </button>
        ))}
      </div>
      <label className="flex items-center gap-1.5">
        <span className="text-slate-500">Colour by</span>
        <select className="field w-auto py-0.5 text-xs" value={colourMode} onChange={(event) => setColourMode(event.target.value)} data-testid="colour-mode">
          <option value="displacement">displacement</option>
          <option value="throw">throw</option>
          {fields.map((field) => (
            <option key={field.key} value={field.key}>
              {inSentence(field.label)}
            </option>
          ))}
        </select>
      </label>
      {mode === "3d" && (
        <>
          <div className="flex flex-wrap items-center gap-1" role="group" aria-label="Camera">
            {PRESETS.map(({ preset, label, title }) => (
              <button
                key={preset}
                type="button"
                className="btn-quiet px-2 py-1 text-xs"
                title={title}
                onClick={() => applyPreset(preset)}
                data-testid={`camera-${preset}`}
              >
                {label}
              </button>
            ))}
          </div>
          <label className="flex items-center gap-1.5" title="Draw displacement as relief off the plane">
            <span className="text-slate-500">Relief ×{exaggeration.toFixed(1)}</span>
            <input
              type="range"
              min={0}
              max={MAX_EXAGGERATION}
              step={0.5}
              value={exaggeration}
              onChange={(event) => setExaggeration(Number(event.target.value))}
              data-testid="relief"
            />
          </label>
          <details className="relative">
            <summary className="cursor-pointer select-none text-slate-600 dark:text-slate-300">Layers</summary>
            <div className="absolute z-20 mt-1 w-40 rounded-md bg-white p-2 shadow-lg ring-1 ring-slate-200 dark:bg-slate-900 dark:ring-slate-700">
              {LAYER_NAMES.map((layer) => (
                <label key={layer} className="flex items-center gap-2 py-0.5">
                  <input type="checkbox" checked={layers[layer]} onChange={() => toggleLayer(layer)} data-testid={`layer-${layer}`} />
                  {LAYER_LABELS[layer]}
                </label>
              ))}
            </div>
          </details>
        </>
      )}
      {extra && <div className="ml-auto flex items-center gap-2">{extra}</div>}
    </div>
  );
}

function DisplacementLegend({ display }: { display: FaultDisplay }) {
  const colourMode = useSceneSettings((state) => state.colourMode);
  const field = useSceneSettings((state) => state.fields.find((candidate) => candidate.key === state.colourMode));
  const [low, high] = field ? field.range : colourMode === "throw" ? display.throwRangeM : display.displacementRangeM;
  const reversed = field?.reversed ?? false;
  const gradient = useMemo(() => {
    const stops = Array.from({ length: 11 }, (_, i) => `${surfaceInterpolator(reversed ? 1 - i / 10 : i / 10)} ${i * 10}%`);
    return `linear-gradient(to top, ${stops.join(", ")})`;
  }, [reversed]);
  // round values an even step apart, at most about seven, so labels neither crowd nor skip unevenly
  const levels = useMemo(() => legendTicks(low, high, 7), [high, low]);
  const fraction = (value: number) => (high > low ? (value - low) / (high - low) : 0.5);
  const title = field ? `${field.label} (${field.unit})` : `${colourMode === "throw" ? "Throw" : "Displacement"} (m)`;
  return (
    <div
      className="pointer-events-none absolute left-3 top-3 rounded-md bg-white/90 p-2 text-[11px] shadow ring-1 ring-slate-200 dark:bg-slate-900/90 dark:ring-slate-700"
      data-testid="legend"
      data-scene-overlay
      data-low={low}
      data-high={high}
      data-reversed={reversed ? "1" : "0"}
      data-title={title}
      data-contours={display.segments.length > 0 ? contourNote(display) : ""}
    >
      <div className="mb-1 max-w-40 font-semibold" data-testid="legend-title">
        {title}
      </div>
      <div className="mt-2 flex gap-1.5">
        <div className="h-40 w-3 rounded-sm" style={{ background: gradient }} />
        <div className="relative h-40 w-12">
          {levels.map((level) => (
            <span key={level} className="num absolute left-0 whitespace-nowrap" style={{ bottom: `calc(${fraction(level) * 100}% - 0.5em)` }}>
              — {level.toLocaleString("en", { maximumFractionDigits: 2 })}
            </span>
          ))}
          {field?.guide && (
            <span
              className="absolute -left-5 w-5 border-t-2 border-dotted border-slate-800 dark:border-slate-100"
              style={{ bottom: `${fraction(field.guide.value) * 100}%` }}
            />
          )}
        </div>
      </div>
      {field && (
        <div className="mt-1 flex max-w-40 items-center gap-1 text-slate-600 dark:text-slate-300" data-testid="legend-no-value">
          <span className="inline-block h-2.5 w-4 rounded-sm" style={{ background: NO_VALUE_COLOUR }} /> no value here
        </div>
      )}
      {field?.guide && (
        <div className="mt-1 flex max-w-40 items-center gap-1 text-slate-600 dark:text-slate-300" data-testid="legend-guide">
          <span className="inline-block w-4 border-t-2 border-dotted border-slate-700 dark:border-slate-200" /> {field.guide.label}
        </div>
      )}
      {display.segments.length > 0 && (
        <div className="mt-1 max-w-40 text-slate-500" data-testid="legend-contours">
          {contourNote(display)}
        </div>
      )}

      <div className="mt-1 flex items-center gap-1 text-slate-600 dark:text-slate-300">
        <span className="inline-block h-1 w-4 rounded bg-tip-500" /> inferred tip line
      </div>
      <div className="flex items-center gap-1 text-slate-600 dark:text-slate-300" data-testid="legend-tip-band">
        <span className="inline-block w-4 border-t border-[#f7b955]" /> its 5–95 % range
      </div>
      {display.segments.some((segment) => segment.tipOpen?.includes(1)) && (
        <div className="flex items-center gap-1 text-slate-600 dark:text-slate-300" data-testid="legend-open-edge">
          <span className="inline-block w-4 border-t-2 border-dashed border-cyan-700 dark:border-cyan-300" /> open edge, no tip inferred
        </div>
      )}
      <div className="flex items-center gap-1 text-slate-600 dark:text-slate-300">
        <span className="inline-block w-4 border-t-2 border-dashed border-slate-600 dark:border-slate-300" /> mapped limit
      </div>
    </div>
  );
}

/** "displacement contours every 10 m", or per segment when their intervals differ. */
function contourNote(display: FaultDisplay): string {
  const intervals = display.segments.map((segment) => segment.contours.intervalM);
  if (intervals.every((interval) => interval === intervals[0])) return `displacement contours every ${metres(intervals[0], 0)}`;
  return `displacement contours every ${display.segments.map((segment) => `${metres(segment.contours.intervalM, 0)} (${segment.id})`).join(", ")}`;
}

function HoverReadout() {
  const readout = useOverlayStore((state) => state.readout);
  const field = useSceneSettings((state) => state.fields.find((candidate) => candidate.key === state.colourMode));
  if (!readout) return null;
  const rows: [string, string][] = [
    ["segment", readout.segmentId],
    ["s", metres(readout.s, 0)],
    ["t", metres(readout.t, 0)],
    ["x", metres(readout.x, 0)],
    ["y", metres(readout.y, 0)],
    ["z", metres(readout.z, 0)],
    ...(readout.localDipDeg !== undefined && readout.localStrikeDeg !== undefined
      ? ([
          ["local strike", azimuth(readout.localStrikeDeg)],
          ["local dip", degrees(readout.localDipDeg)],
        ] as [string, string][])
      : []),
    ["throw", metres(readout.throwM)],
    ["displacement", metres(readout.displacementM)],
  ];
  if (field && readout.fieldValue !== undefined) {
    rows.push([inSentence(field.label), Number.isFinite(readout.fieldValue) ? `${readout.fieldValue.toFixed(2)} ${field.unit}` : "—"]);
  }
  return (
    <dl
      className="pointer-events-none absolute right-3 top-3 grid grid-cols-[auto_auto] gap-x-3 rounded-md bg-white/90 p-2 text-[11px] shadow ring-1 ring-slate-200 dark:bg-slate-900/90 dark:ring-slate-700"
      data-testid="hover-readout"
    >
      {rows.map(([label, value]) => (
        <div key={label} className="contents">
          <dt className="text-slate-500">{label}</dt>
          <dd className="num text-right">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

function ScaleBar() {
  const metresPerPixel = useOverlayStore((state) => state.metresPerPixel);
  if (!metresPerPixel) return null;
  const lengthM = niceStep(metresPerPixel * 120);
  const widthPx = lengthM / metresPerPixel;
  // on a plate of its own, so it reads over the surface at any zoom
  return (
    <div
      className="pointer-events-none absolute bottom-3 left-3 rounded-md bg-white/90 px-2 py-1.5 text-[11px] text-slate-800 shadow ring-1 ring-slate-200 dark:bg-slate-900/90 dark:text-slate-100 dark:ring-slate-700"
      data-testid="scale-bar"
      data-scene-overlay
    >
      <div className="h-1.5 border-x-2 border-b-2 border-slate-700 dark:border-slate-200" style={{ width: widthPx }} />
      <div className="num mt-0.5">{metres(lengthM, 0)} at the centre of view</div>
    </div>
  );
}

const MARKER_SIZE_PX = 104;
const MARKER_AXIS_PX = 32;

/**
 * Which way East, North and Up point, drawn from the camera's rotation: each axis a line with its name placed where
 * it covers no other name; an axis pointing at (⊙) or away from (⊗) the viewer is marked at the centre.
 */
function OrientationMarker() {
  const axes = useOverlayStore((state) => state.axes);
  const dark = useDarkMode();
  if (!axes) return null;
  const centre = MARKER_SIZE_PX / 2;
  const items = [
    { name: "E", vector: axes.east, colour: "#c2410c" },
    { name: "N", vector: axes.north, colour: "#0f766e" },
    { name: "Up", vector: axes.up, colour: dark ? "#94a3b8" : "#475569" },
  ].map((item) => {
    const [x, y, z] = item.vector;
    const planar = Math.hypot(x, y);
    const endOn = planar < 0.25;
    const tip = { x: centre + x * MARKER_AXIS_PX, y: centre + y * MARKER_AXIS_PX };
    const prefer: "above" | "right" | "below" | "left" = endOn ? "right" : Math.abs(x) >= Math.abs(y) ? (x > 0 ? "right" : "left") : y > 0 ? "below" : "above";
    const label = endOn ? `${item.name} ${z > 0 ? "⊙" : "⊗"}` : item.name;
    return { ...item, z, endOn, tip, prefer, label };
  });
  const placed = placeLabels(
    items.map((item) => ({ x: item.tip.x, y: item.tip.y, width: item.label.length * 7 + 8, height: 15, prefer: item.prefer, radius: item.endOn ? 0 : 2 })),
    { x0: 0, y0: 0, x1: MARKER_SIZE_PX, y1: MARKER_SIZE_PX },
    { gap: 2 },
  );
  // far axes first, so the nearer ones are drawn over them
  const order = items.map((_, index) => index).sort((a, b) => items[a].z - items[b].z);
  return (
    <svg
      className="pointer-events-none absolute bottom-3 right-3 rounded-full bg-white/80 shadow ring-1 ring-slate-200 dark:bg-slate-900/80 dark:ring-slate-700"
      width={MARKER_SIZE_PX}
      height={MARKER_SIZE_PX}
      viewBox={`0 0 ${MARKER_SIZE_PX} ${MARKER_SIZE_PX}`}
      role="img"
      aria-label={`Orientation: ${items.map((item) => item.label).join(", ")}`}
      data-testid="orientation-marker"
      data-scene-overlay
    >
      {order.map((index) => {
        const item = items[index];
        const box = placed[index].box;
        return (
          <g key={item.name} data-axis={item.name}>
            {!item.endOn && (
              <line
                x1={centre}
                y1={centre}
                x2={item.tip.x}
                y2={item.tip.y}
                stroke={item.colour}
                strokeWidth={2.5}
                strokeLinecap="round"
                opacity={item.z < -0.5 ? 0.55 : 1}
              />
            )}
            <rect data-axis-label={item.name} x={box.x0} y={box.y0} width={box.x1 - box.x0} height={box.y1 - box.y0} rx={4} fill={item.colour} />
            <text
              x={(box.x0 + box.x1) / 2}
              y={(box.y0 + box.y1) / 2}
              dy="0.35em"
              textAnchor="middle"
              fontSize={10.5}
              fontWeight={700}
              fill="#ffffff"
              style={{ fontFamily: "var(--font-sans, sans-serif)" }}
            >
              {item.label}
            </text>
          </g>
        );
      })}
      <circle cx={centre} cy={centre} r={2} fill={dark ? "#e2e8f0" : "#334155"} />
    </svg>
  );
}
