"use client";
// The fault's 3D view. Renders on demand only (software WebGL is slow): geometry is built once per change
// from typed arrays, draw calls are few (per fault: one surface per segment, one contour set, one tip-line
// set, one mapped-limit set, one pick set, one marker set each for peaks and pins), nothing sets React state
// per frame.
import { useCallback, useEffect, useMemo, useRef, useState, type DependencyList } from "react";
import { Canvas, useFrame, useThree, type ThreeEvent } from "@react-three/fiber";
import { AdaptiveDpr, Html, Line, OrbitControls } from "@react-three/drei";
import * as THREE from "three";
import type { OrbitControls as OrbitControlsImpl } from "three-stdlib";
import type { DisplaySegment, FaultDisplay } from "@/lib/contracts/display";
import type { Vec3 } from "@/lib/contracts/json";
import { worldToPlane } from "@/lib/display/frame";
import { surfaceOffsetAt } from "@/lib/display/surface";
import {
  buildContourLines,
  buildMappedLimitLines,
  buildPeakPoints,
  buildPickPoints,
  buildSurfaceMesh,
  depthLabels,
  displayBounds,
  displayExtentM,
  lineLiftM,
  localOrientationAt,
  residualRangeM,
  surfaceCoordinates,
  surfacePoint,
  surfaceValueAt,
  buildOpenTipLines,
  buildTipBandLines,
  buildTipLines,
  contrastingLineColour,
  DARK_LINE,
  framingPoints,
  LIGHT_LINE,
  surfaceInterpolator,
} from "./geometry";
import { placeLabels, type LabelRequest, type Rect } from "@/lib/views/labels";
import type { ColourMode } from "@/lib/contracts/scene-settings";
import { useDarkMode } from "./useDarkMode";
import { testHooksEnabled } from "./test-hooks";
import { copyCameraState, DEFAULT_FOV_DEG, presetCamera, useCameraStore } from "./cameraStore";
import type { CameraState } from "@/lib/contracts/camera";
import { useLayerVisible, useSceneSettings } from "./sceneSettingsStore";
import { useOverlayStore } from "./overlayStore";
import { metres as formatMetres } from "@/lib/format";

export interface ScenePin {
  id: string;
  /** world coordinates, m */
  x: number;
  y: number;
  z: number;
  resolved?: boolean;
}

export interface SurfaceHit {
  /** world coordinates of the point on the fault surface (the true surface, without relief), m */
  x: number;
  y: number;
  z: number;
  s: number;
  t: number;
  segmentId: string;
}

export interface FaultSceneProps {
  display: FaultDisplay;
  pins?: ScenePin[];
  onSurfaceClick?: (hit: SurfaceHit) => void;
  /** where the camera starts; the overview preset when absent */
  initialCamera?: CameraState;
}

declare global {
  interface Window {
    /** the first frame is on screen (the scene picture waits on it) */
    __slipfieldSceneReady?: boolean;
    // test hooks, installed only behind the flag in ./test-hooks.ts
    __slipfieldFirstFrameMs?: number;
    __slipfieldFrameCount?: number;
    /** performance.now() of recent frames (the last 600), for frame-time measurements */
    __slipfieldFrameTimes?: number[];
    __slipfieldCamera?: () => CameraState | null;
    __slipfieldApplyCamera?: (camera: CameraState) => void;
    /** the drawn surfaces' vertices read back: their distance from each segment's reference plane (test hook) */
    __slipfieldSurfaceProbe?: () => SurfaceProbe[];
  }
}

/** What the test hook reads back from one segment's drawn surface mesh. */
export interface SurfaceProbe {
  segmentId: string;
  vertexCount: number;
  exaggeration: number;
  /** largest and RMS distance of the drawn vertices from the segment's reference plane (m) */
  maxPlaneDistanceM: number;
  rmsPlaneDistanceM: number;
}

const surfaceProbes = new Map<string, () => SurfaceProbe>();

/** The drawn vertices' distances from the reference plane, from the geometry the GPU was given. */
function probeSurface(segment: DisplaySegment, geometry: THREE.BufferGeometry, exaggeration: number): SurfaceProbe {
  const positions = geometry.getAttribute("position").array as Float32Array;
  const index = geometry.getIndex();
  const used = new Uint8Array(positions.length / 3);
  if (index) for (let k = 0; k < index.count; k++) used[index.getX(k)] = 1;
  else used.fill(1);
  const { centroid, normal } = segment.frame;
  let count = 0,
    sumSquares = 0,
    largest = 0;
  for (let vertex = 0; vertex < used.length; vertex++) {
    if (!used[vertex]) continue;
    const distance = Math.abs(
      (positions[vertex * 3] - centroid[0]) * normal[0] +
        (positions[vertex * 3 + 1] - centroid[1]) * normal[1] +
        (positions[vertex * 3 + 2] - centroid[2]) * normal[2],
    );
    count++;
    sumSquares += distance * distance;
    largest = Math.max(largest, distance);
  }
  return { segmentId: segment.id, vertexCount: count, exaggeration, maxPlaneDistanceM: largest, rmsPlaneDistanceM: count ? Math.sqrt(sumSquares / count) : 0 };
}

