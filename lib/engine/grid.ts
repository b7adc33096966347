import type { GridSpec } from "@/lib/display/grid-sampler";
import type { RegularGrid } from "./types";

export const DEFAULT_GRID_CELLS = 512;

/**
 * Grid covering the points; cell from point spacing (half the median Delaunay edge) unless given, capped to
 * gridCells per side. With `square`, exactly gridCells × gridCells nodes of square cells spanning the longer side
 * of the data, centred on the shorter one (a fixed-size grid, as for benchmarks).
 */
export function gridSpecFor(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  spacingM: number,
  options: { cellM?: number; gridCells?: number; square?: boolean } = {},
): GridSpec {
  let minS = Infinity,
    maxS = -Infinity,
    minT = Infinity,
    maxT = -Infinity;
  for (let i = 0; i < s.length; i++) {
    if (s[i] < minS) minS = s[i];
    if (s[i] > maxS) maxS = s[i];
    if (t[i] < minT) minT = t[i];
    if (t[i] > maxT) maxT = t[i];
  }
  const cap = Math.max(2, options.gridCells ?? DEFAULT_GRID_CELLS);
  const extent = Math.max(maxS - minS, maxT - minT);
  if (options.square) {
    const cell = extent / (cap - 1) || 1;
    const span = (cap - 1) * cell;
    return { s0: (minS + maxS - span) / 2, t0: (minT + maxT - span) / 2, cellM: cell, columns: cap, rows: cap };
  }
  let cellM = options.cellM && options.cellM > 0 ? options.cellM : roundSignificant(spacingM / 2, 3);
  if (!(cellM > 0)) cellM = extent / (cap - 1) || 1;
  if (extent / cellM > cap - 1) cellM = extent / (cap - 1);
  return {
    s0: minS,
    t0: minT,
    cellM,
    columns: Math.floor((maxS - minS) / cellM + 1e-9) + 1,
    rows: Math.floor((maxT - minT) / cellM + 1e-9) + 1,
  };
}

function roundSignificant(v: number, digits: number): number {
  if (!(v > 0)) return v;
  const p = 10 ** (Math.floor(Math.log10(v)) - digits + 1);
  return Math.round(v / p) * p;
}

/**
 * Values onto the nodes of a regular grid, rasterised triangle by triangle: each triangle visits only the grid nodes
 * inside its bounding box, so the cost is O(triangles + nodes). NaN outside the triangles. By default `values` hold one
 * value per vertex, interpolated linearly on each triangle; with `perTriangle`, one value per triangle (row k of
 * `triangles`), written as it is onto the triangle's nodes (the stress screen's per-element results).
 */
export function rasterizeTriangles(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  values: ArrayLike<number>[],
  triangles: ArrayLike<number>,
  spec: GridSpec,
  perTriangle = false,
): Float64Array[] {
  const { s0, t0, cellM, columns, rows } = spec;
  const outs = values.map(() => new Float64Array(columns * rows).fill(NaN));
  const eps = 1e-10;
  // per-vertex record [s, t, value…] in one interleaved array, so each triangle corner is one cache line
  const nv = perTriangle ? 0 : values.length;
  const stride = 2 + nv;
  const vertex = new Float64Array(s.length * stride);
  for (let i = 0, o = 0; i < s.length; i++, o += stride) {
    vertex[o] = s[i];
    vertex[o + 1] = t[i];
    for (let v = 0; v < nv; v++) vertex[o + 2 + v] = values[v][i];
  }
  for (let k = 0; k < triangles.length; k += 3) {
    const a = triangles[k] * stride,
      b = triangles[k + 1] * stride,
      c = triangles[k + 2] * stride;
    const ax = (vertex[a] - s0) / cellM,
      ay = (vertex[a + 1] - t0) / cellM;
    const bx = (vertex[b] - s0) / cellM,
      by = (vertex[b + 1] - t0) / cellM;
    const cx = (vertex[c] - s0) / cellM,
      cy = (vertex[c + 1] - t0) / cellM;
    const det = (by - cy) * (ax - cx) + (cx - bx) * (ay - cy);
    if (det === 0) continue;
    const i0 = Math.max(0, Math.ceil(Math.min(ax, bx, cx) - eps));
    const i1 = Math.min(columns - 1, Math.floor(Math.max(ax, bx, cx) + eps));
    const j0 = Math.max(0, Math.ceil(Math.min(ay, by, cy) - eps));
    const j1 = Math.min(rows - 1, Math.floor(Math.max(ay, by, cy) + eps));
    if (i0 > i1 || j0 > j1) continue;
    const inv = 1 / det;
    for (let j = j0; j <= j1; j++) {
      for (let i = i0; i <= i1; i++) {
        const l0 = ((by - cy) * (i - cx) + (cx - bx) * (j - cy)) * inv;
        const l1 = ((cy - ay) * (i - cx) + (ax - cx) * (j - cy)) * inv;
        const l2 = 1 - l0 - l1;
        if (l0 < -eps || l1 < -eps || l2 < -eps) continue;
        const node = j * columns + i;
        if (perTriangle) for (let v = 0; v < values.length; v++) outs[v][node] = values[v][k / 3];
        else for (let v = 0; v < nv; v++) outs[v][node] = l0 * vertex[a + 2 + v] + l1 * vertex[b + 2 + v] + l2 * vertex[c + 2 + v];
      }
    }
  }
  return outs;
}

/** Displacement and throw on the grid, and the off-plane distance w when given (one rasterisation for all). */
export function buildGrid(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  displacementM: ArrayLike<number>,
  throwM: ArrayLike<number>,
  triangles: Uint32Array,
  spec: GridSpec,
  offPlaneM?: ArrayLike<number>,
): RegularGrid {
  const [d, th, w] = rasterizeTriangles(s, t, offPlaneM ? [displacementM, throwM, offPlaneM] : [displacementM, throwM], triangles, spec);
  return w ? { ...spec, displacementM: d, throwM: th, offPlaneM: w } : { ...spec, displacementM: d, throwM: th };
}
