import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { threadedTipLineFitter } from "@/lib/analysis/tipline-thread";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { fitAndSummariseTipLine } from "@/lib/engine/pipeline";
import { tipLineInputs } from "@/lib/engine/tipline-inputs";
import { triangulate } from "@/lib/engine/triangulate";
import { generateSyntheticPicks, toCsv } from "@/lib/engine/synthetic";
import { demoCsv } from "@/lib/demo";

// basis: common practice, no source (the same pure fits, run in a helper thread, give the same numbers)
describe("tip-line fits on a helper thread", () => {
  let helper: ReturnType<typeof threadedTipLineFitter>;
  beforeAll(() => {
    helper = threadedTipLineFitter(path.join(process.cwd(), "dist", "analysis-worker.mjs"));
  });
  afterAll(() => helper.close());

  it("gives exactly the report of the one-thread pipeline, fitted on the helper", () => {
    const { picks } = generateSyntheticPicks({ seed: 5, pickCount: 6000, halfLengthM: 3000, dmaxM: 90, throwCutoffM: 10, noiseM: 2 });
    for (const csv of [toCsv(picks), demoCsv("QG-1")]) {
      const before = helper.counts().onHelper;
      const threaded = analyzeCsv(csv, { tipLineFitter: helper.fitter });
      const inline = analyzeCsv(csv);
      expect(threaded.report).toEqual(inline.report);
      expect(helper.counts().onHelper - before).toBe(inline.report.segments.length);
    }
    expect(helper.counts().inThisThread).toBe(0);
  });

  it("answers each wait with its own fits, skipping the reply to a start nobody waited for (a job that failed midway)", () => {
    const inputsFor = (halfLengthM: number, seed: number) => {
      const { picks } = generateSyntheticPicks({ seed, pickCount: 3000, halfLengthM, dmaxM: 60, throwCutoffM: 0, noiseM: 1 });
      const tri = triangulate(picks.x, picks.y);
      return tipLineInputs(picks.x, picks.y, picks.throwM, tri.outline, tri.triangles, tri.medianEdgeM);
    };
    const abandoned = inputsFor(2000, 7);
    const wanted = inputsFor(3500, 8);
    helper.fitter(abandoned);
    expect(helper.fitter(wanted)()).toEqual(fitAndSummariseTipLine(wanted));
  });

  it("falls back to fitting in this thread when the helper cannot start", () => {
    const missing = threadedTipLineFitter(path.join(process.cwd(), "dist", "no-such-worker.mjs"));
    const csv = demoCsv("QG-4");
    const report = analyzeCsv(csv, { tipLineFitter: missing.fitter }).report;
    expect(report).toEqual(analyzeCsv(csv).report);
    expect(missing.counts()).toEqual({ onHelper: 0, inThisThread: 1 });
    return missing.close();
  }, 30_000);
});
