import { describe, expect, it } from "vitest";
import { fitPlane } from "@/lib/engine/plane";
import { pickWeights, pullTowardNeighbours, qualityNote, weightsMatter } from "@/lib/engine/quality";
import { analyzePicks } from "@/lib/engine/pipeline";
import { generateSyntheticPicks } from "@/lib/engine/synthetic";

describe("pick quality as weights", () => {
  it("weights are the quality, 1 where blank, clamped to [0, 1]; all-zero quality weights nothing (common practice, no source)", () => {
    expect(Array.from(pickWeights([0.5, NaN, 1, 0, 2, -1]))).toEqual([0.5, 1, 1, 0, 1, 0]);
    expect(Array.from(pickWeights([0.2, 0.9, 0.4], [2, 0]))).toEqual([0.4, 0.2]);
    expect(Array.from(pickWeights([0, 0, 0]))).toEqual([1, 1, 1]);
    expect(weightsMatter([1, 1, 1])).toBe(false);
    expect(weightsMatter([1, 0.99])).toBe(true);
  });

  it("the weighted plane: weight 0 drops a point, weight ½ equals counting the others twice (docs/check-values.md G9)", () => {
    // eight points near a plane dipping 40° east, and one wild point
    const x = [0, 100, 200, 0, 100, 200, 50, 150, 100];
    const y = [0, 0, 0, 100, 100, 100, 50, 50, 60];
    const z = x.map((v, i) => -Math.tan((40 * Math.PI) / 180) * v + [0.3, -0.2, 0.1, -0.4, 0.2, 0.1, -0.1, 0.3, 0][i]);
    z[8] += 60;
    const clean = fitPlane(x.slice(0, 8), y.slice(0, 8), z.slice(0, 8));
    const dropped = fitPlane(x, y, z, undefined, [1, 1, 1, 1, 1, 1, 1, 1, 0]);
    expect(dropped.dipDeg).toBeCloseTo(clean.dipDeg, 10);
    expect(dropped.strikeDeg).toBeCloseTo(clean.strikeDeg, 10);
    expect(dropped.centroid[2]).toBeCloseTo(clean.centroid[2], 10);
    const unweighted = fitPlane(x, y, z);
    expect(Math.abs(unweighted.dipDeg - clean.dipDeg)).toBeGreaterThan(1); // the wild point tilts an unweighted fit
    // weights ½ on the last point = every other point counted twice
    const half = fitPlane(x, y, z, undefined, [1, 1, 1, 1, 1, 1, 1, 1, 0.5]);
    const doubled = [...Array(8).keys()].flatMap((i) => [i, i]).concat(8);
    const twice = fitPlane(x, y, z, doubled);
    expect(half.dipDeg).toBeCloseTo(twice.dipDeg, 10);
    expect(half.dipDirectionDeg).toBeCloseTo(twice.dipDirectionDeg, 10);
    expect(half.rmsM).toBeCloseTo(twice.rmsM, 10);
  });

  it("before gridding a doubtful pick moves toward its quality-weighted neighbours by (1 − q); quality-1 picks stay exact (by hand)", () => {
    // a fan of four triangles around pick 0: neighbours 1–4 with values 10, 20, 30, 40 and qualities 1, 1, 0.5, 0
    const values = [100, 10, 20, 30, 40];
    const weights = [0.25, 1, 1, 0.5, 0];
    const triangles = [0, 1, 2, 0, 2, 3, 0, 3, 4, 0, 4, 1];
    const [out] = pullTowardNeighbours([values], weights, triangles);
    // each neighbour shares two triangles with pick 0: weighted mean (2·10 + 2·20 + 2·0.5·30 + 0) / (2 + 2 + 1) = 18
    expect(out[0]).toBeCloseTo(0.25 * 100 + 0.75 * 18, 12);
    expect(out[1]).toBe(10);
    expect(out[2]).toBe(20);
    // pick 4 (quality 0) takes its neighbours' weighted mean: 0 (q 0.25), 30 (q 0.5), 10 (q 1), one triangle each with 3 and 1, two with 0
    expect(out[4]).toBeCloseTo((2 * 0.25 * 100 + 0.5 * 30 + 1 * 10) / (2 * 0.25 + 0.5 + 1), 12);
    expect(values[0]).toBe(100); // the input is not changed
  });

  it("in the pipeline, low-quality spikes no longer set Dmax, and the report says how quality was used", () => {
    const { picks } = generateSyntheticPicks({ seed: 5, halfLengthM: 800, dmaxM: 40, noiseM: 0.5, throwCutoffM: 4, pickCount: 900 });
    const spiked = { ...picks, throwM: Float64Array.from(picks.throwM), quality: new Float64Array(picks.x.length).fill(NaN) };
    // three picks get a throw of 200 m, which no neighbour supports
    for (const i of [100, 300, 500]) {
      spiked.throwM[i] = 200;
      spiked.quality[i] = 0.05;
    }
    const plain = analyzePicks({ ...spiked, quality: new Float64Array(picks.x.length).fill(NaN) }).report;
    const weighted = analyzePicks(spiked).report;
    expect(plain.quality).toEqual({ picksBelowOne: 0, note: qualityNote(0) });
    expect(weighted.quality!.picksBelowOne).toBe(3);
    expect(weighted.quality!.note).toMatch(/^3 picks have a quality below 1\. Quality \(0–1, blank = 1\) weights/);
    // without weights the spike is the maximum: 200 m of throw over sin 60° of dip
    expect(plain.segments[0].max.throwM).toBe(200);
    // with quality 0.05 a spike keeps 5 % of its value over its neighbours' mean: at most the 40·sin 60° = 34.6 m
    // peak + 0.05 × 200 m + 3 × the 0.5 m throw noise of the neighbours = 46.1 m
    expect(weighted.segments[0].max.throwM).toBeLessThan(40 * Math.sin(Math.PI / 3) + 0.05 * 200 + 3 * 0.5);
  });
});
