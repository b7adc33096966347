import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { StressParameters } from "@/lib/contracts/stress";
import { mulberry32 } from "@/lib/engine/synthetic";
import { DEFAULT_STRESS_PARAMETERS, REGIME_PRESETS, applyPreset } from "@/lib/stress/parameters";
import { stressParametersSchema } from "@/lib/contracts/stress";
import { rawTriangleElements, screenElements } from "@/lib/stress/surface";
import { runPythonOracle } from "../../support/python";
import {
  coulombFailureFunction,
  dilationTendency,
  maxSlipTendency,
  orderedPrincipal,
  planeNormal,
  pressureToFailure,
  principalDirections,
  slipTendency,
  stressesAtDepth,
  stressOnPlane,
  stressTensorENU,
  tensorFromPrincipal,
} from "@/lib/stress/tensor";

// The worked state of docs/check-values.md M1–M8 (derived with numpy):
// σ1 = Sv = 60 MPa, SHmax = 45 MPa at azimuth 000, Shmin = 35 MPa at 090, Pp = 25 MPa.
const example = { verticalMPa: 60, maxHorizontalMPa: 45, minHorizontalMPa: 35, porePressureMPa: 25 };
const exampleTensor = stressTensorENU(example, 0);

describe("Cauchy traction on a plane (docs/check-values.md M1–M8, derived)", () => {
  it("builds the ENU tensor diag(35, 45, 60) for SHmax at 000 (docs/check-values.md, the worked state)", () => {
    expect(Array.from(exampleTensor)).toEqual([35, 0, 0, 0, 45, 0, 0, 0, 60]);
  });

  it("strike 000 dip 60 E: n, t, σn = 41.250, τ = 10.825 MPa (M1)", () => {
    const n = planeNormal(0, 60);
    expect(n[0]).toBeCloseTo(0.866, 3);
    expect(n[1]).toBeCloseTo(0, 12);
    expect(n[2]).toBeCloseTo(0.5, 12);
    const { traction, normalMPa, shearMPa } = stressOnPlane(exampleTensor, n);
    expect(traction[0]).toBeCloseTo(30.311, 3);
    expect(traction[2]).toBeCloseTo(30.0, 3);
    expect(Math.abs(normalMPa - 41.25)).toBeLessThan(1e-3);
    expect(Math.abs(shearMPa - 10.825)).toBeLessThan(1e-3);
  });

  it("hanging-wall slip −τ_vec/τ = (0.5, 0, −0.866): down-dip, normal sense (M5)", () => {
    const { shearVector, shearMPa } = stressOnPlane(exampleTensor, planeNormal(0, 60));
    expect(-shearVector[0] / shearMPa).toBeCloseTo(0.5, 3);
    expect(-shearVector[1] / shearMPa).toBeCloseTo(0, 3);
    expect(-shearVector[2] / shearMPa).toBeCloseTo(-0.866, 3);
  });

  it("Ts = 0.2624 total and 0.6662 effective (Morris et al. 1996; M2)", () => {
    const { normalMPa, shearMPa } = stressOnPlane(exampleTensor, planeNormal(0, 60));
    expect(Math.abs(shearMPa / normalMPa - 0.2624)).toBeLessThan(1e-4);
    expect(Math.abs(slipTendency(shearMPa, normalMPa - 25) - 0.6662)).toBeLessThan(1e-4);
  });

  it("Td = 0.750 (Ferrill et al. 1999; M3)", () => {
    const { normalMPa } = stressOnPlane(exampleTensor, planeNormal(0, 60));
    expect(Math.abs(dilationTendency(normalMPa, 60, 35) - 0.75)).toBeLessThan(1e-4);
  });

  it("CFF +1.075 / −0.550 MPa at μ 0.6 / 0.7 and ΔP −1.79 / +0.785 MPa (Coulomb, common practice; M4)", () => {
    const { normalMPa, shearMPa } = stressOnPlane(exampleTensor, planeNormal(0, 60));
    const effective = normalMPa - 25;
    expect(Math.abs(coulombFailureFunction(shearMPa, effective, 0.6, 0) - 1.075)).toBeLessThan(1e-3);
    expect(Math.abs(coulombFailureFunction(shearMPa, effective, 0.7, 0) + 0.55)).toBeLessThan(1e-3);
    expect(Math.abs(pressureToFailure(shearMPa, effective, 0.7, 0) - 0.785)).toBeLessThan(1e-3);
    expect(pressureToFailure(shearMPa, effective, 0.6, 0)).toBeCloseTo(-1.79, 2);
  });

  it("vertical N–S plane (n ∥ σ3): τ = 0, Ts = 0, Td = 1 (M6)", () => {
    const { normalMPa, shearMPa } = stressOnPlane(exampleTensor, [1, 0, 0]);
    expect(normalMPa).toBeCloseTo(35, 9);
    expect(shearMPa).toBeLessThan(1e-9);
    expect(slipTendency(shearMPa, normalMPa - 25)).toBeLessThan(1e-9);
    expect(Math.abs(dilationTendency(normalMPa, 60, 35) - 1)).toBeLessThan(1e-9);
  });

  it("strike 045 dip 60 SE: σn = 45.000, τ = 9.682, Ts′ = 0.4841, Td = 0.600 (M7)", () => {
    const { normalMPa, shearMPa } = stressOnPlane(exampleTensor, planeNormal(45, 60));
    expect(Math.abs(normalMPa - 45)).toBeLessThan(1e-3);
    expect(Math.abs(shearMPa - 9.682)).toBeLessThan(1e-3);
    expect(Math.abs(slipTendency(shearMPa, normalMPa - 25) - 0.4841)).toBeLessThan(1e-3);
    expect(Math.abs(dilationTendency(normalMPa, 60, 35) - 0.6)).toBeLessThan(1e-3);
  });

  it("Ts_max′ = 0.66815 analytically and on a grid of planes near dip 62° (M8)", () => {
    expect(Math.abs(maxSlipTendency(35, 10) - 0.66815)).toBeLessThan(1e-3);
    let best = 0,
      bestDip = 0;
    for (let dip = 0; dip <= 90; dip += 0.1) {
      const { normalMPa, shearMPa } = stressOnPlane(exampleTensor, planeNormal(0, dip));
      const ts = slipTendency(shearMPa, normalMPa - 25);
      if (ts > best) {
        best = ts;
        bestDip = dip;
      }
    }
    expect(Math.abs(best - 0.66814)).toBeLessThan(1e-3);
    expect(Math.abs(bestDip - 62)).toBeLessThan(1);
  });

  it("the normal preset at 2.5 km reproduces the worked example's stresses (docs/check-values.md, the worked state)", () => {
    const s = stressesAtDepth(REGIME_PRESETS.normal, 2500);
    expect(s.verticalMPa).toBeCloseTo(60, 9);
    expect(s.maxHorizontalMPa).toBeCloseTo(45, 9);
    expect(s.minHorizontalMPa).toBeCloseTo(35, 9);
    expect(s.porePressureMPa).toBeCloseTo(25, 9);
  });
});

