import { describe, expect, it } from "vitest";
import { analyzeCsv, analyzePicks, ENGINE_VERSION } from "@/lib/engine/pipeline";
import { generateSyntheticPicks, syntheticRelayOptions, toCsv } from "@/lib/engine/synthetic";

describe("analysis pipeline", () => {
  const { picks, truth } = generateSyntheticPicks({ seed: 7, strikeDeg: 140, dipDeg: 55, halfLengthM: 1000, aspectRatio: 2, dmaxM: 60, throwCutoffM: 8, noiseM: 1.5, pickCount: 1200 });

  it("reports plane, maximum, grid and contours for one segment, and stages in order", () => {
    const stages: string[] = [];
    const { report, grids } = analyzeCsv(toCsv(picks), { onStage: (s) => stages.push(s) });
    expect(report.engineVersion).toBe(ENGINE_VERSION);
    expect(stages[0]).toBe("parse");
    expect(stages.at(-1)).toBe("done");
    const seg = report.segments[0];
    expect(seg.plane.strikeDeg).toBeCloseTo(140, 0);
    expect(seg.plane.dipDeg).toBeCloseTo(55, 0);
    // throw = D sin δ at the maximum (Groshong 2006)
    expect(seg.max.throwM).toBeCloseTo(seg.max.displacementM * Math.sin((seg.plane.dipDeg * Math.PI) / 180), 6);
    expect(seg.max.displacementM).toBeGreaterThan(0.9 * truth[0].dmaxM);
    const grid = grids[seg.id];
    expect(grid.displacementM.length).toBe(grid.columns * grid.rows);
    expect(grid.displacementM.some(Number.isNaN)).toBe(true);
    expect(seg.contours.length).toBeGreaterThanOrEqual(4);
    for (const c of seg.contours) for (const ring of c.rings) for (const [s, t] of ring) {
      expect(s).toBeGreaterThanOrEqual(grid.s0 - 1e-6);
      expect(t).toBeLessThanOrEqual(grid.t0 + (grid.rows - 1) * grid.cellM + 1e-6);
    }
    expect(seg.scaling.plausible).toBe(true);
    expect(seg.tipLine.worldPolygon[0][2]).toBeLessThan(0);
    // JSON-safe: no typed arrays in the report
    const round = JSON.parse(JSON.stringify(report));
    expect(round.segments[0].contours[0].rings[0][0]).toHaveLength(2);
  });

  it("respects the contour interval and cell size options", () => {
    const { report, grids } = analyzePicks(picks, { intervalM: 5, cellM: 20 });
    expect(report.segments[0].contourIntervalM).toBe(5);
    expect(report.segments[0].contours[0].levelM).toBe(5);
    expect(grids.main.cellM).toBe(20);
  });

  // relay geometry as defined by Peacock & Sanderson (1994); O/S compared with Long & Imber (2011)
  it("measures overlap and separation between two overlapping segments", () => {
    const relay = generateSyntheticPicks(syntheticRelayOptions({ seed: 11, halfLengthM: 1200, dmaxM: 70, throwCutoffM: 8, noiseM: 1.5, pickCount: 1200 }, 500, 120));
    const { report } = analyzePicks(relay.picks);
    expect(report.segments).toHaveLength(2);
    expect(report.relays).toHaveLength(1);
    const r = report.relays[0];
    expect(r.segments).toEqual(["F1", "F2"]);
    expect(r.overlapM).toBeGreaterThan(450);
    expect(r.overlapM).toBeLessThan(550);
    expect(r.separationM).toBeCloseTo(120, -1);
    expect(r.overlapToSeparation).toBeCloseTo(r.overlapM / r.separationM, 9);
    expect(["soft", "breached", "hard"]).toContain(r.linkage);
    expect(r.evidence.length).toBeGreaterThan(20);
    expect(r.comparison).toContain("Long & Imber 2011");
    expect(r.summedProfile.displacementM.length).toBe(r.summedProfile.alongStrikeM.length);
  });
});
