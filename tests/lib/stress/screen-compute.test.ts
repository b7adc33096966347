// The reactivation screen reads the analysis' stored triangulation instead of triangulating the picks again: the
// screen must be the same either way (common practice, no source: a stored result must equal the one recomputed).
import { describe, expect, it } from "vitest";
import { computeAnalysis } from "@/lib/analysis/compute";
import { parseUploadedFile } from "@/lib/analysis/upload-parse";
import { decodeFaultDisplay } from "@/lib/display/payload";
import { demoCsv } from "@/lib/demo";
import { applyPreset, DEFAULT_STRESS_PARAMETERS } from "@/lib/stress/parameters";
import { computeFaultScreen, type StressScreenJob } from "@/lib/stress/screen-compute";

describe("the screen from stored results", () => {
  it("gives the same triangles and values with the analysis' stored triangulation as with a fresh one", () => {
    const parsed = parseUploadedFile({
      output: "parse",
      name: "qg-1.csv",
      bytes: new TextEncoder().encode(demoCsv("QG-1")),
      units: "m",
      dropBadRows: false,
      encode: true,
    });
    const { report, display, outputs } = computeAnalysis({ picks: parsed.encoded!, units: "m", settings: {} });
    const grids = Object.fromEntries(
      decodeFaultDisplay(display).segments.map(({ id, grid }) => [id, { s0: grid.s0, t0: grid.t0, cellM: grid.cellM, columns: grid.columns, rows: grid.rows }]),
    );
    const job: StressScreenJob = {
      output: "stress",
      picks: parsed.encoded!,
      outputs,
      segments: report.segments.map(({ id, plane }) => ({ id, plane })),
      grids,
      parameters: { ...applyPreset(DEFAULT_STRESS_PARAMETERS, "normal"), maxHorizontalAzimuthDeg: 40 },
      lengthScaleM: null,
    };
    const fromStored = computeFaultScreen(job);
    const fresh = computeFaultScreen({ ...job, outputs: null });
    expect(fromStored.segments.map((s) => s.segmentId)).toEqual(["north", "south"]);
    expect(fromStored.combined.count).toBeGreaterThan(1000);
    expect(fromStored.orientation).toEqual(fresh.orientation);
    expect(Array.from(fromStored.combined.source)).toEqual(Array.from(fresh.combined.source));
    expect(Array.from(fromStored.combined.slipTendency)).toEqual(Array.from(fresh.combined.slipTendency));
    expect(Array.from(fromStored.combined.pressureToFailureCriticalMPa)).toEqual(Array.from(fresh.combined.pressureToFailureCriticalMPa));
    fromStored.segments.forEach((segment, k) => expect(Array.from(segment.triangleVertices)).toEqual(Array.from(fresh.segments[k].triangleVertices)));
  });
});
