// The true fault surface of a segment: P(s, t) = c + s·ŝ + t·d̂ + w(s, t)·n̂ over its reference plane, with w the picks'
// distance from the plane, interpolated on their Delaunay triangles and smoothed by a local quadratic fit
// (lib/engine/surface.ts) at a length scale set by the pick spacing. From it: the local dip that turns throw into
// displacement, positions on the surface, and lengths measured along it (arc length). Beyond the data the surface is
// continued along the tangent plane of the data's edge, so tip lines inferred past the picks have a place on it.
// Pure; flat typed arrays with NaN for "no data".
import type { GridSpec } from "@/lib/display/grid-sampler";
import { rasterizeTriangles } from "./grid";
import { localPolynomialFit, orientationOfNormal, surfaceNormal } from "./surface";
import type { PlaneFit, SurfaceOffsetGrid } from "./types";

type Frame = Pick<PlaneFit, "centroid" | "strikeVector" | "dipVector" | "normal">;

/** Nodes per side of the surface grid at most (the surface is smooth at its length scale; a few per length suffice). */
const MAX_SURFACE_NODES = 256;
/** Nodes per side of the coarse copy kept in the report. */
const MAX_REPORT_NODES = 96;

export interface SurfaceModel {
  spec: GridSpec;
  /** standard deviation of the Gaussian weights of the local fit (m) */
  lengthScaleM: number;
  /** smoothed w (m), and its slopes ∂w/∂s, ∂w/∂t, at every node: fitted within the data, continued beyond it */
  offPlaneM: Float64Array;
  gradientS: Float64Array;
  gradientT: Float64Array;
  /** 1 where the local fit had the data to fix the surface, 0 where it is continued from the nearest such node */
  fitted: Uint8Array;
  /**
   * Arc length along each row (strike line) from its first node, and along each column (dip line) from its first node
   * (trapezoid rule on √(1 + slope²) at the nodes), so lengths along the surface cost one lookup each.
   */
  arcS: Float64Array;
  arcT: Float64Array;
}

export interface SurfaceSample {
  offPlaneM: number;
  gradientS: number;
  gradientT: number;
}

/**
 * The smoothing length: four median pick spacings, so each local fit rests on some fifty picks and the pick scatter
 * averages out, while bends longer than a few spacings are kept (common practice, no source). Never below two cells of
 * the surface grid.
 */
export function surfaceLengthScaleM(medianEdgeM: number, cellM: number): number {
  const spacing = Number.isFinite(medianEdgeM) && medianEdgeM > 0 ? medianEdgeM : cellM;
  return Math.max(4 * spacing, 2 * cellM);
}

/**
 * Builds the surface of one segment from its picks' plane coordinates and off-plane distances, on the triangles of the
 * analysis. The grid spans the data plus three length scales each side; nodes the fit cannot fix take the tangent plane
 * of the nearest node it fixed.
 */
export function buildSurfaceModel(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  offPlaneM: ArrayLike<number>,
  triangles: Uint32Array,
  medianEdgeM: number,
): SurfaceModel {
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
  const extent = Math.max(maxS - minS, maxT - minT, 1e-6);
  // the cell: a quarter of the length scale, coarser where the fault is large for its pick spacing
  const spacing = Number.isFinite(medianEdgeM) && medianEdgeM > 0 ? medianEdgeM : extent / 100;
  let cellM = spacing;
  let lengthScaleM = surfaceLengthScaleM(spacing, cellM);
  for (let k = 0; k < 8; k++) {
    const pad = 3 * lengthScaleM;
    if ((extent + 2 * pad) / cellM <= MAX_SURFACE_NODES - 1) break;
    cellM = (extent + 2 * pad) / (MAX_SURFACE_NODES - 1);
    lengthScaleM = surfaceLengthScaleM(spacing, cellM);
  }
  const pad = 3 * lengthScaleM;
  const spec: GridSpec = {
    s0: minS - pad,
    t0: minT - pad,
    cellM,
    columns: Math.min(MAX_SURFACE_NODES, Math.ceil((maxS - minS + 2 * pad) / cellM) + 1),
    rows: Math.min(MAX_SURFACE_NODES, Math.ceil((maxT - minT + 2 * pad) / cellM) + 1),
  };
  if (![spec.s0, spec.t0, spec.cellM, spec.columns, spec.rows, lengthScaleM].every(Number.isFinite) || spec.columns < 2 || spec.rows < 2)
    return flatModel(minS, minT);
  const [raw] = rasterizeTriangles(s, t, [offPlaneM], triangles, spec);
  const fit = localPolynomialFit(raw, spec, lengthScaleM, 2);
  const n = spec.columns * spec.rows;
  const fitted = new Uint8Array(n);
  // trusted: nodes with data, and nodes next to it whose window still holds a third of a full window's data
  for (let k = 0; k < n; k++) fitted[k] = Number.isFinite(fit.offPlaneM[k]) && (Number.isFinite(raw[k]) || fit.support[k] >= 0.33) ? 1 : 0;
  const model: SurfaceModel = {
    spec,
    lengthScaleM,
    offPlaneM: fit.offPlaneM,
    gradientS: fit.gradientS,
    gradientT: fit.gradientT,
    fitted,
    arcS: new Float64Array(n),
    arcT: new Float64Array(n),
  };
  continueBeyondData(model);
  fillArcLengths(model);
  return model;
}

