// Reactivation screening on a fault surface. The surface is the picks' Delaunay triangles; each triangle is one area
// element, but its orientation and depth come from the surface smoothed at a stated length scale (the off-plane
// distance w of the picks, gridded and fitted locally: lib/engine/surface.ts), not from its own three corners, whose
// normal mostly measures pick noise. Flat typed arrays in, flat typed arrays out; no I/O.
import type { StressParameters } from "@/lib/contracts/stress";
import { planeToWorld, projectToPlane, type PlaneFrame } from "@/lib/display/frame";
import { triangulate } from "@/lib/engine/triangulate";
import { sampleGrid, type GridSpec, type SampleRule } from "@/lib/display/grid-sampler";
import { pickWeights, pullTowardNeighbours, weightsMatter } from "@/lib/engine/quality";
import { effectivePickCount, localPolynomialFit, offPlaneGrid, slopeScatterDeg, surfaceNormal } from "@/lib/engine/surface";
import { dilationTendency, pressureToFailure, slipTendency, stressesAtDepth, stressOnPlane, stressTensorENU, orderedPrincipal } from "./tensor";

/** Triangles less regular than this (4√3·area / Σ edge², 1 = equilateral) are slivers and skipped (common practice, no source). */
export const MIN_TRIANGLE_QUALITY = 0.05;

/** The orientation range spans this many standard errors of the window's mean normal either side (about 95 %). */
export const ORIENTATION_RANGE_STANDARD_ERRORS = 2;

/** Directions around the normal at which the orientation range is sampled (ΔP is smooth in n, so 8 suffice). */
const RANGE_DIRECTIONS = 8;

export interface SurfaceTriangles {
  /** world coordinates of the vertices (m, East/North/Up) */
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  z: ArrayLike<number>;
  /** three vertex indices per triangle */
  triangles: Uint32Array;
}

/** Area elements to screen: where each is, which way it faces, how big it is and how well its orientation is known. */
export interface ScreenElements {
  count: number;
  /** index of the input triangle each element comes from */
  source: Uint32Array;
  centroidX: Float64Array;
  centroidY: Float64Array;
  centroidZ: Float64Array;
  /** unit normal, pointing up (into the hanging wall of a dipping plane) */
  normalX: Float64Array;
  normalY: Float64Array;
  normalZ: Float64Array;
  areaM2: Float64Array;
  /** half-width of the orientation range (degrees): ORIENTATION_RANGE_STANDARD_ERRORS standard errors; 0 when not known */
  orientationUncertaintyDeg: Float64Array;
  /** RMS spread of the unsmoothed surface's slopes about the fitted one within the window (degrees); NaN when not known */
  slopeScatterDeg: Float64Array;
  /** triangles left out as slivers/degenerate, or above the datum (depth ≤ 0) */
  skippedDegenerate: number;
  skippedAboveDatum: number;
}

export interface TriangleScreen extends ScreenElements {
  depthM: Float64Array;
  normalMPa: Float64Array;
  shearMPa: Float64Array;
  porePressureMPa: Float64Array;
  effectiveNormalMPa: Float64Array;
  slipTendency: Float64Array;
  dilationTendency: Float64Array;
  /** ΔP to failure at the lower and at the upper friction coefficient */
  pressureToFailureLowMPa: Float64Array;
  pressureToFailureHighMPa: Float64Array;
  /** the more critical (smaller) of the two, per element: the lower μ is not always the critical end (cohesion > τ) */
  pressureToFailureCriticalMPa: Float64Array;
  /** range of the critical ΔP, and of the tendencies, over the element's orientation range */
  pressureToFailureMinMPa: Float64Array;
  pressureToFailureMaxMPa: Float64Array;
  slipTendencyMin: Float64Array;
  slipTendencyMax: Float64Array;
  dilationTendencyMin: Float64Array;
  dilationTendencyMax: Float64Array;
}

function elementColumns(total: number) {
  const column = () => new Float64Array(total);
  return {
    source: new Uint32Array(total),
    centroidX: column(),
    centroidY: column(),
    centroidZ: column(),
    normalX: column(),
    normalY: column(),
    normalZ: column(),
    areaM2: column(),
    orientationUncertaintyDeg: column(),
    slopeScatterDeg: column(),
  };
}

