import { describe, expect, it } from "vitest";
import type { StressParameters } from "@/db/schema";
import { DEFAULT_STRESS_PARAMETERS } from "@/lib/stress/parameters";
import { rasterizeTriangleValues, screenTriangles, segmentTriangles } from "@/lib/stress/surface";
import { areaHistogram, evenSubsample, niceStep, summarizeScreen } from "@/lib/stress/summary";

// The worked example plane of the domain reference §7.3 (strike 000, dip 60° E) built from two triangles
// centred at 2.5 km depth, so each triangle must reproduce σn = 41.250, τ = 10.825 MPa, Ts′ 0.6662, Td 0.750.
function examplePlane(): { x: Float64Array; y: Float64Array; z: Float64Array; triangles: Uint32Array } {
  const dip = Math.PI / 3;
  // corners at down-dip distance ±100 m around the point at 2500 m depth
  const corner = (along: number, down: number) => [down * Math.cos(dip), along, -2500 - down * Math.sin(dip)];
  const pts = [corner(-100, -100), corner(100, -100), corner(100, 100), corner(-100, 100)];
  return {
    x: Float64Array.from(pts, (p) => p[0]),
    y: Float64Array.from(pts, (p) => p[1]),
    z: Float64Array.from(pts, (p) => p[2]),
    triangles: Uint32Array.from([0, 1, 2, 0, 2, 3]),
  };
}

const exampleParameters: StressParameters = { ...DEFAULT_STRESS_PARAMETERS, maxHorizontalAzimuthDeg: 0, frictionLow: 0.6, frictionHigh: 0.7, cohesionMPa: 0 };

