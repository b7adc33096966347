import path from "node:path";
import { describe, expect, it } from "vitest";
import { fitPowerLaw, powerLawLine, studentTQuantile, faultScalingPoint } from "@/lib/views/scaling";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { demoCsv } from "@/lib/demo";
import { runPythonOracle } from "../../support/python";
import type { LooseJson } from "../../support/requests";

function mulberry32(seed: number) {
  return () => {
    seed |= 0;
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe("D–L power-law fits", () => {
  it("recovers an exact power law D = 0.02 L^1.2 (docs/check-values.md S2, derived)", () => {
    const L = [10, 100, 1000, 10000];
    const fit = fitPowerLaw(
      L,
      L.map((l) => 0.02 * l ** 1.2),
    )!;
    expect(fit.ols.n).toBeCloseTo(1.2, 9);
    expect(fit.ols.c / 0.02).toBeCloseTo(1, 9);
    expect(fit.rma.n).toBeCloseTo(1.2, 9);
    expect(fit.r).toBeCloseTo(1, 12);
  });

  it("matches the worked OLS and RMA values (docs/check-values.md S3, derived with numpy)", () => {
    const fit = fitPowerLaw([100, 300, 1000, 3000, 10000], [2, 5, 30, 60, 400])!;
    expect(fit.r).toBeCloseTo(0.99263, 4);
    expect(fit.ols.n).toBeCloseTo(1.13839, 4);
    expect(fit.ols.c).toBeCloseTo(0.009262, 5);
    expect(fit.rma.n).toBeCloseTo(1.14685, 4);
    expect(fit.rma.c).toBeCloseTo(0.008738, 5);
  });

  it("refuses fewer than three positive pairs", () => {
    expect(fitPowerLaw([100, 200], [1, 2])).toBeNull();
    expect(fitPowerLaw([100, 200, -5], [1, 2, 3])).toBeNull();
  });

  it("Student t quantiles match tabulated values (docs/check-values.md S6: Student 1908 tables as reprinted in statistics texts; from memory)", () => {
    expect(studentTQuantile(0.975, 1)).toBeCloseTo(12.7062, 3);
    expect(studentTQuantile(0.975, 3)).toBeCloseTo(3.1824, 3);
    expect(studentTQuantile(0.975, 30)).toBeCloseTo(2.0423, 3);
  });

  // docs/check-values.md S4, the small-N case: N = 4 pairs with r = 0.32 and s_y/s_x = 0.9 in log space (built exactly below).
  // Warton et al. (2006) give b·(√(B+1) ∓ √B), B = (1 − r²)·F/(N − 2); with F(0.95; 1, 2) = 18.513 from printed
  // F tables: B = 8.309, so 0.9 × 0.1685 = 0.152 to 0.9 × 5.933 = 5.34. The old symmetric t interval on an OLS-style
  // standard error gave −1.69…3.49, negative slopes included.
  const smallCase = (() => {
    const x = [-1.5, -0.5, 0.5, 1.5];
    const z = [1, -1, -1, 1]; // orthogonal to x and to the mean
    const a = 0.288; // r = 5a / sqrt(5 × 4.05) = 0.32
    const c = Math.sqrt((4.05 - 5 * a * a) / 4); // Σ(y − ȳ)² = 4.05 = 0.81 × Σ(x − x̄)²
    return { L: x.map((v) => 10 ** (3 + v)), D: x.map((v, i) => 10 ** (1 + a * v + c * z[i])) };
  })();

  it("small N: N = 4, r = 0.32 gives an RMA interval of about 0.15…5.34 that excludes negative slopes (Warton et al. 2006)", () => {
    const fit = fitPowerLaw(smallCase.L, smallCase.D)!;
    expect(fit.count).toBe(4);
    expect(fit.r).toBeCloseTo(0.32, 12);
    expect(fit.rma.n).toBeCloseTo(0.9, 12);
    // two decimals: the hand values above carry F to five significant figures
    expect(fit.rma.nConfidence95[0]).toBeCloseTo(0.152, 2);
    expect(fit.rma.nConfidence95[1]).toBeCloseTo(5.34, 2);
    expect(fit.rma.nConfidence95[0]).toBeGreaterThan(0);
    // the interval is not symmetric about n: its ends multiply to n² (√(B+1) − √B)(√(B+1) + √B) = 1
    expect(fit.rma.nConfidence95[0] * fit.rma.nConfidence95[1]).toBeCloseTo(0.81, 12);
    expect(fit.rma.intervalMethod).toMatch(/Warton et al\. 2006/);
    // r = 0.32 on 4 points is far from significant: t = 0.32·√(2/(1 − 0.1024)) = 0.478 on 2 df, p ≈ 0.68
    expect(fit.correlationPValue).toBeGreaterThan(0.6);
  });

  // Independent oracle (tests/lib/views/line_fit_oracle.py, run with the resolved Python): scipy.stats.linregress for
  // OLS, and for RMA the published test inverted numerically (pearsonr p-value of residuals against the fitted axis,
  // brentq for the ends) — no closed form shared with lib/views/scaling.ts.
  it("agrees with scipy: OLS by linregress, RMA interval by numerically inverting the Pitman test (N = 3 to 120, r of both signs)", () => {
    const rand = mulberry32(7);
    const cases = [
      { L: [100, 300, 1000, 3000, 10000], D: [2, 5, 30, 60, 400] },
      { L: [2500, 4400, 1800], D: [46, 78, 30] },
      smallCase,
      { L: [120, 800, 2400, 5100, 9000], D: [30, 12, 9, 4, 6] }, // negative correlation
      ...[5, 8, 25, 120].map((count) => {
        const L = Array.from({ length: count }, () => 10 ** (1 + 4 * rand()));
        return { L, D: L.map((l) => 0.02 * l ** (0.9 + 0.3 * rand()) * 10 ** (0.4 * (rand() - 0.5))) };
      }),
    ];
    const reference = runPythonOracle<LooseJson[]>(path.join(__dirname, "line_fit_oracle.py"), { cases });
    expect(reference).toHaveLength(cases.length);
    cases.forEach((c, i) => {
      const mine = fitPowerLaw(c.L, c.D)!;
      const ref = reference[i];
      expect(mine.ols.n).toBeCloseTo(ref.olsN, 9);
      expect(mine.ols.log10c).toBeCloseTo(ref.olsLog10c, 9);
      expect(mine.r).toBeCloseTo(ref.r, 9);
      expect(mine.correlationPValue).toBeCloseTo(ref.rP, 6);
      expect(mine.ols.nStandardError!).toBeCloseTo(ref.olsSe, 9);
      expect(mine.ols.nConfidence95[0]).toBeCloseTo(ref.olsCi[0], 6);
      expect(mine.ols.nConfidence95[1]).toBeCloseTo(ref.olsCi[1], 6);
      expect(mine.rma.n).toBeCloseTo(ref.rmaN, 9);
      expect(mine.rma.log10c).toBeCloseTo(ref.rmaLog10c, 9);
      // 6 decimals: the Student t quantile here is found by bisection, scipy's by its own series
      expect(mine.rma.nConfidence95[0]).toBeCloseTo(ref.rmaCi[0], 6);
      expect(mine.rma.nConfidence95[1]).toBeCloseTo(ref.rmaCi[1], 6);
    });
  });

  it("at N = 5 the RMA interval misses the true slope 2.5 % of the time on each side (docs/check-values.md S5: 4000 bivariate normal samples; exact under normality, Warton et al. 2006)", () => {
    const rand = mulberry32(2024);
    const normal = () => Math.sqrt(-2 * Math.log(Math.max(rand(), 1e-12))) * Math.cos(2 * Math.PI * rand());
    // x ~ N(0, 1), y = 0.8·(ρ x + √(1 − ρ²) e): the population's standardised major axis slope is σy/σx = 0.8
    const rho = 0.7;
    const trials = 4000;
    let below = 0;
    let above = 0;
    for (let k = 0; k < trials; k++) {
      const x = Array.from({ length: 5 }, normal);
      const y = x.map((v) => 0.8 * (rho * v + Math.sqrt(1 - rho * rho) * normal()));
      const fit = fitPowerLaw(
        x.map((v) => 10 ** v),
        y.map((v) => 10 ** v),
      )!;
      // the published interval takes the sign of the relation from r; the test it inverts cannot tell β from −β, so
      // its exact statement is about the slope with the sign of r (a D–L slope is positive by nature)
      const truth = Math.sign(fit.r) * 0.8;
      if (truth < fit.rma.nConfidence95[0]) below++;
      if (truth > fit.rma.nConfidence95[1]) above++;
    }
    // each tail 0.025 ± 3 binomial standard errors (√(0.025 × 0.975 / 4000) = 0.0025). The old symmetric t interval
    // missed 1.2 % below and 3.75 % above with this seed: too short above, too long below.
    for (const tail of [below / trials, above / trials]) {
      expect(tail).toBeGreaterThan(0.025 - 3 * 0.0025);
      expect(tail).toBeLessThan(0.025 + 3 * 0.0025);
    }
  });

  it("draws constant-ratio lines exactly: D = 0.03 L gives 30 m at 1 km (Schlische et al. 1996; docs/check-values.md S7)", () => {
    const line = powerLawLine(0.03, 1, 100, 10000, 3);
    expect(line[1].lengthM).toBeCloseTo(1000, 9);
    expect(line[1].dMaxM).toBeCloseTo(30, 9);
  });

  it("one fault gives one (L, Dmax) pair; QG-1's length spans both segments' tip lines along strike", () => {
    const { report } = analyzeCsv(demoCsv("QG-1"));
    const point = faultScalingPoint("f", "QG-1", report)!;
    // the fitted Dmax (noise lifts the observed maximum) of the segment with the largest, with its range around it
    expect(point.dMaxM).toBe(Math.max(...report.segments.map((s) => s.max.fittedDisplacementM)));
    expect(point.dMaxRangeM[0]).toBeLessThanOrEqual(point.dMaxM);
    expect(point.dMaxRangeM[1]).toBeGreaterThanOrEqual(point.dMaxM);
    // lib/demo.ts gives the north segment Dmax 78 m: the fitted value within 5 % of it (the observed one is above)
    expect(Math.abs(point.dMaxM / 78 - 1)).toBeLessThan(0.05);
    // lib/demo.ts draws two 3800 m segments overlapping by 700 m: about 6900 m end to end
    expect(point.lengthM).toBeGreaterThan(Math.max(...report.segments.map((s) => s.tipLine.lengthM)));
    expect(point.lengthM).toBeGreaterThan(6900 * 0.9);
    expect(point.lengthM).toBeLessThan(6900 * 1.1);
    // its range from the inner and outer tip lines of both segments
    expect(point.lengthRangeM[0]).toBeLessThan(point.lengthM);
    expect(point.lengthRangeM[1]!).toBeGreaterThan(point.lengthM);
  });
});