function cutElements(columns: ReturnType<typeof elementColumns>, count: number, skippedDegenerate: number, skippedAboveDatum: number): ScreenElements {
  const cut = <T extends Float64Array | Uint32Array>(array: T) => array.slice(0, count) as T;
  return {
    count,
    source: cut(columns.source),
    centroidX: cut(columns.centroidX),
    centroidY: cut(columns.centroidY),
    centroidZ: cut(columns.centroidZ),
    normalX: cut(columns.normalX),
    normalY: cut(columns.normalY),
    normalZ: cut(columns.normalZ),
    areaM2: cut(columns.areaM2),
    orientationUncertaintyDeg: cut(columns.orientationUncertaintyDeg),
    slopeScatterDeg: cut(columns.slopeScatterDeg),
    skippedDegenerate,
    skippedAboveDatum,
  };
}

/** The shape-regularity measure 4√3·area / Σ edge² of a triangle from its three edge vectors' squared lengths and area. */
const triangleRegularity = (area: number, edgeSquares: number) => (edgeSquares > 0 ? (4 * Math.sqrt(3) * area) / edgeSquares : 0);

/**
 * Each triangle as its own element: normal from the cross product of two edges, centroid of its corners. This is the
 * raw orientation, which follows every pick's noise; the product screens smoothed surfaces (surfaceElements), and
 * this stays for exact checks on hand-made triangles and to show what smoothing removes.
 */
export function rawTriangleElements(surface: SurfaceTriangles, minQuality = MIN_TRIANGLE_QUALITY): ScreenElements {
  const { x, y, z, triangles } = surface;
  const total = triangles.length / 3;
  const out = elementColumns(total);
  let kept = 0,
    skippedDegenerate = 0,
    skippedAboveDatum = 0;
  for (let k = 0; k < total; k++) {
    const a = triangles[3 * k],
      b = triangles[3 * k + 1],
      c = triangles[3 * k + 2];
    const abx = x[b] - x[a],
      aby = y[b] - y[a],
      abz = z[b] - z[a];
    const acx = x[c] - x[a],
      acy = y[c] - y[a],
      acz = z[c] - z[a];
    const bcx = x[c] - x[b],
      bcy = y[c] - y[b],
      bcz = z[c] - z[b];
    let nx = aby * acz - abz * acy;
    let ny = abz * acx - abx * acz;
    let nz = abx * acy - aby * acx;
    const twiceArea = Math.hypot(nx, ny, nz);
    const edgeSquares = abx * abx + aby * aby + abz * abz + acx * acx + acy * acy + acz * acz + bcx * bcx + bcy * bcy + bcz * bcz;
    if (!(triangleRegularity(twiceArea / 2, edgeSquares) >= minQuality)) {
      skippedDegenerate++;
      continue;
    }
    const centroidZ = (z[a] + z[b] + z[c]) / 3;
    if (!(-centroidZ > 0)) {
      skippedAboveDatum++;
      continue;
    }
    // the sign of n changes neither σn nor τ; pointing it up keeps the export readable
    const flip = nz < 0 || (nz === 0 && (ny < 0 || (ny === 0 && nx < 0))) ? -1 : 1;
    nx = (flip * nx) / twiceArea;
    ny = (flip * ny) / twiceArea;
    nz = (flip * nz) / twiceArea;
    out.source[kept] = k;
    out.centroidX[kept] = (x[a] + x[b] + x[c]) / 3;
    out.centroidY[kept] = (y[a] + y[b] + y[c]) / 3;
    out.centroidZ[kept] = centroidZ;
    out.normalX[kept] = nx;
    out.normalY[kept] = ny;
    out.normalZ[kept] = nz;
    out.areaM2[kept] = twiceArea / 2;
    out.slopeScatterDeg[kept] = NaN;
    kept++;
  }
  return cutElements(out, kept, skippedDegenerate, skippedAboveDatum);
}

/** One segment's picks in its plane frame, triangulated as the analysis triangulates them. */
export interface SegmentSurface {
  /** local (per-pick of the segment) fault-plane coordinates and off-plane distance, quality-adjusted as for the grids */
  s: Float64Array;
  t: Float64Array;
  offPlaneM: Float64Array;
  /** triangles over local pick numbers, and the same over global pick ids */
  localTriangles: Uint32Array;
  triangles: Uint32Array;
  medianEdgeM: number;
}

