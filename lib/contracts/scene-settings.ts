// What the 3D scene shows besides the camera: its layers, what the surface is coloured by and the relief. The scene's
// store holds them (scene/sceneSettingsStore.ts) and a viewpoint saves them (viewpoints.settings): one shape, one
// spelling.
import { z } from "zod";

export const LAYER_NAMES = ["surface", "contours", "tipLine", "mappedLimit", "picks", "maxMarker", "pins"] as const;
export type LayerName = (typeof LAYER_NAMES)[number];

/** Relief drawn off the plane per metre of displacement: 0 (flat on the plane) to this. */
export const MAX_EXAGGERATION = 5;

/** "displacement", "throw", or the key of a field a panel registered (e.g. "stress:slip"). */
export type ColourMode = string;

export const sceneSettingsSchema = z.object({
  /** layers by name; a name the scene does not know is kept but ignored when applied */
  layers: z.record(z.string().trim().min(1).max(40), z.boolean()).refine((layers) => Object.keys(layers).length <= 30, "At most 30 layers."),
  colourMode: z.string().trim().min(1).max(80),
  exaggeration: z.number().finite().min(0).max(MAX_EXAGGERATION),
});

export type SceneSettings = z.infer<typeof sceneSettingsSchema>;