const COLORS = {
  tipLine: "#f08c00",
  // the inner and outer tip lines: the tip line's hue, lighter
  tipBand: "#f7b955",
  // an open edge is where the data stop, not a tip: a cool colour set apart from the warm tip lines
  openEdge: { light: "#0e7490", dark: "#67e8f9" },
  // the dashed mapped limit runs along the data's edge, between the darkest surface colours and the page: it follows the theme
  mappedLimit: { light: "#334155", dark: "#cbd5e1" },
  peak: "#ffffff",
  pinOpen: "#2f978f",
  pinResolved: "#94a3b8",
} as const;

const GL_OPTIONS = { antialias: false, preserveDrawingBuffer: true };
const PERFORMANCE = { min: 0.5 };

export default function FaultScene({ display, pins, onSurfaceClick, initialCamera }: FaultSceneProps) {
  const extentM = displayExtentM(display);
  // the same object between renders, so R3F never applies the starting camera options again
  const cameraOptions = useMemo(
    () => ({ fov: DEFAULT_FOV_DEG, near: extentM / 1000, far: extentM * 60, up: [0, 0, 1] as Vec3, position: [0, -extentM, extentM] as Vec3 }),
    [extentM],
  );
  // the labels' own layer over the canvas: drei's Html otherwise attaches to whatever element the event system was
  // connected to, which, when the view is switched off and on again, can still be the previous canvas's (its label lost)
  const labelLayer = useRef<HTMLDivElement>(null);
  return (
    <>
      <Canvas frameloop="demand" dpr={[1, 1.5]} flat performance={PERFORMANCE} gl={GL_OPTIONS} camera={cameraOptions} data-testid="fault-scene-canvas">
        <AdaptiveDpr pixelated />
        <SceneLights />
        <FaultLayers display={display} pins={pins} onSurfaceClick={onSurfaceClick} labelLayer={labelLayer} />
        <OrbitControlsRig display={display} initialCamera={initialCamera} />
        <FrameProbe />
      </Canvas>
      <div ref={labelLayer} className="pointer-events-none absolute inset-0 overflow-hidden" data-scene-labels />
    </>
  );
}

function SceneLights() {
  return (
    <>
      <hemisphereLight args={["#ffffff", "#9aa5b1", 2.2]} />
      <directionalLight position={[-0.4, -0.6, 1]} intensity={1.1} />
    </>
  );
}

type LabelLayer = React.RefObject<HTMLDivElement | null>;

function FaultLayers({ display, pins, onSurfaceClick, labelLayer }: Omit<FaultSceneProps, "initialCamera"> & { labelLayer: LabelLayer }) {
  const colourMode = useSceneSettings((state) => state.colourMode);
  const exaggeration = useSceneSettings((state) => state.exaggeration);
  const showSurface = useLayerVisible("surface");
  const showContours = useLayerVisible("contours");
  const showTipLine = useLayerVisible("tipLine");
  const showMappedLimit = useLayerVisible("mappedLimit");
  const showPicks = useLayerVisible("picks");
  const showPeak = useLayerVisible("maxMarker");
  const showPins = useLayerVisible("pins");
  const field = useSceneSettings((state) => state.fields.find((candidate) => candidate.key === colourMode));
  const [low, high] = field ? field.range : colourMode === "throw" ? display.throwRangeM : display.displacementRangeM;
  return (
    <>
      {showSurface &&
        display.segments.map((segment) => (
          <SegmentSurface
            key={segment.id}
            segment={segment}
            origin={display.origin}
            colourMode={colourMode}
            fieldValues={field?.bySegment[segment.id]}
            reversed={field?.reversed}
            exaggeration={exaggeration}
            colorLowM={low}
            colorHighM={high}
            onSurfaceClick={onSurfaceClick}
          />
        ))}
      {showContours && <ContourLines display={display} exaggeration={exaggeration} onDisplacementColours={colourMode === "displacement"} />}
      {showTipLine && <TipLines display={display} />}
      {showMappedLimit && <MappedLimitLines display={display} exaggeration={exaggeration} />}
      {showPicks && display.picks.count > 0 && <PickPoints display={display} exaggeration={exaggeration} />}
      {showPeak && <PeakMarkers display={display} exaggeration={exaggeration} />}
      {showPins && pins && pins.length > 0 && <PinMarkers display={display} pins={pins} />}
      <SegmentLabels display={display} labelLayer={labelLayer} />
      <DepthLabels display={display} labelLayer={labelLayer} />
    </>
  );
}