/**
 * Projects one segment's picks to its plane (s, t, w), triangulates in (s, t) with hull slivers removed, and applies
 * pick quality to w the way the analysis applies it to displacement (lib/engine/quality.ts).
 */
export function segmentSurface(
  picks: { x: ArrayLike<number>; y: ArrayLike<number>; z: ArrayLike<number>; quality?: ArrayLike<number> },
  indices: ArrayLike<number>,
  frame: PlaneFrame,
  /** the analysis' own triangulation of these picks in this frame, when it stored one (then nothing is triangulated) */
  stored?: { triangles: Uint32Array; medianEdgeM: number },
): SegmentSurface {
  const { s, t, w } = projectToPlane(picks.x, picks.y, picks.z, frame, indices);
  if (s.length < 3) return { s, t, offPlaneM: w, localTriangles: new Uint32Array(0), triangles: new Uint32Array(0), medianEdgeM: NaN };
  const { triangles: localTriangles, medianEdgeM } = stored ?? triangulate(s, t);
  const weights = picks.quality ? pickWeights(picks.quality, indices) : null;
  const [offPlaneM] = weights && weightsMatter(weights) ? pullTowardNeighbours([w], weights, localTriangles) : [w];
  const triangles = new Uint32Array(localTriangles.length);
  for (let i = 0; i < localTriangles.length; i++) triangles[i] = indices[localTriangles[i]];
  return { s, t, offPlaneM, localTriangles, triangles, medianEdgeM };
}

/**
 * The default smoothing length: 200 m, or 4 median pick spacings where picks are sparser, rounded up to 10 m. On
 * synthetic faults picked every 25 m × 12.5 m it keeps the minimum ΔP within 0.3 MPa of the noise-free value with up
 * to 5 m of pick jitter (tests/lib/stress/surface.test.ts); a choice, not a published value.
 */
export function defaultLengthScaleM(medianEdgeM: number): number {
  const raw = Math.max(200, 4 * (Number.isFinite(medianEdgeM) ? medianEdgeM : 0));
  return Math.ceil(raw / 10) * 10;
}

/** Nodes of a grid at most; a finer grid for a short length scale would cost more than it tells. */
const MAX_ORIENTATION_NODES = 600_000;

/**
 * A grid fine enough for the length scale (cell ≤ L/3): the given grid (e.g. the analysis' decimated display grid)
 * subdivided by a whole factor, so its nodes stay on the analysis grid's lattice.
 */
export function gridForLengthScale(spec: GridSpec, lengthM: number): GridSpec {
  let factor = Math.max(1, Math.ceil(spec.cellM / (lengthM / 3)));
  while (factor > 1 && ((spec.columns - 1) * factor + 1) * ((spec.rows - 1) * factor + 1) > MAX_ORIENTATION_NODES) factor--;
  return { s0: spec.s0, t0: spec.t0, cellM: spec.cellM / factor, columns: (spec.columns - 1) * factor + 1, rows: (spec.rows - 1) * factor + 1 };
}

/** The fitted fields are read at each triangle's centroid: missing nodes left out, points on the grid's edge kept. */
const AT_CENTROID: SampleRule = { interpolation: "bilinear", missing: "renormalise", outside: "clamp" };

/**
 * Elements with the smoothed surface's orientation: w of the picks on the grid, a local quadratic fitted around every
 * node with Gaussian weights of standard deviation `lengthM` (lib/engine/surface.ts), and for each triangle of the
 * picks the fitted surface at its centroid: normal, position (w along the reference normal) and area (its (s, t) area over the cosine of the
 * local tilt). The orientation range is ±2 standard errors of the window's mean normal: the RMS scatter of the
 * unsmoothed slopes in the window over √(effective number of picks in it).
 */
