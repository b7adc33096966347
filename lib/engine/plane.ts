import type { PlaneFit } from "./types";

const DEG = 180 / Math.PI;

/** Eigen-decomposition of a symmetric 3×3 matrix by cyclic Jacobi rotations; eigenvalues descending. */
export function symmetricEigen3(m: number[][]): { values: [number, number, number]; vectors: [number, number, number][] } {
  const a = m.map((r) => r.slice());
  const v = [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ];
  for (let sweep = 0; sweep < 50; sweep++) {
    const off = a[0][1] ** 2 + a[0][2] ** 2 + a[1][2] ** 2;
    const diag = a[0][0] ** 2 + a[1][1] ** 2 + a[2][2] ** 2;
    if (off <= 1e-30 * Math.max(diag, 1e-300)) break;
    for (let p = 0; p < 2; p++) {
      for (let q = p + 1; q < 3; q++) {
        if (a[p][q] === 0) continue;
        const theta = (a[q][q] - a[p][p]) / (2 * a[p][q]);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < 3; k++) {
          const akp = a[k][p];
          const akq = a[k][q];
          a[k][p] = c * akp - s * akq;
          a[k][q] = s * akp + c * akq;
        }
        for (let k = 0; k < 3; k++) {
          const apk = a[p][k];
          const aqk = a[q][k];
          a[p][k] = c * apk - s * aqk;
          a[q][k] = s * apk + c * aqk;
        }
        for (let k = 0; k < 3; k++) {
          const vkp = v[k][p];
          const vkq = v[k][q];
          v[k][p] = c * vkp - s * vkq;
          v[k][q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = [0, 1, 2].sort((i, j) => a[j][j] - a[i][i]);
  return {
    values: order.map((i) => a[i][i]) as [number, number, number],
    vectors: order.map((i) => [v[0][i], v[1][i], v[2][i]]) as [number, number, number][],
  };
}

export class DegeneratePlaneError extends Error {}

/**
 * Least-squares plane through points (PCA of the centred points = SVD of the N×3 matrix): the normal is the
 * direction of least variance. Strike by the right-hand rule (dip direction = strike + 90), azimuths 0–360.
 * With `weights` (aligned with `indices`, e.g. pick quality) it is the weighted least-squares plane: weighted
 * centroid and weighted scatter matrix, so a pick of weight w counts as w of a pick; the RMS misfit is weighted too.
 */
export function fitPlane(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, indices?: ArrayLike<number>, weights?: ArrayLike<number>): PlaneFit {
  const n = indices ? indices.length : x.length;
  if (n < 3) throw new DegeneratePlaneError("at least 3 points are needed to fit a plane");
  const totalWeight = weights ? sumOf(weights) : n;
  if (!(totalWeight > 0)) throw new DegeneratePlaneError("every point has weight 0");
  const [cx, cy, cz] = weights ? weightedCentroidOf(x, y, z, n, weights, totalWeight, indices) : centroidOf(x, y, z, n, indices);
  const [xx, xy, xz, yy, yz, zz] = weights ? weightedScatterOf(x, y, z, n, cx, cy, cz, weights, indices) : scatterOf(x, y, z, n, cx, cy, cz, indices);
  const { values, vectors } = symmetricEigen3([
    [xx, xy, xz],
    [xy, yy, yz],
    [xz, yz, zz],
  ]);
  const singularValues = values.map((l) => Math.sqrt(Math.max(l, 0))) as [number, number, number];
  const [s1, s2, s3] = singularValues;
  if (!(s1 > 0)) throw new DegeneratePlaneError("all points coincide");
  if (s2 / s1 < 1e-6) throw new DegeneratePlaneError("the points are collinear, so the plane orientation is undetermined");
  let normal = vectors[2];
  if (normal[2] < 0) normal = [-normal[0], -normal[1], -normal[2]];
  const len = Math.hypot(...normal);
  normal = [normal[0] / len, normal[1] / len, normal[2] / len];
  const dipDeg = Math.acos(Math.min(1, Math.max(-1, normal[2]))) * DEG;
  const horizontal = Math.hypot(normal[0], normal[1]);
  let dipDirectionDeg = horizontal > 1e-12 ? Math.atan2(normal[0], normal[1]) * DEG : 90;
  dipDirectionDeg = ((dipDirectionDeg % 360) + 360) % 360;
  const strikeDeg = (((dipDirectionDeg - 90) % 360) + 360) % 360;
  const strikeVector = strikeVectorOf(strikeDeg);
  const dipVector = dipVectorOf(dipDirectionDeg, dipDeg);
  const rmsM = s3 / Math.sqrt(totalWeight);
  let planarityWarning: string | null = null;
  if (s2 / s1 < 0.05) planarityWarning = `points are nearly collinear (s2/s1 = ${(s2 / s1).toFixed(3)}); the dip about that line is poorly constrained`;
  else if (s3 / s2 > 0.2)
    planarityWarning = `points are not planar enough for a single plane (s3/s2 = ${(s3 / s2).toFixed(3)}); treat the plane as a reference frame only`;
  else if (dipDeg < 20) planarityWarning = `low dip (${dipDeg.toFixed(1)}°): small throw errors become large displacement errors`;
  return {
    strikeDeg: normaliseAzimuth(strikeDeg),
    dipDeg,
    dipDirectionDeg,
    rmsM,
    centroid: [cx, cy, cz],
    strikeVector,
    dipVector,
    normal,
    singularValues,
    planarityWarning,
  };
}

// the two passes over the points live in their own small functions, so each is optimised on its own
function centroidOf(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, n: number, indices?: ArrayLike<number>): [number, number, number] {
  let cx = 0;
  let cy = 0;
  let cz = 0;
  for (let k = 0; k < n; k++) {
    const i = indices ? indices[k] : k;
    cx += x[i];
    cy += y[i];
    cz += z[i];
  }
  return [cx / n, cy / n, cz / n];
}

function sumOf(values: ArrayLike<number>): number {
  let total = 0;
  for (let k = 0; k < values.length; k++) total += values[k];
  return total;
}

function weightedCentroidOf(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  n: number,
  weights: ArrayLike<number>,
  totalWeight: number,
  indices?: ArrayLike<number>,
): [number, number, number] {
  let cx = 0;
  let cy = 0;
  let cz = 0;
  for (let k = 0; k < n; k++) {
    const i = indices ? indices[k] : k;
    cx += weights[k] * x[i];
    cy += weights[k] * y[i];
    cz += weights[k] * z[i];
  }
  return [cx / totalWeight, cy / totalWeight, cz / totalWeight];
}

function weightedScatterOf(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  n: number,
  cx: number,
  cy: number,
  cz: number,
  weights: ArrayLike<number>,
  indices?: ArrayLike<number>,
): [number, number, number, number, number, number] {
  let xx = 0,
    xy = 0,
    xz = 0,
    yy = 0,
    yz = 0,
    zz = 0;
  for (let k = 0; k < n; k++) {
    const i = indices ? indices[k] : k;
    const w = weights[k];
    const dx = x[i] - cx;
    const dy = y[i] - cy;
    const dz = z[i] - cz;
    xx += w * dx * dx;
    xy += w * dx * dy;
    xz += w * dx * dz;
    yy += w * dy * dy;
    yz += w * dy * dz;
    zz += w * dz * dz;
  }
  return [xx, xy, xz, yy, yz, zz];
}

function scatterOf(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  n: number,
  cx: number,
  cy: number,
  cz: number,
  indices?: ArrayLike<number>,
): [number, number, number, number, number, number] {
  let xx = 0,
    xy = 0,
    xz = 0,
    yy = 0,
    yz = 0,
    zz = 0;
  for (let k = 0; k < n; k++) {
    const i = indices ? indices[k] : k;
    const dx = x[i] - cx;
    const dy = y[i] - cy;
    const dz = z[i] - cz;
    xx += dx * dx;
    xy += dx * dy;
    xz += dx * dz;
    yy += dy * dy;
    yz += dy * dz;
    zz += dz * dz;
  }
  return [xx, xy, xz, yy, yz, zz];
}

export function normaliseAzimuth(deg: number): number {
  const a = ((deg % 360) + 360) % 360;
  return a >= 360 - 1e-12 ? 0 : a;
}

/**
 * An azimuth as printed with `digits` decimals, in [0, 360): rounded first, then wrapped, so a strike of 359.96°
 * prints "0.0", never "360.0".
 */
export function formatAzimuth(deg: number, digits = 1): string {
  if (!Number.isFinite(deg)) return "—";
  const step = 10 ** digits;
  const rounded = Math.round(normaliseAzimuth(deg) * step) / step;
  return (rounded >= 360 ? 0 : rounded).toFixed(digits);
}

export function strikeVectorOf(strikeDeg: number): [number, number, number] {
  const r = strikeDeg / DEG;
  return [Math.sin(r), Math.cos(r), 0];
}

export function dipVectorOf(dipDirectionDeg: number, dipDeg: number): [number, number, number] {
  const a = dipDirectionDeg / DEG;
  const d = dipDeg / DEG;
  return [Math.sin(a) * Math.cos(d), Math.cos(a) * Math.cos(d), -Math.sin(d)];
}
