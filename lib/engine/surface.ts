// The fault surface itself, not only its reference plane: each pick's off-plane distance w = (p − c)·n, interpolated
// on the same Delaunay triangles and regular (s, t) grid as displacement, smoothed at a stated length scale, and the
// local orientation (normal, strike, dip) of the smoothed surface. Pure; flat typed arrays with NaN for "no data".
import type { PlaneFrame } from "@/lib/display/frame";
import type { GridSpec } from "@/lib/display/grid-sampler";
import { rasterizeTriangles } from "./grid";

/** w on the grid nodes: linear on the triangles, NaN outside them (the same rasterisation as displacement). */
export function offPlaneGrid(s: ArrayLike<number>, t: ArrayLike<number>, offPlaneM: ArrayLike<number>, triangles: Uint32Array, spec: GridSpec): Float64Array {
  return rasterizeTriangles(s, t, [offPlaneM], triangles, spec)[0];
}

/** Gaussian kernel samples exp(−(i·cell)²/(2σ²)) · (i·cell)^power for i = −radius…radius, radius = ⌈3σ/cell⌉. */
function kernel(cellM: number, lengthM: number, power: 0 | 1 | 2, squared = false): Float64Array {
  const radius = Math.max(1, Math.ceil((3 * lengthM) / cellM));
  const out = new Float64Array(2 * radius + 1);
  const variance = squared ? (lengthM * lengthM) / 2 : lengthM * lengthM;
  for (let i = -radius; i <= radius; i++) {
    const d = i * cellM;
    out[i + radius] = Math.exp((-d * d) / (2 * variance)) * (power === 0 ? 1 : power === 1 ? d : d * d);
  }
  return out;
}

/** out(i, j) = Σ_k kernel(k) · field(i + k, j) (along rows, axis "s") or field(i, j + k) (along columns, axis "t"); zero beyond the grid. */
function correlate(field: Float64Array, spec: GridSpec, weights: Float64Array, axis: "s" | "t"): Float64Array {
  const { columns, rows } = spec;
  const radius = (weights.length - 1) / 2;
  const out = new Float64Array(columns * rows);
  if (axis === "s") {
    for (let j = 0; j < rows; j++) {
      const row = j * columns;
      for (let i = 0; i < columns; i++) {
        const lo = Math.max(-radius, -i);
        const hi = Math.min(radius, columns - 1 - i);
        let sum = 0;
        for (let k = lo; k <= hi; k++) sum += weights[k + radius] * field[row + i + k];
        out[row + i] = sum;
      }
    }
  } else {
    // whole rows at a time, so the inner loop walks memory in order
    for (let j = 0; j < rows; j++) {
      const lo = Math.max(-radius, -j);
      const hi = Math.min(radius, rows - 1 - j);
      const row = j * columns;
      for (let k = lo; k <= hi; k++) {
        const weight = weights[k + radius];
        const source = (j + k) * columns;
        for (let i = 0; i < columns; i++) out[row + i] += weight * field[source + i];
      }
    }
  }
  return out;
}

/** The field with NaN as 0, and its mask (1 where finite). */
function maskOf(field: ArrayLike<number>): { values: Float64Array; mask: Float64Array } {
  const values = new Float64Array(field.length);
  const mask = new Float64Array(field.length);
  for (let k = 0; k < field.length; k++) {
    if (Number.isFinite(field[k])) {
      values[k] = field[k];
      mask[k] = 1;
    }
  }
  return { values, mask };
}

/**
 * NaN-aware Gaussian smoothing (normalised convolution: Σ g·m·f / Σ g·m with m = 1 where f is finite; Knutsson &
 * Westin 1993) at standard deviation `lengthM`. Nodes that were NaN stay NaN, so the data outline is kept.
 */
export function smoothGrid(field: ArrayLike<number>, spec: GridSpec, lengthM: number): Float64Array {
  const { values, mask } = maskOf(field);
  const g = kernel(spec.cellM, lengthM, 0);
  const num = correlate(correlate(values, spec, g, "s"), spec, g, "t");
  const den = correlate(correlate(mask, spec, g, "s"), spec, g, "t");
  const out = new Float64Array(values.length);
  for (let k = 0; k < out.length; k++) out[k] = mask[k] && den[k] > 0 ? num[k] / den[k] : NaN;
  return out;
}

