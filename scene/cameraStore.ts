// The camera as data, in world coordinates (m, x East, y North, z Up), so a viewpoint can be saved and
// restored exactly whatever local origin the scene happens to use. The scene records the camera here when
// the person moves it and carries out requests (restore a state, go to a preset).
import { create } from "zustand";
import type { DisplayFrame, Vec3 } from "@/lib/analysis/display";
import type { Bounds } from "./geometry";

export interface CameraState {
  position: Vec3;
  target: Vec3;
  up: Vec3;
  /** vertical field of view, degrees */
  fov: number;
}

export type CameraPreset = "overview" | "map" | "faceOn" | "alongStrike";

export type CameraRequest = { id: number } & (
  | { kind: "state"; state: CameraState }
  | { kind: "preset"; preset: CameraPreset }
);

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
 * A preset view of the scene. `bounds` and `frame` are world-local (relative to `origin`); the result is in
 * world coordinates. The distance fits the bounds' enclosing sphere in the field of view.
 */
export function presetCamera(
  preset: CameraPreset,
  { bounds, frame, origin, fov = DEFAULT_FOV_DEG }: { bounds: Bounds; frame: DisplayFrame; origin: Vec3; fov?: number },
): CameraState {
  const centre = bounds.min.map((low, axis) => (low + bounds.max[axis]) / 2) as Vec3;
  const radius = Math.max(1, 0.5 * Math.hypot(...bounds.max.map((high, axis) => high - bounds.min[axis])));
  const distance = (radius / Math.sin(((fov / 2) * Math.PI) / 180)) * 1.05;
  const direction = normalize(presetDirection(preset, frame));
  const local = centre.map((value, axis) => value + direction[axis] * distance) as Vec3;
  return {
    position: add(local, origin),
    target: add(centre, origin),
    up: [...WORLD_UP],
    fov,
  };
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
const scale = (a: readonly number[], k: number): Vec3 => [a[0] * k, a[1] * k, a[2] * k];
function normalize(a: readonly number[]): Vec3 {
  const length = Math.hypot(a[0], a[1], a[2]);
  return length > 0 ? scale(a, 1 / length) : [0, 0, 1];
}