describe("regime presets follow Andersonian ordering (Anderson 1951, from memory)", () => {
  it.each([
    [
      "normal",
      (s: ReturnType<typeof stressesAtDepth>) => s.verticalMPa >= s.maxHorizontalMPa && s.maxHorizontalMPa >= s.minHorizontalMPa,
      "verticalMPa",
      "minHorizontalMPa",
    ],
    [
      "strike-slip",
      (s: ReturnType<typeof stressesAtDepth>) => s.maxHorizontalMPa >= s.verticalMPa && s.verticalMPa >= s.minHorizontalMPa,
      "maxHorizontalMPa",
      "minHorizontalMPa",
    ],
    [
      "reverse",
      (s: ReturnType<typeof stressesAtDepth>) => s.maxHorizontalMPa >= s.minHorizontalMPa && s.minHorizontalMPa >= s.verticalMPa,
      "maxHorizontalMPa",
      "verticalMPa",
    ],
  ] as const)("%s: σ1 and σ3 are the expected axes at every depth, and the preset validates", (regime, ordered, sigma1Axis, sigma3Axis) => {
    const parameters = applyPreset(DEFAULT_STRESS_PARAMETERS, regime);
    expect(stressParametersSchema.safeParse(parameters).success).toBe(true);
    for (const depthM of [500, 2500, 6000]) {
      const s = stressesAtDepth(parameters, depthM);
      expect(ordered(s)).toBe(true);
      const [s1, , s3] = orderedPrincipal(s);
      expect(s[sigma1Axis]).toBe(s1);
      expect(s[sigma3Axis]).toBe(s3);
      expect(s1).toBeGreaterThan(s3);
    }
  });

  it("an edited preset that breaks its ordering is refused with a message naming the regime; custom accepts it", () => {
    const broken = { ...applyPreset(DEFAULT_STRESS_PARAMETERS, "normal"), maxHorizontalGradient: 30 };
    const result = stressParametersSchema.safeParse(broken);
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].message).toMatch(/Normal faulting.*custom/);
    expect(stressParametersSchema.safeParse({ ...broken, regime: "custom" }).success).toBe(true);
  });

  it("field messages carry units", () => {
    const result = stressParametersSchema.safeParse({ ...DEFAULT_STRESS_PARAMETERS, verticalGradient: -3, referenceDepthM: "deep" });
    expect(result.success).toBe(false);
    const messages = result.error!.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("\n");
    expect(messages).toMatch(/verticalGradient: .*MPa\/km/);
    expect(messages).toMatch(/referenceDepthM: .*\(m\)/);
  });
});

