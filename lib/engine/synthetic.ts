// Synthetic fault picks from published isolated-fault models: elliptical tip line (Barnett et al. 1987) with a
// Walsh & Watterson (1989) or elliptical-crack (Pollard & Segall 1987) profile, truncated at a throw cut-off.
// Optionally listric (the dip falling linearly with distance down the fault: a circular-arc profile, straight along
// strike; common practice, no source), with s and t then arc lengths on the surface, and with the picks scattered off
// the surface along its normal (geometric picking scatter).
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
  /** listric: the dip at the top and at the base of the tip line (degrees); dipDeg is then unused */
  listric?: { dipTopDeg: number; dipBaseDeg: number };
  /** standard deviation of Gaussian scatter of the picks off the surface, along its normal (m) */
  scatterM?: number;
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
interface RawColumns {
  x: number[];
  y: number[];
  z: number[];
  throwM: number[];
}

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
  const h = Math.sqrt((Math.PI * a * b) / n);
  const rad = Math.PI / 180;
  // the surface down the dip at arc length t from the centre: horizontal (along the dip direction) and vertical offsets,
  // and the dip there; a plane unless listric (δ(t) = δ0 − κ·t, integrated in closed form)
  const across = strikeVectorOf(strikeDeg + 90);
  const dip0 = o.listric ? ((o.listric.dipTopDeg + o.listric.dipBaseDeg) / 2) * rad : (dipDeg * Math.PI) / 180;
  const kappa = o.listric ? ((o.listric.dipTopDeg - o.listric.dipBaseDeg) * rad) / (2 * b) : 0;
  const downDip = (t: number): { horizontal: number; vertical: number; dip: number } => {
    const dip = dip0 - kappa * t;
    if (kappa === 0) return { horizontal: t * Math.cos(dip0), vertical: -t * Math.sin(dip0), dip };
    return { horizontal: (Math.sin(dip0) - Math.sin(dip)) / kappa, vertical: (Math.cos(dip) - Math.cos(dip0)) / kappa, dip };
  };
  const scatterM = o.scatterM ?? 0;
  let count = 0;
  for (let j = 0; j * h < 2 * b; j++) {
    for (let i = 0; i * h < 2 * a; i++) {
      const s = -a + (i + 0.5 + 0.6 * (rand() - 0.5)) * h;
      const t = -b + (j + 0.5 + 0.6 * (rand() - 0.5)) * h;
      const r = Math.hypot(s / a, t / b);
      if (r >= 1) continue;
      const { horizontal, vertical, dip } = o.listric ? downDip(t) : { horizontal: 0, vertical: 0, dip: dip0 };
      const throwM = dmaxM * f(r) * Math.sin(dip) + noiseM * gaussian(rand);
      if (throwM < cutoff || throwM < 0) continue;
      // scatter along the upward normal: sin δ toward the dip direction, cos δ up
      const off = scatterM > 0 ? scatterM * gaussian(rand) : 0;
      if (o.listric) {
        out.x.push(centre[0] + s * sv[0] + horizontal * across[0] + off * Math.sin(dip) * across[0]);
        out.y.push(centre[1] + s * sv[1] + horizontal * across[1] + off * Math.sin(dip) * across[1]);
        out.z.push(centre[2] + vertical + off * Math.cos(dip));
      } else {
        out.x.push(centre[0] + s * sv[0] + t * dv[0] + off * Math.sin(dip) * across[0]);
        out.y.push(centre[1] + s * sv[1] + t * dv[1] + off * Math.sin(dip) * across[1]);
        out.z.push(centre[2] + s * sv[2] + t * dv[2] + off * Math.cos(dip));
      }
      out.throwM.push(throwM);
      count++;
    }
  }
  return {
    count,
    truth: {
      segment,
      lengthM: 2 * a,
      heightM: 2 * b,
      halfLengthM: a,
      halfHeightM: b,
      dmaxM,
      strikeDeg,
      dipDeg: o.listric ? dip0 / rad : dipDeg,
      profile,
      centre,
    },
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
  const second: [number, number, number] = [centre[0] + shift * sv[0] + separationM * perp[0], centre[1] + shift * sv[1] + separationM * perp[1], centre[2]];
  return [
    { ...overrides, segment: "F1", centre },
    { ...overrides, segment: "F2", centre: second },
  ];
}

export function toCsv(picks: PickColumns): string {
  const lines = ["x,y,z,throw,segment"];
  for (let i = 0; i < picks.x.length; i++) {
    lines.push(
      `${picks.x[i].toFixed(3)},${picks.y[i].toFixed(3)},${picks.z[i].toFixed(3)},${picks.throwM[i].toFixed(3)},${picks.segmentNames[picks.segment[i]]}`,
    );
  }
  return lines.join("\n") + "\n";
}