// ---- geometry lifetime ----------------------------------------------------------------------------------

/** A disposable built in useMemo and disposed when it is rebuilt or the component unmounts. */
function useDisposable<T extends { dispose(): void }>(factory: () => T, deps: DependencyList): T {
  // the caller's dependencies are forwarded as they are (a generic hook, like useMemo itself)
  // eslint-disable-next-line react-hooks/exhaustive-deps, react-hooks/use-memo
  const value = useMemo(factory, deps);
  useEffect(() => () => value.dispose(), [value]);
  return value;
}

function bufferGeometry({ positions, colors, indices }: { positions: Float32Array; colors?: Float32Array; indices?: Uint32Array }) {
  const geometry = new THREE.BufferGeometry();
  geometry.setAttribute("position", new THREE.BufferAttribute(positions, 3));
  if (colors) geometry.setAttribute("color", new THREE.BufferAttribute(colors, 3));
  if (indices) geometry.setIndex(new THREE.BufferAttribute(indices, 1));
  geometry.computeBoundingSphere();
  return geometry;
}

// ---- surface and hover ----------------------------------------------------------------------------------

// Raycasting a 192² surface costs milliseconds; skip it while the camera is being dragged.
let cameraDragging = false;
function raycastUnlessDragging(this: THREE.Mesh, raycaster: THREE.Raycaster, intersects: THREE.Intersection[]) {
  if (!cameraDragging) THREE.Mesh.prototype.raycast.call(this, raycaster, intersects);
}

/** Publishes at most one hover readout per animation frame. */
function useReadoutPublisher() {
  const pending = useRef<Parameters<ReturnType<typeof useOverlayStore.getState>["setReadout"]>[0] | undefined>(undefined);
  const scheduled = useRef(false);
  return useCallback((readout: Parameters<ReturnType<typeof useOverlayStore.getState>["setReadout"]>[0]) => {
    pending.current = readout;
    if (scheduled.current) return;
    scheduled.current = true;
    requestAnimationFrame(() => {
      scheduled.current = false;
      useOverlayStore.getState().setReadout(pending.current ?? null);
    });
  }, []);
}

function SegmentSurface({
  segment,
  origin,
  colourMode,
  fieldValues,
  reversed,
  exaggeration,
  colorLowM,
  colorHighM,
  onSurfaceClick,
}: {
  segment: DisplaySegment;
  origin: Vec3;
  colourMode: ColourMode;
  fieldValues?: Float32Array;
  reversed?: boolean;
  exaggeration: number;
  colorLowM: number;
  colorHighM: number;
  onSurfaceClick?: (hit: SurfaceHit) => void;
}) {
  // shaded where there is relief or the surface bends away from its plane; flat colours (the legend's exactly) otherwise
  const shaded = exaggeration > 0 || surfaceBends(segment);
  const geometry = useDisposable(() => {
    const built = bufferGeometry(buildSurfaceMesh(segment, { colourMode, exaggeration, colorRangeM: [colorLowM, colorHighM], fieldValues, reversed }));
    if (shaded) built.computeVertexNormals();
    return built;
  }, [segment, colourMode, exaggeration, colorLowM, colorHighM, fieldValues, reversed, shaded]);
  useEffect(() => {
    if (!testHooksEnabled()) return;
    surfaceProbes.set(segment.id, () => probeSurface(segment, geometry, exaggeration));
    window.__slipfieldSurfaceProbe = () => [...surfaceProbes.values()].map((probe) => probe());
    return () => {
      surfaceProbes.delete(segment.id);
    };
  }, [segment, geometry, exaggeration]);
  const publishReadout = useReadoutPublisher();

  const hitAt = (point: THREE.Vector3) => {
    // the point on the drawn surface back to (s, t), then the true surface point there (the relief taken off)
    const [s, t] = surfaceCoordinates(segment, point.x, point.y, point.z, (u, v) => {
      const displacement = surfaceValueAt(segment.grid, segment.grid.displacementM, u, v);
      return Number.isNaN(displacement) ? 0 : displacement * exaggeration;
    });
    const local = new Float64Array(3);
    surfacePoint(segment, s, t, 0, local, 0);
    return { s, t, x: origin[0] + local[0], y: origin[1] + local[1], z: origin[2] + local[2] };
  };

  return (
    <mesh
      geometry={geometry}
      raycast={raycastUnlessDragging}
      onPointerMove={(event: ThreeEvent<PointerEvent>) => {
        event.stopPropagation();
        const hit = hitAt(event.point);
        const { strikeDeg, dipDeg } = localOrientationAt(segment, hit.s, hit.t);
        publishReadout({
          segmentId: segment.id,
          ...hit,
          localStrikeDeg: strikeDeg,
          localDipDeg: dipDeg,
          displacementM: surfaceValueAt(segment.grid, segment.grid.displacementM, hit.s, hit.t),
          throwM: surfaceValueAt(segment.grid, segment.grid.throwM, hit.s, hit.t),
          fieldValue: fieldValues ? surfaceValueAt(segment.grid, fieldValues, hit.s, hit.t) : undefined,
        });
      }}
      onPointerOut={() => publishReadout(null)}
      onClick={(event: ThreeEvent<MouseEvent>) => {
        if (!onSurfaceClick) return;
        event.stopPropagation();
        onSurfaceClick({ ...hitAt(event.point), segmentId: segment.id });
      }}
    >
      {shaded ? (
        <meshLambertMaterial vertexColors side={THREE.DoubleSide} />
      ) : (
        // flat on the plane there is no relief to shade: show the legend's colours exactly
        <meshBasicMaterial vertexColors side={THREE.DoubleSide} />
      )}
    </mesh>
  );
}

