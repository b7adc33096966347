// A segment's fault-plane frame and the one transform between it and the world: a world point is
// centroid + s·strikeVector + t·dipVector + h·normal (m; x East, y North, z Up; s along strike, t down dip, h off the
// plane along its normal). Pure and browser-safe: the engine, the display payload, the 3D scene, the stress screen and
// the exports all place points with these functions.

/** The frame: a centroid and three unit vectors (strike, dip, normal), world metres. */
export interface PlaneFrame {
  centroid: ArrayLike<number>;
  strikeVector: ArrayLike<number>;
  dipVector: ArrayLike<number>;
  normal: ArrayLike<number>;
}

/** The world position (float64) of the plane point (s, t), raised h along the normal. */
export function planeToWorld(frame: PlaneFrame, s: number, t: number, h = 0): [number, number, number] {
  const { centroid: c, strikeVector: sv, dipVector: dv, normal: nv } = frame;
  return [c[0] + s * sv[0] + t * dv[0] + h * nv[0], c[1] + s * sv[1] + t * dv[1] + h * nv[1], c[2] + s * sv[2] + t * dv[2] + h * nv[2]];
}

/** planeToWorld written into out[offset..offset+2] (the 3D scene's Float32 vertex arrays). */
export function writePlaneToWorld(frame: PlaneFrame, s: number, t: number, h: number, out: Float32Array, offset: number): void {
  const { centroid: c, strikeVector: sv, dipVector: dv, normal: nv } = frame;
  for (let axis = 0; axis < 3; axis++) out[offset + axis] = c[axis] + s * sv[axis] + t * dv[axis] + h * nv[axis];
}

/** The plane coordinates (s, t) and the distance h off the plane of a world point. */
export function worldToPlane(frame: PlaneFrame, x: number, y: number, z: number): [number, number, number] {
  const { centroid: c, strikeVector: sv, dipVector: dv, normal: nv } = frame;
  const px = x - c[0];
  const py = y - c[1];
  const pz = z - c[2];
  return [px * sv[0] + py * sv[1] + pz * sv[2], px * dv[0] + py * dv[1] + pz * dv[2], px * nv[0] + py * nv[1] + pz * nv[2]];
}

/** worldToPlane for many points at once (columns of picks, optionally those at `indices`): s, t and w = h. */
export function projectToPlane(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  frame: PlaneFrame,
  indices?: ArrayLike<number>,
): { s: Float64Array; t: Float64Array; w: Float64Array } {
  const n = indices ? indices.length : x.length;
  const s = new Float64Array(n);
  const t = new Float64Array(n);
  const w = new Float64Array(n);
  const [cx, cy, cz] = [frame.centroid[0], frame.centroid[1], frame.centroid[2]];
  const [sx, sy, sz] = [frame.strikeVector[0], frame.strikeVector[1], frame.strikeVector[2]];
  const [dx, dy, dz] = [frame.dipVector[0], frame.dipVector[1], frame.dipVector[2]];
  const [nx, ny, nz] = [frame.normal[0], frame.normal[1], frame.normal[2]];
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

/** The same frame with its centroid moved by `origin` (a frame kept relative to a local origin, made world again). */
export function shiftedFrame(frame: PlaneFrame, origin: ArrayLike<number>): PlaneFrame {
  return { ...frame, centroid: [origin[0] + frame.centroid[0], origin[1] + frame.centroid[1], origin[2] + frame.centroid[2]] };
}
