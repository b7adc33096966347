// The juxtaposition diagram on the fault plane (Allan 1989, AAPG Bulletin 73): the hanging-wall and footwall horizon
// traces in (along strike, elevation), the units between them, and the areas where a unit of one wall faces a unit
// of the other, classified by what meets what. Reservoir facing reservoir across the fault is a possible cross-fault
// pathway; reservoir facing seal is sealed by juxtaposition alone. Pure; the traces come from the cut-off stations.
//
// The diagram covers the part of the fault between the shallowest and the deepest cut-off at each station. Each
// wall's column there is cut into bands by its own horizon traces: the band above the first horizon of the
// stratigraphy table is undescribed, each unit reaches from its top horizon down to the next unit's top, the last unit
// down to the bottom of the diagram. Every band boundary is linear between stations, so every area is integrated
// exactly (piecewise linear between the crossings of the boundaries).

export type UnitKind = "reservoir" | "seal" | "other";

export interface StratigraphyUnit {
  name: string;
  /** the horizon at the unit's top (a horizon of the cut-off file) */
  topHorizon: string;
  kind: UnitKind;
  /** shale (clay) volume fraction 0–1, for the shale gouge ratio; null when not known */
  clayFraction: number | null;
}

/** The traces of one segment, as the cut-off stations give them: elevation (m) per station, null where missing. */
export interface JuxtapositionTraces {
  stationsS: number[];
  horizons: { name: string; hwZ: (number | null)[]; fwZ: (number | null)[] }[];
  /** the reference frame's dip, for areas on the fault plane */
  dipDeg: number;
}

export type PairKind = "reservoir-reservoir" | "reservoir-seal" | "reservoir-other" | "no-reservoir";

export const PAIR_WORDS: Record<PairKind, string> = {
  "reservoir-reservoir": "reservoir against reservoir: possible cross-fault pathway",
  "reservoir-seal": "reservoir against seal: sealed by juxtaposition",
  "reservoir-other": "reservoir against other or undescribed rock",
  "no-reservoir": "no reservoir on either side",
};

/** the band above the table's first top horizon on a wall */
export const UNDESCRIBED = "undescribed";

export interface Band {
  unit: string;
  kind: UnitKind | "undescribed";
  /** top and base elevation (m) per station; NaN where the wall's traces are missing */
  topZ: number[];
  baseZ: number[];
}

export interface JuxtapositionArea {
  hwUnit: string;
  fwUnit: string;
  hwKind: Band["kind"];
  fwKind: Band["kind"];
  pair: PairKind;
  /** area in the diagram: along strike × vertical (m²) */
  areaM2: number;
  /** the same on the inclined fault plane: areaM2 / sin(dip) */
  planeAreaM2: number;
  /** closed polygons [s, z] of the facing area, one per run along strike */
  polygons: [number, number][][];
}

export interface Juxtaposition {
  stationsS: number[];
  /** top and bottom of the diagram (m) per station */
  topZ: number[];
  bottomZ: number[];
  hw: Band[];
  fw: Band[];
  areas: JuxtapositionArea[];
  /** total diagram area (m², along strike × vertical) and along-strike length covered */
  windowAreaM2: number;
  coveredLengthM: number;
  /** units of the table whose top horizon this segment has no cut-offs of */
  unplaced: string[];
  notes: string[];
}

export function pairKind(a: Band["kind"], b: Band["kind"]): PairKind {
  if (a === "reservoir" && b === "reservoir") return "reservoir-reservoir";
  if (a === "reservoir" || b === "reservoir") return a === "seal" || b === "seal" ? "reservoir-seal" : "reservoir-other";
  return "no-reservoir";
}

const value = (v: number | null | undefined) => (v === null || v === undefined ? NaN : v);

type Placed = { unit: StratigraphyUnit; trace: JuxtapositionTraces["horizons"][number] };

/**
 * The placed units whose top horizon has a cut-off on both walls at station k, when they run without a gap: [first,
 * last] in table order; null when none does or one in between is missing (the column is then not known there).
 */
export function presentRange(placed: Placed[], k: number): [number, number] | null {
  const present = placed.map(({ trace }) => trace.hwZ[k] !== null && trace.hwZ[k] !== undefined && trace.fwZ[k] !== null && trace.fwZ[k] !== undefined);
  const first = present.indexOf(true);
  if (first < 0) return null;
  const last = present.lastIndexOf(true);
  for (let i = first; i <= last; i++) if (!present[i]) return null;
  return [first, last];
}

/**
 * Bands of one wall at every station: within the diagram, the band above the first horizon present there belongs to
 * the unit above it in the table (undescribed above the table's first horizon), each present unit reaches down to the
 * next one's top, the last present one to the bottom. NaN where a band is not in the diagram at that station.
 */
