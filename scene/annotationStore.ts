// Pins shown in the scene and the "place a pin" mode, shared by the viewer (which draws pins and reports
// clicks on the surface) and the pins panel (which owns the data and the comment form).
import { create } from "zustand";
import type { ScenePin, SurfaceHit } from "./FaultScene";

interface AnnotationStore {
  pins: ScenePin[];
  /** true while the next click on the surface should drop a pin */
  placing: boolean;
  /** where the person clicked in placing mode; the panel turns it into a comment form */
  pendingHit: SurfaceHit | null;
  setPins: (pins: ScenePin[]) => void;
  setPlacing: (placing: boolean) => void;
  setPendingHit: (hit: SurfaceHit | null) => void;
}

export const useAnnotationStore = create<AnnotationStore>()((set) => ({
  pins: [],
  placing: false,
  pendingHit: null,
  setPins: (pins) => set({ pins }),
  setPlacing: (placing) => set({ placing, pendingHit: placing ? null : null }),
  setPendingHit: (pendingHit) => set({ pendingHit, placing: false }),
}));
