// Reactivation screening on the triangles of a fault surface: each triangle with its own orientation (normal
// from its three corners) and depth (its centroid), under a stress state given by gradients. Flat typed
// arrays in, flat typed arrays out; no I/O.
import type { StressParameters } from "@/db/schema";
import { projectToPlane } from "@/lib/engine/project";
import { triangulate } from "@/lib/engine/triangulate";
import {
  dilationTendency,
  pressureToFailure,
  slipTendency,
  stressesAtDepth,
  stressOnPlane,
  stressTensorENU,
  orderedPrincipal,
} from "./tensor";

/** Triangles less regular than this (4√3·area / Σ edge², 1 = equilateral) are slivers and skipped (common practice, no source). */
export const MIN_TRIANGLE_QUALITY = 0.05;

export interface SurfaceTriangles {
  /** world coordinates of the vertices (m, East/North/Up) */
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  z: ArrayLike<number>;
  /** three vertex indices per triangle */
  triangles: Uint32Array;
}

export interface TriangleScreen {
  count: number;
  /** index of the input triangle each row comes from */
  source: Uint32Array;
  centroidX: Float64Array;
  centroidY: Float64Array;
  centroidZ: Float64Array;
  /** unit normal, pointing up (into the hanging wall of a dipping plane) */
  normalX: Float64Array;
  normalY: Float64Array;
  normalZ: Float64Array;
  areaM2: Float64Array;
  depthM: Float64Array;
  normalMPa: Float64Array;
  shearMPa: Float64Array;
  porePressureMPa: Float64Array;
  effectiveNormalMPa: Float64Array;
  slipTendency: Float64Array;
  dilationTendency: Float64Array;
  /** ΔP to failure at the lower friction coefficient (the more critical end of the band) */
  pressureToFailureLowMPa: Float64Array;
  pressureToFailureHighMPa: Float64Array;
  /** triangles left out as slivers/degenerate, or above the datum (depth ≤ 0) */
  skippedDegenerate: number;
  skippedAboveDatum: number;
}

/**
 * Per triangle: normal n from the cross product of two edges, depth = −z of the centroid, the stress tensor at
 * that depth, then σn and τ (Cauchy), σn′ = σn − Pp, Ts = τ/σn′ (Morris et al. 1996), Td = (σ1 − σn)/(σ1 − σ3)
 * (Ferrill et al. 1999) and ΔP = σn′ − (τ − C)/μ for μ at both ends of the friction band (Coulomb, common practice).
 */
