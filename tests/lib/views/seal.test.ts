import { describe, expect, it } from "vitest";
import type { FaultDisplay } from "@/lib/contracts/display";
import { parseCutoffCsv } from "@/lib/engine/cutoffs";
import { deriveFromCutoffs } from "@/lib/engine/cutoff-stations";
import type { StratigraphyUnit } from "@/lib/engine/juxtaposition";
import { footwallColumnAt, sgrField, traceAt } from "@/lib/views/seal";
import { sgrAtPoint } from "@/lib/engine/sgr";
import { alongStrike, cutoffCsv } from "../engine/cutoff-fixtures";

const SIN60 = Math.sin(Math.PI / 3);
// three flat horizons thrown down 50 m on the 60° fault: footwall H1 −1000, H2 −1020, H3 −1050 m
const summary = deriveFromCutoffs(
  parseCutoffCsv(
    cutoffCsv(
      (
        [
          ["H1", -1000],
          ["H2", -1020],
          ["H3", -1050],
        ] as const
      ).flatMap(([horizon, z]) => [
        { horizon, wall: "fw" as const, points: alongStrike(0, 1000, 11, () => z) },
        { horizon, wall: "hw" as const, points: alongStrike(0, 1000, 11, () => z - 50) },
      ]),
    ),
  ),
).summary;
// the layers of the published worked example (docs/check-values.md F1): 20 m at 0.1, 30 m at 0.8, then 0.3
const units: StratigraphyUnit[] = [
  { name: "A", topHorizon: "H1", kind: "reservoir", clayFraction: 0.1 },
  { name: "B", topHorizon: "H2", kind: "seal", clayFraction: 0.8 },
  { name: "C", topHorizon: "H3", kind: "other", clayFraction: 0.3 },
];

/** A shown surface on the cut-offs' own plane: 3 × 3 nodes, rows at elevations −1030, −1050, −1070 m, throw 50 m. */
function surface(): FaultDisplay {
  const frame = summary.segments[0].frame;
  const cellM = 20 / SIN60;
  const t0 = (frame.centroid[2] + 1030) / SIN60;
  const grid = { s0: -cellM, t0, cellM, columns: 3, rows: 3, displacementM: new Float32Array(9).fill(50 / SIN60), throwM: new Float32Array(9).fill(50) };
  return {
    version: 1,
    origin: [...frame.centroid],
    segments: [
      {
        id: "main",
        frame: {
          centroid: [0, 0, 0],
          strikeVector: frame.strikeVector,
          dipVector: frame.dipVector,
          normal: frame.normal,
          strikeDeg: frame.strikeDeg,
          dipDeg: frame.dipDeg,
        },
        grid,
        contours: { intervalM: 10, levelsM: [], points: new Float32Array(0), ringStarts: new Uint32Array(1), ringLevelIndex: new Uint16Array(0) },
        tipLine: [],
        mappedLimit: [],
        max: { displacementM: 0, throwM: 0, s: 0, t: 0 },
      },
    ],
    picks: {
      count: 0,
      totalCount: 0,
      position: new Float32Array(0),
      displacementM: new Float32Array(0),
      residualM: new Float32Array(0),
      segmentIndex: new Uint16Array(0),
    },
    displacementRangeM: [0, 60],
    throwRangeM: [0, 50],
  };
}

describe("SGR on the shown surface, node by node (Yielding, Freeman & Needham 1997; checked by hand)", () => {
  it("reads the footwall column at the node's place along strike", () => {
    const segment = summary.segments[0];
    expect(traceAt(segment.stationsS, segment.horizons[1].fwZ, 12.5)).toBeCloseTo(-1020, 9);
    const column = footwallColumnAt(segment, units, 0)!;
    expect(column.map((u) => [Number(u.topZ.toFixed(6)), Number(u.baseZ.toFixed(6))])).toEqual([
      [-1000, -1020],
      [-1020, -1050],
      [-1050, -Infinity],
    ]);
  });

  it("at −1050 m the 50 m window holds 20 m of A and 30 m of B: (2 + 24) / 50 = 52 %; at −1070 m (24 + 6) / 50 = 60 %; at −1030 m the window leaves the table's column: no value", () => {
    const field = sgrField(surface(), summary, units);
    const values = Array.from(field.bySegment.main);
    for (const column of [0, 1, 2]) {
      expect(values[column]).toBeNaN();
      expect(values[3 + column]).toBeCloseTo(52, 4);
      expect(values[6 + column]).toBeCloseTo(60, 4);
    }
    expect(field.computed).toBe(6);
    expect(field.withThrow).toBe(9);
    expect(field.range).toEqual([0, 60]);
  });

  it("where the first horizon's cut-offs end the column starts at the next one, the unit above it reaching upward", () => {
    const segment = structuredClone(summary.segments[0]);
    segment.horizons[0].fwZ = segment.horizons[0].fwZ.map((z, k) => (k >= 5 ? null : z));
    // at s = 300 m H1 is gone: A reaches above H2 (−1020 m); at −1030 m the window [−1030, −980] m is 10 m of B and
    // 40 m of A: (8 + 4) / 50
    const column = footwallColumnAt(segment, units, 300)!;
    expect(column[0]).toEqual({ topZ: Infinity, baseZ: expect.closeTo(-1020, 6), clayFraction: 0.1 });
    expect(column).toHaveLength(3);
    expect(sgrAtPoint(column, -1030, 50)).toBeCloseTo(0.24, 9);
    // a missing horizon between two present ones leaves the column unknown
    segment.horizons[1].fwZ = segment.horizons[1].fwZ.map(() => null);
    expect(footwallColumnAt(segment, units, -300)).toBeNull();
  });

  it("a unit of unknown shale fraction in the window leaves the node without a value", () => {
    const field = sgrField(
      surface(),
      summary,
      units.map((unit) => (unit.name === "B" ? { ...unit, clayFraction: null } : unit)),
    );
    expect(field.computed).toBe(0);
  });
});
