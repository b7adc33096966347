// The true fault surface in a display payload: its distance from the segment's reference plane along the plane's normal.
// Pure and browser-safe; the scene, the plane map and the glTF export place lines and pins on the surface with it.
import type { DisplaySegment } from "@/lib/contracts/display";
import { EDGE_TOLERANT_BILINEAR, sampleGrid } from "./grid-sampler";

/**
 * The surface's distance from the reference plane at (s, t) of a segment (m): the display grid's own where it has data
 * around (s, t), else the coarse surface (which covers the tip lines; a point beyond it reads its nearest edge), else 0
 * (payloads made before the true surface).
 */
export function surfaceOffsetAt(segment: DisplaySegment, s: number, t: number): number {
  const { grid, surface } = segment;
  if (grid.offPlaneM) {
    const w = sampleGrid(grid, grid.offPlaneM, s, t, EDGE_TOLERANT_BILINEAR);
    if (!Number.isNaN(w)) return w;
  }
  if (surface) {
    const u = Math.min(Math.max(s, surface.s0), surface.s0 + (surface.columns - 1) * surface.cellM);
    const v = Math.min(Math.max(t, surface.t0), surface.t0 + (surface.rows - 1) * surface.cellM);
    const w = sampleGrid(surface, surface.offPlaneM, u, v, EDGE_TOLERANT_BILINEAR);
    if (!Number.isNaN(w)) return w;
  }
  return 0;
}
