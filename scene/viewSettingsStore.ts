import { create } from "zustand";
import type { ColorMode, ScalarField } from "./geometry";

export type LayerName = "surface" | "contours" | "tipLine" | "mappedLimit" | "picks" | "maxMarker" | "pins";

export const LAYER_NAMES: readonly LayerName[] = ["surface", "contours", "tipLine", "mappedLimit", "picks", "maxMarker", "pins"];

export const MAX_EXAGGERATION = 5;

/** Displacement and throw are always there to colour by; other colour modes are fields registered by a panel. */
export const isBuiltInColourMode = (mode: string) => mode === "displacement" || mode === "throw";

interface ViewSettingsStore {
  /** which saved settings were applied last (a viewpoint link's token), if any */
  appliedFrom: string | null;
  layers: Record<LayerName, boolean>;
  colorMode: ColorMode;
  /** relief drawn off the plane per metre of displacement, 0–5 */
  exaggeration: number;
  setLayer: (layer: LayerName, visible: boolean) => void;
  toggleLayer: (layer: LayerName) => void;
  setColorMode: (mode: ColorMode) => void;
  /** extra colour modes offered next to displacement and throw */
  fields: ScalarField[];
  /** replaces the fields whose keys start with `prefix`; falls back to displacement if the shown one is gone */
  setFields: (prefix: string, fields: ScalarField[]) => void;
  setExaggeration: (exaggeration: number) => void;
}

export const useViewSettings = create<ViewSettingsStore>()((set) => ({
  appliedFrom: null,
  layers: { surface: true, contours: true, tipLine: true, mappedLimit: true, picks: false, maxMarker: true, pins: true },
  colorMode: "displacement",
  exaggeration: 0,
  setLayer: (layer, visible) => set((state) => ({ layers: { ...state.layers, [layer]: visible } })),
  toggleLayer: (layer) => set((state) => ({ layers: { ...state.layers, [layer]: !state.layers[layer] } })),
  setColorMode: (colorMode) => set({ colorMode }),
  fields: [],
  setFields: (prefix, fields) =>
    set((state) => {
      const kept = state.fields.filter((field) => !field.key.startsWith(prefix));
      const next = [...kept, ...fields];
      const shown = state.colorMode === "displacement" || state.colorMode === "throw" || next.some((field) => field.key === state.colorMode);
      return { fields: next, colorMode: shown ? state.colorMode : "displacement" };
    }),
  setExaggeration: (exaggeration) =>
    set({ exaggeration: Math.min(MAX_EXAGGERATION, Math.max(0, Number.isFinite(exaggeration) ? exaggeration : 0)) }),
}));

/** narrow selector: one layer's visibility */
export const useLayerVisible = (layer: LayerName) => useViewSettings((state) => state.layers[layer]);
