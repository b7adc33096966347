// Reading a value off a regular (s, t) grid at any point: the one sampler, with the rule for missing data (NaN nodes,
// points off the grid) stated by each caller. Pure and browser-safe.

/** A regular grid: node (column, row) sits at (s0 + column·cellM, t0 + row·cellM); values row-major. */
export interface GridSpec {
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
}

export interface SampleRule {
  /**
   * How the four nodes around the point are combined:
   * - "bilinear": bilinear weights over the cell;
   * - "mesh-triangles": linear on the two triangles of the cell split along its (column, row)–(column+1, row+1)
   *   diagonal, the way the 3D surface is drawn (so a readout shows what the mesh shows).
   */
  interpolation: "bilinear" | "mesh-triangles";
  /**
   * A node without data (NaN):
   * - "missing": makes the value missing (NaN) whenever its weight counts, so no value reaches past the data;
   * - "renormalise": is left out and the other corners' weights are renormalised; NaN only when every corner is missing
   *   (a value close to the data's edge still reads, e.g. a pick's residual against the surface).
   */
  missing: "missing" | "renormalise";
  /**
   * A point off the grid: "missing" gives NaN (for "mesh-triangles", within a 1e-6-cell tolerance); "clamp" reads the
   * nearest edge of the grid instead.
   */
  outside: "missing" | "clamp";
}

/** The engine's rule: exact bilinear interpolation of its gridded data, nothing reaching past it. */
export const STRICT_BILINEAR: SampleRule = { interpolation: "bilinear", missing: "missing", outside: "missing" };
/** Residuals and profiles at the data's edge: missing corners left out. */
export const EDGE_TOLERANT_BILINEAR: SampleRule = { interpolation: "bilinear", missing: "renormalise", outside: "missing" };
/** The drawn surface's value under the pointer. */
export const AS_DRAWN: SampleRule = { interpolation: "mesh-triangles", missing: "missing", outside: "missing" };

/** The value of `values` (row-major over `grid`) at (s, t) under `rule`. */
export function sampleGrid(grid: GridSpec, values: ArrayLike<number>, s: number, t: number, rule: SampleRule): number {
  if (rule.interpolation === "mesh-triangles") return onMeshTriangles(grid, values, s, t);
  if (rule.outside === "clamp") return clampedRenormalised(grid, values, s, t, rule.missing);
  return rule.missing === "missing" ? bilinear(grid, values, s, t) : bilinearRenormalised(grid, values, s, t);
}

/** Bilinear; NaN outside the grid or where a corner with weight is missing (NaN propagates through the sum). */
function bilinear(grid: GridSpec, field: ArrayLike<number>, s: number, t: number): number {
  const gx = (s - grid.s0) / grid.cellM;
  const gy = (t - grid.t0) / grid.cellM;
  if (gx < 0 || gy < 0 || gx > grid.columns - 1 || gy > grid.rows - 1) return NaN;
  const i = Math.min(Math.floor(gx), grid.columns - 2);
  const j = Math.min(Math.floor(gy), grid.rows - 2);
  if (i < 0 || j < 0) return field[Math.round(gy) * grid.columns + Math.round(gx)];
  const fx = gx - i,
    fy = gy - j;
  const c = grid.columns;
  return (
    field[j * c + i] * (1 - fx) * (1 - fy) +
    field[j * c + i + 1] * fx * (1 - fy) +
    field[(j + 1) * c + i] * (1 - fx) * fy +
    field[(j + 1) * c + i + 1] * fx * fy
  );
}

/** Bilinear over the corners that have data (weights renormalised); NaN outside the grid or when none do. */
function bilinearRenormalised(grid: GridSpec, values: ArrayLike<number>, s: number, t: number): number {
  const u = (s - grid.s0) / grid.cellM;
  const v = (t - grid.t0) / grid.cellM;
  if (!(u >= 0 && v >= 0 && u <= grid.columns - 1 && v <= grid.rows - 1)) return NaN;
  const column = Math.min(Math.floor(u), grid.columns - 2);
  const row = Math.min(Math.floor(v), grid.rows - 2);
  // a single row or column: nearest node
  if (column < 0 || row < 0) return values[Math.round(v) * grid.columns + Math.round(u)];
  const fu = u - column;
  const fv = v - row;
  let sum = 0;
  let weightSum = 0;
  const corners: [number, number, number][] = [
    [0, 0, (1 - fu) * (1 - fv)],
    [1, 0, fu * (1 - fv)],
    [0, 1, (1 - fu) * fv],
    [1, 1, fu * fv],
  ];
  for (const [dc, dr, weight] of corners) {
    const value = values[(row + dr) * grid.columns + column + dc];
    if (Number.isNaN(value) || weight === 0) continue;
    sum += value * weight;
    weightSum += weight;
  }
  return weightSum > 0 ? sum / weightSum : NaN;
}

/** The point moved onto the grid's nearest edge first; then bilinear under the missing-data rule. */
function clampedRenormalised(grid: GridSpec, field: ArrayLike<number>, s: number, t: number, missing: SampleRule["missing"]): number {
  const gx = Math.min(Math.max((s - grid.s0) / grid.cellM, 0), grid.columns - 1);
  const gy = Math.min(Math.max((t - grid.t0) / grid.cellM, 0), grid.rows - 1);
  const i = Math.min(Math.floor(gx), grid.columns - 2);
  const j = Math.min(Math.floor(gy), grid.rows - 2);
  const fx = gx - Math.max(i, 0),
    fy = gy - Math.max(j, 0);
  let sum = 0,
    weight = 0,
    lost = false;
  const add = (ii: number, jj: number, w: number) => {
    if (ii < 0 || jj < 0 || ii >= grid.columns || jj >= grid.rows || w === 0) return;
    const v = field[jj * grid.columns + ii];
    if (Number.isFinite(v)) {
      sum += w * v;
      weight += w;
    } else lost = true;
  };
  add(i, j, (1 - fx) * (1 - fy));
  add(i + 1, j, fx * (1 - fy));
  add(i, j + 1, (1 - fx) * fy);
  add(i + 1, j + 1, fx * fy);
  if (missing === "missing" && lost) return NaN;
  return weight > 0 ? sum / weight : NaN;
}

/** Linear on the cell's two triangles split along its (column, row)–(column+1, row+1) diagonal, as the mesh is drawn. */
function onMeshTriangles(grid: GridSpec, values: ArrayLike<number>, s: number, t: number): number {
  const u = (s - grid.s0) / grid.cellM;
  const v = (t - grid.t0) / grid.cellM;
  const column = Math.min(Math.max(Math.floor(u), 0), grid.columns - 2);
  const row = Math.min(Math.max(Math.floor(v), 0), grid.rows - 2);
  const fu = u - column;
  const fv = v - row;
  const tolerance = 1e-6;
  if (fu < -tolerance || fv < -tolerance || fu > 1 + tolerance || fv > 1 + tolerance) return NaN;
  const at = (dc: number, dr: number) => values[(row + dr) * grid.columns + column + dc];
  const [a, b, c, d] = [at(0, 0), at(1, 0), at(0, 1), at(1, 1)];
  // barycentric on triangle (a, b, d) when fu >= fv, else on (a, d, c)
  if (fu >= fv) return a + fu * (b - a) + fv * (d - b);
  return a + fv * (c - a) + fu * (d - c);
}
