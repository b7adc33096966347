// Synthetic faults with a known tip line, written here independently of the engine (its own profile formulas,
// geometry and random numbers), so the tip-line tests do not share code with what they test.
import type { PickColumns } from "@/lib/engine/types";

/** Displacement profiles of the truth, centre (r = 0) to tip (r = 1), each with its source. */
export const TRUTH_PROFILES = {
  // Walsh & Watterson (1987), in its product form (1 − r)^1.5·(1 + 3r)^0.5
  "walsh-watterson": (r: number) => (r >= 1 ? 0 : Math.pow(1 - r, 1.5) * Math.sqrt(1 + 3 * r)),
  // elliptical crack, Pollard & Segall (1987)
  "elliptical-crack": (r: number) => (r >= 1 ? 0 : Math.sqrt((1 - r) * (1 + r))),
  // linear taper, constant tip gradient: Muraoka & Kamata (1983); Dawers et al. (1993)
  linear: (r: number) => (r >= 1 ? 0 : 1 - r),
  // parabolic bull's-eye (common practice, no source)
  parabolic: (r: number) => (r >= 1 ? 0 : (1 - r) * (1 + r)),
  // flat-topped with steep tips, tapering linearly over the outer 45 %: restricted faults, Nicol et al. (1996)
  "flat-topped": (r: number) => (r >= 1 ? 0 : r <= 0.55 ? 1 : (1 - r) / 0.45),
  // a shape none of the engine's candidates has exactly: flat top with a cosine taper over the outer half (from memory:
  // a smooth restricted-fault profile; used only to check the range stays honest on an unseen shape)
  "cosine-taper": (r: number) => (r >= 1 ? 0 : r <= 0.5 ? 1 : 0.5 * (1 + Math.cos((Math.PI * (r - 0.5)) / 0.5))),
  // two more shapes outside the candidates (common practice, no source): a bell with a long tail, a steep-shouldered one
  "long-tail-bell": (r: number) => (r >= 1 ? 0 : Math.pow(1 - r * r, 1.5)),
  "steep-shoulder": (r: number) => (r >= 1 ? 0 : Math.pow(1 - r * r * r, 0.7)),
} as const;

export type TruthProfile = keyof typeof TRUTH_PROFILES;
export type Side = "strike-start" | "strike-end" | "up-dip" | "down-dip";

export interface TruthFault {
  profile: TruthProfile;
  /** distance from the displacement maximum to the tip on each side (m) */
  reach: { strikeStartM: number; strikeEndM: number; upDipM: number; downDipM: number };
  dmaxM: number;
  strikeDeg: number;
  dipDeg: number;
  throwCutoffM: number;
  noiseM: number;
  layout: "scattered" | "lines";
  /** picks per square kilometre of fault (scattered) or pick spacing along lines / between lines (m) */
  pickCount: number;
  lineSpacingM?: number;
  /** data stop at this fraction of the reach on one side, as at a survey edge */
  edge?: { side: Side; fraction: number };
  /** sideways scatter of the picks off the plane (m) */
  planeScatterM?: number;
  /** exponent of the tip line's superellipse: 2 an ellipse (default), 4 a boxy tip line as on layer-bound faults */
  tipExponent?: number;
  seed: number;
}

/** xorshift32 (Marsaglia 2003): a random source of the test's own. */
function xorshift(seed: number): () => number {
  let x = seed >>> 0 || 0x9e3779b9;
  return () => {
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return x / 4294967296;
  };
}

/** Standard normal by the polar method (Marsaglia & Bray 1964). */
function normal(rand: () => number): number {
  for (;;) {
    const u = 2 * rand() - 1;
    const v = 2 * rand() - 1;
    const q = u * u + v * v;
    if (q > 0 && q < 1) return u * Math.sqrt((-2 * Math.log(q)) / q);
  }
}

/** Radius of (s, t) relative to a tip line of four quarter-ellipses about the origin. */
export function truthRadius(f: TruthFault, s: number, t: number): number {
  const a = s < 0 ? f.reach.strikeStartM : f.reach.strikeEndM;
  const b = t < 0 ? f.reach.upDipM : f.reach.downDipM;
  const e = f.tipExponent ?? 2;
  return Math.pow(Math.pow(Math.abs(s / a), e) + Math.pow(Math.abs(t / b), e), 1 / e);
}

export function truthLength(f: TruthFault): number {
  return f.reach.strikeStartM + f.reach.strikeEndM;
}
export function truthHeight(f: TruthFault): number {
  return f.reach.upDipM + f.reach.downDipM;
}