describe("screen of a triangulated surface", () => {
  it("each triangle of the worked-example plane gives §7.3's numbers (domain reference §10 rows 45–49, [D])", () => {
    const plane = examplePlane();
    // the two triangles have centroids at depth 2500 ∓ 100·sin60/3; use a single mid-depth triangle pair check via the mean
    const screen = screenTriangles(plane, exampleParameters);
    expect(screen.count).toBe(2);
    for (let i = 0; i < 2; i++) {
      expect(screen.normalX[i]).toBeCloseTo(Math.sin(Math.PI / 3), 9);
      expect(screen.normalZ[i]).toBeCloseTo(0.5, 9);
      // stresses scale linearly with depth: rescale to 2500 m to compare with the worked example
      const k = 2500 / screen.depthM[i];
      expect(Math.abs(screen.normalMPa[i] * k - 41.25)).toBeLessThan(1e-3);
      expect(Math.abs(screen.shearMPa[i] * k - 10.825)).toBeLessThan(1e-3);
      expect(Math.abs(screen.slipTendency[i] - 0.6662)).toBeLessThan(1e-4);
      expect(Math.abs(screen.dilationTendency[i] - 0.75)).toBeLessThan(1e-4);
      expect(Math.abs(screen.pressureToFailureHighMPa[i] * k - 0.785)).toBeLessThan(1e-3);
      expect(screen.pressureToFailureLowMPa[i] * k).toBeCloseTo(-1.79, 2);
      expect(screen.areaM2[i]).toBeCloseTo(20_000, 6);
    }
  });

  it("normals point up whatever the triangle winding (common practice, no source)", () => {
    const plane = examplePlane();
    const screen = screenTriangles({ ...plane, triangles: Uint32Array.from([0, 2, 1, 0, 3, 2]) }, exampleParameters);
    expect(screen.normalZ[0]).toBeGreaterThan(0);
    expect(screen.normalZ[1]).toBeGreaterThan(0);
  });

  it("skips degenerate (collinear) triangles and triangles above the datum, and counts them", () => {
    const x = Float64Array.from([0, 100, 200, 0, 100, 0]);
    const y = Float64Array.from([0, 0, 0, 0, 0, 100]);
    const z = Float64Array.from([-1000, -1000, -1000, 50, 50, 50]);
    const screen = screenTriangles({ x, y, z, triangles: Uint32Array.from([0, 1, 2, 3, 4, 5]) }, exampleParameters);
    expect(screen.count).toBe(0);
    expect(screen.skippedDegenerate).toBe(1);
    expect(screen.skippedAboveDatum).toBe(1);
  });

  it("summary: area-weighted minimum ΔP, fractions below thresholds and a histogram summing to 1 (common practice, no source)", () => {
    const screen = screenTriangles(examplePlane(), exampleParameters);
    const summary = summarizeScreen(screen, exampleParameters, [0, 1, 100]);
    expect(summary.areaM2).toBeCloseTo(40_000, 6);
    expect(summary.minPressureToFailureMPa.low).toBe(Math.min(...screen.pressureToFailureLowMPa));
    expect(summary.minPressureToFailureMPa.high).toBeGreaterThan(summary.minPressureToFailureMPa.low);
    // at μ 0.6 every triangle has ΔP < 0 (failure predicted), at μ 0.7 both are positive
    expect(summary.thresholds[0]).toEqual({ thresholdMPa: 0, fractionLow: 1, fractionHigh: 0 });
    expect(summary.thresholds[2].fractionHigh).toBe(1);
    expect(summary.failingFraction.low).toBe(1);
    const sumLow = summary.histogram.fractionLow.reduce((a, b) => a + b, 0);
    const sumHigh = summary.histogram.fractionHigh.reduce((a, b) => a + b, 0);
    expect(sumLow).toBeCloseTo(1, 12);
    expect(sumHigh).toBeCloseTo(1, 12);
    expect(summary.reference.sigma1MPa).toBeCloseTo(60, 9);
    expect(Math.abs(summary.reference.maxPossibleSlipTendency - 0.66815)).toBeLessThan(1e-3);
    expect(summary.sentence).toMatch(/μ = 0\.6.*μ = 0\.7/);
    expect(summary.sentence).toMatch(/already at or past failure/);
  });

  it("histogram bins: weighted by area, edges on round steps", () => {
    const h = areaHistogram([0.5, 1.5, 1.6, 4.2], [0.5, 1.5, 1.6, 4.2], [1, 1, 1, 1], 4);
    expect(niceStep(3.7, 4)).toBe(1);
    expect(h.edgesMPa).toEqual([0, 1, 2, 3, 4, 5]);
    expect(h.fractionLow).toEqual([0.25, 0.5, 0, 0, 0.25]);
  });

  it("rasterises per-triangle values onto the grid nodes inside each triangle, NaN elsewhere", () => {
    const s = [0, 10, 10, 0];
    const t = [0, 0, 10, 10];
    const [out] = rasterizeTriangleValues(s, t, [0, 1, 2, 0, 2, 3], [[7, 9]], { s0: 0, t0: 0, cellM: 5, columns: 4, rows: 3 });
    // node (10, 0) lies only in the first triangle; (0, 10) only in the second; (15, *) outside
    expect(out[0 * 4 + 2]).toBe(7);
    expect(out[2 * 4 + 0]).toBe(9);
    expect(out[0 * 4 + 3]).toBeNaN();
  });

  it("segmentTriangles triangulates picks in the plane frame and returns global pick ids", () => {
    const { x, y, z } = examplePlane();
    const frame = { centroid: [0, 0, -2500], strikeVector: [0, 1, 0], dipVector: [0.5, 0, -Math.sin(Math.PI / 3)], normal: [Math.sin(Math.PI / 3), 0, 0.5] };
    const { triangles, s, t } = segmentTriangles(x, y, z, [0, 1, 2, 3], frame);
    expect(triangles.length).toBe(6);
    expect(new Set(triangles)).toEqual(new Set([0, 1, 2, 3]));
    expect(s[1]).toBeCloseTo(100, 9);
    expect(t[2]).toBeCloseTo(100, 9);
  });

  it("evenSubsample keeps everything under the cap and is deterministic above it", () => {
    expect(evenSubsample(5, 10)).toEqual(Uint32Array.from([0, 1, 2, 3, 4]));
    expect(evenSubsample(100, 4)).toEqual(Uint32Array.from([0, 25, 50, 75]));
  });
});
