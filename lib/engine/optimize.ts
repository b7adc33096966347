// Small numerical tools the fits share: a derivative-free minimiser, the normal distribution's tails and a seedable
// random source, so every analysis of the same picks gives the same numbers.

/** Minimise f by the Nelder–Mead simplex (Nelder & Mead 1965, standard coefficients). */
export function nelderMead(
  f: (p: number[]) => number,
  start: number[],
  steps: number[],
  maxIterations = 600,
  tolerance = 1e-10,
): { point: number[]; value: number; iterations: number } {
  const dim = start.length;
  let simplex = [start.slice()];
  for (let i = 0; i < dim; i++) {
    const p = start.slice();
    p[i] += steps[i];
    simplex.push(p);
  }
  let values = simplex.map(f);
  let it = 0;
  for (; it < maxIterations; it++) {
    const order = values.map((_, i) => i).sort((i, j) => values[i] - values[j]);
    simplex = order.map((i) => simplex[i]);
    values = order.map((i) => values[i]);
    if (Math.abs(values[dim] - values[0]) <= tolerance * (Math.abs(values[0]) + 1e-30)) break;
    const centroid = new Array(dim).fill(0);
    for (let i = 0; i < dim; i++) for (let k = 0; k < dim; k++) centroid[k] += simplex[i][k] / dim;
    const along = (c: number) => centroid.map((v, k) => v + c * (simplex[dim][k] - v));
    const reflected = along(-1);
    const fr = f(reflected);
    if (fr < values[0]) {
      const expanded = along(-2);
      const fe = f(expanded);
      if (fe < fr) {
        simplex[dim] = expanded;
        values[dim] = fe;
      } else {
        simplex[dim] = reflected;
        values[dim] = fr;
      }
    } else if (fr < values[dim - 1]) {
      simplex[dim] = reflected;
      values[dim] = fr;
    } else {
      const contracted = fr < values[dim] ? along(-0.5) : along(0.5);
      const fc = f(contracted);
      if (fc < Math.min(fr, values[dim])) {
        simplex[dim] = contracted;
        values[dim] = fc;
      } else {
        for (let i = 1; i <= dim; i++) {
          simplex[i] = simplex[i].map((v, k) => simplex[0][k] + 0.5 * (v - simplex[0][k]));
          values[i] = f(simplex[i]);
        }
      }
    }
  }
  let best = 0;
  for (let i = 1; i <= dim; i++) if (values[i] < values[best]) best = i;
  return { point: simplex[best], value: values[best], iterations: it };
}

/** Complementary error function (Numerical Recipes erfcc, relative error < 1.2e-7). */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t *
          (1.00002368 +
            t *
              (0.37409196 +
                t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/** log of the standard normal CDF, accurate in the far lower tail. */
export function logNormalCdf(x: number): number {
  // from x ≈ 8.29 up, 0.5·erfc(−x/√2) rounds to exactly 1 in double precision, so the log is exactly 0
  if (x >= 8.5) return 0;
  if (x < -6) {
    const x2 = x * x;
    return -x2 / 2 - Math.log(-x) - 0.5 * Math.log(2 * Math.PI) + Math.log(1 - 1 / x2 + 3 / (x2 * x2));
  }
  return Math.log(0.5 * erfc(-x / Math.SQRT2));
}

/** mulberry32: small, fast, seedable PRNG returning [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A standard normal deviate (Box–Muller) from a uniform source. */
export function gaussian(rand: () => number): number {
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/**
 * Weighted quantiles of values (weights ≥ 0): each value stands at the middle of its weight and the quantile is
 * linear between neighbours. Several fractions and weightings share one sort. NaN where no value has weight.
 */
export function weightedQuantiles(values: ArrayLike<number>, weightings: ArrayLike<number>[], fractions: number[]): number[][] {
  const n = values.length;
  const order = new Uint32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(values[i])) order[count++] = i;
  const sorted = order.subarray(0, count).sort((i, j) => values[i] - values[j]);
  return weightings.map((weights) => {
    let total = 0;
    for (let k = 0; k < count; k++) total += Math.max(0, weights[sorted[k]]);
    return fractions.map((fraction) => {
      if (!(total > 0)) return NaN;
      const target = fraction * total;
      let cumulative = 0;
      let prevMid = NaN;
      let prevValue = NaN;
      for (let k = 0; k < count; k++) {
        const w = Math.max(0, weights[sorted[k]]);
        if (w === 0) continue;
        const value = values[sorted[k]];
        const mid = cumulative + w / 2;
        if (mid >= target) {
          if (Number.isNaN(prevMid)) return value;
          return prevValue + ((target - prevMid) / (mid - prevMid)) * (value - prevValue);
        }
        cumulative += w;
        prevMid = mid;
        prevValue = value;
      }
      return prevValue;
    });
  });
}

/** One weighted quantile (see weightedQuantiles). */
export function weightedQuantile(values: ArrayLike<number>, weights: ArrayLike<number>, fraction: number): number {
  return weightedQuantiles(values, [weights], [fraction])[0][0];
}

/** The k-th smallest value (0-based) by Hoare's quickselect, in place, O(n) on average — sort()[k] without the sort. */
export function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const tmp = a[i];
        a[i] = a[j];
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k];
}