/** Whether the segment's surface departs from its plane by more than a few cells' worth of slope (shading shows it). */
function surfaceBends(segment: DisplaySegment): boolean {
  const offsets = segment.grid.offPlaneM;
  if (!offsets) return false;
  let low = Infinity,
    high = -Infinity;
  for (const value of offsets) {
    if (Number.isNaN(value)) continue;
    low = Math.min(low, value);
    high = Math.max(high, value);
  }
  return high - low > 0.25 * segment.grid.cellM;
}

// ---- lines ----------------------------------------------------------------------------------------------

/**
 * Contours are drawn in a colour that stands out on the surface under them: over the displacement colours each level
 * gets a dark or light line by the colour at that level (viridis runs dark to light); over other colourings, whose
 * colour at a contour is not its level's, the line follows the theme.
 */
function ContourLines({ display, exaggeration, onDisplacementColours }: { display: FaultDisplay; exaggeration: number; onDisplacementColours: boolean }) {
  const dark = useDarkMode();
  const geometry = useDisposable(() => {
    const [low, high] = display.displacementRangeM;
    const colour = new THREE.Color();
    const themeLine = dark ? LIGHT_LINE : DARK_LINE;
    const colourOf = (levelM: number): [number, number, number] => {
      const css = onDisplacementColours
        ? contrastingLineColour(surfaceInterpolator(high > low ? Math.min(1, Math.max(0, (levelM - low) / (high - low))) : 0.5))
        : themeLine;
      colour.set(css);
      return [colour.r, colour.g, colour.b];
    };
    return bufferGeometry(buildContourLines(display, exaggeration, colourOf));
  }, [display, exaggeration, onDisplacementColours, dark]);
  return (
    <lineSegments geometry={geometry} renderOrder={1}>
      <lineBasicMaterial vertexColors transparent opacity={0.75} />
    </lineSegments>
  );
}

/** The central tip line bold, the 5–95 % band as two thin lines, and open edges (no tip inferred) dashed apart. */
function TipLines({ display }: { display: FaultDisplay }) {
  const central = useMemo(() => Array.from(buildTipLines(display).positions), [display]);
  const band = useMemo(() => Array.from(buildTipBandLines(display).positions), [display]);
  const open = useMemo(() => Array.from(buildOpenTipLines(display).positions), [display]);
  const dark = useDarkMode();
  const dashM = displayExtentM(display) / 60;
  return (
    <>
      {central.length > 0 && <Line segments points={central} color={COLORS.tipLine} lineWidth={4} renderOrder={2} />}
      {band.length > 0 && <Line segments points={band} color={COLORS.tipBand} lineWidth={1.5} transparent opacity={0.85} renderOrder={2} />}
      {open.length > 0 && (
        <Line
          segments
          dashed
          dashSize={dashM}
          gapSize={dashM * 0.8}
          points={open}
          color={dark ? COLORS.openEdge.dark : COLORS.openEdge.light}
          lineWidth={3}
          renderOrder={2}
        />
      )}
    </>
  );
}

function MappedLimitLines({ display, exaggeration }: { display: FaultDisplay; exaggeration: number }) {
  const points = useMemo(() => Array.from(buildMappedLimitLines(display, exaggeration).positions), [display, exaggeration]);
  const dashM = displayExtentM(display) / 80;
  const dark = useDarkMode();
  if (points.length === 0) return null;
  return (
    <Line
      segments
      dashed
      dashSize={dashM}
      gapSize={dashM * 0.7}
      points={points}
      color={dark ? COLORS.mappedLimit.dark : COLORS.mappedLimit.light}
      lineWidth={1.5}
      renderOrder={2}
    />
  );
}

