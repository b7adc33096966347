// Dip-slip and oblique-slip relations between throw T, heave H, displacement (net slip) D, dip δ and rake r.
// Dip slip (Groshong 2006, 3-D Structural Geology, eq. 8.3): T = D sin δ, H = D cos δ, D = sqrt(T² + H²).
// Oblique slip: the slip vector of length D at rake r (from the strike, in the fault surface) has a dip-slip part
// D·|sin r| and a strike-slip part D·cos r; only the dip-slip part offsets a horizon vertically, so T = D·|sin r|·sin δ.
const RAD = Math.PI / 180;

export function displacementFromThrow(throwM: number, dipDeg: number, rakeDeg = 90): number {
  return throwM / (Math.sin(dipDeg * RAD) * Math.abs(Math.sin(rakeDeg * RAD)));
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

/** Strike-slip and dip-slip parts of a slip of length D at rake r (degrees). */
export function slipComponents(displacementM: number, rakeDeg: number): { strikeSlipM: number; dipSlipM: number } {
  return { strikeSlipM: displacementM * Math.cos(rakeDeg * RAD), dipSlipM: displacementM * Math.abs(Math.sin(rakeDeg * RAD)) };
}

/**
 * Displacement per pick: the dip-slip part from throw and heave where heave is given (their vector sum), otherwise
 * throw / sin(dip), then divided by |sin(rake)| for oblique slip. `dipDeg` and `rakeDeg` are one value for every pick or
 * one per pick (the local dip of a curved surface). The sign of the throw is kept (negative: offset of the opposite sense).
 */
export function displacementColumn(
  throwM: ArrayLike<number>,
  heaveM: ArrayLike<number>,
  dipDeg: number | ArrayLike<number>,
  rakeDeg: number | ArrayLike<number> = 90,
): Float64Array {
  const out = new Float64Array(throwM.length);
  const dipOf = typeof dipDeg === "number" ? () => dipDeg : (i: number) => dipDeg[i];
  const rakeOf = typeof rakeDeg === "number" ? () => rakeDeg : (i: number) => rakeDeg[i];
  for (let i = 0; i < out.length; i++) {
    const h = heaveM[i];
    const t = throwM[i];
    const dipSlip = Number.isFinite(h) ? (t < 0 ? -1 : 1) * Math.hypot(t, h) : t / Math.sin(dipOf(i) * RAD);
    out[i] = dipSlip / Math.abs(Math.sin(rakeOf(i) * RAD));
  }
  return out;
}
