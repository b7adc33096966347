// The camera as data, in world coordinates (m, x East, y North, z Up), so a viewpoint can be saved and
// restored exactly whatever local origin the scene happens to use. The scene records the camera here when
// the person moves it and carries out requests (restore a state, go to a preset).
import { create } from "zustand";
import type { DisplayFrame } from "@/lib/contracts/display";
import type { Vec3 } from "@/lib/contracts/json";
import type { Bounds } from "./geometry";
import type { CameraState } from "@/lib/contracts/camera";

export type CameraPreset = "overview" | "map" | "faceOn" | "alongStrike";

export type CameraRequest = { id: number } & ({ kind: "state"; state: CameraState } | { kind: "preset"; preset: CameraPreset });

interface CameraStore {
  /** the camera as last shown; null before the scene's first frame */
  camera: CameraState | null;
  /** the latest request for the scene to carry out */
  request: CameraRequest | null;
  /** records the camera as shown (called by the scene) */
  setCamera: (camera: CameraState) => void;
  /** moves the camera to exactly this state */
  applyCamera: (camera: CameraState) => void;
  applyPreset: (preset: CameraPreset) => void;
  /** back to the opening overview */
  reset: () => void;
}

let requestCounter = 0;

export const useCameraStore = create<CameraStore>()((set) => ({
  camera: null,
  request: null,
  setCamera: (camera) => set({ camera }),
  applyCamera: (camera) => set({ request: { id: ++requestCounter, kind: "state", state: copyCameraState(camera) } }),
  applyPreset: (preset) => set({ request: { id: ++requestCounter, kind: "preset", preset } }),
  reset: () => set({ request: { id: ++requestCounter, kind: "preset", preset: "overview" } }),
}));

export function copyCameraState(camera: CameraState): CameraState {
  return {
    position: [...camera.position],
    target: [...camera.target],
    up: [...camera.up],
    fov: camera.fov,
  };
}

export const DEFAULT_FOV_DEG = 40;
const WORLD_UP: Vec3 = [0, 0, 1];

/**
 * A preset view of the scene. `bounds`, `frame` and `points` are world-local (relative to `origin`); the result is in
 * world coordinates. With `points` (the fault's outline, flat x, y, z), the camera is aimed at their middle as seen
 * from the preset's direction and moved in until they fill the view of aspect `aspect` (width / height) with a small
 * margin; without them, the distance fits the bounds' enclosing sphere.
 */
export function presetCamera(
  preset: CameraPreset,
  {
    bounds,
    frame,
    origin,
    fov = DEFAULT_FOV_DEG,
    points,
    aspect = 1.6,
    leftInset = 0,
    rightInset = 0,
  }: {
    bounds: Bounds;
    frame: DisplayFrame;
    origin: Vec3;
    fov?: number;
    points?: ArrayLike<number>;
    aspect?: number;
    /** fractions of the view's width at its left and right edges to keep free (overlays sit there) */
    leftInset?: number;
    rightInset?: number;
  },
): CameraState {
  const direction = normalize(presetDirection(preset, frame));
  const clampInset = (inset: number) => Math.min(0.35, Math.max(0, inset));
  const fitted = points && points.length >= 9 ? fitToPoints(points, direction, fov, aspect, clampInset(leftInset), clampInset(rightInset)) : null;
  if (fitted) return { position: add(fitted.position, origin), target: add(fitted.target, origin), up: [...WORLD_UP], fov };
  const centre = bounds.min.map((low, axis) => (low + bounds.max[axis]) / 2) as Vec3;
  const radius = Math.max(1, 0.5 * Math.hypot(...bounds.max.map((high, axis) => high - bounds.min[axis])));
  const distance = (radius / Math.sin(((fov / 2) * Math.PI) / 180)) * 1.05;
  const local = centre.map((value, axis) => value + direction[axis] * distance) as Vec3;
  return {
    position: add(local, origin),
    target: add(centre, origin),
    up: [...WORLD_UP],
    fov,
  };
}

const FIT_MARGIN = 1.1;

