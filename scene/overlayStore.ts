// What the HTML overlays around the canvas show: the hover readout and the scale. Written by the scene from
// pointer and camera events (never from useFrame), read by small leaf components.
import { create } from "zustand";

export interface SurfaceReadout {
  segmentId: string;
  s: number;
  t: number;
  /** world coordinates of the point on the fault plane, m */
  x: number;
  y: number;
  z: number;
  displacementM: number;
  throwM: number;
  /** the shown scalar field's value here, when colouring by one */
  fieldValue?: number;
}

interface OverlayStore {
  readout: SurfaceReadout | null;
  /** metres per CSS pixel at the orbit target */
  metresPerPixel: number | null;
  setReadout: (readout: SurfaceReadout | null) => void;
  setMetresPerPixel: (metresPerPixel: number) => void;
}

export const useOverlayStore = create<OverlayStore>()((set, get) => ({
  readout: null,
  metresPerPixel: null,
  setReadout: (readout) => set({ readout }),
  setMetresPerPixel: (metresPerPixel) => {
    const previous = get().metresPerPixel;
    // ignore sub-percent changes so orbiting does not re-render the scale bar every frame
    if (previous === null || Math.abs(metresPerPixel - previous) > previous * 0.01) set({ metresPerPixel });
  },
}));
