// Plane faults whose analysis was saved before the engine learnt the true (curved) fault surface: the regression test
// (tests/engine/plane-regression.test.ts) runs them again and compares with the saved numbers. The picks come from the
// synthetic generator with fixed options and seeds, so the saved reports can be reproduced exactly.
import { generateSyntheticPicks, syntheticRelayOptions, type SyntheticFaultOptions } from "@/lib/engine/synthetic";
import type { AnalysisReport, PickColumns } from "@/lib/engine/types";

export const PLANE_CASES: { name: string; picks: () => PickColumns }[] = [
  {
    name: "single fault, Walsh & Watterson profile, dip 55°",
    picks: () =>
      generateSyntheticPicks({
        seed: 7,
        strikeDeg: 140,
        dipDeg: 55,
        halfLengthM: 1000,
        aspectRatio: 2,
        dmaxM: 60,
        throwCutoffM: 8,
        noiseM: 1.5,
        pickCount: 1200,
      }).picks,
  },
  {
    name: "two segments with a relay, dip 60°",
    picks: () =>
      generateSyntheticPicks(syntheticRelayOptions({ seed: 11, halfLengthM: 1200, dmaxM: 70, throwCutoffM: 8, noiseM: 1.5, pickCount: 1200 }, 500, 120)).picks,
  },
  {
    name: "blind fault, elliptical-crack profile, dip 52° (the first demo QG-4)",
    picks: () =>
      generateSyntheticPicks(
        [
          {
            segment: "main",
            strikeDeg: 318,
            dipDeg: 52,
            halfLengthM: 1250,
            aspectRatio: 2.3,
            dmaxM: 46,
            noiseM: 1.5,
            throwCutoffM: 10,
            pickCount: 2400,
            profile: "elliptical-crack",
            centre: [467_600, 6_734_900, -2_600],
          },
        ] satisfies SyntheticFaultOptions[],
        4402,
      ).picks,
  },
];

/** The numbers the regression compares: per segment the maximum, tip line, centroid and asymmetry; per relay its geometry. */
export function regressionSummary(report: AnalysisReport) {
  return {
    segments: report.segments.map((s) => ({
      id: s.id,
      dipDeg: s.plane.dipDeg,
      maxDisplacementM: s.max.displacementM,
      fittedDmaxM: s.max.fittedDisplacementM,
      lengthM: s.tipLine.lengthM,
      heightM: s.tipLine.heightM,
      lengthRangeM: s.tipLine.lengthRangeM,
      heightRangeM: s.tipLine.heightRangeM,
      areaM2: s.tipLine.areaM2,
      centroid: s.centroidOfDisplacement,
      asymmetry: s.asymmetry,
      mappedLengthM: s.mappedLimit.lengthM,
      mappedHeightM: s.mappedLimit.heightM,
      contourLevels: s.contours.length,
    })),
    relays: report.relays.map((r) => ({ segments: r.segments, overlapM: r.overlapM, separationM: r.separationM, linkage: r.linkage })),
  };
}
