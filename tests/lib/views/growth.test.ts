import { describe, expect, it } from "vitest";
import { backstripThrows, expansionIndex, horizonThrowBins, readThrowDepth, throwDepthAt } from "@/lib/views/growth";
import type { AnalysisReport, PickColumns } from "@/lib/engine/types";

describe("growth clues", () => {
  it("expansion index 150 m / 100 m = 1.50, accrued throw 50 m (Thorsen 1963, from memory; docs/check-values.md H1)", () => {
    expect(expansionIndex(150, 100)).toEqual({ index: 1.5, accruedThrowM: 50 });
    expect(expansionIndex(0, 100)).toBeNull();
    expect(expansionIndex(NaN, 100)).toBeNull();
  });

  it("backstrips T(H1..H5) = 10, 30, 60, 60, 60 m (docs/check-values.md H2, derived)", () => {
    const steps = backstripThrows(["H1", "H2", "H3", "H4", "H5"].map((horizon, k) => ({ horizon, throwM: [10, 30, 60, 60, 60][k] })));
    expect(steps[0]).toEqual({ from: "H1", to: null, accruedM: 10 });
    expect(steps[1].accruedM).toBe(20);
    expect(steps[2].accruedM).toBe(30);
    expect(steps[1].accruedM + steps[2].accruedM).toBe(50); // H3 → H1: 50 m
    expect(steps[3].accruedM).toBe(0);
  });

  it("reads T–z shapes as hints (signatures after Cartwright et al. 1998; docs/check-values.md H3)", () => {
    expect(readThrowDepth([60, 60, 61].map((throwM) => ({ throwM }))).pattern).toBe("constant");
    expect(readThrowDepth([10, 30, 60, 60, 60].map((throwM) => ({ throwM }))).pattern).toBe("stepped");
    expect(readThrowDepth([10, 25, 40, 55].map((throwM) => ({ throwM }))).pattern).toBe("upward-decrease");
    expect(readThrowDepth([10, 40, 60, 35, 12].map((throwM) => ({ throwM }))).pattern).toBe("c-shaped");
    expect(readThrowDepth([10, 40].map((throwM) => ({ throwM }))).pattern).toBe("too-few");
    const basis = readThrowDepth([10, 40, 60].map((throwM) => ({ throwM }))).basis;
    expect(basis).toMatch(/Cartwright et al\. \(1998\)/);
    // the reading is shown to users: published sources only, no notes on where a value came from
    expect(basis).not.toMatch(/memory|reference|section|§/i);
  });

  it("bins horizon picks along strike and reads T–z at a position (exact on a constructed case; common practice, no source)", () => {
    // plane striking north (strike vector (0,1,0)), centroid at the origin: s = y. Two horizons, throws 20 m (upper) and 50 m (lower).
    const ys = [0, 10, 20, 500, 510, 0, 10, 20, 500, 510];
    const picks: PickColumns = {
      x: new Float64Array(10),
      y: Float64Array.from(ys),
      z: Float64Array.from([-100, -100, -100, -100, -100, -400, -400, -400, -400, -400]),
      throwM: Float64Array.from([20, 22, 18, 5, 5, 50, 52, 48, 30, 30]),
      heaveM: new Float64Array(10).fill(NaN),
      quality: new Float64Array(10).fill(NaN),
      segment: new Uint32Array(10),
      horizon: Int32Array.from([0, 0, 0, 0, 0, 1, 1, 1, 1, 1]),
      segmentNames: ["main"],
      horizonNames: ["upper", "lower"],
      sourceRow: Uint32Array.from({ length: 10 }, (_, i) => i + 2),
    };
    const report = { segments: [{ id: "main", plane: { centroid: [0, 0, 0], strikeVector: [0, 1, 0] } }] } as unknown as AnalysisReport;
    const bins = horizonThrowBins(picks, report, 2);
    expect(bins).toHaveLength(4);
    const tz = throwDepthAt(bins, "main", 0);
    expect(tz.map((p) => p.horizon)).toEqual(["upper", "lower"]);
    expect(tz.map((p) => p.throwM)).toEqual([20, 50]);
    expect(tz[1].z).toBe(-400);
  });
});

describe("hw_thickness / fw_thickness columns reach the growth view", () => {
  it("are parsed (feet converted), survive pick storage, and give the expansion index per interval (Thorsen 1963, from memory)", async () => {
    const { parsePickCsv } = await import("@/lib/engine/csv");
    const { encodePicks, decodePicks } = await import("@/lib/picks/codec");
    const lines = ["x,y,z,throw,horizon,hw_thickness,fw_thickness"];
    // a plane striking north, dipping east at 45°: two horizons, the upper interval thickened in the hanging wall
    for (let i = 0; i < 6; i++)
      for (const [h, z, th, hw, fw] of [
        ["H1", -100, 20, 150, 100],
        ["H2", -300, 60, 80, 80],
      ] as const) {
        lines.push(`${-z + i * 0.01},${i * 100},${z},${th},${h},${hw},${fw}`);
      }
    const parsed = parsePickCsv(lines.join("\n"));
    expect(parsed.picks.hwThicknessM?.[0]).toBe(150);
    const stored = decodePicks(encodePicks(parsed.picks));
    expect(Array.from(stored.fwThicknessM!)).toEqual(Array.from(parsed.picks.fwThicknessM!));
    const report = { segments: [{ id: "main", plane: { centroid: [0, 0, 0], strikeVector: [0, 1, 0] } }] } as unknown as AnalysisReport;
    const tz = throwDepthAt(horizonThrowBins(stored, report, 3), "main", 0);
    expect(tz.map((p) => p.horizon)).toEqual(["H1", "H2"]);
    expect(expansionIndex(tz[0].hwThicknessM, tz[0].fwThicknessM)).toEqual({ index: 1.5, accruedThrowM: 50 });
    expect(expansionIndex(tz[1].hwThicknessM, tz[1].fwThicknessM)!.index).toBe(1);
    const feet = parsePickCsv(lines.join("\n"), { units: "ft" });
    expect(feet.picks.hwThicknessM![0]).toBeCloseTo(150 * 0.3048, 9);
    // files without the columns carry no thickness arrays (stored pick sets stay as before)
    expect(parsePickCsv("x,y,z,throw\n0,0,0,1\n0,100,0,2\n10,0,-10,3\n").picks.hwThicknessM).toBeUndefined();
  });
});