// invariants (common practice, no source: they follow from the definitions behind docs/check-values.md M1–M3)
const unit = fc
  .tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }))
  .filter(([a, b, c]) => Math.hypot(a, b, c) > 1e-3)
  .map(([a, b, c]) => {
    const l = Math.hypot(a, b, c);
    return [a / l, b / l, c / l] as [number, number, number];
  });
const state = fc.record({
  verticalMPa: fc.double({ min: 1, max: 150, noNaN: true }),
  maxHorizontalMPa: fc.double({ min: 1, max: 150, noNaN: true }),
  minHorizontalMPa: fc.double({ min: 1, max: 150, noNaN: true }),
  porePressureMPa: fc.double({ min: 0, max: 0.9, noNaN: true }),
  azimuthDeg: fc.double({ min: 0, max: 360, noNaN: true }),
});

describe("invariants (common practice, no source)", () => {
  it("a plane normal to any principal stress carries no shear", () => {
    fc.assert(
      fc.property(state, (s) => {
        const tensor = stressTensorENU(s, s.azimuthDeg);
        const d = principalDirections(s.azimuthDeg);
        for (const n of [d.maxHorizontal, d.minHorizontal, d.vertical]) {
          expect(stressOnPlane(tensor, n).shearMPa).toBeLessThan(1e-9 * 150);
        }
      }),
    );
  });

  it("σn on any plane lies between σ3 and σ1, and Td between 0 and 1", () => {
    fc.assert(
      fc.property(state, unit, (s, n) => {
        const tensor = stressTensorENU(s, s.azimuthDeg);
        const [s1, , s3] = orderedPrincipal(s);
        const { normalMPa } = stressOnPlane(tensor, n);
        expect(normalMPa).toBeGreaterThanOrEqual(s3 - 1e-9);
        expect(normalMPa).toBeLessThanOrEqual(s1 + 1e-9);
        if (s1 - s3 > 1e-6) {
          const td = dilationTendency(normalMPa, s1, s3);
          expect(td).toBeGreaterThanOrEqual(-1e-6);
          expect(td).toBeLessThanOrEqual(1 + 1e-6);
        }
      }),
    );
  });

  it("raising pore pressure by δ lowers ΔP to failure by exactly δ, for any μ and C", () => {
    fc.assert(
      fc.property(
        state,
        unit,
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: 0.1, max: 1.2, noNaN: true }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        (s, n, delta, mu, cohesion) => {
          const { normalMPa, shearMPa } = stressOnPlane(stressTensorENU(s, s.azimuthDeg), n);
          const pp = s.porePressureMPa * Math.min(s.verticalMPa, s.maxHorizontalMPa, s.minHorizontalMPa);
          const before = pressureToFailure(shearMPa, normalMPa - pp, mu, cohesion);
          const after = pressureToFailure(shearMPa, normalMPa - (pp + delta), mu, cohesion);
          expect(before - after).toBeCloseTo(delta, 9);
        },
      ),
    );
  });

  it("scaling all stresses and pore pressure by k leaves Ts and Td unchanged", () => {
    fc.assert(
      fc.property(state, unit, fc.double({ min: 0.01, max: 100, noNaN: true }), (s, n, k) => {
        const pp = s.porePressureMPa * Math.min(s.verticalMPa, s.maxHorizontalMPa, s.minHorizontalMPa);
        const scaled = {
          verticalMPa: k * s.verticalMPa,
          maxHorizontalMPa: k * s.maxHorizontalMPa,
          minHorizontalMPa: k * s.minHorizontalMPa,
          porePressureMPa: k * pp,
        };
        const a = stressOnPlane(stressTensorENU(s, s.azimuthDeg), n);
        const b = stressOnPlane(stressTensorENU(scaled, s.azimuthDeg), n);
        const [s1, , s3] = orderedPrincipal(s);
        const [k1, , k3] = orderedPrincipal(scaled);
        const tsA = slipTendency(a.shearMPa, a.normalMPa - pp);
        const tsB = slipTendency(b.shearMPa, b.normalMPa - k * pp);
        expect(Math.abs(tsA - tsB)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(tsA)));
        if (s1 - s3 > 1e-6) expect(dilationTendency(a.normalMPa, s1, s3)).toBeCloseTo(dilationTendency(b.normalMPa, k1, k3), 9);
      }),
    );
  });

  it("the tensor is symmetric with trace Sv + SHmax + Shmin at any azimuth", () => {
    fc.assert(
      fc.property(state, (s) => {
        const t = stressTensorENU(s, s.azimuthDeg);
        expect(t[1]).toBeCloseTo(t[3], 12);
        expect(t[2]).toBeCloseTo(t[6], 12);
        expect(t[5]).toBeCloseTo(t[7], 12);
        expect(t[0] + t[4] + t[8]).toBeCloseTo(s.verticalMPa + s.maxHorizontalMPa + s.minHorizontalMPa, 9);
      }),
    );
  });

  it("tensorFromPrincipal with the identity frame gives the diagonal", () => {
    expect(
      Array.from(
        tensorFromPrincipal(
          [3, 2, 1],
          [
            [1, 0, 0],
            [0, 1, 0],
            [0, 0, 1],
          ],
        ),
      ),
    ).toEqual([3, 0, 0, 0, 2, 0, 0, 0, 1]);
  });
});