// ---- points ---------------------------------------------------------------------------------------------

function PickPoints({ display, exaggeration }: { display: FaultDisplay; exaggeration: number }) {
  const geometry = useDisposable(
    () => bufferGeometry(buildPickPoints(display, exaggeration, residualRangeM(display.picks.residualM))),
    [display, exaggeration],
  );
  return (
    <points geometry={geometry} renderOrder={3}>
      <pointsMaterial vertexColors size={3} sizeAttenuation={false} />
    </points>
  );
}

type MarkerShape = "diamond" | "pin";

/** A small sprite drawn once on a 2D canvas; the marker layers use it as their point shape. */
function useMarkerTexture(shape: MarkerShape) {
  return useDisposable(() => {
    const size = 64;
    const canvas = document.createElement("canvas");
    canvas.width = canvas.height = size;
    const context = canvas.getContext("2d");
    if (context) {
      context.lineWidth = 8;
      context.strokeStyle = "#0f172a";
      context.fillStyle = "#ffffff";
      context.beginPath();
      if (shape === "diamond") {
        context.moveTo(size / 2, 6);
        context.lineTo(size - 6, size / 2);
        context.lineTo(size / 2, size - 6);
        context.lineTo(6, size / 2);
        context.closePath();
      } else {
        context.arc(size / 2, size / 2, size / 2 - 8, 0, Math.PI * 2);
      }
      context.fill();
      context.stroke();
    }
    const texture = new THREE.CanvasTexture(canvas);
    texture.colorSpace = THREE.SRGBColorSpace;
    return texture;
  }, [shape]);
}

function PeakMarkers({ display, exaggeration }: { display: FaultDisplay; exaggeration: number }) {
  const geometry = useDisposable(() => bufferGeometry(buildPeakPoints(display, exaggeration)), [display, exaggeration]);
  const texture = useMarkerTexture("diamond");
  return (
    <points geometry={geometry} renderOrder={4}>
      <pointsMaterial map={texture} color={COLORS.peak} size={18} sizeAttenuation={false} transparent alphaTest={0.5} depthTest={false} />
    </points>
  );
}

/**
 * Where a pin is drawn (world-local): on the drawn surface of the segment it lies on (the one whose surface it is
 * nearest), with the relief there, so a pin sits on the surface at any exaggeration; its stored point when off every grid.
 */
function pinOnSurface(display: FaultDisplay, pin: ScenePin, exaggeration: number): [number, number, number] {
  const x = pin.x - display.origin[0],
    y = pin.y - display.origin[1],
    z = pin.z - display.origin[2];
  let best: { segment: DisplaySegment; s: number; t: number; distance: number } | null = null;
  for (const segment of display.segments) {
    const [s, t, h] = worldToPlane(segment.frame, x, y, z);
    const { grid } = segment;
    if (s < grid.s0 || t < grid.t0 || s > grid.s0 + (grid.columns - 1) * grid.cellM || t > grid.t0 + (grid.rows - 1) * grid.cellM) continue;
    const distance = Math.abs(h - surfaceOffsetAt(segment, s, t));
    if (!best || distance < best.distance) best = { segment, s, t, distance };
  }
  if (!best) return [x, y, z];
  const displacement = surfaceValueAt(best.segment.grid, best.segment.grid.displacementM, best.s, best.t);
  const point = new Float64Array(3);
  surfacePoint(best.segment, best.s, best.t, (Number.isNaN(displacement) ? 0 : displacement * exaggeration) + lineLiftM(display), point, 0);
  return [point[0], point[1], point[2]];
}

function PinMarkers({ display, pins }: { display: FaultDisplay; pins: ScenePin[] }) {
  const exaggeration = useSceneSettings((state) => state.exaggeration);
  const geometry = useDisposable(() => {
    const positions = new Float32Array(pins.length * 3);
    const colors = new Float32Array(pins.length * 3);
    const color = new THREE.Color();
    pins.forEach((pin, i) => {
      const local = pinOnSurface(display, pin, exaggeration);
      positions[i * 3] = local[0];
      positions[i * 3 + 1] = local[1];
      positions[i * 3 + 2] = local[2];
      color.set(pin.resolved ? COLORS.pinResolved : COLORS.pinOpen).toArray(colors, i * 3);
    });
    return bufferGeometry({ positions, colors });
  }, [display, pins, exaggeration]);
  const texture = useMarkerTexture("pin");
  return (
    <points geometry={geometry} renderOrder={5}>
      <pointsMaterial map={texture} vertexColors size={16} sizeAttenuation={false} transparent alphaTest={0.5} depthTest={false} />
    </points>
  );
}

