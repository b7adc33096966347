// Converting between the viewer's settings store and a viewpoint's saved settings (the stored shape uses
// `colourMode`; the store calls it `colorMode`).
import type { ViewSettings } from "@/db/schema";
import { LAYER_NAMES, useViewSettings } from "@/scene/viewSettingsStore";

export function currentViewSettings(): ViewSettings {
  const state = useViewSettings.getState();
  return { layers: { ...state.layers }, colourMode: state.colorMode, exaggeration: state.exaggeration };
}

/**
 * Applies saved settings to the viewer. Layers the viewer does not know are ignored; a colour mode that is not
 * available here (e.g. an analysis field not loaded) falls back to displacement. Returns whether it did.
 */
export function applyViewSettings(settings: ViewSettings, from: string | null = null): { colourFellBack: boolean } {
  const store = useViewSettings.getState();
  const layers = { ...store.layers };
  for (const layer of LAYER_NAMES) {
    const visible = settings.layers[layer];
    if (typeof visible === "boolean") layers[layer] = visible;
  }
  const available = settings.colourMode === "displacement" || settings.colourMode === "throw" || store.fields.some((field) => field.key === settings.colourMode);
  useViewSettings.setState({ layers, colorMode: available ? settings.colourMode : "displacement", appliedFrom: from });
  store.setExaggeration(settings.exaggeration);
  return { colourFellBack: !available };
}