export function surfaceElements(
  surface: SegmentSurface,
  frame: PlaneFrame,
  spec: GridSpec,
  lengthM: number,
  minQuality = MIN_TRIANGLE_QUALITY,
): ScreenElements {
  const { s, t, offPlaneM, localTriangles } = surface;
  const wGrid = offPlaneGrid(s, t, offPlaneM, localTriangles, spec);
  // degree 2: no slope bias from curvature on the edges of the data, where the shallowest (least stressed) and deepest
  // parts of a fault lie (lib/engine/surface.ts)
  const fit = localPolynomialFit(wGrid, spec, lengthM, 2);
  const scatter = slopeScatterDeg(wGrid, fit, spec, lengthM);
  const picksInWindow = effectivePickCount(s, t, spec, lengthM);
  const total = localTriangles.length / 3;
  const out = elementColumns(total);
  let kept = 0,
    skippedDegenerate = 0,
    skippedAboveDatum = 0;
  for (let k = 0; k < total; k++) {
    const a = localTriangles[3 * k],
      b = localTriangles[3 * k + 1],
      c = localTriangles[3 * k + 2];
    const abs = s[b] - s[a],
      abt = t[b] - t[a],
      acs = s[c] - s[a],
      act = t[c] - t[a],
      bcs = s[c] - s[b],
      bct = t[c] - t[b];
    const areaST = Math.abs(abs * act - abt * acs) / 2;
    if (!(triangleRegularity(areaST, abs * abs + abt * abt + acs * acs + act * act + bcs * bcs + bct * bct) >= minQuality)) {
      skippedDegenerate++;
      continue;
    }
    const sc = (s[a] + s[b] + s[c]) / 3;
    const tc = (t[a] + t[b] + t[c]) / 3;
    const gradientS = sampleGrid(spec, fit.gradientS, sc, tc, AT_CENTROID);
    const gradientT = sampleGrid(spec, fit.gradientT, sc, tc, AT_CENTROID);
    const w = sampleGrid(spec, fit.offPlaneM, sc, tc, AT_CENTROID);
    if (!Number.isFinite(gradientS) || !Number.isFinite(gradientT) || !Number.isFinite(w)) {
      skippedDegenerate++;
      continue;
    }
    const [x, y, z] = planeToWorld(frame, sc, tc, w);
    if (!(-z > 0)) {
      skippedAboveDatum++;
      continue;
    }
    const [nx, ny, nz] = surfaceNormal(gradientS, gradientT, frame);
    const flip = nz < 0 ? -1 : 1;
    const spread = sampleGrid(spec, scatter, sc, tc, AT_CENTROID);
    const count = sampleGrid(spec, picksInWindow, sc, tc, AT_CENTROID);
    out.source[kept] = k;
    out.centroidX[kept] = x;
    out.centroidY[kept] = y;
    out.centroidZ[kept] = z;
    out.normalX[kept] = flip * nx;
    out.normalY[kept] = flip * ny;
    out.normalZ[kept] = flip * nz;
    out.areaM2[kept] = areaST * Math.sqrt(1 + gradientS * gradientS + gradientT * gradientT);
    out.slopeScatterDeg[kept] = spread;
    out.orientationUncertaintyDeg[kept] = Number.isFinite(spread) && count > 1 ? (ORIENTATION_RANGE_STANDARD_ERRORS * spread) / Math.sqrt(count) : NaN;
    kept++;
  }
  return cutElements(out, kept, skippedDegenerate, skippedAboveDatum);
}

/**
 * Per element: depth = −z of its centroid, the stress tensor at that depth, then σn and τ (Cauchy), σn′ = σn − Pp,
 * Ts = τ/σn′ (Morris et al. 1996), Td = (σ1 − σn)/(σ1 − σ3) (Ferrill et al. 1999) and ΔP = σn′ − (τ − C)/μ at both
 * ends of the friction band (Coulomb, common practice), the smaller taken as the critical one. The ranges repeat this
 * for normals tilted by the element's orientation uncertainty in eight directions.
 */