// ---- labels ---------------------------------------------------------------------------------------------

const LABEL_Z_RANGE: [number, number] = [10, 0];
const LABEL_STYLE = { pointerEvents: "none" } as const;
/** room kept free at the left of a preset view for the colour legend and the depth labels beside the fault */
const LEGEND_MARGIN_PX = 210;
/** room kept free at the right for the orientation marker */
const MARKER_MARGIN_PX = 110;

interface SceneLabel {
  key: string;
  position: Vec3;
  text: string;
  kind: "segment" | "peak";
}

/**
 * Segment names (above the top of each tip line) and peak values (beside each peak marker). Each frame in which the
 * camera moved, the labels are projected to the screen and moved, by their own style only (no React state), to the
 * nearest spot where they cover no other label, peak marker or depth label: seen along strike, the segments' labels
 * would otherwise print over each other.
 */
function SegmentLabels({ display, labelLayer }: { display: FaultDisplay; labelLayer: LabelLayer }) {
  const exaggeration = useSceneSettings((state) => state.exaggeration);
  const showPeak = useLayerVisible("maxMarker");
  const lift = lineLiftM(display);
  const labels = useMemo(() => {
    const out: SceneLabel[] = [];
    for (const segment of display.segments) {
      const top = segment.tipLine.reduce((best, point) => (point[1] < best[1] ? point : best), segment.tipLine[0] ?? [0, 0]);
      const point = new Float32Array(3);
      surfacePoint(segment, top[0], top[1], lift, point, 0);
      out.push({ key: `${segment.id}:segment`, kind: "segment", text: `Segment ${segment.id}`, position: [point[0], point[1], point[2]] });
      if (showPeak) {
        surfacePoint(segment, segment.max.s, segment.max.t, segment.max.displacementM * exaggeration + lift * 2, point, 0);
        out.push({
          key: `${segment.id}:peak`,
          kind: "peak",
          text: `Peak ${formatMetres(segment.max.displacementM)}`,
          position: [point[0], point[1], point[2]],
        });
      }
    }
    return out;
  }, [display, exaggeration, lift, showPeak]);
  const elements = useRef(new Map<string, HTMLDivElement>());
  useLabelDeclutter(labels, elements);
  return (
    <>
      {labels.map((label) => (
        <Html
          key={label.key}
          position={label.position}
          center
          zIndexRange={LABEL_Z_RANGE}
          style={LABEL_STYLE}
          portal={labelLayer as React.RefObject<HTMLElement>}
        >
          <div
            ref={(element) => {
              if (element) elements.current.set(label.key, element);
              else elements.current.delete(label.key);
            }}
            data-scene-label={label.kind}
            className={
              label.kind === "segment"
                ? "whitespace-nowrap rounded bg-white/85 px-1.5 py-0.5 text-xs font-semibold text-slate-800 shadow-sm ring-1 ring-slate-300 dark:bg-slate-900/85 dark:text-slate-100 dark:ring-slate-600"
                : "whitespace-nowrap rounded bg-slate-900/75 px-1 text-[11px] font-medium text-white"
            }
          >
            {label.text}
          </div>
        </Html>
      ))}
    </>
  );
}

const PEAK_MARKER_RADIUS_PX = 10;

