import { describe, expect, it } from "vitest";
import { generateSyntheticPicks } from "@/lib/engine/synthetic";
import { analyzePicks } from "@/lib/engine/pipeline";
import type { ProfileModel } from "@/lib/engine/types";

// Synthetic isolated faults after Barnett et al. (1987): elliptical tip line, concentric contours, with the
// Walsh & Watterson (1989) or elliptical-crack (Pollard & Segall 1987) profile; aspect ratios 1–3.5 span
// Nicol et al. (1996). Picks below a throw cut-off are removed, as below seismic resolution.
interface Case { profile: Exclude<ProfileModel, "linear">; aspectRatio: number; dipDeg: number; strikeDeg: number; cutoffM: number; noiseM: number; seed: number }

const cases: Case[] = [];
const aspects = [1, 1.8, 2.5, 3.5];
const dips = [30, 45, 65, 80];
const strikes = [20, 115, 200, 305];
for (const profile of ["walsh-watterson-1989", "elliptical-crack"] as const) {
  for (let k = 0; k < 4; k++) {
    const cutoffM = [5, 10, 15, 12][k];
    cases.push({ profile, aspectRatio: aspects[k], dipDeg: dips[(k + (profile === "elliptical-crack" ? 1 : 0)) % 4], strikeDeg: strikes[(k + 2 * (profile === "elliptical-crack" ? 1 : 0)) % 4], cutoffM, noiseM: cutoffM / 5, seed: 100 + cases.length });
  }
}

describe("inferred tip line on synthetic faults", () => {
  it.each(cases)("$profile, aspect $aspectRatio, dip $dipDeg°, strike $strikeDeg°, cut-off $cutoffM m, noise $noiseM m", (c) => {
    const sinDip = Math.sin((c.dipDeg * Math.PI) / 180);
    // throw at the centre: 8× the cut-off for the tapered profile, 1.5× for the crack (whose tips stay steep)
    const dmaxM = ((c.profile === "elliptical-crack" ? 1.5 : 8) * c.cutoffM) / sinDip;
    const { picks, truth } = generateSyntheticPicks({ seed: c.seed, profile: c.profile, aspectRatio: c.aspectRatio, dipDeg: c.dipDeg, strikeDeg: c.strikeDeg, throwCutoffM: c.cutoffM, noiseM: c.noiseM, dmaxM, halfLengthM: 1200, pickCount: 1500 });
    const seg = analyzePicks(picks).report.segments[0];
    const { lengthM, heightM } = truth[0];
    expect(Math.abs(seg.tipLine.lengthM / lengthM - 1)).toBeLessThan(0.05);
    expect(Math.abs(seg.tipLine.heightM / heightM - 1)).toBeLessThan(0.05);
    expect(seg.tipLine.model).toBe(c.profile);
    // the mapped limit alone falls short by 10 % or more (Kim & Sanderson 2005: unresolved tips shorten L)
    expect(seg.mappedLimit.lengthM).toBeLessThanOrEqual(0.9 * lengthM);
    expect(seg.mappedLimit.heightM).toBeLessThan(heightM);
    expect(seg.tipLine.uncertaintyM).toBeGreaterThanOrEqual(0);
    expect(seg.tipLine.polygon.length).toBeGreaterThan(16);
    expect(Math.abs(seg.plane.dipDeg - c.dipDeg)).toBeLessThan(0.5);
  });
});
