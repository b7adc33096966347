import { describe, expect, it } from "vitest";
import { areasByPair, juxtapose, juxtapositionCsv, pairKind, type JuxtapositionTraces, type StratigraphyUnit } from "@/lib/engine/juxtaposition";
import { sgrAtPoint, sgrGuideWords, SGR_THRESHOLD, shaleGougeRatio, type ColumnUnit } from "@/lib/engine/sgr";

const SIN60 = Math.sin(Math.PI / 3);
const units: StratigraphyUnit[] = [
  { name: "Sand A", topHorizon: "H1", kind: "reservoir", clayFraction: 0.1 },
  { name: "Shale B", topHorizon: "H2", kind: "seal", clayFraction: 0.8 },
];

/** Footwall H1 −1000 m, H2 −1100 m (unit A 100 m thick); the hanging wall thrown down by throw(s). */
function twoUnitFault(stationsS: number[], throwAt: (s: number) => number): JuxtapositionTraces {
  return {
    stationsS,
    dipDeg: 60,
    horizons: [
      { name: "H1", fwZ: stationsS.map(() => -1000), hwZ: stationsS.map((s) => -1000 - throwAt(s)) },
      { name: "H2", fwZ: stationsS.map(() => -1100), hwZ: stationsS.map((s) => -1100 - throwAt(s)) },
    ],
  };
}

const areaOf = (result: ReturnType<typeof juxtapose>, hw: string, fw: string) => result.areas.find((a) => a.hwUnit === hw && a.fwUnit === fw)?.areaM2 ?? 0;

