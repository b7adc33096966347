import { create } from "zustand";
import type { ColorMode } from "./geometry";

export type LayerName = "surface" | "contours" | "tipLine" | "mappedLimit" | "picks" | "maxMarker" | "pins";

export const LAYER_NAMES: readonly LayerName[] = ["surface", "contours", "tipLine", "mappedLimit", "picks", "maxMarker", "pins"];

export const MAX_EXAGGERATION = 5;

interface ViewSettingsStore {
  layers: Record<LayerName, boolean>;
  colorMode: ColorMode;
  /** relief drawn off the plane per metre of displacement, 0–5 */
  exaggeration: number;
  setLayer: (layer: LayerName, visible: boolean) => void;
  toggleLayer: (layer: LayerName) => void;
  setColorMode: (mode: ColorMode) => void;
  setExaggeration: (exaggeration: number) => void;
}

export const useViewSettings = create<ViewSettingsStore>()((set) => ({
  layers: { surface: true, contours: true, tipLine: true, mappedLimit: true, picks: false, maxMarker: true, pins: true },
  colorMode: "displacement",
  exaggeration: 0,
  setLayer: (layer, visible) => set((state) => ({ layers: { ...state.layers, [layer]: visible } })),
  toggleLayer: (layer) => set((state) => ({ layers: { ...state.layers, [layer]: !state.layers[layer] } })),
  setColorMode: (colorMode) => set({ colorMode }),
  setExaggeration: (exaggeration) =>
    set({ exaggeration: Math.min(MAX_EXAGGERATION, Math.max(0, Number.isFinite(exaggeration) ? exaggeration : 0)) }),
}));

/** narrow selector: one layer's visibility */
export const useLayerVisible = (layer: LayerName) => useViewSettings((state) => state.layers[layer]);
