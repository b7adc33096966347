// What the optional `quality` column (0–1, the interpreter's confidence in a pick) does to the analysis: it weights
// the least-squares plane fit and limits a pick's influence on the interpolated surfaces. Pure, flat arrays.

/**
 * One weight per pick in [0, 1] from the quality column: the quality itself, 1 where it is blank (NaN). When every
 * weight of the selection is 0 the column carries no preference and all weights are 1. `indices` selects picks (a
 * segment); the result is aligned with it. Shared by the plane fit, the interpolation and the tip-line fits.
 */
export function pickWeights(quality: ArrayLike<number>, indices?: ArrayLike<number>): Float64Array {
  const n = indices ? indices.length : quality.length;
  const weights = new Float64Array(n);
  let total = 0;
  for (let k = 0; k < n; k++) {
    const q = quality[indices ? indices[k] : k];
    const w = Number.isFinite(q) ? Math.min(1, Math.max(0, q)) : 1;
    weights[k] = w;
    total += w;
  }
  if (n > 0 && total === 0) weights.fill(1);
  return weights;
}

/** True when some weight is below 1, i.e. the quality column changes anything. */
export function weightsMatter(weights: ArrayLike<number>): boolean {
  for (let k = 0; k < weights.length; k++) if (weights[k] < 1) return true;
  return false;
}

/**
 * Pulls each low-quality pick's values toward its Delaunay neighbours before interpolation:
 * v′ = q·v + (1 − q)·v̄, with v̄ the quality-weighted mean of the neighbours' values (plain mean when all neighbours
 * have weight 0). A pick of quality 1 keeps its value exactly, a pick of quality 0 takes its neighbours' value, so
 * the linear surface through the picks honours good picks and leans on them around doubtful ones (a one-step
 * weighted neighbourhood average; common practice, no single source). One pass over the triangles; the values of
 * the input are never changed.
 */
export function pullTowardNeighbours(values: ArrayLike<number>[], weights: ArrayLike<number>, triangles: ArrayLike<number>): Float64Array[] {
  const n = weights.length;
  const weightSum = new Float64Array(n);
  const plainCount = new Float64Array(n);
  const sums = values.map(() => new Float64Array(n));
  const plainSums = values.map(() => new Float64Array(n));
  // each triangle edge a–b adds b to a's neighbourhood and a to b's, so a neighbour counts once per triangle the two
  // share: twice inside the triangulation, once along its hull
  const addEdge = (a: number, b: number) => {
    const wb = weights[b];
    weightSum[a] += wb;
    plainCount[a] += 1;
    for (let v = 0; v < values.length; v++) {
      sums[v][a] += wb * values[v][b];
      plainSums[v][a] += values[v][b];
    }
  };
  for (let k = 0; k < triangles.length; k += 3) {
    const a = triangles[k],
      b = triangles[k + 1],
      c = triangles[k + 2];
    addEdge(a, b);
    addEdge(b, a);
    addEdge(b, c);
    addEdge(c, b);
    addEdge(c, a);
    addEdge(a, c);
  }
  return values.map((column, v) => {
    const out = Float64Array.from(column);
    for (let i = 0; i < n; i++) {
      const q = weights[i];
      if (q >= 1 || plainCount[i] === 0) continue;
      const mean = weightSum[i] > 0 ? sums[v][i] / weightSum[i] : plainSums[v][i] / plainCount[i];
      out[i] = q * column[i] + (1 - q) * mean;
    }
    return out;
  });
}

/** The sentence the fault sheet and the command line show about the quality column. */
export function qualityNote(picksBelowOne: number): string {
  if (picksBelowOne === 0) return `No pick has a quality below 1, so every pick counts fully. ${QUALITY_USE}`;
  return `${picksBelowOne.toLocaleString("en")} ${picksBelowOne === 1 ? "pick has" : "picks have"} a quality below 1. ${QUALITY_USE}`;
}

/** How the quality column is used, in the words the upload panel and the fault sheet show. */
export const QUALITY_USE =
  "Quality (0–1, blank = 1) weights each pick in the least-squares plane fit, and before gridding pulls a pick toward its neighbours by (1 − quality), so quality-1 picks are honoured exactly.";