export interface LocalSurfaceFit {
  /** smoothed w (m) at each node */
  offPlaneM: Float64Array;
  /** ∂w/∂s and ∂w/∂t of the local fit at the node (dimensionless) */
  gradientS: Float64Array;
  gradientT: Float64Array;
  /** share of the full kernel's weight that falls on nodes with data (1 inside, about ½ on an edge, ¼ at a corner) */
  support: Float64Array;
}

/** Gaussian kernel samples exp(−d²/(2σ²)) · (d/σ)^power, d = i·cell, i = −radius…radius (radius = ⌈3σ/cell⌉). */
function scaledKernel(cellM: number, lengthM: number, power: number): Float64Array {
  const radius = Math.max(1, Math.ceil((3 * lengthM) / cellM));
  const out = new Float64Array(2 * radius + 1);
  for (let i = -radius; i <= radius; i++) {
    const u = (i * cellM) / lengthM;
    out[i + radius] = Math.exp((-u * u) / 2) * u ** power;
  }
  return out;
}

/** Solves the symmetric system a·x = b (n × n, row-major, destroyed) by Gaussian elimination with partial pivoting; false when singular. */
function solveInPlace(a: Float64Array, b: Float64Array, n: number): boolean {
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r * n + col]) > Math.abs(a[pivot * n + col])) pivot = r;
    if (!(Math.abs(a[pivot * n + col]) > 1e-12)) return false;
    if (pivot !== col) {
      for (let c = 0; c < n; c++) {
        const tmp = a[col * n + c];
        a[col * n + c] = a[pivot * n + c];
        a[pivot * n + c] = tmp;
      }
      const tmp = b[col];
      b[col] = b[pivot];
      b[pivot] = tmp;
    }
    for (let r = col + 1; r < n; r++) {
      const f = a[r * n + col] / a[col * n + col];
      if (f === 0) continue;
      for (let c = col; c < n; c++) a[r * n + c] -= f * a[col * n + c];
      b[r] -= f * b[col];
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let sum = b[r];
    for (let c = r + 1; c < n; c++) sum -= a[r * n + c] * b[c];
    b[r] = sum / a[r * n + r];
  }
  return true;
}

/**
 * Locally weighted polynomial regression of w on (s, t) with Gaussian weights of standard deviation `lengthM`
 * (Cleveland & Devlin 1988): at every node the polynomial of the given degree in (Δs, Δt) that best fits the finite
 * nodes around it; its constant term is the smoothed w and its linear terms the slopes. Degree 2 is the usual choice
 * for slopes (a degree one above the derivative wanted: Fan & Gijbels 1996): unlike plain smoothing or a local plane
 * its slope has no bias from curvature where the window is one-sided, on the edges of the data. Degree 1 (a local
 * plane) is steadier there when the surface is flat. Values are given wherever the window holds enough data to fix the
 * polynomial — also at NaN nodes next to the data, so values can be read up to the outline; `support` tells how much
 * data the window held.
 */
