// Pure dip-slip relations between throw T, heave H, displacement D and dip δ (Groshong 2006, eq. 8.3):
// T = D sin δ, H = D cos δ, D = sqrt(T² + H²), δ = atan(T / H).
const RAD = Math.PI / 180;

export function displacementFromThrow(throwM: number, dipDeg: number): number {
  return throwM / Math.sin(dipDeg * RAD);
}

export function heaveFromThrow(throwM: number, dipDeg: number): number {
  return throwM / Math.tan(dipDeg * RAD);
}

export function dipFromThrowHeave(throwM: number, heaveM: number): number {
  return Math.atan2(throwM, heaveM) / RAD;
}

export function displacementFromThrowHeave(throwM: number, heaveM: number): number {
  return Math.hypot(throwM, heaveM);
}

/** Displacement per pick: from throw and heave where heave is given, otherwise throw / sin(dip). */
export function displacementColumn(throwM: ArrayLike<number>, heaveM: ArrayLike<number>, dipDeg: number): Float64Array {
  const out = new Float64Array(throwM.length);
  const sinDip = Math.sin(dipDeg * RAD);
  for (let i = 0; i < out.length; i++) {
    const h = heaveM[i];
    out[i] = Number.isFinite(h) ? Math.hypot(throwM[i], h) : throwM[i] / sinDip;
  }
  return out;
}
