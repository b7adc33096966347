import { describe, expect, it } from "vitest";
import { buildFaultDisplay, decimateGrid, selectDisplayPicks } from "@/lib/display/build";
import { decodeFaultDisplay, encodeFaultDisplay } from "@/lib/display/payload";
import { analyzePicks } from "@/lib/engine/pipeline";
import { generateSyntheticPicks, syntheticRelayOptions } from "@/lib/engine/synthetic";
import { DIP_DEG, domeGrid, fixtureAnalysis, picksOnPlane, UTM_CENTROID } from "./fixture";

function nanMax(values: ArrayLike<number>) {
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) if (values[i] > max) max = values[i];
  return max;
}

function twoSegmentFixture() {
  const north = domeGrid({ holes: [4 * 11 + 3] });
  const south = domeGrid({ columns: 13, rows: 9, peakM: 40 });
  const centroids: Record<string, [number, number, number]> = {
    north: UTM_CENTROID,
    south: [UTM_CENTROID[0] + 120, UTM_CENTROID[1] + 60, UTM_CENTROID[2] - 5],
  };
  const grids = { north, south };
  const report = fixtureAnalysis(grids, centroids);
  return { report, grids };
}

describe("decimateGrid", () => {
  // basis: common practice, no source (display decimation by nodal sampling)
  it("keeps at most maxCells nodes per side, the peak exactly, and copies values (NaN stays NaN)", () => {
    const columns = 401;
    const rows = 301;
    const holes: number[] = [];
    for (let row = 100; row < 106; row++) for (let column = 200; column < 206; column++) holes.push(row * columns + column);
    const grid = domeGrid({ columns, rows, cellM: 5, holes });
    // move the peak off the lattice a stride-3 sampling from node 0 would use
    grid.displacementM[157 * columns + 88] = 999;
    const display = decimateGrid(grid, 192);
    expect(display.columns).toBeLessThanOrEqual(192);
    expect(display.rows).toBeLessThanOrEqual(192);
    expect(nanMax(display.displacementM)).toBe(999);
    let nanNodes = 0;
    for (let row = 0; row < display.rows; row++) {
      for (let column = 0; column < display.columns; column++) {
        const sourceColumn = (display.s0 + column * display.cellM - grid.s0) / grid.cellM;
        const sourceRow = (display.t0 + row * display.cellM - grid.t0) / grid.cellM;
        expect(Number.isInteger(Math.round(sourceColumn * 1e6) / 1e6)).toBe(true);
        const source = grid.displacementM[Math.round(sourceRow) * columns + Math.round(sourceColumn)];
        const value = display.displacementM[row * display.columns + column];
        if (Number.isNaN(source)) {
          expect(value).toBeNaN();
          nanNodes++;
        } else {
          expect(value).toBe(Math.fround(source));
        }
      }
    }
    // a 6-cell-wide hole survives a stride of 3
    expect(nanNodes).toBeGreaterThan(0);
  });

  // basis: common practice, no source
  it("leaves a grid that already fits untouched", () => {
    const grid = domeGrid();
    const display = decimateGrid(grid, 192);
    expect([display.columns, display.rows, display.cellM, display.s0, display.t0]).toEqual([grid.columns, grid.rows, grid.cellM, grid.s0, grid.t0]);
  });
});