export function screenTriangles(surface: SurfaceTriangles, parameters: StressParameters, minQuality = MIN_TRIANGLE_QUALITY): TriangleScreen {
  const { x, y, z, triangles } = surface;
  const total = triangles.length / 3;
  const columns = () => new Float64Array(total);
  const out = {
    source: new Uint32Array(total),
    centroidX: columns(), centroidY: columns(), centroidZ: columns(),
    normalX: columns(), normalY: columns(), normalZ: columns(),
    areaM2: columns(), depthM: columns(), normalMPa: columns(), shearMPa: columns(), porePressureMPa: columns(),
    effectiveNormalMPa: columns(), slipTendency: columns(), dilationTendency: columns(),
    pressureToFailureLowMPa: columns(), pressureToFailureHighMPa: columns(),
  };
  let kept = 0;
  let skippedDegenerate = 0;
  let skippedAboveDatum = 0;
  const n: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < total; k++) {
    const a = triangles[3 * k], b = triangles[3 * k + 1], c = triangles[3 * k + 2];
    const abx = x[b] - x[a], aby = y[b] - y[a], abz = z[b] - z[a];
    const acx = x[c] - x[a], acy = y[c] - y[a], acz = z[c] - z[a];
    const bcx = x[c] - x[b], bcy = y[c] - y[b], bcz = z[c] - z[b];
    let nx = aby * acz - abz * acy;
    let ny = abz * acx - abx * acz;
    let nz = abx * acy - aby * acx;
    const twiceArea = Math.hypot(nx, ny, nz);
    const edgeSquares = abx * abx + aby * aby + abz * abz + acx * acx + acy * acy + acz * acz + bcx * bcx + bcy * bcy + bcz * bcz;
    const quality = edgeSquares > 0 ? (4 * Math.sqrt(3) * (twiceArea / 2)) / edgeSquares : 0;
    if (!(quality >= minQuality)) {
      skippedDegenerate++;
      continue;
    }
    const depthM = -(z[a] + z[b] + z[c]) / 3;
    if (!(depthM > 0)) {
      skippedAboveDatum++;
      continue;
    }
    // the sign of n changes neither σn nor τ; pointing it up keeps the export readable
    const flip = nz < 0 || (nz === 0 && (ny < 0 || (ny === 0 && nx < 0))) ? -1 : 1;
    nx = (flip * nx) / twiceArea;
    ny = (flip * ny) / twiceArea;
    nz = (flip * nz) / twiceArea;
    n[0] = nx; n[1] = ny; n[2] = nz;
    const stresses = stressesAtDepth(parameters, depthM);
    const tensor = stressTensorENU(stresses, parameters.maxHorizontalAzimuthDeg);
    const { normalMPa, shearMPa } = stressOnPlane(tensor, n);
    const [sigma1, , sigma3] = orderedPrincipal(stresses);
    const effective = normalMPa - stresses.porePressureMPa;
    out.source[kept] = k;
    out.centroidX[kept] = (x[a] + x[b] + x[c]) / 3;
    out.centroidY[kept] = (y[a] + y[b] + y[c]) / 3;
    out.centroidZ[kept] = -depthM;
    out.normalX[kept] = nx;
    out.normalY[kept] = ny;
    out.normalZ[kept] = nz;
    out.areaM2[kept] = twiceArea / 2;
    out.depthM[kept] = depthM;
    out.normalMPa[kept] = normalMPa;
    out.shearMPa[kept] = shearMPa;
    out.porePressureMPa[kept] = stresses.porePressureMPa;
    out.effectiveNormalMPa[kept] = effective;
    out.slipTendency[kept] = slipTendency(shearMPa, effective);
    out.dilationTendency[kept] = dilationTendency(normalMPa, sigma1, sigma3);
    out.pressureToFailureLowMPa[kept] = pressureToFailure(shearMPa, effective, parameters.frictionLow, parameters.cohesionMPa);
    out.pressureToFailureHighMPa[kept] = pressureToFailure(shearMPa, effective, parameters.frictionHigh, parameters.cohesionMPa);
    kept++;
  }
  const cut = <T extends Float64Array | Uint32Array>(array: T) => array.slice(0, kept) as T;
  return {
    count: kept,
    source: cut(out.source),
    centroidX: cut(out.centroidX), centroidY: cut(out.centroidY), centroidZ: cut(out.centroidZ),
    normalX: cut(out.normalX), normalY: cut(out.normalY), normalZ: cut(out.normalZ),
    areaM2: cut(out.areaM2), depthM: cut(out.depthM), normalMPa: cut(out.normalMPa), shearMPa: cut(out.shearMPa),
    porePressureMPa: cut(out.porePressureMPa), effectiveNormalMPa: cut(out.effectiveNormalMPa),
    slipTendency: cut(out.slipTendency), dilationTendency: cut(out.dilationTendency),
    pressureToFailureLowMPa: cut(out.pressureToFailureLowMPa), pressureToFailureHighMPa: cut(out.pressureToFailureHighMPa),
    skippedDegenerate,
    skippedAboveDatum,
  };
}

export interface PlaneFrame {
  centroid: readonly number[];
  strikeVector: readonly number[];
  dipVector: readonly number[];
  normal: readonly number[];
}

/**
 * The Delaunay triangles of one segment's picks, built as the analysis builds them: projected to the segment's
 * plane (s, t), triangulated there with hull slivers removed. Returns vertex indices into the full pick arrays
 * plus each vertex's (s, t), so values can be rasterised back onto the segment's grid.
 */