function fillArcLengths(model: SurfaceModel) {
  const { columns, rows, cellM } = model.spec;
  const { gradientS, gradientT, arcS, arcT } = model;
  for (let j = 0; j < rows; j++) {
    const row = j * columns;
    arcS[row] = 0;
    for (let i = 1; i < columns; i++) {
      const a = gradientS[row + i - 1],
        b = gradientS[row + i];
      arcS[row + i] = arcS[row + i - 1] + (cellM * (Math.sqrt(1 + a * a) + Math.sqrt(1 + b * b))) / 2;
    }
  }
  for (let i = 0; i < columns; i++) arcT[i] = 0;
  for (let j = 1; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const a = gradientT[(j - 1) * columns + i],
        b = gradientT[j * columns + i];
      arcT[j * columns + i] = arcT[(j - 1) * columns + i] + (cellM * (Math.sqrt(1 + a * a) + Math.sqrt(1 + b * b))) / 2;
    }
  }
}

/** The reference plane itself, for coordinates too extreme to grid (w = 0 everywhere). */
function flatModel(s0: number, t0: number): SurfaceModel {
  const spec: GridSpec = { s0: Number.isFinite(s0) ? s0 : 0, t0: Number.isFinite(t0) ? t0 : 0, cellM: 1, columns: 2, rows: 2 };
  return {
    spec,
    lengthScaleM: NaN,
    offPlaneM: new Float64Array(4),
    gradientS: new Float64Array(4),
    gradientT: new Float64Array(4),
    fitted: new Uint8Array(4),
    arcS: Float64Array.of(0, 1, 0, 1),
    arcT: Float64Array.of(0, 0, 1, 1),
  };
}

/**
 * Every node the fit did not fix takes the tangent plane of the nearest fixed node (nearest by a breadth-first walk over
 * the 8 neighbours): w = w₀ + ∂w/∂s·Δs + ∂w/∂t·Δt, with that node's slopes.
 */
function continueBeyondData(model: SurfaceModel) {
  const { spec, offPlaneM, gradientS, gradientT, fitted } = model;
  const { columns, rows, cellM } = spec;
  const n = columns * rows;
  const source = new Int32Array(n).fill(-1);
  const queue = new Int32Array(n);
  let head = 0,
    tail = 0;
  for (let k = 0; k < n; k++) {
    if (fitted[k]) {
      source[k] = k;
      queue[tail++] = k;
    }
  }
  if (tail === 0) {
    // nothing to continue from: the reference plane itself
    offPlaneM.fill(0);
    gradientS.fill(0);
    gradientT.fill(0);
    return;
  }
  while (head < tail) {
    const k = queue[head++];
    const i = k % columns,
      j = (k / columns) | 0;
    const from = source[k];
    const fi = from % columns,
      fj = (from / columns) | 0;
    for (let dj = -1; dj <= 1; dj++) {
      for (let di = -1; di <= 1; di++) {
        const ni = i + di,
          nj = j + dj;
        if (ni < 0 || nj < 0 || ni >= columns || nj >= rows) continue;
        const m = nj * columns + ni;
        if (source[m] >= 0) continue;
        source[m] = from;
        queue[tail++] = m;
        offPlaneM[m] = offPlaneM[from] + gradientS[from] * (ni - fi) * cellM + gradientT[from] * (nj - fj) * cellM;
        gradientS[m] = gradientS[from];
        gradientT[m] = gradientT[from];
      }
    }
  }
}