describe("buildFaultDisplay", () => {
  // basis: Float32 keeps ~7 significant digits, so UTM-size coordinates need a local origin (common practice)
  it("puts the origin at the first segment's centroid and keeps pick positions to the millimetre", () => {
    const { report, grids } = twoSegmentFixture();
    const picks = picksOnPlane(report, [
      { segment: "north", s: 10, t: -10, throwM: 30 },
      { segment: "south", s: -20, t: 0, throwM: 20 },
    ]);
    const display = buildFaultDisplay({ report, grids, picks });
    expect(display.origin).toEqual(UTM_CENTROID);
    expect(display.segments[0].frame.centroid).toEqual([0, 0, 0]);
    expect(display.segments[1].frame.centroid[0]).toBeCloseTo(120, 9);
    for (let i = 0; i < picks.x.length; i++) {
      expect(Math.abs(display.picks.position[i * 3] + display.origin[0] - picks.x[i])).toBeLessThan(1e-3);
      expect(Math.abs(display.picks.position[i * 3 + 1] + display.origin[1] - picks.y[i])).toBeLessThan(1e-3);
      expect(Math.abs(display.picks.position[i * 3 + 2] + display.origin[2] - picks.z[i])).toBeLessThan(1e-3);
    }
    expect(Array.from(display.picks.segmentIndex)).toEqual([0, 1]);
  });

  // basis: common practice, no source (dip-slip geometry: D = T / sin(dip), or D = sqrt(T² + H²) where heave is given)
  it("gives each pick its displacement and its residual against the surface", () => {
    const { report, grids } = twoSegmentFixture();
    // node (column 7, row 4) of "north": s = 20, t = 0
    const surfaceAtNode = grids.north.displacementM[4 * 11 + 7];
    const picks = picksOnPlane(report, [
      { segment: "north", s: 20, t: 0, throwM: 30 },
      { segment: "north", s: 20, t: 0, throwM: 30, heaveM: 40 },
      { segment: "north", s: 500, t: 0, throwM: 30 },
    ]);
    const display = buildFaultDisplay({ report, grids, picks });
    const expectedDisplacement = 30 / Math.sin((DIP_DEG * Math.PI) / 180);
    expect(display.picks.displacementM[0]).toBeCloseTo(expectedDisplacement, 4);
    expect(display.picks.residualM[0]).toBeCloseTo(expectedDisplacement - surfaceAtNode, 3);
    expect(display.picks.displacementM[1]).toBeCloseTo(50, 4);
    expect(display.picks.residualM[2]).toBeNaN(); // outside the grid
  });

  // basis: common practice, no source (the view always points relief up, into the hanging wall)
  it("points every segment's normal upward", () => {
    const { report, grids } = twoSegmentFixture();
    expect(report.segments[0].plane.normal[2]).toBeLessThan(0);
    const display = buildFaultDisplay({ report, grids, picks: picksOnPlane(report, []) });
    for (const segment of display.segments) expect(segment.frame.normal[2]).toBeGreaterThan(0);
  });

  // basis: common practice, no source
  it("decimates an engine grid of a synthetic relay and keeps each segment's peak", () => {
    const { picks } = generateSyntheticPicks(syntheticRelayOptions({ pickCount: 1500 }), 3);
    const { report, grids } = analyzePicks(picks);
    const display = buildFaultDisplay({ report, grids, picks, maxCells: 40 });
    expect(display.segments.map((segment) => segment.id)).toEqual(report.segments.map((segment) => segment.id));
    display.segments.forEach((segment) => {
      expect(segment.grid.columns).toBeLessThanOrEqual(40);
      expect(segment.grid.rows).toBeLessThanOrEqual(40);
      expect(nanMax(segment.grid.displacementM)).toBe(Math.fround(nanMax(grids[segment.id].displacementM)));
      expect(segment.contours.levelsM.length).toBeGreaterThan(2);
    });
    expect(display.picks.count).toBe(picks.x.length);
  });
});

describe("selectDisplayPicks", () => {
  // basis: common practice, no source (deterministic display subsampling that keeps outliers)
  it("keeps at most the budget, deterministically, including the largest residuals", () => {
    const residuals = Float32Array.from({ length: 50_000 }, (_, i) => Math.sin(i * 12.9898) * 2);
    residuals[31_337] = 400;
    residuals[7] = -250;
    const first = selectDisplayPicks(residuals, 20_000);
    const second = selectDisplayPicks(residuals, 20_000);
    expect(first.length).toBe(20_000);
    expect(second).toEqual(first);
    expect(first).toContain(31_337);
    expect(first).toContain(7);
    expect([...first].sort((a, b) => a - b)).toEqual(first);
    expect(new Set(first).size).toBe(first.length);
  });
});

describe("encodeFaultDisplay / decodeFaultDisplay", () => {
  // basis: common practice, no source (a round trip must give back what went in)
  it("round-trips a two-segment display, NaN holes included, from an unaligned view too", () => {
    const { report, grids } = twoSegmentFixture();
    const picks = picksOnPlane(report, [
      { segment: "north", s: 10, t: -10, throwM: 30 },
      { segment: "south", s: 900, t: 0, throwM: 20 },
    ]);
    const display = buildFaultDisplay({ report, grids, picks });
    const bytes = encodeFaultDisplay(display);
    const decoded = decodeFaultDisplay(bytes);
    expect(decoded).toEqual(display);
    expect(decoded.segments[0].grid.displacementM).toBeInstanceOf(Float32Array);
    expect(Number.isNaN(decoded.segments[0].grid.displacementM[4 * 11 + 3])).toBe(true);
    expect(decoded.picks.residualM[1]).toBeNaN();

    const padded = new Uint8Array(bytes.length + 3);
    padded.set(bytes, 3);
    expect(decodeFaultDisplay(padded.subarray(3))).toEqual(display);
  });

  // basis: common practice, no source
  it("is compact: grid bodies cost 4 bytes a value", () => {
    const grid = domeGrid({ columns: 150, rows: 120 });
    const report = fixtureAnalysis({ main: grid }, { main: UTM_CENTROID });
    const bytes = encodeFaultDisplay(buildFaultDisplay({ report, grids: { main: grid }, picks: picksOnPlane(report, []) }));
    const gridBytes = 150 * 120 * 4 * 2;
    expect(bytes.length).toBeGreaterThan(gridBytes);
    expect(bytes.length).toBeLessThan(gridBytes * 1.25);
  });

  // basis: common practice, no source
  it("refuses bytes that are not a display payload", () => {
    expect(() => decodeFaultDisplay(new TextEncoder().encode('{"version":1}'))).toThrow(/display payload/);
  });
});
