// Synthetic curved faults made here, independently of the engine (own geometry, own random numbers), with their truth:
// - listric: a circular-arc (constant-curvature) profile, the dip falling linearly with distance down the fault
//   from 68° at the top of the tip line to 38° at its base; straight along strike (common practice, no source).
// - corrugated: a plane of dip 60° with a sine undulation of its surface along strike, w = A·sin(2π s/λ), axes down
//   the dip (common practice, no source).
// Displacement is an elliptical crack (Pollard & Segall 1987) D = Dmax·√(1 − r²), r² = (u/a)² + (v/b)², with u and v
// measured along the surface (arc length), so the field is symmetric on the surface. Slip is pure dip-slip down the
// local dip, so throw = D·sin(local dip). Picks below the throw cut-off are dropped, as below seismic resolution.
import type { PickColumns } from "@/lib/engine/types";

const RAD = Math.PI / 180;

export interface CurvedFault {
  kind: "listric" | "corrugated";
  /** half-length and half-height of the tip line along the surface (m) */
  a: number;
  b: number;
  dmaxM: number;
  strikeDeg: number;
  throwCutoffM: number;
  throwNoiseM: number;
  /** scatter of the picks off the surface, along its normal (m) */
  scatterM: number;
  /** pick spacing on the surface (m) */
  spacingM: number;
  seed: number;
  /** listric: dip at the top and base of the tip line (degrees) */
  dipTopDeg?: number;
  dipBaseDeg?: number;
  /** corrugated: plane dip, amplitude and wavelength (degrees, m, m) */
  dipDeg?: number;
  amplitudeM?: number;
  wavelengthM?: number;
}

export const CENTRE: [number, number, number] = [431_000, 6_652_000, -2_400];

/** xorshift32 (Marsaglia 2003) and the polar method (Marsaglia & Bray 1964): this file's own random numbers. */
function random(seed: number) {
  let x = seed >>> 0 || 0x9e3779b9;
  const uniform = () => {
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return x / 4294967296;
  };
  const normal = () => {
    for (;;) {
      const p = 2 * uniform() - 1,
        q = 2 * uniform() - 1,
        r = p * p + q * q;
      if (r > 0 && r < 1) return p * Math.sqrt((-2 * Math.log(r)) / r);
    }
  };
  return { uniform, normal };
}

type Vec = [number, number, number];
const add = (...vs: [number, Vec][]): Vec => vs.reduce<Vec>((acc, [k, v]) => [acc[0] + k * v[0], acc[1] + k * v[1], acc[2] + k * v[2]], [0, 0, 0]);

export interface SurfaceTruth {
  /** world point of surface coordinates (u, v), u along strike and v down dip, both arc lengths from the centre */
  point(u: number, v: number): Vec;
  /** unit normal (upward) and local dip there */
  normal(u: number, v: number): Vec;
  dipDeg(u: number, v: number): number;
}

