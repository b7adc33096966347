import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import { analyzePicks } from "@/lib/engine/pipeline";
import { PLANE_CASES, regressionSummary } from "./plane-regression-cases";

// Reports saved by engine 2.0.0 (with its faster tip-line fits), before the analysis read the true fault surface
// (tests/engine/fixtures/plane-reports.json).
// These picks lie exactly on their planes, so the surface is the plane and every number must come back unchanged apart
// from floating-point noise: relative 1e-6 on lengths, areas and displacements, absolute 1e-6 on the dimensionless
// asymmetry and 1e-3 m on the centroid (a weighted mean over ~10⁵ nodes).
const saved = JSON.parse(readFileSync(path.join(__dirname, "fixtures", "plane-reports.json"), "utf8")) as {
  cases: Record<string, ReturnType<typeof regressionSummary>>;
};

const close = (actual: number, expected: number, relative: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(relative * Math.max(1, Math.abs(expected)));

describe("plane faults give the results saved before the true surface was read", () => {
  for (const testCase of PLANE_CASES) {
    it(testCase.name, () => {
      const now = regressionSummary(analyzePicks(testCase.picks()).report);
      const before = saved.cases[testCase.name];
      expect(now.segments.map((s) => s.id)).toEqual(before.segments.map((s) => s.id));
      now.segments.forEach((segment, k) => {
        const old = before.segments[k];
        for (const key of ["dipDeg", "maxDisplacementM", "fittedDmaxM", "lengthM", "heightM", "areaM2", "mappedLengthM", "mappedHeightM"] as const)
          close(segment[key], old[key], 1e-6);
        for (const key of ["lengthRangeM", "heightRangeM"] as const) {
          close(segment[key][0], old[key][0], 1e-6);
          if (old[key][1] === null) expect(segment[key][1]).toBeNull();
          else close(segment[key][1]!, old[key][1]!, 1e-6);
        }
        expect(Math.abs(segment.centroid.s - old.centroid.s)).toBeLessThan(1e-3);
        expect(Math.abs(segment.centroid.t - old.centroid.t)).toBeLessThan(1e-3);
        expect(Math.abs(segment.asymmetry.alongStrike - old.asymmetry.alongStrike)).toBeLessThan(1e-6);
        expect(Math.abs(segment.asymmetry.downDip - old.asymmetry.downDip)).toBeLessThan(1e-6);
        expect(segment.contourLevels).toBe(old.contourLevels);
      });
      expect(now.relays.length).toBe(before.relays.length);
      now.relays.forEach((relay, k) => {
        expect(relay.segments).toEqual(before.relays[k].segments);
        expect(relay.linkage).toBe(before.relays[k].linkage);
        close(relay.overlapM, before.relays[k].overlapM, 1e-6);
        close(relay.separationM, before.relays[k].separationM, 1e-6);
      });
    });
  }
});