export function screenElements(elements: ScreenElements, parameters: StressParameters): TriangleScreen {
  const total = elements.count;
  const column = () => new Float64Array(total);
  const out = {
    depthM: column(),
    normalMPa: column(),
    shearMPa: column(),
    porePressureMPa: column(),
    effectiveNormalMPa: column(),
    slipTendency: column(),
    dilationTendency: column(),
    pressureToFailureLowMPa: column(),
    pressureToFailureHighMPa: column(),
    pressureToFailureCriticalMPa: column(),
    pressureToFailureMinMPa: column(),
    pressureToFailureMaxMPa: column(),
    slipTendencyMin: column(),
    slipTendencyMax: column(),
    dilationTendencyMin: column(),
    dilationTendencyMax: column(),
  };
  const n: [number, number, number] = [0, 0, 0];
  const tilted: [number, number, number] = [0, 0, 0];
  for (let i = 0; i < total; i++) {
    const depthM = -elements.centroidZ[i];
    const stresses = stressesAtDepth(parameters, depthM);
    const tensor = stressTensorENU(stresses, parameters.maxHorizontalAzimuthDeg);
    const [sigma1, , sigma3] = orderedPrincipal(stresses);
    const pp = stresses.porePressureMPa;
    const evaluate = (normal: readonly number[]) => {
      const { normalMPa, shearMPa } = stressOnPlane(tensor, normal);
      const effective = normalMPa - pp;
      const low = pressureToFailure(shearMPa, effective, parameters.frictionLow, parameters.cohesionMPa);
      const high = pressureToFailure(shearMPa, effective, parameters.frictionHigh, parameters.cohesionMPa);
      return {
        normalMPa,
        shearMPa,
        effective,
        low,
        high,
        critical: Math.min(low, high),
        ts: slipTendency(shearMPa, effective),
        td: dilationTendency(normalMPa, sigma1, sigma3),
      };
    };
    n[0] = elements.normalX[i];
    n[1] = elements.normalY[i];
    n[2] = elements.normalZ[i];
    const centre = evaluate(n);
    out.depthM[i] = depthM;
    out.normalMPa[i] = centre.normalMPa;
    out.shearMPa[i] = centre.shearMPa;
    out.porePressureMPa[i] = pp;
    out.effectiveNormalMPa[i] = centre.effective;
    out.slipTendency[i] = centre.ts;
    out.dilationTendency[i] = centre.td;
    out.pressureToFailureLowMPa[i] = centre.low;
    out.pressureToFailureHighMPa[i] = centre.high;
    out.pressureToFailureCriticalMPa[i] = centre.critical;
    let dpMin = centre.critical,
      dpMax = centre.critical,
      tsMin = centre.ts,
      tsMax = centre.ts,
      tdMin = centre.td,
      tdMax = centre.td;
    const angle = (elements.orientationUncertaintyDeg[i] * Math.PI) / 180;
    if (angle > 0) {
      // two unit vectors perpendicular to n
      const helper = Math.abs(n[2]) < 0.9 ? [0, 0, 1] : [1, 0, 0];
      let e1x = helper[1] * n[2] - helper[2] * n[1],
        e1y = helper[2] * n[0] - helper[0] * n[2],
        e1z = helper[0] * n[1] - helper[1] * n[0];
      const e1 = Math.hypot(e1x, e1y, e1z);
      e1x /= e1;
      e1y /= e1;
      e1z /= e1;
      const e2x = n[1] * e1z - n[2] * e1y,
        e2y = n[2] * e1x - n[0] * e1z,
        e2z = n[0] * e1y - n[1] * e1x;
      const cos = Math.cos(angle),
        sin = Math.sin(angle);
      for (let d = 0; d < RANGE_DIRECTIONS; d++) {
        const phi = (2 * Math.PI * d) / RANGE_DIRECTIONS;
        const a = sin * Math.cos(phi),
          b = sin * Math.sin(phi);
        tilted[0] = cos * n[0] + a * e1x + b * e2x;
        tilted[1] = cos * n[1] + a * e1y + b * e2y;
        tilted[2] = cos * n[2] + a * e1z + b * e2z;
        const v = evaluate(tilted);
        dpMin = Math.min(dpMin, v.critical);
        dpMax = Math.max(dpMax, v.critical);
        if (Number.isFinite(v.ts)) {
          tsMin = Math.min(tsMin, v.ts);
          tsMax = Math.max(tsMax, v.ts);
        }
        tdMin = Math.min(tdMin, v.td);
        tdMax = Math.max(tdMax, v.td);
      }
    }
    out.pressureToFailureMinMPa[i] = dpMin;
    out.pressureToFailureMaxMPa[i] = dpMax;
    out.slipTendencyMin[i] = tsMin;
    out.slipTendencyMax[i] = tsMax;
    out.dilationTendencyMin[i] = tdMin;
    out.dilationTendencyMax[i] = tdMax;
  }
  return { ...elements, ...out };
}