export function localPolynomialFit(field: ArrayLike<number>, spec: GridSpec, lengthM: number, degree: 1 | 2 = 1): LocalSurfaceFit {
  const { values, mask } = maskOf(field);
  // monomials Δs^a·Δt^b (in units of L) of the fitted polynomial
  const terms: [number, number][] =
    degree === 1
      ? [
          [0, 0],
          [1, 0],
          [0, 1],
        ]
      : [
          [0, 0],
          [1, 0],
          [0, 1],
          [2, 0],
          [1, 1],
          [0, 2],
        ];
  const maxPower = 2 * degree;
  const kernels = Array.from({ length: maxPower + 1 }, (_, p) => scaledKernel(spec.cellM, lengthM, p));
  // moments Σ K·m·Δs^a·Δt^b for a + b ≤ 2·degree, and Σ K·w·Δs^a·Δt^b for a + b ≤ degree: separable, s first
  const moments = new Map<string, Float64Array>();
  for (let a = 0; a <= maxPower; a++) {
    const along = correlate(mask, spec, kernels[a], "s");
    for (let b = 0; a + b <= maxPower; b++) moments.set(`${a},${b}`, correlate(along, spec, kernels[b], "t"));
  }
  const data = new Map<string, Float64Array>();
  for (let a = 0; a <= degree; a++) {
    const along = correlate(values, spec, kernels[a], "s");
    for (let b = 0; a + b <= degree; b++) data.set(`${a},${b}`, correlate(along, spec, kernels[b], "t"));
  }
  const size = terms.length;
  const normal = terms.flatMap(([a1, b1]) => terms.map(([a2, b2]) => moments.get(`${a1 + a2},${b1 + b2}`)!));
  const rightHandSide = terms.map(([a, b]) => data.get(`${a},${b}`)!);
  const M00 = moments.get("0,0")!;
  let fullKernel = 0;
  for (const a of kernels[0]) for (const b of kernels[0]) fullKernel += a * b;
  const n = values.length;
  const offPlaneM = new Float64Array(n).fill(NaN);
  const gradientS = new Float64Array(n).fill(NaN);
  const gradientT = new Float64Array(n).fill(NaN);
  const support = new Float64Array(n);
  const matrix = new Float64Array(size * size);
  const vector = new Float64Array(size);
  // the window's data must spread at least 0.2 L in every direction to fix a slope (common practice, no source)
  const minSpread = 0.2 ** 2;
  for (let k = 0; k < n; k++) {
    const w = M00[k];
    support[k] = w / fullKernel;
    if (!(w > 1e-9 * fullKernel)) continue;
    const ms = moments.get("1,0")![k] / w,
      mt = moments.get("0,1")![k] / w;
    const css = moments.get("2,0")![k] / w - ms * ms,
      ctt = moments.get("0,2")![k] / w - mt * mt,
      cst = moments.get("1,1")![k] / w - ms * mt;
    const lambdaMin = (css + ctt) / 2 - Math.sqrt(((css - ctt) / 2) ** 2 + cst * cst);
    if (!(lambdaMin > minSpread)) continue;
    for (let e = 0; e < size * size; e++) matrix[e] = normal[e][k] / w;
    for (let e = 0; e < size; e++) vector[e] = rightHandSide[e][k] / w;
    if (!solveInPlace(matrix, vector, size)) continue;
    offPlaneM[k] = vector[0];
    gradientS[k] = vector[1] / lengthM;
    gradientT[k] = vector[2] / lengthM;
  }
  return { offPlaneM, gradientS, gradientT, support };
}

/**
 * Local spread of the surface's orientation at the smoothing scale: the RMS difference (as an angle, degrees) between
 * the node-to-node slopes of the unsmoothed w grid and the fitted slopes, Gaussian-weighted like the fit.
 */
export function slopeScatterDeg(field: ArrayLike<number>, fit: LocalSurfaceFit, spec: GridSpec, lengthM: number): Float64Array {
  const { columns, rows, cellM } = spec;
  const n = columns * rows;
  const rawS = new Float64Array(n).fill(NaN);
  const rawT = new Float64Array(n).fill(NaN);
  const slope = (a: number, b: number, d: number) => (Number.isFinite(a) && Number.isFinite(b) ? (b - a) / (d * cellM) : NaN);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const k = j * columns + i;
      if (!Number.isFinite(field[k])) continue;
      // central difference where both neighbours have data, else one-sided
      const left = i > 0 ? field[k - 1] : NaN,
        right = i < columns - 1 ? field[k + 1] : NaN;
      const up = j > 0 ? field[k - columns] : NaN,
        down = j < rows - 1 ? field[k + columns] : NaN;
      rawS[k] =
        Number.isFinite(left) && Number.isFinite(right) ? slope(left, right, 2) : Number.isFinite(right) ? slope(field[k], right, 1) : slope(left, field[k], 1);
      rawT[k] = Number.isFinite(up) && Number.isFinite(down) ? slope(up, down, 2) : Number.isFinite(down) ? slope(field[k], down, 1) : slope(up, field[k], 1);
    }
  }
  const g0 = kernel(cellM, lengthM, 0);
  const smooth = (values: Float64Array) => correlate(correlate(values, spec, g0, "s"), spec, g0, "t");
  // a node counts where both of its slopes are known
  const mask = new Float64Array(n);
  const slopeS = new Float64Array(n);
  const slopeT = new Float64Array(n);
  const squares = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(rawS[k]) || !Number.isFinite(rawT[k])) continue;
    mask[k] = 1;
    slopeS[k] = rawS[k];
    slopeT[k] = rawT[k];
    squares[k] = rawS[k] ** 2 + rawT[k] ** 2;
  }
  const weight = smooth(mask);
  const meanS = smooth(slopeS);
  const meanT = smooth(slopeT);
  const meanSquare = smooth(squares);
  const out = new Float64Array(n).fill(NaN);
  for (let k = 0; k < n; k++) {
    const w = weight[k];
    const bs = fit.gradientS[k],
      bt = fit.gradientT[k];
    if (!(w > 0) || !Number.isFinite(bs)) continue;
    // E|g − b|² = E|g|² − 2 b·E[g] + |b|²
    const variance = Math.max(0, meanSquare[k] / w - (2 * (bs * meanS[k] + bt * meanT[k])) / w + bs * bs + bt * bt);
    out[k] = (Math.atan(Math.sqrt(variance)) * 180) / Math.PI;
  }
  return out;
}

