import { describe, expect, it } from "vitest";
import { fitDisplacementLength, scalingNote, schlischeDisplacementM } from "@/lib/engine/metrics";
import { rampDipDeg, overlapToSeparationNote, LONG_IMBER_MEAN_OS } from "@/lib/engine/relays";

describe("displacement–length scaling", () => {
  // docs/check-values.md S1: plausibility 1e-3 ≤ Dmax/L ≤ 1e-1 (Barnett et al. 1987, R/Dmax 5–500)
  it("flags Dmax/L outside 0.001–0.1 and names the source", () => {
    expect(scalingNote(30, 1000).plausible).toBe(true);
    expect(scalingNote(0.5, 1000).plausible).toBe(false);
    expect(scalingNote(150, 1000).plausible).toBe(false);
    expect(scalingNote(1, 1000).plausible).toBe(true);
    expect(scalingNote(30, 1000).note).toContain("Barnett et al. 1987");
  });
  // docs/check-values.md S2 (derived)
  it("exact D = 0.02 L^1.2 recovers n and c", () => {
    const L = [10, 100, 1000, 10000];
    const fit = fitDisplacementLength(
      L,
      L.map((l) => 0.02 * l ** 1.2),
      "ols",
    );
    expect(fit.n).toBeCloseTo(1.2, 9);
    expect(fit.c / 0.02).toBeCloseTo(1, 9);
  });
  // docs/check-values.md S3 (derived with numpy)
  it("OLS and reduced major axis on a small dataset", () => {
    const L = [100, 300, 1000, 3000, 10000];
    const D = [2, 5, 30, 60, 400];
    const ols = fitDisplacementLength(L, D, "ols");
    expect(ols.n).toBeCloseTo(1.13839, 4);
    expect(ols.c).toBeCloseTo(0.009262, 4);
    expect(ols.r).toBeCloseTo(0.99263, 4);
    const rma = fitDisplacementLength(L, D, "rma");
    expect(rma.n).toBeCloseTo(1.14685, 4);
    expect(rma.c).toBeCloseTo(0.008738, 4);
  });
  // docs/check-values.md S7: Schlische et al. 1996, D = 0.03 L
  it("Schlische line at L = 1000 m gives 30 m", () => {
    expect(schlischeDisplacementM(1000)).toBe(30);
    expect(scalingNote(30, 1000).note).toContain("Schlische et al. (1996) predicts 30.0 m");
  });
});

describe("relay ramps", () => {
  // docs/check-values.md R1 (derived; geometry after Peacock & Sanderson 1991)
  it("ΔT = 100 m over O = 600 m gives 9.462°", () => {
    const r = rampDipDeg(100, 600);
    expect(r.dipDeg).toBeCloseTo(9.462, 3);
    expect(r.flag).toBe("ok");
  });
  // docs/check-values.md R2; breaching at ~10–15° (Fossen & Rotevatn 2016)
  it("ΔT = 30 m over O = 100 m gives 16.699°, breaching likely", () => {
    const r = rampDipDeg(30, 100);
    expect(r.dipDeg).toBeCloseTo(16.699, 3);
    expect(r.flag).toBe("breaching likely");
    expect(rampDipDeg(105.8, 600).flag).toBe("approaching breaching");
  });
  // docs/check-values.md R3: Long & Imber 2011 global mean O/S = 4.2
  it("O = 600, S = 142.857 is the global mean ratio", () => {
    expect(600 / 142.857).toBeCloseTo(LONG_IMBER_MEAN_OS, 2);
    const note = overlapToSeparationNote(600 / 142.857);
    expect(note).toContain("4.20 (typical)");
    expect(note).toContain("Long & Imber 2011");
    expect(note).toContain("Acocella et al. 2000");
  });
});
