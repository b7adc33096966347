// Pure dip-slip relations between throw T, heave H, displacement D and dip δ (Groshong 2006, eq. 8.3):
// T = D sin δ, H = D cos δ, D = sqrt(T² + H²), δ = atan(T / H).
const RAD = Math.PI / 180;

export function displacementFromThrow(throwM: number, dipDeg: number): number {
  return throwM / Math.sin(dipDeg * RAD);
}

/** The throw of a dip-slip displacement: T = D sin δ. */
export function throwFromDisplacement(displacementM: number, dipDeg: number): number {
  return displacementM * Math.sin(dipDeg * RAD);
}

export function heaveFromThrow(throwM: number, dipDeg: number): number {
  return throwM / Math.tan(dipDeg * RAD);
}

export function dipFromThrowHeave(throwM: number, heaveM: number): number {
  return Math.atan2(throwM, heaveM) / RAD;
}

/** sin(dip), as the displacement of picks divides by it. */
export function sinOfDip(dipDeg: number): number {
  return Math.sin(dipDeg * RAD);
}

/** One pick's displacement: from throw and heave where heave is given, otherwise throw / sin(dip) (sinDip: sinOfDip). */
export function pickDisplacement(throwM: number, heaveM: number, sinDip: number): number {
  return Number.isFinite(heaveM) ? Math.hypot(throwM, heaveM) : throwM / sinDip;
}

/** Displacement per pick: from throw and heave where heave is given, otherwise throw / sin(dip). */
export function displacementColumn(throwM: ArrayLike<number>, heaveM: ArrayLike<number>, dipDeg: number): Float64Array {
  const out = new Float64Array(throwM.length);
  const sinDip = sinOfDip(dipDeg);
  for (let i = 0; i < out.length; i++) out[i] = pickDisplacement(throwM[i], heaveM[i], sinDip);
  return out;
}