describe("per-triangle screen against an independent numpy implementation", () => {
  it("matches numpy (rotation-matrix tensor, eigvalsh σ1/σ3, np.cross normals) within 1e-9 MPa on 500 random triangles", () => {
    const rand = mulberry32(9);
    const n = 1500;
    const x = Float64Array.from({ length: n }, () => rand() * 2000);
    const y = Float64Array.from({ length: n }, () => rand() * 2000);
    const z = Float64Array.from({ length: n }, () => -500 - rand() * 3000);
    const triangles = Uint32Array.from({ length: n }, (_, i) => i);
    const parameters: StressParameters = {
      ...applyPreset(DEFAULT_STRESS_PARAMETERS, "strike-slip"),
      maxHorizontalAzimuthDeg: 37,
      cohesionMPa: 1.5,
      frictionLow: 0.55,
      frictionHigh: 0.85,
    };
    const screen = screenElements(rawTriangleElements({ x, y, z, triangles }, 0), parameters);
    expect(screen.count).toBe(500);
    const ref = runPythonOracle<{ sigmaN: number; tau: number; ts: number; td: number; dpLow: number; dpHigh: number }[]>(
      path.join(__dirname, "stress_oracle.py"),
      { parameters, points: Array.from(x, (v, i) => [v, y[i], z[i]]), triangles: Array.from(triangles) },
    );
    let worstStress = 0,
      worstRatio = 0,
      higherFrictionCritical = 0;
    for (let i = 0; i < screen.count; i++) {
      const r = ref[screen.source[i]];
      worstStress = Math.max(
        worstStress,
        Math.abs(screen.normalMPa[i] - r.sigmaN),
        Math.abs(screen.shearMPa[i] - r.tau),
        Math.abs(screen.pressureToFailureLowMPa[i] - r.dpLow),
        Math.abs(screen.pressureToFailureHighMPa[i] - r.dpHigh),
      );
      // the more critical end of the band is whichever ΔP is smaller, per triangle
      worstStress = Math.max(worstStress, Math.abs(screen.pressureToFailureCriticalMPa[i] - Math.min(r.dpLow, r.dpHigh)));
      if (r.dpHigh < r.dpLow) higherFrictionCritical++;
      worstRatio = Math.max(worstRatio, Math.abs(screen.slipTendency[i] - r.ts), Math.abs(screen.dilationTendency[i] - r.td));
    }
    expect(worstStress).toBeLessThan(1e-9);
    expect(worstRatio).toBeLessThan(1e-9);
    // with 1.5 MPa of cohesion some triangles carry less shear than that: there the upper μ is the critical end
    expect(higherFrictionCritical).toBeGreaterThan(0);
  });
});
