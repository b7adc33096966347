import { generateSyntheticPicks, toCsv, type SyntheticFaultOptions } from "@/lib/engine/synthetic";
import { gaussian, mulberry32 } from "@/lib/engine/optimize";
import { profileFunction } from "@/lib/engine/profiles";
import { dipVectorOf, strikeVectorOf } from "@/lib/engine/plane";
import type { StratigraphyUnit } from "@/lib/engine/juxtaposition";
import { twtFromDepthLinear, type LinearVelocityModel } from "@/lib/engine/time-depth";

/**
 * The invented Quillon Graben demo: a fictional offshore basin screened for CO2 storage.
 * QG-1: two overlapping normal-fault segments (north and south) with a relay ramp between them.
 * QG-4: an isolated blind normal fault with an elliptical tip line, gently listric (dip 60° at its top to 44° at its base).
 * Picks are drawn from published displacement models with noise and a 10 m resolution cut-off, and scattered off the
 * fault surface by a few metres (as picks made on seismic are).
 */
const BASIN_CENTRE: [number, number, number] = [462_400, 6_731_800, -2_150];

function strikeUnit(strikeDeg: number): [number, number] {
  const radians = (strikeDeg * Math.PI) / 180;
  return [Math.sin(radians), Math.cos(radians)];
}

function qg1Segments(): SyntheticFaultOptions[] {
  const strikeDeg = 152;
  const halfLengthM = 1900;
  const overlapM = 700;
  const separationM = 260;
  const along = strikeUnit(strikeDeg);
  const across = strikeUnit(strikeDeg + 90);
  const shift = 2 * halfLengthM - overlapM;
  const common = {
    strikeDeg,
    dipDeg: 58,
    halfLengthM,
    aspectRatio: 2.1,
    noiseM: 2,
    scatterM: 2,
    throwCutoffM: 10,
    pickCount: 2600,
    profile: "walsh-watterson-1987" as const,
  };
  const north: [number, number, number] = [BASIN_CENTRE[0] - (shift / 2) * along[0], BASIN_CENTRE[1] - (shift / 2) * along[1], BASIN_CENTRE[2]];
  const south: [number, number, number] = [
    north[0] + shift * along[0] + separationM * across[0],
    north[1] + shift * along[1] + separationM * across[1],
    BASIN_CENTRE[2] - 40,
  ];
  return [
    { ...common, segment: "north", dmaxM: 78, centre: north },
    { ...common, segment: "south", dmaxM: 64, dipDeg: 61, centre: south },
  ];
}

function qg4(): SyntheticFaultOptions {
  return {
    segment: "main",
    strikeDeg: 318,
    dipDeg: 52,
    listric: { dipTopDeg: 60, dipBaseDeg: 44 },
    scatterM: 3,
    halfLengthM: 1250,
    aspectRatio: 2.3,
    dmaxM: 46,
    noiseM: 1.5,
    throwCutoffM: 10,
    pickCount: 2400,
    profile: "elliptical-crack",
    centre: [BASIN_CENTRE[0] + 5200, BASIN_CENTRE[1] + 3100, -2_600],
  };
}

export const DEMO_FAULTS = [
  {
    name: "QG-1",
    description:
      "Graben-bounding normal fault: north and south segments overlapping across a relay ramp near the crest of the storage closure. Cut-off lines of four horizons, interpreted in two-way time, depth-converted with v(z) = 1800 + 0.6·z m/s.",
    fileName: "qg-1-throw-picks.csv",
    options: qg1Segments,
    seed: 1201,
  },
  {
    name: "QG-4",
    description: "Isolated blind normal fault below the top-seal horizon, east of the closure; gently listric, flattening from about 60° to 44° with depth.",
    fileName: "qg-4-throw-picks.csv",
    options: () => [qg4()],
    seed: 4402,
  },
] as const;

export function demoPicks(name: (typeof DEMO_FAULTS)[number]["name"]) {
  const fault = DEMO_FAULTS.find((candidate) => candidate.name === name)!;
  return generateSyntheticPicks([...fault.options()], fault.seed);
}

export function demoCsv(name: (typeof DEMO_FAULTS)[number]["name"]) {
  return toCsv(demoPicks(name).picks);
}

/** The demo study's coordinate reference: WGS 84 / UTM zone 31N, z above mean sea level (MSL height). */
export const DEMO_COORDINATE_REFERENCE = { epsg: 32631, verticalEpsg: 5714 };
// ---- QG-1's cut-off lines, in two-way time ------------------------------------------------------------------------

/** The velocity model the demo's interpreters state for the Quillon Graben: v(z) = 1800 + 0.6 z m/s (invented). */
export const DEMO_VELOCITY: LinearVelocityModel = { kind: "linear", v0MPerS: 1800, kPerS: 0.6 };
export const DEMO_CUTOFF_FILE = "qg-1-cutoff-lines.csv";