/**
 * Effective number of picks in each node's window, (Σ K·c)² / Σ K²·c with c the picks per node (Kish's effective
 * sample size for weighted data, Kish 1965): how many picks the fitted orientation really rests on.
 */
export function effectivePickCount(s: ArrayLike<number>, t: ArrayLike<number>, spec: GridSpec, lengthM: number): Float64Array {
  const { s0, t0, cellM, columns, rows } = spec;
  const counts = new Float64Array(columns * rows);
  for (let p = 0; p < s.length; p++) {
    const i = Math.round((s[p] - s0) / cellM);
    const j = Math.round((t[p] - t0) / cellM);
    if (i >= 0 && i < columns && j >= 0 && j < rows) counts[j * columns + i]++;
  }
  const g = kernel(cellM, lengthM, 0);
  const gSquared = kernel(cellM, lengthM, 0, true);
  const sum = correlate(correlate(counts, spec, g, "s"), spec, g, "t");
  const sumSquared = correlate(correlate(counts, spec, gSquared, "s"), spec, gSquared, "t");
  const out = new Float64Array(counts.length);
  for (let k = 0; k < out.length; k++) out[k] = sumSquared[k] > 0 ? (sum[k] * sum[k]) / sumSquared[k] : 0;
  return out;
}

/**
 * Unit normal (East, North, Up; pointing to the side of the reference plane's normal) of the surface
 * P = c + s·ŝ + t·d̂ + w(s, t)·n̂ where w has slopes (∂w/∂s, ∂w/∂t): the gradient of (P − c)·n̂ − w is n̂ − w_s·ŝ − w_t·d̂.
 */
export function surfaceNormal(gradientS: number, gradientT: number, frame: Omit<PlaneFrame, "centroid">): [number, number, number] {
  const [sx, sy, sz] = [frame.strikeVector[0], frame.strikeVector[1], frame.strikeVector[2]];
  const [dx, dy, dz] = [frame.dipVector[0], frame.dipVector[1], frame.dipVector[2]];
  const [nx, ny, nz] = [frame.normal[0], frame.normal[1], frame.normal[2]];
  const x = nx - gradientS * sx - gradientT * dx;
  const y = ny - gradientS * sy - gradientT * dy;
  const z = nz - gradientS * sz - gradientT * dz;
  const length = Math.hypot(x, y, z);
  return [x / length, y / length, z / length];
}

/** Strike (right-hand rule), dip and dip direction in degrees of a plane with the given normal. */
export function orientationOfNormal(normal: readonly number[]): { strikeDeg: number; dipDeg: number; dipDirectionDeg: number } {
  const sign = normal[2] < 0 ? -1 : 1;
  const [x, y, z] = [sign * normal[0], sign * normal[1], sign * normal[2]];
  const dipDeg = (Math.acos(Math.min(1, z / Math.hypot(x, y, z))) * 180) / Math.PI;
  const dipDirectionDeg = Math.hypot(x, y) > 1e-12 ? ((((Math.atan2(x, y) * 180) / Math.PI) % 360) + 360) % 360 : 90;
  return { strikeDeg: (dipDirectionDeg + 270) % 360, dipDeg, dipDirectionDeg };
}