describe("juxtaposition areas on a two-unit fault, against areas computed by hand (diagram after Allan 1989; docs/check-values.md J1, J2)", () => {
  it("constant throw 50 m over 1000 m: three strips of 50 m × 1000 m", () => {
    const result = juxtapose(
      twoUnitFault([0, 500, 1000], () => 50),
      units,
    );
    // diagram from the footwall's H1 (−1000 m) to the hanging wall's H2 (−1150 m)
    expect(result.windowAreaM2).toBeCloseTo(150_000, 6);
    expect(areaOf(result, "undescribed", "Sand A")).toBeCloseTo(50_000, 6);
    expect(areaOf(result, "Sand A", "Sand A")).toBeCloseTo(50_000, 6);
    expect(areaOf(result, "Sand A", "Shale B")).toBeCloseTo(50_000, 6);
    expect(result.areas).toHaveLength(3);
    const sandOnSand = result.areas.find((a) => a.hwUnit === "Sand A" && a.fwUnit === "Sand A")!;
    expect(sandOnSand.pair).toBe("reservoir-reservoir");
    expect(sandOnSand.planeAreaM2).toBeCloseTo(50_000 / SIN60, 6);
    expect(sandOnSand.polygons).toHaveLength(1);
    expect(sandOnSand.polygons[0]).toEqual([
      [0, -1050],
      [500, -1050],
      [1000, -1050],
      [1000, -1100],
      [500, -1100],
      [0, -1100],
    ]);
  });

  it("throw growing from 20 m to 120 m along strike, stations only at the ends: sand on sand closes at s = 800 m (T = 100 m)", () => {
    const result = juxtapose(
      twoUnitFault([0, 1000], (s) => 20 + 0.1 * s),
      units,
    );
    // sand on sand: 100 − T for T < 100 m, ∫0^800 (80 − 0.1 s) ds = 64,000 − 32,000
    expect(areaOf(result, "Sand A", "Sand A")).toBeCloseTo(32_000, 6);
    // hanging-wall sand on footwall shale: T up to s = 800 m, then the whole 100 m: 48,000 + 20,000
    expect(areaOf(result, "Sand A", "Shale B")).toBeCloseTo(68_000, 6);
    // undescribed hanging-wall rock on footwall sand: min(T, 100)
    expect(areaOf(result, "undescribed", "Sand A")).toBeCloseTo(68_000, 6);
    // undescribed on shale once T > 100 m: ∫800^1000 (0.1 s − 80) ds
    expect(areaOf(result, "undescribed", "Shale B")).toBeCloseTo(2_000, 6);
    // the diagram: 100 + T high, ∫0^1000 (120 + 0.1 s) ds
    expect(result.windowAreaM2).toBeCloseTo(170_000, 6);
    const byPair = areasByPair(result.areas);
    expect(byPair["reservoir-reservoir"].areaM2).toBeCloseTo(32_000, 6);
    expect(byPair["reservoir-seal"].areaM2).toBeCloseTo(68_000, 6);
    expect(byPair["reservoir-other"].areaM2).toBeCloseTo(68_000, 6);
    expect(byPair["no-reservoir"].areaM2).toBeCloseTo(2_000, 6);
    // the sand-on-sand polygon is the triangle-topped strip ending at the breakpoint s = 800 m
    const polygon = result.areas.find((a) => a.hwUnit === "Sand A" && a.fwUnit === "Sand A")!.polygons[0];
    expect(polygon.map(([s, z]) => [Number(s.toFixed(6)), Number(z.toFixed(6))])).toEqual([
      [0, -1020],
      [800, -1100],
      [0, -1100],
    ]);
  });

  it("stations with a missing cut-off are left out of the diagram, and units whose top horizon is absent are named", () => {
    const traces = twoUnitFault([0, 500, 1000], () => 50);
    traces.horizons[1].hwZ[2] = null;
    const result = juxtapose(traces, [...units, { name: "Deep sand", topHorizon: "H9", kind: "reservoir", clayFraction: 0.05 }]);
    expect(result.coveredLengthM).toBe(500);
    expect(areaOf(result, "Sand A", "Sand A")).toBeCloseTo(25_000, 6);
    expect(result.unplaced).toEqual(["Deep sand"]);
  });

  it("where the top horizon's cut-offs end, the diagram spans the horizons left, the unit above reaching to the top", () => {
    // H1 has no cut-offs at s = 1000 and 1500 m: there the diagram runs from H2's footwall (−1100 m) to its hanging
    // wall (−1150 m), and the hanging wall's unit above H2 is sand A; the interval where H1 ends (500–1000 m) is left out
    const traces = twoUnitFault([0, 500, 1000, 1500], () => 50);
    traces.horizons[0].hwZ[2] = traces.horizons[0].hwZ[3] = null;
    traces.horizons[0].fwZ[2] = traces.horizons[0].fwZ[3] = null;
    const result = juxtapose(traces, units);
    expect(result.coveredLengthM).toBe(1000);
    expect(areaOf(result, "Sand A", "Shale B")).toBeCloseTo(25_000 + 25_000, 6);
    expect(areaOf(result, "Sand A", "Sand A")).toBeCloseTo(25_000, 6);
    expect(areaOf(result, "undescribed", "Sand A")).toBeCloseTo(25_000, 6);
    expect(result.windowAreaM2).toBeCloseTo(150 * 500 + 50 * 500, 6);
    expect(result.notes.join(" ")).toMatch(/where a horizon's cut-offs end/);
  });

  it("what meets what, and the CSV of the areas", () => {
    expect(pairKind("reservoir", "reservoir")).toBe("reservoir-reservoir");
    expect(pairKind("seal", "reservoir")).toBe("reservoir-seal");
    expect(pairKind("undescribed", "reservoir")).toBe("reservoir-other");
    expect(pairKind("seal", "other")).toBe("no-reservoir");
    const csv = juxtapositionCsv(
      "main",
      juxtapose(
        twoUnitFault([0, 1000], () => 50),
        units,
      ),
    )
      .trim()
      .split("\n");
    expect(csv[0]).toBe(
      "segment,hanging_wall_unit,hanging_wall_kind,footwall_unit,footwall_kind,what_meets_what,area_along_strike_by_vertical_m2,area_on_fault_plane_m2,share_of_diagram_percent",
    );
    expect(csv).toContain("main,Sand A,reservoir,Sand A,reservoir,reservoir against reservoir: possible cross-fault pathway,50000.0,57735.0,33.33");
  });
});

describe("shale gouge ratio SGR = Σ Vsh·Δz / T (Yielding, Freeman & Needham 1997), checked by hand", () => {
  it("the worked example docs/check-values.md F1: layers 20 m at 0.1, 10 m at 0.8, 20 m at 0.3, T = 50 m → 32.0 %", () => {
    expect(
      shaleGougeRatio([
        { thicknessM: 20, clayFraction: 0.1 },
        { thicknessM: 10, clayFraction: 0.8 },
        { thicknessM: 20, clayFraction: 0.3 },
      ]),
    ).toBeCloseTo(0.32, 12);
  });

  // the same three layers as a footwall column: A 0 to −20 m, B −20 to −30 m, C −30 to −50 m
  const column: ColumnUnit[] = [
    { topZ: 0, baseZ: -20, clayFraction: 0.1 },
    { topZ: -20, baseZ: -30, clayFraction: 0.8 },
    { topZ: -30, baseZ: -50, clayFraction: 0.3 },
  ];

  it("at chosen points: the window runs from the point up by the throw through the footwall column", () => {
    // z = −50 m, T = 50 m: the whole column, 16 / 50
    expect(sgrAtPoint(column, -50, 50)).toBeCloseTo(0.32, 12);
    // z = −40 m, T = 30 m: 10 m of each layer, (1 + 8 + 3) / 30
    expect(sgrAtPoint(column, -40, 30)).toBeCloseTo(0.4, 12);
    // z = −30 m, T = 5 m: inside the shale only
    expect(sgrAtPoint(column, -30, 5)).toBeCloseTo(0.8, 12);
    // z = −20 m, T = 20 m: all in sand A
    expect(sgrAtPoint(column, -20, 20)).toBeCloseTo(0.1, 12);
  });

  it("no value where the window leaves the described column, meets a unit of unknown shale fraction, or the throw is zero", () => {
    expect(sgrAtPoint(column, -10, 30)).toBeNaN();
    expect(sgrAtPoint([{ topZ: 0, baseZ: -50, clayFraction: null }], -40, 10)).toBeNaN();
    expect(sgrAtPoint(column, -40, 0)).toBeNaN();
  });

  it("the ~20 % threshold is a guide on either side (docs/check-values.md F2: 19 % below, 21 % above)", () => {
    expect(SGR_THRESHOLD).toBe(0.2);
    expect(sgrGuideWords(0.19)).toMatch(/^below the ~20 % guide/);
    expect(sgrGuideWords(0.21)).toMatch(/^at or above the ~20 % guide/);
    expect(sgrGuideWords(NaN)).toBe("not computed");
  });
});
