import { describe, expect, it } from "vitest";
import { displacementFromThrow, heaveFromThrow, dipFromThrowHeave, displacementColumn } from "@/lib/engine/displacement";
import { DegeneratePlaneError, fitPlane, formatAzimuth, strikeVectorOf, dipVectorOf } from "@/lib/engine/plane";
import { azimuth } from "@/lib/format";
import { projectToPlane, planeToWorld } from "@/lib/display/frame";

const circularDiff = (a: number, b: number) => Math.abs(((a - b + 540) % 360) - 180);

describe("throw, heave and displacement", () => {
  // Groshong 2006 (3-D Structural Geology, eq. 8.3); worked values: docs/check-values.md G1–G3
  it("T = 100 m, dip 60° gives D = 115.470 m and H = 57.735 m", () => {
    expect(displacementFromThrow(100, 60)).toBeCloseTo(115.47, 3);
    expect(heaveFromThrow(100, 60)).toBeCloseTo(57.735, 3);
  });
  it("dip from throw and heave: T = 100, H = 57.735 gives 60.000°", () => {
    expect(dipFromThrowHeave(100, 57.735)).toBeCloseTo(60, 3);
  });
  it("T = 100 m at 45° and 30°", () => {
    expect(displacementFromThrow(100, 45)).toBeCloseTo(141.421, 3);
    expect(heaveFromThrow(100, 45)).toBeCloseTo(100, 3);
    expect(displacementFromThrow(100, 30)).toBeCloseTo(200, 3);
    expect(heaveFromThrow(100, 30)).toBeCloseTo(173.205, 3);
  });
  it("uses heave where it is given: D = sqrt(T² + H²) (docs/check-values.md G4; Groshong 2006)", () => {
    const d = displacementColumn([30, 40], [40, NaN], 60);
    expect(d[0]).toBeCloseTo(50, 12);
    expect(d[1]).toBeCloseTo(40 / Math.sin(Math.PI / 3), 12);
  });
});

describe("best-fit plane", () => {
  // docs/check-values.md G5 (derived with numpy SVD)
  it("plane dipping 60° east: strike 000 by the right-hand rule", () => {
    const p = fitPlane([0, 0, 100, 100], [0, 100, 0, 100], [0, 0, -173.2051, -173.2051]);
    expect(p.dipDeg).toBeCloseTo(60, 2);
    expect(circularDiff(p.dipDirectionDeg, 90)).toBeLessThan(0.01);
    expect(circularDiff(p.strikeDeg, 0)).toBeLessThan(0.01);
    expect(p.rmsM).toBeLessThan(1e-6);
    // the fit lands within rounding of 360°: it prints as 0.0°, never 360.0°
    expect(formatAzimuth(p.strikeDeg)).toBe("0.0");
    expect(azimuth(p.strikeDeg)).toBe("0.0°");
  });
  it("azimuths print in [0, 360) after rounding (common practice, no source)", () => {
    expect(formatAzimuth(359.96)).toBe("0.0");
    expect(formatAzimuth(359.94)).toBe("359.9");
    expect(formatAzimuth(360)).toBe("0.0");
    expect(formatAzimuth(-0.04)).toBe("0.0");
    expect(formatAzimuth(-90)).toBe("270.0");
    expect(formatAzimuth(359.6, 0)).toBe("0");
    expect(formatAzimuth(152.25, 0)).toBe("152");
    expect(azimuth(NaN)).toBe("—");
  });
  // docs/check-values.md G6 (derived)
  it("plane dipping 45° north: strike 270", () => {
    const p = fitPlane([0, 100, 0, 100], [0, 0, 100, 100], [0, 0, -100, -100]);
    expect(p.dipDeg).toBeCloseTo(45, 2);
    expect(circularDiff(p.dipDirectionDeg, 0)).toBeLessThan(0.01);
    expect(circularDiff(p.strikeDeg, 270)).toBeLessThan(0.01);
  });
  // docs/check-values.md G7 (common practice, no source: collinear points leave the plane undetermined)
  it("refuses collinear and coincident points", () => {
    expect(() => fitPlane([0, 1, 2, 3], [0, 1, 2, 3], [0, -1, -2, -3])).toThrow(DegeneratePlaneError);
    expect(() => fitPlane([5, 5, 5], [1, 1, 1], [0, 0, 0])).toThrow(DegeneratePlaneError);
  });
  it("unit vectors form a right-handed frame with an upward normal (by hand)", () => {
    const p = fitPlane([0, 10, 0, 10, 5], [0, 0, 10, 10, 5], [0, -3, -1, -4, -2]);
    const dot = (a: number[], b: number[]) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
    expect(dot(p.strikeVector, p.dipVector)).toBeCloseTo(0, 12);
    expect(dot(p.strikeVector, p.normal)).toBeCloseTo(0, 12);
    expect(p.normal[2]).toBeGreaterThan(0);
    expect(p.dipVector[2]).toBeLessThan(0);
  });
});

describe("fault-plane coordinates", () => {
  // docs/check-values.md G8 (derived): strike 000, dip 60 E, p = (100, 200, −300) → s = 200, t = 309.808, w = −63.397
  it("projects a point to along-strike, down-dip and normal coordinates", () => {
    const sv = strikeVectorOf(0);
    const dv = dipVectorOf(90, 60);
    const nv: [number, number, number] = [Math.sin(Math.PI / 2) * Math.sin(Math.PI / 3), 0, Math.cos(Math.PI / 3)];
    const frame = { centroid: [0, 0, 0] as [number, number, number], strikeVector: sv, dipVector: dv, normal: nv };
    const { s, t, w } = projectToPlane([100], [200], [-300], frame);
    expect(s[0]).toBeCloseTo(200, 3);
    expect(t[0]).toBeCloseTo(309.808, 3);
    expect(w[0]).toBeCloseTo(-63.397, 3);
    const back = planeToWorld(frame, s[0], t[0]);
    expect(back[1]).toBeCloseTo(200, 9);
  });
});