/** Picks of a truth fault in world coordinates (x East, y North, z Up), with their plane coordinates kept aside. */
export function truthPicks(f: TruthFault): { picks: PickColumns; s: Float64Array; t: Float64Array } {
  const rand = xorshift(f.seed * 2654435761);
  const profile = TRUTH_PROFILES[f.profile];
  const strike = (f.strikeDeg * Math.PI) / 180;
  const dipDirection = strike + Math.PI / 2;
  const dip = (f.dipDeg * Math.PI) / 180;
  // right-hand rule: the fault dips to the right of the strike direction
  const along = [Math.sin(strike), Math.cos(strike), 0];
  const down = [Math.sin(dipDirection) * Math.cos(dip), Math.cos(dipDirection) * Math.cos(dip), -Math.sin(dip)];
  const normalVector = [along[1] * down[2] - along[2] * down[1], along[2] * down[0] - along[0] * down[2], along[0] * down[1] - along[1] * down[0]];
  const origin = [512_000, 6_810_000, -2400];
  const L = truthLength(f),
    H = truthHeight(f);
  const places: [number, number][] = [];
  if (f.layout === "scattered") {
    const spacing = Math.sqrt((L * H * Math.PI) / 4 / f.pickCount);
    for (let t = -f.reach.upDipM; t <= f.reach.downDipM; t += spacing)
      for (let s = -f.reach.strikeStartM; s <= f.reach.strikeEndM; s += spacing) places.push([s + (rand() - 0.5) * spacing, t + (rand() - 0.5) * spacing]);
  } else {
    // seismic lines across strike every lineSpacingM, picks along each line at a fifth of that
    const across = f.lineSpacingM ?? 100;
    const step = across / 5;
    const offset = rand() * across;
    for (let s = -f.reach.strikeStartM + offset; s <= f.reach.strikeEndM; s += across)
      for (let t = -f.reach.upDipM; t <= f.reach.downDipM; t += step) places.push([s, t + (rand() - 0.5) * step * 0.3]);
  }
  const xs: number[] = [],
    ys: number[] = [],
    zs: number[] = [],
    throws: number[] = [],
    ss: number[] = [],
    ts: number[] = [];
  const sinDip = Math.sin(dip);
  for (const [s, t] of places) {
    const r = truthRadius(f, s, t);
    if (r >= 1) continue;
    if (f.edge) {
      const { side, fraction } = f.edge;
      if (side === "strike-start" && s < -fraction * f.reach.strikeStartM) continue;
      if (side === "strike-end" && s > fraction * f.reach.strikeEndM) continue;
      if (side === "up-dip" && t < -fraction * f.reach.upDipM) continue;
      if (side === "down-dip" && t > fraction * f.reach.downDipM) continue;
    }
    const observed = f.dmaxM * profile(r) * sinDip + f.noiseM * normal(rand);
    if (observed < f.throwCutoffM) continue;
    const off = (f.planeScatterM ?? 0) * normal(rand);
    xs.push(origin[0] + s * along[0] + t * down[0] + off * normalVector[0]);
    ys.push(origin[1] + s * along[1] + t * down[1] + off * normalVector[1]);
    zs.push(origin[2] + s * along[2] + t * down[2] + off * normalVector[2]);
    throws.push(observed);
    ss.push(s);
    ts.push(t);
  }
  const n = xs.length;
  return {
    picks: {
      x: Float64Array.from(xs),
      y: Float64Array.from(ys),
      z: Float64Array.from(zs),
      throwM: Float64Array.from(throws),
      heaveM: new Float64Array(n).fill(NaN),
      quality: new Float64Array(n).fill(NaN),
      segment: new Uint32Array(n),
      horizon: new Int32Array(n).fill(-1),
      segmentNames: ["main"],
      horizonNames: [],
      sourceRow: Uint32Array.from({ length: n }, (_, i) => i + 2),
    },
    s: Float64Array.from(ss),
    t: Float64Array.from(ts),
  };
}

/**
 * The battery: at least 50 faults drawn over shapes, aspect ratios 1–3, dips 35–85°, cut-offs 10–40 % of Dmax,
 * noise 1–3 m, scattered and line-style picks, some with the maximum off centre.
 */
export function truthBattery(
  count = 60,
  seed = 20261205,
  shapes: TruthProfile[] = ["walsh-watterson", "elliptical-crack", "linear", "parabolic", "flat-topped"],
): TruthFault[] {
  const rand = xorshift(seed);
  const out: TruthFault[] = [];
  for (let k = 0; k < count; k++) {
    const profile = shapes[k % shapes.length];
    const aspect = 1 + 2 * rand();
    const halfLength = 900 + 1600 * rand();
    const halfHeight = halfLength / aspect;
    // every third fault has its maximum off centre: up to 35 % longer on one side than the other
    const skew = k % 3 === 2 ? 0.2 + 0.15 * rand() : 0;
    const skewDip = k % 3 === 2 ? 0.1 * rand() : 0;
    const dmaxM = 60 + 90 * rand();
    const dipDeg = 35 + 50 * rand();
    const cutoffFraction = 0.1 + 0.3 * rand();
    const layout = k % 4 === 3 ? "lines" : "scattered";
    out.push({
      profile,
      reach: {
        strikeStartM: halfLength * (1 - skew),
        strikeEndM: halfLength * (1 + skew),
        upDipM: halfHeight * (1 + skewDip),
        downDipM: halfHeight * (1 - skewDip),
      },
      dmaxM,
      strikeDeg: 360 * rand(),
      dipDeg,
      throwCutoffM: cutoffFraction * dmaxM * Math.sin((dipDeg * Math.PI) / 180),
      noiseM: 1 + 2 * rand(),
      layout,
      pickCount: 1500 + Math.floor(1500 * rand()),
      lineSpacingM: 60 + 60 * rand(),
      planeScatterM: 2,
      seed: seed + 17 * k,
    });
  }
  return out;
}
