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
 * outline of the data closes each ring without spurious rings around the gaps. Each level is traced by d3-contour
 * on the smallest window holding every node at or above it plus one node of margin: d3-contour treats the space
 * beyond its grid as below the level, so the window yields the same rings as the whole grid at a fraction of the
 * cost for the higher levels.
 */
export function contourGrid(grid: GridSpec, field: Float64Array, levels: number[]): { levelM: number; rings: Ring[] }[] {
  if (levels.length === 0) return [];
  const sorted = levels.slice().sort((a, b) => a - b);
  const below = sorted[0] - 1;
  const { columns, rows } = grid;
  const values = new Float64Array(field.length);
  for (let i = 0; i < field.length; i++) values[i] = Number.isNaN(field[i]) ? below : field[i];
  // window of the nodes at or above each level; nested, since a node above one level is above every lower one
  const count = sorted.length;
  const minI = new Int32Array(count).fill(columns), maxI = new Int32Array(count).fill(-1);
  const minJ = new Int32Array(count).fill(rows), maxJ = new Int32Array(count).fill(-1);
  const lowest = sorted[0];
  for (let j = 0; j < rows; j++) {
    const rowStart = j * columns;
    for (let i = 0; i < columns; i++) {
      const v = values[rowStart + i];
      if (!(v >= lowest)) continue;
      let lo = 0, hi = count - 1; // highest k with sorted[k] <= v
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if (sorted[mid] <= v) lo = mid;
        else hi = mid - 1;
      }
      if (i < minI[lo]) minI[lo] = i;
      if (i > maxI[lo]) maxI[lo] = i;
      if (j < minJ[lo]) minJ[lo] = j;
      if (j > maxJ[lo]) maxJ[lo] = j;
    }
  }
  for (let k = count - 2; k >= 0; k--) {
    minI[k] = Math.min(minI[k], minI[k + 1]);
    maxI[k] = Math.max(maxI[k], maxI[k + 1]);
    minJ[k] = Math.min(minJ[k], minJ[k + 1]);
    maxJ[k] = Math.max(maxJ[k], maxJ[k + 1]);
  }
  const gen = d3Contours();
  const maxX = columns - 0.5;
  const maxY = rows - 0.5;
  return sorted.map((level, k) => {
    if (maxI[k] < 0) return { levelM: level, rings: [] };
    const i0 = Math.max(0, minI[k] - 1), i1 = Math.min(columns - 1, maxI[k] + 1);
    const j0 = Math.max(0, minJ[k] - 1), j1 = Math.min(rows - 1, maxJ[k] + 1);
    const width = i1 - i0 + 1, height = j1 - j0 + 1;
    const window = new Float64Array(width * height);
    for (let j = 0; j < height; j++) window.set(values.subarray((j0 + j) * columns + i0, (j0 + j) * columns + i0 + width), j * width);
    const mp = gen.size([width, height]).contour(window as unknown as number[], level);
    const rings: Ring[] = [];
    for (const polygon of mp.coordinates) {
      for (const ring of polygon) {
        // d3-contour places node i at i + 0.5 and pads the edge by half a cell; clamp back onto the grid.
        // The points are fresh arrays from d3-contour, so they are rewritten in place.
        for (const point of ring) {
          point[0] = grid.s0 + (Math.min(Math.max(point[0] + i0, 0.5), maxX) - 0.5) * grid.cellM;
          point[1] = grid.t0 + (Math.min(Math.max(point[1] + j0, 0.5), maxY) - 0.5) * grid.cellM;
        }
        rings.push(ring as Ring);
      }
    }
    return { levelM: mp.value, rings };
  });
}

/** Signed area of a ring (shoelace). */
export function ringArea(ring: [number, number][]): number {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  return a / 2;
}