export function segmentTriangles(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  indices: ArrayLike<number>,
  frame: PlaneFrame,
): { triangles: Uint32Array; s: Float64Array; t: Float64Array } {
  const frameTuple = {
    centroid: [frame.centroid[0], frame.centroid[1], frame.centroid[2]] as [number, number, number],
    strikeVector: [frame.strikeVector[0], frame.strikeVector[1], frame.strikeVector[2]] as [number, number, number],
    dipVector: [frame.dipVector[0], frame.dipVector[1], frame.dipVector[2]] as [number, number, number],
    normal: [frame.normal[0], frame.normal[1], frame.normal[2]] as [number, number, number],
  };
  const { s, t } = projectToPlane(x, y, z, frameTuple, indices);
  if (s.length < 3) return { triangles: new Uint32Array(0), s, t };
  const local = triangulate(s, t).triangles;
  const triangles = new Uint32Array(local.length);
  for (let i = 0; i < local.length; i++) triangles[i] = indices[local[i]];
  // (s, t) indexed by global pick id would need a full-length array; callers use `local` order via this map
  return { triangles, s: scatter(s, indices, x.length), t: scatter(t, indices, x.length) };
}

function scatter(values: Float64Array, indices: ArrayLike<number>, length: number): Float64Array {
  const out = new Float64Array(length).fill(NaN);
  for (let i = 0; i < indices.length; i++) out[indices[i]] = values[i];
  return out;
}

export interface GridShape {
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
}

/**
 * Per-triangle constant values onto the nodes of a regular (s, t) grid, rasterised triangle by triangle (each
 * triangle visits only the nodes of its bounding box). `triangleVertices` holds three vertex indices per row of
 * `values`; nodes in no triangle stay NaN.
 */
export function rasterizeTriangleValues(
  s: ArrayLike<number>,
  t: ArrayLike<number>,
  triangleVertices: ArrayLike<number>,
  values: ArrayLike<number>[],
  grid: GridShape,
): Float32Array[] {
  const { s0, t0, cellM, columns, rows } = grid;
  const outs = values.map(() => new Float32Array(columns * rows).fill(NaN));
  const eps = 1e-9;
  const count = triangleVertices.length / 3;
  for (let k = 0; k < count; k++) {
    const a = triangleVertices[3 * k], b = triangleVertices[3 * k + 1], c = triangleVertices[3 * k + 2];
    const ax = (s[a] - s0) / cellM, ay = (t[a] - t0) / cellM;
    const bx = (s[b] - s0) / cellM, by = (t[b] - t0) / cellM;
    const cx = (s[c] - s0) / cellM, cy = (t[c] - t0) / cellM;
    const det = (by - cy) * (ax - cx) + (cx - bx) * (ay - cy);
    if (!(Math.abs(det) > 0)) continue;
    const i0 = Math.max(0, Math.ceil(Math.min(ax, bx, cx) - eps));
    const i1 = Math.min(columns - 1, Math.floor(Math.max(ax, bx, cx) + eps));
    const j0 = Math.max(0, Math.ceil(Math.min(ay, by, cy) - eps));
    const j1 = Math.min(rows - 1, Math.floor(Math.max(ay, by, cy) + eps));
    const inv = 1 / det;
    for (let j = j0; j <= j1; j++) {
      for (let i = i0; i <= i1; i++) {
        const l0 = ((by - cy) * (i - cx) + (cx - bx) * (j - cy)) * inv;
        const l1 = ((cy - ay) * (i - cx) + (ax - cx) * (j - cy)) * inv;
        const l2 = 1 - l0 - l1;
        if (l0 < -eps || l1 < -eps || l2 < -eps) continue;
        const node = j * columns + i;
        for (let v = 0; v < values.length; v++) outs[v][node] = values[v][k];
      }
    }
  }
  return outs;
}
