import { generateSyntheticPicks, toCsv, type SyntheticFaultOptions } from "@/lib/engine/synthetic";

/**
 * The invented Quillon Graben demo: a fictional offshore basin screened for CO2 storage.
 * QG-1: two overlapping normal-fault segments (north and south) with a relay ramp between them.
 * QG-4: an isolated blind normal fault with an elliptical tip line.
 * Picks are drawn from published displacement models with noise and a 10 m resolution cut-off.
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
  const common = { strikeDeg, dipDeg: 58, halfLengthM, aspectRatio: 2.1, noiseM: 2, throwCutoffM: 10, pickCount: 2600, profile: "walsh-watterson-1987" as const };
  const north: [number, number, number] = [BASIN_CENTRE[0] - (shift / 2) * along[0], BASIN_CENTRE[1] - (shift / 2) * along[1], BASIN_CENTRE[2]];
  const south: [number, number, number] = [north[0] + shift * along[0] + separationM * across[0], north[1] + shift * along[1] + separationM * across[1], BASIN_CENTRE[2] - 40];
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
    description: "Graben-bounding normal fault: north and south segments overlapping across a relay ramp near the crest of the storage closure.",
    fileName: "qg-1-throw-picks.csv",
    options: qg1Segments,
    seed: 1201,
  },
  {
    name: "QG-4",
    description: "Isolated blind normal fault below the top-seal horizon, east of the closure.",
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

export const DEMO_PASSWORD = "quillon-demo-1";
export const DEMO_ACCOUNTS = [
  { email: "owner@quillon.test", name: "Maren Ostby", role: "owner" },
  { email: "interpreter@quillon.test", name: "Tomas Iverson", role: "interpreter" },
  { email: "reviewer@quillon.test", name: "Ada Nwosu", role: "reviewer" },
  { email: "viewer@quillon.test", name: "Luis Ferreira", role: "viewer" },
] as const;