/** The fault's surface as a function of arc-length coordinates. */
export function surfaceTruth(f: CurvedFault): SurfaceTruth {
  const strike: Vec = [Math.sin(f.strikeDeg * RAD), Math.cos(f.strikeDeg * RAD), 0];
  const across: Vec = [Math.sin((f.strikeDeg + 90) * RAD), Math.cos((f.strikeDeg + 90) * RAD), 0];
  const up: Vec = [0, 0, 1];
  const unit = (v: Vec): Vec => {
    const l = Math.hypot(...v);
    return [v[0] / l, v[1] / l, v[2] / l];
  };
  const dipOfNormal = (n: Vec) => Math.acos(Math.abs(n[2])) / RAD;
  if (f.kind === "listric") {
    // δ(v) = δ0 − κ v: a circular arc; x (horizontal, down the dip direction) and z from integrating cos δ and −sin δ
    const top = f.dipTopDeg! * RAD,
      base = f.dipBaseDeg! * RAD;
    const kappa = (top - base) / (2 * f.b);
    const delta0 = (top + base) / 2;
    const dip = (v: number) => delta0 - kappa * v;
    return {
      point: (u, v) =>
        add([1, CENTRE], [u, strike], [(Math.sin(delta0) - Math.sin(dip(v))) / kappa, across], [(Math.cos(delta0) - Math.cos(dip(v))) / kappa, up]),
      normal: (_u, v) => unit(add([Math.sin(dip(v)), across], [Math.cos(dip(v)), up])),
      dipDeg: (_u, v) => dip(v) / RAD,
    };
  }
  // corrugated: P = C + σ ŝ + v d̂ + A sin(kσ) n̂ with σ the plane coordinate along strike; u is the arc length in σ
  const delta = f.dipDeg! * RAD;
  const down: Vec = add([Math.cos(delta), across], [-Math.sin(delta), up]);
  const plane: Vec = add([Math.sin(delta), across], [Math.cos(delta), up]);
  const k = (2 * Math.PI) / f.wavelengthM!;
  const A = f.amplitudeM!;
  // σ(u) by integrating du/dσ = √(1 + (A k cos kσ)²) on a fine table, inverted by interpolation
  const step = 0.5;
  const sigmas: number[] = [0];
  const us: number[] = [0];
  const span = 2 * f.a;
  for (let s = 0; us[us.length - 1] < span; s += step) {
    const mid = s + step / 2;
    sigmas.push(s + step);
    us.push(us[us.length - 1] + step * Math.sqrt(1 + (A * k * Math.cos(k * mid)) ** 2));
  }
  const sigmaOf = (u: number) => {
    const sign = u < 0 ? -1 : 1;
    const target = Math.abs(u);
    let lo = 0,
      hi = us.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (us[mid] <= target) lo = mid;
      else hi = mid;
    }
    const f2 = (target - us[lo]) / (us[hi] - us[lo]);
    return sign * (sigmas[lo] + f2 * (sigmas[hi] - sigmas[lo]));
  };
  // the undulation is odd in σ, so σ(−u) = −σ(u)
  const normalAt = (sigma: number): Vec => unit(add([1, plane], [-A * k * Math.cos(k * sigma), strike]));
  return {
    point: (u, v) => {
      const sigma = sigmaOf(u);
      return add([1, CENTRE], [sigma, strike], [v, down], [A * Math.sin(k * sigma), plane]);
    },
    normal: (u) => normalAt(sigmaOf(u)),
    dipDeg: (u) => dipOfNormal(normalAt(sigmaOf(u))),
  };
}

/** Picks on a jittered lattice in (u, v) over the tip line, with their true positions (before scatter). */
export function curvedFaultPicks(f: CurvedFault): { picks: PickColumns; truth: SurfaceTruth; truePositions: Vec[] } {
  const truth = surfaceTruth(f);
  const rand = random(f.seed);
  const x: number[] = [],
    y: number[] = [],
    z: number[] = [],
    throws: number[] = [];
  const truePositions: Vec[] = [];
  const h = f.spacingM;
  for (let v = -f.b + h / 2; v < f.b; v += h) {
    for (let u = -f.a + h / 2; u < f.a; u += h) {
      const pu = u + 0.6 * h * (rand.uniform() - 0.5);
      const pv = v + 0.6 * h * (rand.uniform() - 0.5);
      const r2 = (pu / f.a) ** 2 + (pv / f.b) ** 2;
      if (r2 >= 1) continue;
      const d = f.dmaxM * Math.sqrt(1 - r2);
      const t = d * Math.sin(truth.dipDeg(pu, pv) * RAD) + f.throwNoiseM * rand.normal();
      if (t < f.throwCutoffM) continue;
      const p = truth.point(pu, pv);
      const n = truth.normal(pu, pv);
      const off = f.scatterM * rand.normal();
      truePositions.push(p);
      x.push(p[0] + off * n[0]);
      y.push(p[1] + off * n[1]);
      z.push(p[2] + off * n[2]);
      throws.push(t);
    }
  }
  const count = x.length;
  return {
    truth,
    truePositions,
    picks: {
      x: Float64Array.from(x),
      y: Float64Array.from(y),
      z: Float64Array.from(z),
      throwM: Float64Array.from(throws),
      heaveM: new Float64Array(count).fill(NaN),
      quality: new Float64Array(count).fill(NaN),
      segment: new Uint32Array(count),
      horizon: new Int32Array(count).fill(-1),
      segmentNames: ["main"],
      horizonNames: [],
      sourceRow: Uint32Array.from({ length: count }, (_, i) => i + 2),
    },
  };
}

export const LISTRIC: CurvedFault = {
  kind: "listric",
  a: 1500,
  b: 600,
  dmaxM: 80,
  strikeDeg: 30,
  dipTopDeg: 68,
  dipBaseDeg: 38,
  throwCutoffM: 3,
  throwNoiseM: 0.3,
  scatterM: 2,
  spacingM: 20,
  seed: 1717,
};

export const CORRUGATED: CurvedFault = {
  kind: "corrugated",
  a: 1500,
  b: 650,
  dmaxM: 80,
  strikeDeg: 30,
  dipDeg: 60,
  amplitudeM: 110,
  wavelengthM: 1200,
  throwCutoffM: 3,
  throwNoiseM: 0.3,
  scatterM: 2,
  spacingM: 20,
  seed: 2929,
};