function bandsOf(wall: "hwZ" | "fwZ", placed: Placed[], ranges: ([number, number] | null)[], topZ: number[], bottomZ: number[]): Band[] {
  const n = topZ.length;
  const at = (i: number, k: number) => value(placed[i].trace[wall][k]);
  const undescribed: Band = { unit: UNDESCRIBED, kind: "undescribed", topZ: new Array(n).fill(NaN), baseZ: new Array(n).fill(NaN) };
  const units: Band[] = placed.map(({ unit }) => ({ unit: unit.name, kind: unit.kind, topZ: new Array(n).fill(NaN), baseZ: new Array(n).fill(NaN) }));
  for (let k = 0; k < n; k++) {
    const range = ranges[k];
    if (!range) continue;
    const [first, last] = range;
    const above = first === 0 ? undescribed : units[first - 1];
    above.topZ[k] = topZ[k];
    above.baseZ[k] = at(first, k);
    for (let i = first; i <= last; i++) {
      units[i].topZ[k] = at(i, k);
      units[i].baseZ[k] = i < last ? at(i + 1, k) : bottomZ[k];
    }
  }
  return [undescribed, ...units];
}

/**
 * Facing length of two bands between two stations, as a piecewise linear function of s: its breakpoints (where any two
 * of the four boundaries cross) and its values there. Exact: between breakpoints every boundary keeps its order.
 */
function facingPieces(s0: number, s1: number, a: Band, b: Band, k: number): { s: number[]; upper: number[]; lower: number[] } {
  const lines = [a.topZ, a.baseZ, b.topZ, b.baseZ].map((z) => [z[k], z[k + 1]] as const);
  const cuts = new Set<number>([0, 1]);
  for (let i = 0; i < 4; i++) {
    for (let j = i + 1; j < 4; j++) {
      const d0 = lines[i][0] - lines[j][0];
      const d1 = lines[i][1] - lines[j][1];
      if (d0 * d1 < 0) cuts.add(d0 / (d0 - d1));
    }
  }
  const fractions = [...cuts].sort((x, y) => x - y);
  const at = (line: readonly [number, number], f: number) => line[0] + f * (line[1] - line[0]);
  const s: number[] = [],
    upper: number[] = [],
    lower: number[] = [];
  for (const f of fractions) {
    s.push(s0 + f * (s1 - s0));
    upper.push(Math.min(at(lines[0], f), at(lines[2], f)));
    lower.push(Math.max(at(lines[1], f), at(lines[3], f)));
  }
  return { s, upper, lower };
}