/** The invented horizons, with the footwall depth of each at the basin centre (m) and the units below them. */
const DEMO_HORIZONS = [
  { name: "Top Vell Claystone", depthM: 1700 },
  { name: "Top Quillon Sandstone", depthM: 2000 },
  { name: "Top Harl Shale", depthM: 2090 },
  { name: "Top Brack Sandstone", depthM: 2135 },
] as const;

/** The study's stratigraphy: a claystone seal over the Quillon Sandstone store, a thin shale, a deeper sandstone. */
export const DEMO_STRATIGRAPHY: StratigraphyUnit[] = [
  { name: "Vell Claystone", topHorizon: "Top Vell Claystone", kind: "seal", clayFraction: 0.65 },
  { name: "Quillon Sandstone", topHorizon: "Top Quillon Sandstone", kind: "reservoir", clayFraction: 0.12 },
  { name: "Harl Shale", topHorizon: "Top Harl Shale", kind: "seal", clayFraction: 0.55 },
  { name: "Brack Sandstone", topHorizon: "Top Brack Sandstone", kind: "reservoir", clayFraction: 0.18 },
];

/**
 * QG-1's cut-off lines from the same displacement model as its picks: on each segment's plane, the footwall cut-off
 * of a horizon (dipping 1.5 % along strike) and the hanging-wall one moved down dip by the displacement there (found by
 * fixed-point iteration, so the midpoint carries the model's throw); vertices every 50 m along strike where the throw
 * is at least 10 m, written in two-way time with DEMO_VELOCITY, about 0.8 ms of picking noise. The hanging-wall cut-off
 * of Top Harl Shale on the north segment stops 300 m short of its end (not interpretable there), so some stations
 * have one wall only.
 */
export function demoCutoffCsv(): string {
  const rand = mulberry32(1807);
  const rows = ["x,y,twt,horizon,wall,segment"];
  for (const segment of qg1Segments()) {
    const strikeDeg = segment.strikeDeg!;
    const dipDeg = segment.dipDeg!;
    const a = segment.halfLengthM!;
    const b = a / segment.aspectRatio!;
    const f = profileFunction(segment.profile!);
    const sv = strikeVectorOf(strikeDeg);
    const dv = dipVectorOf((strikeDeg + 90) % 360, dipDeg);
    const sinDip = Math.sin((dipDeg * Math.PI) / 180);
    const centre = segment.centre!;
    const displacement = (s: number, t: number) => {
      const r = Math.hypot(s / a, t / b);
      return r >= 1 ? 0 : segment.dmaxM! * f(r);
    };
    for (const horizon of DEMO_HORIZONS) {
      const vertices: { s: number; tFw: number; tHw: number }[] = [];
      for (let s = -a; s <= a; s += 50) {
        const u = s + (centre[0] - BASIN_CENTRE[0]) * sv[0] + (centre[1] - BASIN_CENTRE[1]) * sv[1];
        const zFw = -(horizon.depthM + 0.015 * u);
        const tFw = (centre[2] - zFw) / sinDip;
        let d = 0;
        for (let k = 0; k < 30; k++) d = displacement(s, tFw + d / 2);
        if (d * sinDip < 10) continue;
        vertices.push({ s, tFw, tHw: tFw + d });
      }
      const shortHw = segment.segment === "north" && horizon.name === "Top Harl Shale";
      for (const wall of ["fw", "hw"] as const) {
        const lastS = shortHw && wall === "hw" ? vertices[vertices.length - 1].s - 300 : Infinity;
        for (const vertex of vertices) {
          if (vertex.s > lastS) continue;
          const t = wall === "fw" ? vertex.tFw : vertex.tHw;
          const x = centre[0] + vertex.s * sv[0] + t * dv[0] + gaussian(rand);
          const y = centre[1] + vertex.s * sv[1] + t * dv[1] + gaussian(rand);
          const z = centre[2] + t * dv[2];
          const twtMs = twtFromDepthLinear(-z, DEMO_VELOCITY.v0MPerS, DEMO_VELOCITY.kPerS) + 0.8 * gaussian(rand);
          rows.push(`${x.toFixed(2)},${y.toFixed(2)},${twtMs.toFixed(2)},${horizon.name},${wall},${segment.segment}`);
        }
      }
    }
  }
  return `${rows.join("\n")}\n`;
}

export const DEMO_PASSWORD = "quillon-demo-1";
export const DEMO_ACCOUNTS = [
  { email: "owner@quillon.test", name: "Maren Ostby", role: "owner" },
  { email: "interpreter@quillon.test", name: "Tomas Iverson", role: "interpreter" },
  { email: "reviewer@quillon.test", name: "Ada Nwosu", role: "reviewer" },
  { email: "viewer@quillon.test", name: "Luis Ferreira", role: "viewer" },
] as const;
