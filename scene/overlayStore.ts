// What the HTML overlays around the canvas show: the hover readout and the scale. Written by the scene from
// pointer and camera events (never from useFrame), read by small leaf components.
import { create } from "zustand";

export interface SurfaceReadout {
  segmentId: string;
  s: number;
  t: number;
  /** world coordinates of the point on the fault surface, m */
  x: number;
  y: number;
  z: number;
  /** the surface's local strike (right-hand rule) and dip there, degrees */
  localStrikeDeg?: number;
  localDipDeg?: number;
  displacementM: number;
  throwM: number;
  /** the shown scalar field's value here, when colouring by one */
  fieldValue?: number;
}

/** Where the world's East, North and Up axes point on the screen: x right, y down, z towards the viewer (unit length). */
export interface ScreenAxes {
  east: [number, number, number];
  north: [number, number, number];
  up: [number, number, number];
}

interface OverlayStore {
  readout: SurfaceReadout | null;
  /** metres per CSS pixel at the orbit target */
  metresPerPixel: number | null;
  /** the camera's orientation, for the orientation marker */
  axes: ScreenAxes | null;
  setReadout: (readout: SurfaceReadout | null) => void;
  setMetresPerPixel: (metresPerPixel: number) => void;
  setAxes: (axes: ScreenAxes) => void;
}

const axesDiffer = (a: ScreenAxes, b: ScreenAxes) =>
  (["east", "north", "up"] as const).some((key) => a[key].some((value, index) => Math.abs(value - b[key][index]) > 0.005));

export const useOverlayStore = create<OverlayStore>()((set, get) => ({
  readout: null,
  metresPerPixel: null,
  axes: null,
  setReadout: (readout) => set({ readout }),
  setAxes: (axes) => {
    const previous = get().axes;
    if (previous === null || axesDiffer(previous, axes)) set({ axes });
  },
  setMetresPerPixel: (metresPerPixel) => {
    const previous = get().metresPerPixel;
    // ignore sub-percent changes so orbiting does not re-render the scale bar every frame
    if (previous === null || Math.abs(metresPerPixel - previous) > previous * 0.01) set({ metresPerPixel });
  },
}));