function useLabelDeclutter(labels: SceneLabel[], elements: React.RefObject<Map<string, HTMLDivElement>>) {
  const camera = useThree((state) => state.camera);
  const size = useThree((state) => state.size);
  const canvas = useThree((state) => state.gl.domElement);
  const invalidate = useThree((state) => state.invalidate);
  const lastMatrix = useRef<THREE.Matrix4 | null>(null);
  const lastLabels = useRef<SceneLabel[] | null>(null);
  const waitedFrames = useRef(0);
  const projected = useMemo(() => new THREE.Vector3(), []);
  useFrame(() => {
    const moved = !lastMatrix.current || !lastMatrix.current.equals(camera.matrixWorld) || lastLabels.current !== labels;
    if (!moved) return;
    // the labels' HTML mounts after the first frames: until every one can be measured, look again next frame
    const measurable = labels.every((label) => (elements.current.get(label.key)?.offsetWidth ?? 0) > 0);
    if (!measurable && waitedFrames.current < 120) {
      waitedFrames.current += 1;
      invalidate();
      return;
    }
    waitedFrames.current = 0;
    lastMatrix.current = camera.matrixWorld.clone();
    lastLabels.current = labels;
    const requests: (LabelRequest & { element: HTMLDivElement })[] = [];
    for (const label of labels) {
      const element = elements.current.get(label.key);
      if (!element || element.offsetWidth === 0) continue;
      projected.set(...label.position).project(camera);
      if (projected.z > 1) continue;
      requests.push({
        element,
        x: ((projected.x + 1) / 2) * size.width,
        y: ((1 - projected.y) / 2) * size.height,
        width: element.offsetWidth,
        height: element.offsetHeight,
        radius: label.kind === "peak" ? PEAK_MARKER_RADIUS_PX : 0,
        prefer: label.kind === "peak" ? "right" : "above",
      });
    }
    // the depth labels stay where they are, and so do the legend, scale bar and orientation marker over the canvas
    // (marked data-scene-overlay inside the viewer's data-scene-frame); the other labels keep clear of them
    const frame = canvas.getBoundingClientRect();
    const container = canvas.closest("[data-scene-frame]") ?? canvas.parentElement;
    const relative = (element: HTMLElement): Rect => {
      const box = element.getBoundingClientRect();
      return { x0: box.left - frame.left, y0: box.top - frame.top, x1: box.right - frame.left, y1: box.bottom - frame.top };
    };
    const obstacles: Rect[] = [];
    // a depth label that would start left of the canvas (the fault fills the view) slides right until it is inside
    for (const element of container?.querySelectorAll<HTMLElement>("[data-scene-label='depth']") ?? []) {
      element.style.transform = "";
      const box = relative(element);
      const shift = Math.max(0, -box.x0 + 2);
      if (shift > 0) element.style.transform = `translateX(${shift.toFixed(1)}px)`;
      obstacles.push({ ...box, x0: box.x0 + shift, x1: box.x1 + shift });
    }
    for (const element of container?.querySelectorAll<HTMLElement>("[data-scene-overlay]") ?? []) obstacles.push(relative(element));
    const placed = placeLabels(requests, { x0: 0, y0: 0, x1: size.width, y1: size.height }, { gap: 4, obstacles });
    placed.forEach((placement, index) => {
      const { element, x, y } = requests[index];
      const dx = (placement.box.x0 + placement.box.x1) / 2 - x;
      const dy = (placement.box.y0 + placement.box.y1) / 2 - y;
      element.style.transform = `translate(${dx.toFixed(1)}px, ${dy.toFixed(1)}px)`;
    });
  });
}

function DepthLabels({ display, labelLayer }: { display: FaultDisplay; labelLayer: LabelLayer }) {
  const labels = useMemo(() => depthLabels(display, display.origin[2]), [display]);
  return (
    <>
      {labels.map(({ position, depthM }) => (
        <Html key={depthM} position={position} zIndexRange={LABEL_Z_RANGE} style={LABEL_STYLE} portal={labelLayer as React.RefObject<HTMLElement>}>
          <div className="-translate-x-full -translate-y-1/2">
            <div
              data-scene-label="depth"
              className="flex items-center gap-1 whitespace-nowrap rounded bg-white/60 px-0.5 font-mono text-[10px] text-slate-600 dark:bg-slate-900/60 dark:text-slate-300"
            >
              {formatMetres(depthM)} depth
              <span className="inline-block h-px w-2 bg-slate-500" />
            </div>
          </div>
        </Html>
      ))}
    </>
  );
}

// ---- camera ---------------------------------------------------------------------------------------------