/** The juxtaposition of one segment: bands of both walls and every facing area, classified. */
export function juxtapose(traces: JuxtapositionTraces, units: StratigraphyUnit[]): Juxtaposition {
  const n = traces.stationsS.length;
  const notes: string[] = [];
  const placed = units
    .map((unit) => ({ unit, trace: traces.horizons.find((h) => h.name.trim().toLowerCase() === unit.topHorizon.trim().toLowerCase()) }))
    .filter((entry): entry is { unit: StratigraphyUnit; trace: JuxtapositionTraces["horizons"][number] } => Boolean(entry.trace));
  const unplaced = units.filter((unit) => !placed.some((entry) => entry.unit === unit)).map((unit) => unit.name);
  const ranges = traces.stationsS.map((_, k) => presentRange(placed, k));
  const topZ: number[] = [];
  const bottomZ: number[] = [];
  for (let k = 0; k < n; k++) {
    const range = ranges[k];
    let top = -Infinity,
      bottom = Infinity;
    if (range) {
      for (let i = range[0]; i <= range[1]; i++) {
        for (const z of [placed[i].trace.hwZ[k] as number, placed[i].trace.fwZ[k] as number]) {
          top = Math.max(top, z);
          bottom = Math.min(bottom, z);
        }
      }
    }
    topZ.push(range ? top : NaN);
    bottomZ.push(range ? bottom : NaN);
  }
  if (placed.length === 0) {
    notes.push("none of the stratigraphy table's top horizons has cut-offs on this segment");
    return { stationsS: traces.stationsS, topZ, bottomZ, hw: [], fw: [], areas: [], windowAreaM2: 0, coveredLengthM: 0, unplaced, notes };
  }
  const ordered = placed.every((entry, i) => i === 0 || meanOf(entry.trace.fwZ) <= meanOf(placed[i - 1].trace.fwZ));
  if (!ordered) notes.push("the table's order of units differs from the order of their footwall cut-offs in depth; the table's order is used");
  if (ranges.some((range, k) => range && (range[0] > 0 || range[1] < placed.length - 1) && Number.isFinite(topZ[k]))) {
    notes.push("where a horizon's cut-offs end, the diagram spans the horizons that remain, the unit above the first of them reaching to its top");
  }
  /** between stations k and k + 1 the same horizons are present: the diagram is drawn and measured there */
  const spans = (k: number) => Boolean(ranges[k] && ranges[k + 1] && ranges[k]![0] === ranges[k + 1]![0] && ranges[k]![1] === ranges[k + 1]![1]);
  const hw = bandsOf("hwZ", placed, ranges, topZ, bottomZ);
  const fw = bandsOf("fwZ", placed, ranges, topZ, bottomZ);
  const sin = Math.sin((traces.dipDeg * Math.PI) / 180);

  let windowAreaM2 = 0;
  let coveredLengthM = 0;
  for (let k = 0; k + 1 < n; k++) {
    if (!spans(k)) continue;
    const ds = traces.stationsS[k + 1] - traces.stationsS[k];
    coveredLengthM += ds;
    windowAreaM2 += (ds * (topZ[k] - bottomZ[k] + topZ[k + 1] - bottomZ[k + 1])) / 2;
  }
  const areas: JuxtapositionArea[] = [];
  for (const a of hw) {
    for (const b of fw) {
      let areaM2 = 0;
      const polygons: [number, number][][] = [];
      let upperRun: [number, number][] = [];
      let lowerRun: [number, number][] = [];
      const closeRun = () => {
        if (upperRun.length >= 2) {
          // where the strip closes its two edges share a point: keep it once
          const ring = [...upperRun, ...lowerRun.reverse()].filter((p, i, all) => i === 0 || p[0] !== all[i - 1][0] || p[1] !== all[i - 1][1]);
          polygons.push(ring);
        }
        upperRun = [];
        lowerRun = [];
      };
      for (let k = 0; k + 1 < n; k++) {
        if (!spans(k) || ![a.topZ[k], a.topZ[k + 1], b.topZ[k], b.topZ[k + 1]].every(Number.isFinite)) {
          closeRun();
          continue;
        }
        const { s, upper, lower } = facingPieces(traces.stationsS[k], traces.stationsS[k + 1], a, b, k);
        for (let p = 0; p + 1 < s.length; p++) {
          const l0 = Math.max(0, upper[p] - lower[p]);
          const l1 = Math.max(0, upper[p + 1] - lower[p + 1]);
          areaM2 += ((s[p + 1] - s[p]) * (l0 + l1)) / 2;
          if (l0 > 0 || l1 > 0) {
            // the facing strip: at a breakpoint where it closes, its upper and lower edges meet
            if (upperRun.length === 0 || upperRun[upperRun.length - 1][0] !== s[p]) {
              closeRun();
              upperRun.push([s[p], l0 > 0 ? upper[p] : lower[p]]);
              lowerRun.push([s[p], lower[p]]);
            }
            upperRun.push([s[p + 1], l1 > 0 ? upper[p + 1] : lower[p + 1]]);
            lowerRun.push([s[p + 1], lower[p + 1]]);
          } else closeRun();
        }
      }
      closeRun();
      if (areaM2 <= 0) continue;
      areas.push({
        hwUnit: a.unit,
        fwUnit: b.unit,
        hwKind: a.kind,
        fwKind: b.kind,
        pair: pairKind(a.kind, b.kind),
        areaM2,
        planeAreaM2: sin > 0 ? areaM2 / sin : NaN,
        polygons,
      });
    }
  }
  return { stationsS: traces.stationsS, topZ, bottomZ, hw, fw, areas, windowAreaM2, coveredLengthM, unplaced, notes };
}

function meanOf(values: (number | null)[]): number {
  let sum = 0,
    count = 0;
  for (const v of values)
    if (v !== null && Number.isFinite(v)) {
      sum += v;
      count++;
    }
  return count ? sum / count : NaN;
}

/** Areas summed by what meets what (m², diagram and fault plane). */
export function areasByPair(areas: JuxtapositionArea[]): Record<PairKind, { areaM2: number; planeAreaM2: number }> {
  const out = Object.fromEntries((Object.keys(PAIR_WORDS) as PairKind[]).map((kind) => [kind, { areaM2: 0, planeAreaM2: 0 }])) as Record<
    PairKind,
    { areaM2: number; planeAreaM2: number }
  >;
  for (const area of areas) {
    out[area.pair].areaM2 += area.areaM2;
    out[area.pair].planeAreaM2 += area.planeAreaM2;
  }
  return out;
}

/** The areas as CSV rows (one per facing pair of units), for export. */
export function juxtapositionCsv(segment: string, result: Juxtaposition): string {
  const quote = (text: string) => (/[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text);
  const lines = [
    "segment,hanging_wall_unit,hanging_wall_kind,footwall_unit,footwall_kind,what_meets_what,area_along_strike_by_vertical_m2,area_on_fault_plane_m2,share_of_diagram_percent",
  ];
  for (const area of result.areas) {
    lines.push(
      [
        quote(segment),
        quote(area.hwUnit),
        area.hwKind,
        quote(area.fwUnit),
        area.fwKind,
        quote(PAIR_WORDS[area.pair]),
        area.areaM2.toFixed(1),
        Number.isFinite(area.planeAreaM2) ? area.planeAreaM2.toFixed(1) : "",
        result.windowAreaM2 > 0 ? ((100 * area.areaM2) / result.windowAreaM2).toFixed(2) : "",
      ].join(","),
    );
  }
  return `${lines.join("\n")}\n`;
}
