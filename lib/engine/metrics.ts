import type { RegularGrid } from "./types";

/** D–L fits in log space; one fault contributes one (L, Dmax) pair. */
export function fitDisplacementLength(lengthM: number[], dmaxM: number[], method: "ols" | "rma" = "rma"): { n: number; c: number; r: number; count: number } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < lengthM.length; i++) {
    if (lengthM[i] > 0 && dmaxM[i] > 0) {
      xs.push(Math.log10(lengthM[i]));
      ys.push(Math.log10(dmaxM[i]));
    }
  }
  const k = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / k;
  const my = ys.reduce((a, b) => a + b, 0) / k;
  let sxx = 0,
    syy = 0,
    sxy = 0;
  for (let i = 0; i < k; i++) {
    sxx += (xs[i] - mx) ** 2;
    syy += (ys[i] - my) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  const r = sxy / Math.sqrt(sxx * syy);
  const olsSlope = sxy / sxx;
  // reduced major axis: slope = sign(r)·s_y/s_x, for errors in both D and L (common practice)
  const n = method === "ols" ? olsSlope : Math.sign(r) * Math.sqrt(syy / sxx);
  return { n, c: 10 ** (my - n * mx), r, count: k };
}

export const DL_PLAUSIBLE_MIN = 1e-3;
export const DL_PLAUSIBLE_MAX = 1e-1;

/** Schlische et al. (1996), 201 faults of the Danville basin: D = 0.03 L. */
export function schlischeDisplacementM(lengthM: number): number {
  return 0.03 * lengthM;
}

/** Where Dmax/L sits against published ranges, in plain words. */
export function scalingNote(dmaxM: number, lengthM: number): { dOverL: number; note: string; plausible: boolean } {
  const dOverL = dmaxM / lengthM;
  const plausible = dOverL >= DL_PLAUSIBLE_MIN && dOverL <= DL_PLAUSIBLE_MAX;
  const range = plausible
    ? "inside the 0.001–0.1 range of isolated faults (Barnett et al. 1987)"
    : `outside the 0.001–0.1 range of isolated faults (Barnett et al. 1987); check the throw units, the tip line and whether this is one fault`;
  const schlische = schlischeDisplacementM(lengthM);
  const relative = dmaxM > schlische ? "more" : "less";
  const note =
    `Dmax/L = ${dOverL.toPrecision(3)}, ${range}. ` +
    `The linear trend D = 0.03 L of Schlische et al. (1996) predicts ${schlische.toFixed(1)} m for this length; this fault has ${relative} displacement (${dmaxM.toFixed(1)} m). ` +
    `Published D–L scatter is about half an order of magnitude (Cartwright et al. 1995), so treat this as a check, not a constraint.`;
  return { dOverL, note, plausible };
}

/** Aspect ratio screen: Nicol et al. (1996) report 1.0–3.4 (mean 2.15) for unrestricted normal faults. */
export function aspectRatioNote(aspectRatio: number): string | null {
  if (aspectRatio < 1 || aspectRatio > 3.4)
    return `aspect ratio ${aspectRatio.toFixed(2)} is outside 1.0–3.4 reported for unrestricted normal faults (Nicol et al. 1996); review the tip line`;
  return null;
}

/** Mean and max of the displacement gradient magnitude on the grid (central differences, m/m). */
export function gridGradients(grid: RegularGrid): { meanPerM: number; maxPerM: number } {
  const { columns, rows, cellM, displacementM: d } = grid;
  let sum = 0,
    count = 0,
    max = 0;
  for (let j = 1; j < rows - 1; j++) {
    for (let i = 1; i < columns - 1; i++) {
      const k = j * columns + i;
      const gx = (d[k + 1] - d[k - 1]) / (2 * cellM);
      const gy = (d[k + columns] - d[k - columns]) / (2 * cellM);
      const g = Math.hypot(gx, gy);
      if (!Number.isFinite(g)) continue;
      sum += g;
      count++;
      if (g > max) max = g;
    }
  }
  return { meanPerM: count ? sum / count : NaN, maxPerM: max };
}

/** Displacement-weighted centroid of the grid (s, t). */
export function displacementCentroid(grid: RegularGrid): { s: number; t: number } {
  let w = 0,
    ws = 0,
    wt = 0;
  for (let j = 0; j < grid.rows; j++) {
    for (let i = 0; i < grid.columns; i++) {
      const v = grid.displacementM[j * grid.columns + i];
      if (!(v > 0)) continue;
      w += v;
      ws += v * (grid.s0 + i * grid.cellM);
      wt += v * (grid.t0 + j * grid.cellM);
    }
  }
  return w > 0 ? { s: ws / w, t: wt / w } : { s: NaN, t: NaN };
}
