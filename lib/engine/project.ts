import type { PlaneFit } from "./types";

type Frame = Pick<PlaneFit, "centroid" | "strikeVector" | "dipVector" | "normal">;

/** Fault-plane coordinates: s along strike, t down dip, w off-plane residual, origin at the centroid. */
export function projectToPlane(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  frame: Frame,
  indices?: ArrayLike<number>,
): { s: Float64Array; t: Float64Array; w: Float64Array } {
  const n = indices ? indices.length : x.length;
  const s = new Float64Array(n);
  const t = new Float64Array(n);
  const w = new Float64Array(n);
  const [cx, cy, cz] = frame.centroid;
  const [sx, sy, sz] = frame.strikeVector;
  const [dx, dy, dz] = frame.dipVector;
  const [nx, ny, nz] = frame.normal;
  for (let k = 0; k < n; k++) {
    const i = indices ? indices[k] : k;
    const px = x[i] - cx;
    const py = y[i] - cy;
    const pz = z[i] - cz;
    s[k] = px * sx + py * sy + pz * sz;
    t[k] = px * dx + py * dy + pz * dz;
    w[k] = px * nx + py * ny + pz * nz;
  }
  return { s, t, w };
}

export function planeToWorld(s: number, t: number, frame: Frame): [number, number, number] {
  const [cx, cy, cz] = frame.centroid;
  const [sx, sy, sz] = frame.strikeVector;
  const [dx, dy, dz] = frame.dipVector;
  return [cx + s * sx + t * dx, cy + s * sy + t * dy, cz + s * sz + t * dz];
}

export function ringToWorld(ring: [number, number][], frame: Frame): [number, number, number][] {
  return ring.map(([s, t]) => planeToWorld(s, t, frame));
}