function OrbitControlsRig({ display, initialCamera }: { display: FaultDisplay; initialCamera?: CameraState }) {
  const camera = useThree((state) => state.camera) as THREE.PerspectiveCamera;
  const controls = useThree((state) => state.controls) as OrbitControlsImpl | null;
  const invalidate = useThree((state) => state.invalidate);
  const heightPx = useThree((state) => state.size.height);
  const exaggeration = useSceneSettings((state) => state.exaggeration);
  const request = useCameraStore((state) => state.request);
  const handledRequest = useRef<number | null>(null);
  const initialised = useRef(false);
  /** the view is still the automatic opening one: nobody has moved it, asked for a preset or restored a viewpoint */
  const autoFramed = useRef(false);
  const [ox, oy, oz] = display.origin;

  const publishScale = useCallback(() => {
    if (!controls || heightPx <= 0) return;
    const distance = camera.position.distanceTo(controls.target);
    const visibleHeightM = 2 * distance * Math.tan(THREE.MathUtils.degToRad(camera.fov / 2));
    useOverlayStore.getState().setMetresPerPixel(visibleHeightM / heightPx);
    useOverlayStore.getState().setAxes(screenAxesOf(camera));
  }, [camera, controls, heightPx]);

  const recordCamera = useCallback(() => {
    if (!controls) return;
    useCameraStore.getState().setCamera({
      position: [camera.position.x + ox, camera.position.y + oy, camera.position.z + oz],
      target: [controls.target.x + ox, controls.target.y + oy, controls.target.z + oz],
      up: [camera.up.x, camera.up.y, camera.up.z],
      fov: camera.fov,
    });
    publishScale();
  }, [camera, controls, ox, oy, oz, publishScale]);

  const applyCamera = useCallback(
    (state: CameraState) => {
      if (!controls) return;
      camera.up.set(...state.up);
      camera.position.set(state.position[0] - ox, state.position[1] - oy, state.position[2] - oz);
      camera.fov = state.fov;
      camera.updateProjectionMatrix();
      controls.target.set(state.target[0] - ox, state.target[1] - oy, state.target[2] - oz);
      controls.update();
      // record the requested numbers, not the camera's re-derived ones, so a restore reads back exactly
      useCameraStore.getState().setCamera(copyCameraState(state));
      publishScale();
      invalidate();
    },
    [camera, controls, invalidate, ox, oy, oz, publishScale],
  );

  const widthPx = useThree((state) => state.size.width);
  const presetFor = useCallback(
    (preset: Parameters<typeof presetCamera>[0]) =>
      presetCamera(preset, {
        bounds: displayBounds(display, exaggeration),
        frame: display.segments[0].frame,
        origin: display.origin,
        points: framingPoints(display, exaggeration),
        aspect: heightPx > 0 ? widthPx / heightPx : undefined,
        // the colour legend takes the left edge of the view and the orientation marker the right: the fault is framed between
        leftInset: widthPx > 2 * (LEGEND_MARGIN_PX + MARKER_MARGIN_PX) ? LEGEND_MARGIN_PX / widthPx : 0,
        rightInset: widthPx > 2 * (LEGEND_MARGIN_PX + MARKER_MARGIN_PX) ? MARKER_MARGIN_PX / widthPx : 0,
      }),
    [display, exaggeration, heightPx, widthPx],
  );

  useEffect(() => {
    if (!controls) return;
    if (!initialised.current) {
      initialised.current = true;
      handledRequest.current = useCameraStore.getState().request?.id ?? null;
      autoFramed.current = !initialCamera;
      applyCamera(initialCamera ?? presetFor("overview"));
    } else if (autoFramed.current) {
      // the canvas settled on another size (or the relief changed) before anyone moved the view: frame the fault again
      applyCamera(presetFor("overview"));
    }
  }, [controls, applyCamera, initialCamera, presetFor]);

  useEffect(() => {
    if (!controls || !request || request.id === handledRequest.current) return;
    handledRequest.current = request.id;
    autoFramed.current = false;
    applyCamera(request.kind === "state" ? request.state : presetFor(request.preset));
  }, [controls, request, applyCamera, presetFor]);

  useEffect(() => {
    if (!testHooksEnabled()) return;
    window.__slipfieldCamera = () => useCameraStore.getState().camera;
    window.__slipfieldApplyCamera = (state) => useCameraStore.getState().applyCamera(state);
    return () => {
      delete window.__slipfieldCamera;
      delete window.__slipfieldApplyCamera;
    };
  }, []);

  useEffect(publishScale, [publishScale]);

  return (
    <OrbitControls
      makeDefault
      enableDamping={false}
      regress
      zoomToCursor
      onStart={() => {
        cameraDragging = true;
        autoFramed.current = false;
      }}
      onEnd={() => {
        cameraDragging = false;
        recordCamera();
      }}
      onChange={recordCamera}
    />
  );
}

/** The world axes on the screen: x right, y down, z towards the viewer (from the camera's rotation). */
function screenAxesOf(camera: THREE.Camera) {
  const right = new THREE.Vector3(1, 0, 0).applyQuaternion(camera.quaternion);
  const up = new THREE.Vector3(0, 1, 0).applyQuaternion(camera.quaternion);
  const back = new THREE.Vector3(0, 0, 1).applyQuaternion(camera.quaternion);
  const axis = (index: 0 | 1 | 2): [number, number, number] => [right.getComponent(index), -up.getComponent(index), back.getComponent(index)];
  return { east: axis(0), north: axis(1), up: axis(2) };
}

/** Raises the readiness flag browser tests wait on, once the first frame is on screen. */
function FrameProbe() {
  const frames = useRef(0);
  const [timed] = useState(testHooksEnabled);
  useFrame(() => {
    frames.current += 1;
    if (timed) {
      window.__slipfieldFrameCount = frames.current;
      const times = (window.__slipfieldFrameTimes ??= []);
      times.push(performance.now());
      if (times.length > 600) times.splice(0, times.length - 600);
    }
    if (frames.current === 1) {
      requestAnimationFrame(() => {
        if (timed) window.__slipfieldFirstFrameMs = performance.now();
        window.__slipfieldSceneReady = true;
      });
    }
  });
  useEffect(
    () => () => {
      window.__slipfieldSceneReady = false;
    },
    [],
  );
  return null;
}
