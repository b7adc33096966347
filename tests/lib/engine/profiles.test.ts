import { describe, expect, it } from "vitest";
import { walshWattersonProfile, ellipticalCrackProfile, linearProfile, visibleRadius, extrapolateTipLinear } from "@/lib/engine/profiles";

const mean = (f: (r: number) => number) => {
  const n = 200000;
  let s = 0;
  for (let i = 0; i < n; i++) s += f((i + 0.5) / n);
  return s / n;
};

describe("published displacement profiles", () => {
  // Walsh & Watterson (1987) profile; docs/check-values.md P1
  it("Walsh & Watterson values", () => {
    expect(walshWattersonProfile(0.5)).toBeCloseTo(0.559, 4);
    expect(walshWattersonProfile(0.25)).toBeCloseTo(0.8592, 4);
    expect(walshWattersonProfile(0.75)).toBeCloseTo(0.2253, 4);
    expect(walshWattersonProfile(0.9)).toBeCloseTo(0.0608, 4);
    expect(walshWattersonProfile(1)).toBe(0);
    expect(walshWattersonProfile(1.3)).toBe(0);
  });
  // docs/check-values.md P2: the two published forms are algebraically identical
  it("equals (1 − r)^1.5 (1 + 3r)^0.5 to 1e-12", () => {
    let worst = 0;
    for (let i = 0; i <= 1000; i++) {
      const r = i / 1000;
      worst = Math.max(worst, Math.abs(walshWattersonProfile(r) - (1 - r) ** 1.5 * (1 + 3 * r) ** 0.5));
    }
    expect(worst).toBeLessThan(1e-12);
  });
  // docs/check-values.md P3: steepest gradient 1.3625 Dmax/R at r = 1/sqrt(3)
  it("Walsh & Watterson steepest gradient", () => {
    let best = 0;
    let at = 0;
    const h = 1e-6;
    for (let i = 1; i < 10000; i++) {
      const r = i / 10000;
      const g = Math.abs(walshWattersonProfile(r + h) - walshWattersonProfile(r - h)) / (2 * h);
      if (g > best) {
        best = g;
        at = r;
      }
    }
    expect(best).toBeCloseTo(1.3625, 3);
    expect(at).toBeCloseTo(0.5774, 3);
  });
  // Pollard & Segall (1987) elliptical crack; docs/check-values.md P4
  it("elliptical crack values", () => {
    expect(ellipticalCrackProfile(0.5)).toBeCloseTo(0.866, 4);
    expect(ellipticalCrackProfile(0.9)).toBeCloseTo(0.4359, 4);
  });
  // docs/check-values.md P5
  it("profile means", () => {
    expect(mean(walshWattersonProfile)).toBeCloseTo(0.5374, 4);
    expect(mean(ellipticalCrackProfile)).toBeCloseTo(0.7854, 4);
    expect(mean(linearProfile)).toBeCloseTo(0.5, 4);
  });
  // docs/check-values.md P6: 2D elliptical field, a = 1000, b = 465.116, Dmax = 100 (Barnett et al. 1987 tip-line shape)
  it("2D elliptical field value", () => {
    const r = Math.hypot(500 / 1000, 232.558 / 465.116);
    expect(100 * walshWattersonProfile(r)).toBeCloseTo(28.005, 2);
  });
  // docs/check-values.md P7: true/visible length at a cut-off of 15 % of Dmax
  it("visible-length factors at a 15 % cut-off", () => {
    expect(1 / visibleRadius("walsh-watterson-1987", 0.15)).toBeCloseTo(1.23, 3);
    expect(1 / visibleRadius("linear", 0.15)).toBeCloseTo(1.176, 3);
    expect(1 / visibleRadius("elliptical-crack", 0.15)).toBeCloseTo(1.011, 3);
  });
});

describe("near-tip gradient extrapolation", () => {
  // docs/check-values.md P8 (common practice, Barnett et al. 1987 endorse extrapolating gradients)
  it("two picks: tip at 1000 m", () => {
    expect(extrapolateTipLinear([800, 900], [30, 15]).tipM).toBeCloseTo(1000, 2);
  });
  // docs/check-values.md P9
  it("least squares through four picks: slope −0.132, tip 1018.94 m", () => {
    const fit = extrapolateTipLinear([600, 700, 800, 900], [55, 42, 30, 15]);
    expect(fit.slopePerM).toBeCloseTo(-0.132, 3);
    expect(fit.tipM).toBeCloseTo(1018.94, 2);
  });
});