/** Bilinear sample of a complete (NaN-free) node field of `spec` at fractional node (gx, gy) inside the grid. */
function bilinear(spec: GridSpec, field: ArrayLike<number>, gx: number, gy: number): number {
  const columns = spec.columns,
    rows = spec.rows;
  let i = Math.floor(gx),
    j = Math.floor(gy);
  if (i > columns - 2) i = columns - 2;
  if (j > rows - 2) j = rows - 2;
  if (i < 0) i = 0;
  if (j < 0) j = 0;
  const fx = gx - i,
    fy = gy - j;
  const k = j * columns + i;
  const top = field[k] + fx * (field[k + 1] - field[k]);
  const bottom = field[k + columns] + fx * (field[k + columns + 1] - field[k + columns]);
  return top + fy * (bottom - top);
}

/** w and its slopes at (s, t): bilinear inside the grid; beyond it, the tangent plane at the nearest point of the grid. */
export function sampleSurface(model: SurfaceModel, s: number, t: number): SurfaceSample {
  const { spec } = model;
  const maxS = spec.s0 + (spec.columns - 1) * spec.cellM;
  const maxT = spec.t0 + (spec.rows - 1) * spec.cellM;
  const cs = Math.min(Math.max(s, spec.s0), maxS);
  const ct = Math.min(Math.max(t, spec.t0), maxT);
  const gx = (cs - spec.s0) / spec.cellM,
    gy = (ct - spec.t0) / spec.cellM;
  const gradientS = bilinear(spec, model.gradientS, gx, gy);
  const gradientT = bilinear(spec, model.gradientT, gx, gy);
  const w = bilinear(spec, model.offPlaneM, gx, gy);
  return { offPlaneM: w + gradientS * (s - cs) + gradientT * (t - ct), gradientS, gradientT };
}

/** Local orientation of the surface at (s, t): strike (right-hand rule), dip and dip direction, degrees. */
export function localOrientation(model: SurfaceModel, frame: Frame, s: number, t: number): { strikeDeg: number; dipDeg: number; dipDirectionDeg: number } {
  const { gradientS, gradientT } = sampleSurface(model, s, t);
  return orientationOfNormal(surfaceNormal(gradientS, gradientT, frame));
}

/** Dip (degrees) of the surface whose slopes over the frame's plane are (∂w/∂s, ∂w/∂t). */
function dipOfSlopes(gradientS: number, gradientT: number, frame: Frame): number {
  return orientationOfNormal(surfaceNormal(gradientS, gradientT, frame)).dipDeg;
}

/** Local dip (degrees) at each point. */
export function localDipColumn(model: SurfaceModel, frame: Frame, s: ArrayLike<number>, t: ArrayLike<number>): Float64Array {
  const out = new Float64Array(s.length);
  const { spec } = model;
  const maxGx = spec.columns - 1,
    maxGy = spec.rows - 1;
  for (let i = 0; i < s.length; i++) {
    const gx = Math.min(Math.max((s[i] - spec.s0) / spec.cellM, 0), maxGx);
    const gy = Math.min(Math.max((t[i] - spec.t0) / spec.cellM, 0), maxGy);
    out[i] = dipOfSlopes(bilinear(spec, model.gradientS, gx, gy), bilinear(spec, model.gradientT, gx, gy), frame);
  }
  return out;
}

/** World position (x East, y North, z Up) of the surface point over (s, t) of the reference plane. */
export function surfacePoint(model: SurfaceModel, frame: Frame, s: number, t: number): [number, number, number] {
  return pointOver(frame, s, t, sampleSurface(model, s, t).offPlaneM);
}

/** c + s·ŝ + t·d̂ + w·n̂ */
export function pointOver(frame: Frame, s: number, t: number, w: number): [number, number, number] {
  const [cx, cy, cz] = frame.centroid;
  const [sx, sy, sz] = frame.strikeVector;
  const [dx, dy, dz] = frame.dipVector;
  const [nx, ny, nz] = frame.normal;
  return [cx + s * sx + t * dx + w * nx, cy + s * sy + t * dy + w * ny, cz + s * sz + t * dz + w * nz];
}

/**
 * Arc length of the strike line at t from the grid's first column to s, and of the dip line at s from the grid's first
 * row to t: from the node tables, linear between nodes and rows; beyond the grid, the continued tangent plane's slope.
 */
