import { describe, expect, it } from "vitest";
import {
  AUTOMATIC_CANDIDATES,
  PROFILE_CANDIDATES,
  PUBLISHED_PROFILES,
  modelRadius,
  modelTipPolygon,
  profileFunction,
  writeProfile,
} from "@/lib/engine/profiles";
import type { ProfileModel } from "@/lib/engine/types";

const logit = (y: number, lo: number, hi: number) => Math.log((y - lo) / (hi - y));

describe("candidate displacement profiles", () => {
  it("are 1 at the maximum, fall monotonically and are exactly 0 from the tip on (common practice, no source)", () => {
    for (const model of AUTOMATIC_CANDIDATES) {
      const f = profileFunction(model);
      expect(f(0)).toBeCloseTo(1, 12);
      expect(f(1)).toBe(0);
      expect(f(1.3)).toBe(0);
      let previous = f(0);
      for (let k = 1; k <= 200; k++) {
        const value = f(k / 200);
        expect(value).toBeLessThanOrEqual(previous + 1e-12);
        expect(value).toBeGreaterThanOrEqual(0);
        previous = value;
      }
    }
  });

  it("give the published values (docs/check-values.md P10, P4): linear taper 1 − r (Muraoka & Kamata 1983; Dawers et al. 1993), parabola 1 − r², elliptical crack √(1 − r²) (Pollard & Segall 1987)", () => {
    for (const r of [0.1, 0.25, 0.5, 0.75, 0.9]) {
      expect(profileFunction("linear")(r)).toBeCloseTo(1 - r, 12);
      expect(profileFunction("parabolic")(r)).toBeCloseTo(1 - r * r, 12);
      expect(profileFunction("elliptical-crack")(r)).toBeCloseTo(Math.sqrt(1 - r * r), 12);
    }
    // Walsh & Watterson (1987) in its second form, (1 − r)^1.5·(1 + 3r)^0.5: 0.5590 at r = 0.5 (docs/check-values.md P1)
    expect(profileFunction("walsh-watterson-1987")(0.5)).toBeCloseTo(0.559, 4);
  });

  it("flat-topped (Nicol et al. 1996; docs/check-values.md P11): full displacement to the plateau, then a straight taper to the tip", () => {
    const plateau = 0.55;
    const f = profileFunction("flat-topped", [logit(plateau, 0, 0.9)]);
    expect(f(0.3)).toBe(1);
    expect(f(plateau)).toBeCloseTo(1, 9);
    expect(f(0.775)).toBeCloseTo(0.5, 9);
    expect(f(0.99)).toBeCloseTo(0.01 / 0.45, 9);
  });

  it("the flexible family (1 − r^p)^q (docs/check-values.md P12) contains the linear, parabolic and elliptical profiles", () => {
    const flexible = (p: number, q: number) => profileFunction("flexible", [logit(p, 0.6, 8), logit(q, 0.3, 3)]);
    for (const r of [0.2, 0.5, 0.8, 0.95]) {
      expect(flexible(1, 1)(r)).toBeCloseTo(1 - r, 9);
      expect(flexible(2, 1)(r)).toBeCloseTo(1 - r * r, 9);
      expect(flexible(2, 0.5)(r)).toBeCloseTo(Math.sqrt(1 - r * r), 9);
    }
  });

  it("report slopes and shape derivatives that match finite differences (what the fit's gradient relies on)", () => {
    const out = new Float64Array(4);
    const plus = new Float64Array(4);
    const minus = new Float64Array(4);
    const h = 1e-6;
    for (const model of AUTOMATIC_CANDIDATES) {
      const { kind, shapeParameters } = PROFILE_CANDIDATES[model];
      const shape = [0.3, -0.4];
      for (const r of [0.12, 0.37, 0.58, 0.81, 0.93]) {
        writeProfile(kind, r, shape[0], shape[1], out);
        writeProfile(kind, r + h, shape[0], shape[1], plus);
        writeProfile(kind, r - h, shape[0], shape[1], minus);
        expect(out[1]).toBeCloseTo((plus[0] - minus[0]) / (2 * h), 4);
        for (let j = 0; j < shapeParameters; j++) {
          const up = shape.slice();
          const down = shape.slice();
          up[j] += h;
          down[j] -= h;
          writeProfile(kind, r, up[0], up[1], plus);
          writeProfile(kind, r, down[0], down[1], minus);
          expect(out[2 + j]).toBeCloseTo((plus[0] - minus[0]) / (2 * h), 4);
        }
      }
    }
  });

  it("leave the flexible family out of the central estimate: it has no mechanical basis of its own", () => {
    expect(PUBLISHED_PROFILES).not.toContain("flexible" satisfies ProfileModel);
    expect(AUTOMATIC_CANDIDATES).toContain("flexible" satisfies ProfileModel);
  });
});

describe("fault model geometry: four reaches and a superellipse exponent (common practice, no source)", () => {
  const model = { centre: { s: 100, t: -50 }, reach: { strikeStartM: 800, strikeEndM: 1200, upDipM: 300, downDipM: 500 }, exponent: 2 };

  it("puts each reach on its own side: radius 1 at the four tips", () => {
    expect(modelRadius(model, 100 - 800, -50)).toBeCloseTo(1, 12);
    expect(modelRadius(model, 100 + 1200, -50)).toBeCloseTo(1, 12);
    expect(modelRadius(model, 100, -50 - 300)).toBeCloseTo(1, 12);
    expect(modelRadius(model, 100, -50 + 500)).toBeCloseTo(1, 12);
  });

  it("is an ellipse at exponent 2 and reaches farther toward the corners as the exponent grows", () => {
    const corner = (e: number) => modelRadius({ ...model, exponent: e }, 100 + 1200 * Math.SQRT1_2, -50 + 500 * Math.SQRT1_2);
    expect(corner(2)).toBeCloseTo(1, 12);
    expect(corner(4)).toBeLessThan(1);
    expect(corner(1.5)).toBeGreaterThan(1);
  });

  it("draws its tip line on radius 1", () => {
    for (const [s, t] of modelTipPolygon({ ...model, exponent: 3.3 }, 64)) expect(modelRadius({ ...model, exponent: 3.3 }, s, t)).toBeCloseTo(1, 9);
  });
});
