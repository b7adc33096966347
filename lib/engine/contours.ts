import { contours as d3Contours } from "d3-contour";
import type { Ring } from "./types";
import type { GridSpec } from "./grid";

/** A "nice" interval (1, 2, 2.5 or 5 × 10^k) giving roughly 8–12 levels between 0 and maxValue. */
export function niceInterval(maxValue: number, targetLevels = 10): number {
  if (!(maxValue > 0)) return 1;
  const raw = maxValue / targetLevels;
  const p = 10 ** Math.floor(Math.log10(raw));
  const candidates = [0.5, 1, 2, 2.5, 5, 10].map((m) => m * p);
  const miss = (c: number) => Math.abs(contourLevels(maxValue, c).length - targetLevels);
  let best = candidates[1];
  for (const c of candidates) if (miss(c) < miss(best)) best = c;
  return best;
}

export function contourLevels(maxValue: number, intervalM: number): number[] {
  const levels: number[] = [];
  for (let k = 1; k * intervalM < maxValue && levels.length < 1000; k++) levels.push(k * intervalM);
  return levels;
}

/**
 * Contour rings of a grid field in (s, t). NaN nodes are replaced by a value below the lowest level, so the
 * outline of the data closes each ring without spurious rings around the gaps.
 */
export function contourGrid(grid: GridSpec, field: Float64Array, levels: number[]): { levelM: number; rings: Ring[] }[] {
  if (levels.length === 0) return [];
  const below = Math.min(...levels) - 1;
  const values = new Float64Array(field.length);
  for (let i = 0; i < field.length; i++) values[i] = Number.isNaN(field[i]) ? below : field[i];
  const gen = d3Contours().size([grid.columns, grid.rows]).thresholds(levels);
  const maxX = grid.columns - 0.5;
  const maxY = grid.rows - 0.5;
  return gen(values as unknown as number[]).map((mp) => ({
    levelM: mp.value,
    rings: mp.coordinates.flatMap((polygon) =>
      polygon.map((ring) =>
        // d3-contour places node i at i + 0.5 and pads the edge by half a cell; clamp back onto the grid
        ring.map(([gx, gy]) => [
          grid.s0 + (Math.min(Math.max(gx, 0.5), maxX) - 0.5) * grid.cellM,
          grid.t0 + (Math.min(Math.max(gy, 0.5), maxY) - 0.5) * grid.cellM,
        ] as [number, number]),
      ),
    ),
  }));
}

/** Signed area of a ring (shoelace). */
export function ringArea(ring: [number, number][]): number {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  return a / 2;
}