function cumulativeArc(model: SurfaceModel, s: number, t: number): { alongS: number; alongT: number } {
  const { spec, arcS, arcT } = model;
  const maxS = spec.s0 + (spec.columns - 1) * spec.cellM;
  const maxT = spec.t0 + (spec.rows - 1) * spec.cellM;
  const cs = Math.min(Math.max(s, spec.s0), maxS);
  const ct = Math.min(Math.max(t, spec.t0), maxT);
  const gx = (cs - spec.s0) / spec.cellM,
    gy = (ct - spec.t0) / spec.cellM;
  let alongS = bilinear(spec, arcS, gx, gy);
  let alongT = bilinear(spec, arcT, gx, gy);
  if (s !== cs) {
    const g = bilinear(spec, model.gradientS, gx, gy);
    alongS += (s - cs) * Math.sqrt(1 + g * g);
  }
  if (t !== ct) {
    const g = bilinear(spec, model.gradientT, gx, gy);
    alongT += (t - ct) * Math.sqrt(1 + g * g);
  }
  return { alongS, alongT };
}

/**
 * Coordinates measured along the surface from (s₀, t₀): u is the arc length of the surface's strike line through the
 * point (t held) from s₀ to s, v that of its dip line (s held) from t₀ to t: u = ∫ √(1 + (∂w/∂s)²) ds,
 * v = ∫ √(1 + (∂w/∂t)²) dt. Signed like s − s₀ and t − t₀.
 */
export function alongSurface(model: SurfaceModel, s0: number, t0: number, s: number, t: number): { u: number; v: number } {
  const here = cumulativeArc(model, s, t);
  return { u: here.alongS - cumulativeArc(model, s0, t).alongS, v: here.alongT - cumulativeArc(model, s, t0).alongT };
}

/** Length (along strike) and height (down dip) of a polygon in (s, t), measured along the surface from (s₀, t₀). */
export function extentAlongSurface(
  model: SurfaceModel,
  polygon: [number, number][],
  s0: number,
  t0: number,
): { lengthM: number; heightM: number; minU: number; maxU: number; minV: number; maxV: number } {
  let minU = Infinity,
    maxU = -Infinity,
    minV = Infinity,
    maxV = -Infinity;
  for (const [s, t] of polygon) {
    const { u, v } = alongSurface(model, s0, t0, s, t);
    if (u < minU) minU = u;
    if (u > maxU) maxU = u;
    if (v < minV) minV = v;
    if (v > maxV) maxV = v;
  }
  return { lengthM: maxU - minU, heightM: maxV - minV, minU, maxU, minV, maxV };
}

/** Mean of the area stretch √(1 + w_s² + w_t²) over the surface nodes inside a polygon (1 when none is inside). */
export function meanAreaStretch(model: SurfaceModel, polygon: [number, number][]): number {
  const { spec } = model;
  let sum = 0,
    count = 0;
  const crossings: number[] = [];
  for (let j = 0; j < spec.rows; j++) {
    const t = spec.t0 + j * spec.cellM;
    // even-odd scanline: where the row crosses the polygon's edges, nodes between pairs of crossings are inside
    crossings.length = 0;
    for (let a = 0, b = polygon.length - 1; a < polygon.length; b = a++) {
      const [sa, ta] = polygon[a],
        [sb, tb] = polygon[b];
      if (ta > t !== tb > t) crossings.push(((sb - sa) * (t - ta)) / (tb - ta) + sa);
    }
    crossings.sort((p, q) => p - q);
    for (let c = 0; c + 1 < crossings.length; c += 2) {
      const i0 = Math.max(0, Math.ceil((crossings[c] - spec.s0) / spec.cellM));
      const i1 = Math.min(spec.columns - 1, Math.floor((crossings[c + 1] - spec.s0) / spec.cellM));
      for (let i = i0; i <= i1; i++) {
        const k = j * spec.columns + i;
        sum += Math.sqrt(1 + model.gradientS[k] ** 2 + model.gradientT[k] ** 2);
        count++;
      }
    }
  }
  return count ? sum / count : 1;
}

/** Even-odd rule. */
export function insidePolygon(polygon: [number, number][], s: number, t: number): boolean {
  let inside = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const [si, ti] = polygon[i],
      [sj, tj] = polygon[j];
    if (ti > t !== tj > t && s < ((sj - si) * (t - ti)) / (tj - ti) + si) inside = !inside;
  }
  return inside;
}

