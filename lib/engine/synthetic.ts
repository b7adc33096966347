// Synthetic fault picks from published isolated-fault models: elliptical tip line (Barnett et al. 1987) with a
// Walsh & Watterson (1989) or elliptical-crack (Pollard & Segall 1987) profile, truncated at a throw cut-off.
import type { PickColumns, ProfileModel } from "./types";
import { profileFunction } from "./profiles";
import { gaussian, mulberry32 } from "./optimize";
import { dipVectorOf, strikeVectorOf } from "./plane";

export { mulberry32 };

export interface SyntheticFaultOptions {
  seed?: number;
  segment?: string;
  strikeDeg?: number;
  dipDeg?: number;
  /** along-strike half-length a of the tip line (m) */
  halfLengthM?: number;
  /** L/H = a/b */
  aspectRatio?: number;
  /** maximum displacement (m), in the fault plane */
  dmaxM?: number;
  profile?: ProfileModel;
  /** standard deviation of Gaussian throw noise (m) */
  noiseM?: number;
  /** picks with throw below this are dropped, as below seismic resolution (m) */
  throwCutoffM?: number;
  /** picks inside the tip line before the cut-off */
  pickCount?: number;
  /** tip-line centre in world coordinates (x East, y North, z Up) */
  centre?: [number, number, number];
}

export interface SyntheticTruth {
  segment: string;
  lengthM: number;
  heightM: number;
  halfLengthM: number;
  halfHeightM: number;
  dmaxM: number;
  strikeDeg: number;
  dipDeg: number;
  profile: ProfileModel;
  centre: [number, number, number];
}

/** growing plain columns shared by all faults (no per-pick objects, so a million picks stay cheap) */
interface RawColumns { x: number[]; y: number[]; z: number[]; throwM: number[] }

function faultPicks(o: SyntheticFaultOptions, rand: () => number, out: RawColumns): { count: number; truth: SyntheticTruth } {
  const strikeDeg = o.strikeDeg ?? 30;
  const dipDeg = o.dipDeg ?? 60;
  const a = o.halfLengthM ?? 1500;
  const b = a / (o.aspectRatio ?? 2);
  const dmaxM = o.dmaxM ?? 80;
  const profile = o.profile ?? "walsh-watterson-1987";
  const f = profileFunction(profile);
  const noiseM = o.noiseM ?? 2;
  const cutoff = o.throwCutoffM ?? 10;
  const n = o.pickCount ?? 2000;
  const centre = o.centre ?? [450000, 6700000, -2000];
  const segment = o.segment ?? "main";
  const sv = strikeVectorOf(strikeDeg);
  const dv = dipVectorOf((strikeDeg + 90) % 360, dipDeg);
  const sinDip = Math.sin((dipDeg * Math.PI) / 180);
  const h = Math.sqrt((Math.PI * a * b) / n);
  let count = 0;
  for (let j = 0; j * h < 2 * b; j++) {
    for (let i = 0; i * h < 2 * a; i++) {
      const s = -a + (i + 0.5 + 0.6 * (rand() - 0.5)) * h;
      const t = -b + (j + 0.5 + 0.6 * (rand() - 0.5)) * h;
      const r = Math.hypot(s / a, t / b);
      if (r >= 1) continue;
      const throwM = dmaxM * f(r) * sinDip + noiseM * gaussian(rand);
      if (throwM < cutoff || throwM < 0) continue;
      out.x.push(centre[0] + s * sv[0] + t * dv[0]);
      out.y.push(centre[1] + s * sv[1] + t * dv[1]);
      out.z.push(centre[2] + s * sv[2] + t * dv[2]);
      out.throwM.push(throwM);
      count++;
    }
  }
  return {
    count,
    truth: { segment, lengthM: 2 * a, heightM: 2 * b, halfLengthM: a, halfHeightM: b, dmaxM, strikeDeg, dipDeg, profile, centre },
  };
}

/** Picks for one or more synthetic faults (one segment each), deterministic for a given seed. */
export function generateSyntheticPicks(faults: SyntheticFaultOptions | SyntheticFaultOptions[], seed = 1): { picks: PickColumns; truth: SyntheticTruth[] } {
  const list = Array.isArray(faults) ? faults : [faults];
  const rand = mulberry32(list[0]?.seed ?? seed);
  const raw: RawColumns = { x: [], y: [], z: [], throwM: [] };
  const names: string[] = [];
  const segmentOf: number[] = [];
  const truth: SyntheticTruth[] = [];
  list.forEach((o, k) => {
    const r = faultPicks({ segment: list.length > 1 ? `F${k + 1}` : "main", ...o }, rand, raw);
    truth.push(r.truth);
    if (r.count === 0) return;
    let si = names.indexOf(r.truth.segment);
    if (si < 0) si = names.push(r.truth.segment) - 1;
    for (let i = 0; i < r.count; i++) segmentOf.push(si);
  });
  const n = raw.x.length;
  const picks: PickColumns = {
    x: Float64Array.from(raw.x),
    y: Float64Array.from(raw.y),
    z: Float64Array.from(raw.z),
    throwM: Float64Array.from(raw.throwM),
    heaveM: new Float64Array(n).fill(NaN),
    quality: new Float64Array(n).fill(NaN),
    segment: Uint32Array.from(segmentOf),
    horizon: new Int32Array(n).fill(-1),
    segmentNames: names,
    horizonNames: [],
    sourceRow: Uint32Array.from({ length: n }, (_, i) => i + 2),
  };
  return { picks, truth };
}

/** Two overlapping, sub-parallel segments forming a relay (the second offset along strike and across it). */
export function syntheticRelayOptions(overrides: Partial<SyntheticFaultOptions> = {}, overlapM = 600, separationM = 150): SyntheticFaultOptions[] {
  const strikeDeg = overrides.strikeDeg ?? 30;
  const a = overrides.halfLengthM ?? 1500;
  const centre = overrides.centre ?? [450000, 6700000, -2000];
  const sv = strikeVectorOf(strikeDeg);
  const perp = strikeVectorOf(strikeDeg + 90);
  const shift = 2 * a - overlapM;
  const second: [number, number, number] = [
    centre[0] + shift * sv[0] + separationM * perp[0],
    centre[1] + shift * sv[1] + separationM * perp[1],
    centre[2],
  ];
  return [
    { ...overrides, segment: "F1", centre },
    { ...overrides, segment: "F2", centre: second },
  ];
}

export function toCsv(picks: PickColumns): string {
  const lines = ["x,y,z,throw,segment"];
  for (let i = 0; i < picks.x.length; i++) {
    lines.push(`${picks.x[i].toFixed(3)},${picks.y[i].toFixed(3)},${picks.z[i].toFixed(3)},${picks.throwM[i].toFixed(3)},${picks.segmentNames[picks.segment[i]]}`);
  }
  return lines.join("\n") + "\n";
}