/**
 * The screen axes of a camera looking along −`direction` with world up (as three.js's lookAt builds them): right =
 * up × direction, screen up = direction × right.
 */
export function screenAxes(direction: Vec3): { right: Vec3; screenUp: Vec3 } {
  let right = cross(WORLD_UP, direction);
  if (Math.hypot(...right) < 1e-9) right = [1, 0, 0];
  right = normalize(right);
  return { right, screenUp: normalize(cross(direction, right)) };
}

/**
 * Target and position that frame every point (perspective, vertical field of view `fovDeg`) in the part of the view
 * between `leftInset` and `rightInset` (fractions of its width).
 */
function fitToPoints(
  points: ArrayLike<number>,
  direction: Vec3,
  fovDeg: number,
  aspect: number,
  leftInset: number,
  rightInset: number,
): { target: Vec3; position: Vec3 } | null {
  const { right, screenUp } = screenAxes(direction);
  const count = Math.floor(points.length / 3);
  const xs = new Float64Array(count),
    ys = new Float64Array(count),
    zs = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const p: Vec3 = [points[i * 3], points[i * 3 + 1], points[i * 3 + 2]];
    xs[i] = dot(p, right);
    ys[i] = dot(p, screenUp);
    zs[i] = dot(p, direction);
  }
  const mid = (values: Float64Array) => {
    let low = Infinity,
      high = -Infinity;
    for (const value of values) {
      low = Math.min(low, value);
      high = Math.max(high, value);
    }
    return (low + high) / 2;
  };
  const [xMid, yMid, zMid] = [mid(xs), mid(ys), mid(zs)];
  if (![xMid, yMid, zMid].every(Number.isFinite)) return null;
  const tanV = Math.tan(((fovDeg / 2) * Math.PI) / 180);
  const tanH = tanV * Math.max(0.2, aspect) * (1 - leftInset - rightInset);
  // a point at depth z (towards the camera) and offset x from the axis is in view when x ≤ (distance − z)·tan
  let distance = 0;
  for (let i = 0; i < count; i++) {
    const dz = zs[i] - zMid;
    distance = Math.max(distance, dz + (Math.abs(xs[i] - xMid) * FIT_MARGIN) / tanH, dz + (Math.abs(ys[i] - yMid) * FIT_MARGIN) / tanV);
  }
  distance = Math.max(distance, 1);
  // aim off the points' middle by half the difference of the insets, so they sit centred in the free part of the view
  const shift = (leftInset - rightInset) * distance * tanV * Math.max(0.2, aspect);
  const target = add(add(scale(right, xMid - shift), scale(screenUp, yMid)), scale(direction, zMid));
  return { target, position: add(target, scale(direction, distance)) };
}

/** unit vector from the target towards the camera */
function presetDirection(preset: CameraPreset, frame: DisplayFrame): Vec3 {
  const { normal, strikeVector } = frame;
  switch (preset) {
    case "map":
      // from straight above; the small southward offset keeps north at the top of the screen
      return [0, -1e-3, 1];
    case "faceOn":
      return [...normal];
    case "alongStrike":
      return [-strikeVector[0], -strikeVector[1], 0.08];
    case "overview": {
      // from the hanging-wall side, raised 35°, swung 30° back along strike
      const horizontal = normalize([normal[0], normal[1], 0]);
      const swung = normalize(add(scale(horizontal, Math.cos(Math.PI / 6)), scale(strikeVector, -Math.sin(Math.PI / 6))));
      const elevation = (35 * Math.PI) / 180;
      return add(scale(swung, Math.cos(elevation)), [0, 0, Math.sin(elevation)]);
    }
  }
}

const add = (a: readonly number[], b: readonly number[]): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
const dot = (a: readonly number[], b: readonly number[]) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: readonly number[], b: readonly number[]): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const scale = (a: readonly number[], k: number): Vec3 => [a[0] * k, a[1] * k, a[2] * k];
function normalize(a: readonly number[]): Vec3 {
  const length = Math.hypot(a[0], a[1], a[2]);
  return length > 0 ? scale(a, 1 / length) : [0, 0, 1];
}