/**
 * The smoothed surface, its local orientation and its area stretch √(1 + w_s² + w_t²) (surface area per unit of plane
 * area) at the nodes of an analysis grid where `mask` has data (NaN elsewhere).
 */
export function surfaceOnGrid(
  model: SurfaceModel,
  frame: Frame,
  spec: GridSpec,
  mask: ArrayLike<number>,
): { offPlaneM: Float64Array; localDipDeg: Float64Array; localStrikeDeg: Float64Array; areaStretch: Float64Array } {
  const n = spec.columns * spec.rows;
  const offPlaneM = new Float64Array(n).fill(NaN);
  const localDipDeg = new Float64Array(n).fill(NaN);
  const localStrikeDeg = new Float64Array(n).fill(NaN);
  const areaStretch = new Float64Array(n).fill(NaN);
  const m = model.spec;
  const [sx, sy, sz] = frame.strikeVector;
  const [dx, dy, dz] = frame.dipVector;
  const [nx, ny, nz] = frame.normal;
  for (let j = 0; j < spec.rows; j++) {
    const t = spec.t0 + j * spec.cellM;
    const gy = Math.min(Math.max((t - m.t0) / m.cellM, 0), m.rows - 1);
    for (let i = 0; i < spec.columns; i++) {
      const k = j * spec.columns + i;
      if (!Number.isFinite(mask[k])) continue;
      const s = spec.s0 + i * spec.cellM;
      const gx = Math.min(Math.max((s - m.s0) / m.cellM, 0), m.columns - 1);
      offPlaneM[k] = bilinear(m, model.offPlaneM, gx, gy);
      const gs = bilinear(m, model.gradientS, gx, gy),
        gt = bilinear(m, model.gradientT, gx, gy);
      // the normal n̂ − w_s·ŝ − w_t·d̂, pointed up: dip from its vertical part, dip direction from its horizontal part
      let x = nx - gs * sx - gt * dx,
        y = ny - gs * sy - gt * dy,
        z = nz - gs * sz - gt * dz;
      if (z < 0) {
        x = -x;
        y = -y;
        z = -z;
      }
      const length = Math.sqrt(x * x + y * y + z * z);
      localDipDeg[k] = (Math.acos(Math.min(1, z / length)) * 180) / Math.PI;
      const dipDirection = x * x + y * y > 1e-24 * length * length ? (Math.atan2(x, y) * 180) / Math.PI : 90;
      localStrikeDeg[k] = (((dipDirection + 270) % 360) + 360) % 360;
      areaStretch[k] = Math.sqrt(1 + gs * gs + gt * gt);
    }
  }
  return { offPlaneM, localDipDeg, localStrikeDeg, areaStretch };
}

/** A coarse copy of the surface over [minS, maxS] × [minT, maxT] (at most MAX_REPORT_NODES a side), w rounded to the centimetre. */
export function reportSurfaceGrid(model: SurfaceModel, minS: number, maxS: number, minT: number, maxT: number): SurfaceOffsetGrid {
  const extent = Math.max(maxS - minS, maxT - minT, 1e-6);
  const cellM = Math.max(model.spec.cellM, extent / (MAX_REPORT_NODES - 1));
  if (![minS, maxS, minT, maxT, cellM].every(Number.isFinite)) return { s0: 0, t0: 0, cellM: 1, columns: 2, rows: 2, offsetM: [0, 0, 0, 0] };
  const columns = Math.max(2, Math.ceil((maxS - minS) / cellM) + 1);
  const rows = Math.max(2, Math.ceil((maxT - minT) / cellM) + 1);
  const offsetM: number[] = new Array(columns * rows);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) offsetM[j * columns + i] = Math.round(sampleSurface(model, minS + i * cellM, minT + j * cellM).offPlaneM * 100) / 100;
  }
  return { s0: minS, t0: minT, cellM, columns, rows, offsetM };
}

/** w at (s, t) from a report's coarse surface copy: bilinear, held at the edge value beyond it. */
export function offsetFromReportGrid(grid: SurfaceOffsetGrid, s: number, t: number): number {
  const gx = Math.min(Math.max((s - grid.s0) / grid.cellM, 0), grid.columns - 1);
  const gy = Math.min(Math.max((t - grid.t0) / grid.cellM, 0), grid.rows - 1);
  return bilinear(grid, grid.offsetM, gx, gy);
}
