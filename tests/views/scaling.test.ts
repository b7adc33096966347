import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { fitPowerLaw, powerLawLine, studentTQuantile, faultScalingPoint } from "@/lib/views/scaling";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { demoCsv } from "@/lib/demo";

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
  it("recovers an exact power law D = 0.02 L^1.2 (domain reference check 26, derived)", () => {
    const L = [10, 100, 1000, 10000];
    const fit = fitPowerLaw(L, L.map((l) => 0.02 * l ** 1.2))!;
    expect(fit.ols.n).toBeCloseTo(1.2, 9);
    expect(fit.ols.c / 0.02).toBeCloseTo(1, 9);
    expect(fit.rma.n).toBeCloseTo(1.2, 9);
    expect(fit.r).toBeCloseTo(1, 12);
  });

  it("matches the worked OLS and RMA values of the reference sheet (checks 27–28, derived with numpy/scipy)", () => {
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

  it("Student t quantiles match tabulated values (Student 1908 tables as reprinted in any statistics text; from memory)", () => {
    expect(studentTQuantile(0.975, 1)).toBeCloseTo(12.7062, 3);
    expect(studentTQuantile(0.975, 3)).toBeCloseTo(3.1824, 3);
    expect(studentTQuantile(0.975, 30)).toBeCloseTo(2.0423, 3);
  });

  // independent oracle: scipy.stats.linregress and scipy.stats.t, run in python3 (tests/views/linregress_oracle.py)
  it("agrees with scipy.stats.linregress (OLS) and the RMA slope sign(r)·s_y/s_x with 95 % CIs", () => {
    const rand = mulberry32(7);
    const cases = [
      { L: [100, 300, 1000, 3000, 10000], D: [2, 5, 30, 60, 400] },
      { L: [2500, 4400, 1800], D: [46, 78, 30] },
      ...[8, 25, 120].map((count) => {
        const L = Array.from({ length: count }, () => 10 ** (1 + 4 * rand()));
        return { L, D: L.map((l) => 0.02 * l ** (0.9 + 0.3 * rand()) * 10 ** (0.4 * (rand() - 0.5))) };
      }),
    ];
    const py = spawnSync("python3", [path.join(__dirname, "linregress_oracle.py")], { input: JSON.stringify({ cases }), encoding: "utf8" });
    if (py.error || py.status !== 0) throw new Error(`the scipy oracle needs python3 with scipy (apt install python3-scipy): ${py.error?.message ?? py.stderr}`);
    const reference = JSON.parse(py.stdout) as Record<string, any>[];
    expect(reference).toHaveLength(cases.length);
    cases.forEach((c, i) => {
      const mine = fitPowerLaw(c.L, c.D)!;
      const ref = reference[i];
      expect(mine.ols.n).toBeCloseTo(ref.olsN, 9);
      expect(mine.ols.log10c).toBeCloseTo(ref.olsLog10c, 9);
      expect(mine.r).toBeCloseTo(ref.r, 9);
      expect(mine.ols.nStandardError).toBeCloseTo(ref.olsSe, 9);
      expect(mine.ols.nConfidence95[0]).toBeCloseTo(ref.olsCi[0], 6);
      expect(mine.ols.nConfidence95[1]).toBeCloseTo(ref.olsCi[1], 6);
      expect(mine.rma.n).toBeCloseTo(ref.rmaN, 9);
      expect(mine.rma.log10c).toBeCloseTo(ref.rmaLog10c, 9);
      expect(mine.rma.nConfidence95[0]).toBeCloseTo(ref.rmaCi[0], 6);
      expect(mine.rma.nConfidence95[1]).toBeCloseTo(ref.rmaCi[1], 6);
    });
  });

  it("draws constant-ratio lines exactly: D = 0.03 L gives 30 m at 1 km (Schlische et al. 1996, check 29)", () => {
    const line = powerLawLine(0.03, 1, 100, 10000, 3);
    expect(line[1].lengthM).toBeCloseTo(1000, 9);
    expect(line[1].dMaxM).toBeCloseTo(30, 9);
  });

  it("one fault gives one (L, Dmax) pair; QG-1's length spans both segments' tip lines along strike", () => {
    const { report } = analyzeCsv(demoCsv("QG-1"));
    const point = faultScalingPoint("f", "QG-1", report)!;
    expect(point.dMaxM).toBe(Math.max(...report.segments.map((s) => s.max.displacementM)));
    // lib/demo.ts draws two 3800 m segments overlapping by 700 m: about 6900 m end to end
    expect(point.lengthM).toBeGreaterThan(Math.max(...report.segments.map((s) => s.tipLine.lengthM)));
    expect(point.lengthM).toBeGreaterThan(6900 * 0.9);
    expect(point.lengthM).toBeLessThan(6900 * 1.1);
  });
});
