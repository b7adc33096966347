// Shale gouge ratio (Yielding, Freeman & Needham 1997, AAPG Bulletin 81, 897–917): at a point on a fault, the share of
// shale in the rock that has slipped past it,
//   SGR = Σ (Vsh_i · Δz_i) / T
// over the layers i of the throw window (thickness Δz_i inside it, shale volume fraction Vsh_i), T the throw there.
// Here the window is the footwall column from the point's elevation z up to z + T: on a fault with throw T, the rock
// beside the point in the hanging wall started T higher, so that interval of the footwall sequence has moved past it.
// The published threshold of about 20 % between faults that hold little across-fault pressure difference and faults
// that seal is a screening guide, not a verdict.

/** SGR near which fault rock changes from little to significant sealing capacity (Yielding et al. 1997): a guide */
export const SGR_THRESHOLD = 0.2;

export const SGR_SOURCE = "Yielding, Freeman & Needham 1997";

/** One unit of a footwall column at one place: its top and base elevation (m, up) and shale fraction (null: unknown). */
export interface ColumnUnit {
  topZ: number;
  baseZ: number;
  clayFraction: number | null;
}

/** SGR (fraction 0–1) of a throw window given as the layers inside it: Σ Vsh·Δz / Σ Δz, the throw being their sum. */
export function shaleGougeRatio(layers: { thicknessM: number; clayFraction: number }[]): number {
  let shale = 0;
  let throwM = 0;
  for (const layer of layers) {
    shale += layer.clayFraction * layer.thicknessM;
    throwM += layer.thicknessM;
  }
  return throwM > 0 ? shale / throwM : NaN;
}

/**
 * SGR (fraction) at a point at elevation zM with throw throwM, from the footwall column there. NaN where the throw is
 * not positive, or part of the window lies outside the described units or in a unit of unknown shale fraction.
 */
export function sgrAtPoint(column: ColumnUnit[], zM: number, throwM: number): number {
  if (!(throwM > 0) || !Number.isFinite(zM)) return NaN;
  const windowBase = zM;
  const windowTop = zM + throwM;
  let shale = 0;
  let covered = 0;
  for (const unit of column) {
    const overlap = Math.min(windowTop, unit.topZ) - Math.max(windowBase, unit.baseZ);
    if (!(overlap > 0)) continue;
    if (unit.clayFraction === null) return NaN;
    shale += unit.clayFraction * overlap;
    covered += overlap;
  }
  // the units tile the column, so the window is described only if they cover all of it
  if (covered < throwM * (1 - 1e-9)) return NaN;
  return shale / throwM;
}

/** Which side of the published guide an SGR falls on, in words (never a verdict). */
export function sgrGuideWords(sgr: number): string {
  if (!Number.isFinite(sgr)) return "not computed";
  return sgr < SGR_THRESHOLD
    ? "below the ~20 % guide: little capacity to hold an across-fault pressure difference is expected"
    : "at or above the ~20 % guide: some sealing capacity is possible";
}
