// What an analysis computed besides its report and display payload, stored once (analysis_outputs) so that nothing is
// computed twice: the full-resolution grids (displacement, throw and the fault surface's offset, local dip and strike)
// and each pick's displacement (exports read them instead of rerunning the pipeline), and each segment's triangulation
// of its picks (the stress screen reads it instead of triangulating again).
// The one typed-array codec, deflated with fflate (pure JavaScript: a time limit may stop the analysis worker thread at
// any moment, and Node aborts the whole process when a worker is stopped inside a native zlib call); packed in the worker.
import { unzlibSync, zlibSync } from "fflate";
import type { GridSpec } from "@/lib/display/grid-sampler";
import { decodeRecord, encodeRecord } from "@/lib/display/codec";
import type { PipelineResult, SegmentTriangulation } from "@/lib/engine/pipeline";
import type { RegularGrid } from "@/lib/engine/types";

const OUTPUTS_MAGIC = "SLAO";

export type StoredGrid = RegularGrid & GridSpec;

export interface AnalysisOutputs {
  /** per segment id */
  grids: Record<string, StoredGrid>;
  triangulations: Record<string, SegmentTriangulation>;
  /** absent in records stored before the true fault surface */
  pickDisplacementM?: Float64Array;
}

export function packAnalysisOutputs({
  grids,
  triangulations,
  pickDisplacementM,
}: Pick<PipelineResult, "grids" | "triangulations" | "pickDisplacementM">): Uint8Array {
  return zlibSync(encodeRecord({ grids, triangulations, pickDisplacementM }, OUTPUTS_MAGIC), { level: 1 });
}

export function unpackAnalysisOutputs(bytes: Uint8Array): AnalysisOutputs {
  return decodeRecord(unzlibSync(bytes), OUTPUTS_MAGIC, "analysis output record") as AnalysisOutputs;
}
