// What the 3D scene shows besides the camera (layers, colour mode, relief) and the colour fields panels register. A
// viewpoint saves and restores these settings as they are (lib/contracts/scene-settings.ts): one shape, one spelling.
import { create } from "zustand";
import { LAYER_NAMES, MAX_EXAGGERATION, type ColourMode, type LayerName, type SceneSettings } from "@/lib/contracts/scene-settings";
import type { ScalarField } from "@/lib/contracts/display";

/** Displacement and throw are always there to colour by; other colour modes are fields registered by a panel. */
export const isBuiltInColourMode = (mode: string) => mode === "displacement" || mode === "throw";

interface SceneSettingsStore {
  /** which saved settings were applied last (a viewpoint link's token), if any */
  appliedFrom: string | null;
  layers: Record<LayerName, boolean>;
  colourMode: ColourMode;
  /** relief drawn off the plane per metre of displacement, 0–5 */
  exaggeration: number;
  setLayer: (layer: LayerName, visible: boolean) => void;
  toggleLayer: (layer: LayerName) => void;
  setColourMode: (mode: ColourMode) => void;
  /** extra colour modes offered next to displacement and throw */
  fields: ScalarField[];
  /** replaces the fields whose keys start with `prefix`; falls back to displacement if the shown one is gone */
  setFields: (prefix: string, fields: ScalarField[]) => void;
  setExaggeration: (exaggeration: number) => void;
}

export const useSceneSettings = create<SceneSettingsStore>()((set) => ({
  appliedFrom: null,
  layers: { surface: true, contours: true, tipLine: true, mappedLimit: true, picks: false, maxMarker: true, pins: true },
  colourMode: "displacement",
  exaggeration: 0,
  setLayer: (layer, visible) => set((state) => ({ layers: { ...state.layers, [layer]: visible } })),
  toggleLayer: (layer) => set((state) => ({ layers: { ...state.layers, [layer]: !state.layers[layer] } })),
  setColourMode: (colourMode) => set({ colourMode }),
  fields: [],
  setFields: (prefix, fields) =>
    set((state) => {
      const kept = state.fields.filter((field) => !field.key.startsWith(prefix));
      const next = [...kept, ...fields];
      const shown = isBuiltInColourMode(state.colourMode) || next.some((field) => field.key === state.colourMode);
      return { fields: next, colourMode: shown ? state.colourMode : "displacement" };
    }),
  setExaggeration: (exaggeration) => set({ exaggeration: Math.min(MAX_EXAGGERATION, Math.max(0, Number.isFinite(exaggeration) ? exaggeration : 0)) }),
}));

/** narrow selector: one layer's visibility */
export const useLayerVisible = (layer: LayerName) => useSceneSettings((state) => state.layers[layer]);

/** The settings as a viewpoint saves them. */
export function currentSceneSettings(): SceneSettings {
  const state = useSceneSettings.getState();
  return { layers: { ...state.layers }, colourMode: state.colourMode, exaggeration: state.exaggeration };
}

/**
 * Applies saved settings to the scene. Layers the scene does not know are ignored; a colour mode that is not available
 * here (e.g. an analysis field not loaded) falls back to displacement. `from` names what they came from (a link's token).
 */
export function applySceneSettings(settings: SceneSettings, from: string | null = null): { colourFellBack: boolean } {
  const store = useSceneSettings.getState();
  const layers = { ...store.layers };
  for (const layer of LAYER_NAMES) {
    const visible = settings.layers[layer];
    if (typeof visible === "boolean") layers[layer] = visible;
  }
  const available = isBuiltInColourMode(settings.colourMode) || store.fields.some((field) => field.key === settings.colourMode);
  useSceneSettings.setState({ layers, colourMode: available ? settings.colourMode : "displacement", appliedFrom: from });
  store.setExaggeration(settings.exaggeration);
  return { colourFellBack: !available };
}
