import { contours as d3Contours } from "d3-contour";
import type { Ring } from "./types";
import type { GridSpec } from "@/lib/display/grid-sampler";

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
  const windows = levelWindows(grid, field, sorted);
  const gen = d3Contours();
  // the windows are nested, so the lowest level's is the largest: one buffer serves every level
  const buffer = windows.width[0] > 0 ? new Float64Array(windows.width[0] * windows.height[0]) : new Float64Array(0);
  return sorted.map((level, k) => {
    const width = windows.width[k],
      height = windows.height[k];
    if (width === 0) return { levelM: level, rings: [] };
    const i0 = windows.i0[k],
      j0 = windows.j0[k];
    const window = fillWindow(field, grid.columns, i0, j0, width, height, below, buffer);
    const mp = gen.size([width, height]).contour(window as unknown as number[], level);
    return { levelM: mp.value, rings: ringsOnGrid(mp.coordinates, grid, i0, j0) };
  });
}

interface LevelWindows {
  i0: Int32Array;
  j0: Int32Array;
  /** 0 when no node reaches the level */
  width: Int32Array;
  height: Int32Array;
}

/** For each level (ascending), the window of the nodes at or above it plus one node of margin, clipped to the grid. */
function levelWindows(grid: GridSpec, field: Float64Array, sorted: number[]): LevelWindows {
  const { columns, rows } = grid;
  const count = sorted.length;
  const minI = new Int32Array(count).fill(columns),
    maxI = new Int32Array(count).fill(-1);
  const minJ = new Int32Array(count).fill(rows),
    maxJ = new Int32Array(count).fill(-1);
  const lowest = sorted[0];
  for (let j = 0; j < rows; j++) {
    const rowStart = j * columns;
    for (let i = 0; i < columns; i++) {
      const v = field[rowStart + i];
      if (!(v >= lowest)) continue; // NaN included
      const k = highestLevelAtOrBelow(sorted, v);
      if (i < minI[k]) minI[k] = i;
      if (i > maxI[k]) maxI[k] = i;
      if (j < minJ[k]) minJ[k] = j;
      if (j > maxJ[k]) maxJ[k] = j;
    }
  }
  // nested: a node above one level is above every lower one
  for (let k = count - 2; k >= 0; k--) {
    minI[k] = Math.min(minI[k], minI[k + 1]);
    maxI[k] = Math.max(maxI[k], maxI[k + 1]);
    minJ[k] = Math.min(minJ[k], minJ[k + 1]);
    maxJ[k] = Math.max(maxJ[k], maxJ[k + 1]);
  }
  const out: LevelWindows = { i0: new Int32Array(count), j0: new Int32Array(count), width: new Int32Array(count), height: new Int32Array(count) };
  for (let k = 0; k < count; k++) {
    if (maxI[k] < 0) continue;
    const i0 = Math.max(0, minI[k] - 1),
      i1 = Math.min(columns - 1, maxI[k] + 1);
    const j0 = Math.max(0, minJ[k] - 1),
      j1 = Math.min(rows - 1, maxJ[k] + 1);
    out.i0[k] = i0;
    out.j0[k] = j0;
    out.width[k] = i1 - i0 + 1;
    out.height[k] = j1 - j0 + 1;
  }
  return out;
}

/** highest k with sorted[k] <= v, for v >= sorted[0] */
function highestLevelAtOrBelow(sorted: number[], v: number): number {
  let lo = 0,
    hi = sorted.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (sorted[mid] <= v) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** The window's nodes, row by row, at the start of `buffer`; NaN nodes become `below`. */
function fillWindow(
  field: Float64Array,
  columns: number,
  i0: number,
  j0: number,
  width: number,
  height: number,
  below: number,
  buffer: Float64Array,
): Float64Array {
  for (let j = 0, w = 0; j < height; j++) {
    const rowStart = (j0 + j) * columns + i0;
    for (let i = 0; i < width; i++, w++) {
      const v = field[rowStart + i];
      buffer[w] = v === v ? v : below;
    }
  }
  return buffer.subarray(0, width * height);
}

/**
 * d3-contour places node i at i + 0.5 and pads the edge by half a cell: shift by the window origin, clamp back
 * onto the grid and map to (s, t). The points are fresh arrays from d3-contour, so they are rewritten in place.
 */
function ringsOnGrid(coordinates: number[][][][], grid: GridSpec, i0: number, j0: number): Ring[] {
  const maxX = grid.columns - 0.5;
  const maxY = grid.rows - 0.5;
  const rings: Ring[] = [];
  for (const polygon of coordinates) {
    for (const ring of polygon) {
      for (const point of ring) {
        point[0] = grid.s0 + (Math.min(Math.max(point[0] + i0, 0.5), maxX) - 0.5) * grid.cellM;
        point[1] = grid.t0 + (Math.min(Math.max(point[1] + j0, 0.5), maxY) - 0.5) * grid.cellM;
      }
      rings.push(ring as unknown as Ring);
    }
  }
  return rings;
}

/** Signed area of a ring (shoelace). */
export function ringArea(ring: [number, number][]): number {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  return a / 2;
}
