// What an analysis computed besides its report and display payload, stored once (analysis_outputs) so that nothing is
// computed twice: the full-resolution displacement and throw grids (exports read them instead of rerunning the
// pipeline) and each segment's triangulation of its picks (the stress screen reads it instead of triangulating again).
// The one typed-array codec, deflated with fflate (pure JavaScript: a time limit may stop the analysis worker thread at
// any moment, and Node aborts the whole process when a worker is stopped inside a native zlib call); packed in the worker.
import { unzlibSync, zlibSync } from "fflate";
import type { GridSpec } from "@/lib/display/grid-sampler";
import { decodeRecord, encodeRecord } from "@/lib/display/codec";
import type { PipelineResult, SegmentTriangulation } from "@/lib/engine/pipeline";

const OUTPUTS_MAGIC = "SLAO";

export interface StoredGrid extends GridSpec {
  displacementM: Float64Array;
  throwM: Float64Array;
}

export interface AnalysisOutputs {
  /** per segment id */
  grids: Record<string, StoredGrid>;
  triangulations: Record<string, SegmentTriangulation>;
}

export function packAnalysisOutputs({ grids, triangulations }: Pick<PipelineResult, "grids" | "triangulations">): Uint8Array {
  const stored: Record<string, StoredGrid> = {};
  for (const [id, { s0, t0, cellM, columns, rows, displacementM, throwM }] of Object.entries(grids)) stored[id] = { s0, t0, cellM, columns, rows, displacementM, throwM };
  return zlibSync(encodeRecord({ grids: stored, triangulations }, OUTPUTS_MAGIC), { level: 1 });
}

export function unpackAnalysisOutputs(bytes: Uint8Array): AnalysisOutputs {
  return decodeRecord(unzlibSync(bytes), OUTPUTS_MAGIC, "analysis output record") as AnalysisOutputs;
}
