import { describe, expect, it } from "vitest";
import { analyzeCsv, analyzePicks, ENGINE_VERSION } from "@/lib/engine/pipeline";
import { generateSyntheticPicks, syntheticRelayOptions, toCsv } from "@/lib/engine/synthetic";

/** Even-odd point-in-polygon and distance to the polygon's edges (by hand, for the checks below). */
function inside(polygon: [number, number][], s: number, t: number): boolean {
  let result = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const [si, ti] = polygon[i],
      [sj, tj] = polygon[j];
    if (ti > t !== tj > t && s < ((sj - si) * (t - ti)) / (tj - ti) + si) result = !result;
  }
  return result;
}
function distanceToEdges(polygon: [number, number][], s: number, t: number): number {
  let best = Infinity;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const [ax, ay] = polygon[j],
      [bx, by] = polygon[i];
    const dx = bx - ax,
      dy = by - ay;
    const f = Math.max(0, Math.min(1, ((s - ax) * dx + (t - ay) * dy) / (dx * dx + dy * dy || 1)));
    best = Math.min(best, Math.hypot(s - ax - f * dx, t - ay - f * dy));
  }
  return best;
}

describe("analysis pipeline", () => {
  const { picks, truth } = generateSyntheticPicks({
    seed: 7,
    strikeDeg: 140,
    dipDeg: 55,
    halfLengthM: 1000,
    aspectRatio: 2,
    dmaxM: 60,
    throwCutoffM: 8,
    noiseM: 1.5,
    pickCount: 1200,
  });

  it("reports plane, maximum, grid and contours for one segment, and stages in order", () => {
    const stages: string[] = [];
    const { report, grids } = analyzeCsv(toCsv(picks), { onStage: (s) => stages.push(s) });
    expect(report.engineVersion).toBe(ENGINE_VERSION);
    expect(stages[0]).toBe("parse");
    expect(stages.at(-1)).toBe("done");
    const seg = report.segments[0];
    // the generator places picks exactly on the plane (noise is in throw only); the CSV keeps millimetres
    expect(Math.abs(seg.plane.strikeDeg - 140)).toBeLessThan(0.01);
    expect(Math.abs(seg.plane.dipDeg - 55)).toBeLessThan(0.01);
    // Dmax is the largest pick displacement, throw / sin(dip) (Groshong 2006): computed here from the picks' throws.
    // The CSV rounds throws to 1 mm, so 1e-3 m / sin 55° bounds the difference.
    let maxThrow = 0;
    for (const value of picks.throwM) maxThrow = Math.max(maxThrow, value);
    expect(Math.abs(seg.max.displacementM - maxThrow / Math.sin((55 * Math.PI) / 180))).toBeLessThan(1e-3 / Math.sin((55 * Math.PI) / 180));
    // with the local dip, which the millimetre rounding of the positions tilts by under 1e-4° here
    expect(seg.max.throwM).toBeCloseTo(seg.max.displacementM * Math.sin((seg.plane.dipDeg * Math.PI) / 180), 4);
    // and it cannot exceed the model's Dmax by more than 4 standard deviations of the throw noise (1.5 m / sin 55°)
    expect(seg.max.displacementM).toBeLessThan(truth[0].dmaxM + (4 * 1.5) / Math.sin((55 * Math.PI) / 180));
    // the grid holds data exactly inside the mapped outline: every node further than one cell from the outline is
    // finite inside it and NaN outside it (linear interpolation on triangles, NaN outside the data)
    const grid = grids[seg.id];
    expect(grid.displacementM.length).toBe(grid.columns * grid.rows);
    const outline = seg.mappedLimit.polygon;
    let checkedInside = 0,
      checkedOutside = 0;
    for (let j = 0; j < grid.rows; j++) {
      for (let i = 0; i < grid.columns; i++) {
        const s = grid.s0 + i * grid.cellM,
          t = grid.t0 + j * grid.cellM;
        if (distanceToEdges(outline, s, t) <= grid.cellM) continue;
        const finite = Number.isFinite(grid.displacementM[j * grid.columns + i]);
        expect(finite).toBe(inside(outline, s, t));
        if (finite) checkedInside++;
        else checkedOutside++;
      }
    }
    expect(checkedInside).toBeGreaterThan(1000);
    expect(checkedOutside).toBeGreaterThan(100);
    // contour levels: every multiple of the nice interval below Dmax (about ten), all traced inside the grid
    const levels = seg.contours.map((c) => c.levelM);
    expect(levels).toEqual(Array.from({ length: Math.ceil(seg.max.displacementM / seg.contourIntervalM) - 1 }, (_, k) => seg.contourIntervalM * (k + 1)));
    for (const c of seg.contours)
      for (const ring of c.rings)
        for (const [s, t] of ring) {
          expect(s).toBeGreaterThanOrEqual(grid.s0 - 1e-6);
          expect(s).toBeLessThanOrEqual(grid.s0 + (grid.columns - 1) * grid.cellM + 1e-6);
          expect(t).toBeGreaterThanOrEqual(grid.t0 - 1e-6);
          expect(t).toBeLessThanOrEqual(grid.t0 + (grid.rows - 1) * grid.cellM + 1e-6);
        }
    expect(seg.scaling.plausible).toBe(true);
    expect(seg.tipLine.worldPolygon[0][2]).toBeLessThan(0);
    // the off-plane distance grid: these picks lie on the plane, so w is 0 wherever there is data
    let worstW = 0;
    grid.offPlaneM!.forEach((w, k) => {
      if (Number.isFinite(grid.displacementM[k])) worstW = Math.max(worstW, Math.abs(w));
    });
    expect(worstW).toBeLessThan(0.01);
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
  it("measures overlap and separation between two overlapping segments, and calls them soft-linked with nothing mapped between", () => {
    const relay = generateSyntheticPicks(
      syntheticRelayOptions({ seed: 11, halfLengthM: 1200, dmaxM: 70, throwCutoffM: 8, noiseM: 1.5, pickCount: 1200 }, 500, 120),
    );
    const { report } = analyzePicks(relay.picks);
    expect(report.segments).toHaveLength(2);
    expect(report.relays).toHaveLength(1);
    const r = report.relays[0];
    expect(r.segments).toEqual(["F1", "F2"]);
    // the overlap is measured between the inferred tip lines: each end is one segment's inferred tip, so the error
    // against the generator's 500 m is bounded by the two segments' stated tip-line uncertainties
    const [a, b] = report.segments;
    expect(Math.abs(r.overlapM - 500)).toBeLessThanOrEqual(a.tipLine.uncertaintyM + b.tipLine.uncertaintyM);
    // and it is exactly the overlap of the two tip-line polygons along the mean strike (the two strikes are equal here)
    const along = ([x, y]: number[]) => x * a.plane.strikeVector[0] + y * a.plane.strikeVector[1];
    const extent = (seg: typeof a) => [Math.min(...seg.tipLine.worldPolygon.map(along)), Math.max(...seg.tipLine.worldPolygon.map(along))];
    const [ea, eb] = [extent(a), extent(b)];
    expect(r.overlapM).toBeCloseTo(Math.min(ea[1], eb[1]) - Math.max(ea[0], eb[0]), 6);
    // the generator offsets the second plane by exactly 120 m across strike and both picks lie on their planes
    expect(Math.abs(r.separationM - 120)).toBeLessThan(1e-6);
    expect(r.overlapToSeparation).toBeCloseTo(r.overlapM / r.separationM, 9);
    // no picks between the segments: soft-linked (Peacock & Sanderson 1994 stage 2), with that evidence named
    expect(r.linkage).toBe("soft");
    expect(r.connection?.kind).toBe("none");
    expect(r.evidence).toMatch(/^No picks or segment connect the relay ramp/);
    expect(r.comparison).toContain("Long & Imber 2011");
    expect(r.summedProfile.displacementM.length).toBe(r.summedProfile.alongStrikeM.length);
  });
});
