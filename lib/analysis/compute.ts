import { analyzePicks, type PipelineResult, type TipLineFitter } from "@/lib/engine/pipeline";
import type { AnalysisReport, AnalysisSettings, FaultKinematics } from "@/lib/engine/types";
import { decodePickSet } from "@/lib/picks/codec";
import { buildFaultDisplay } from "@/lib/display/build";
import { encodeFaultDisplay } from "@/lib/display/payload";
import { packAnalysisOutputs } from "./outputs";

export interface AnalysisJob {
  picks: Uint8Array;
  units: "m" | "ft";
  /** the run's settings (contour interval, cell, cut-off, profiles, ends, smoothing) */
  settings?: AnalysisSettings;
  /** the fault's type (default normal) */
  kinematics?: FaultKinematics;
  /** "display" (default): the report and the display payload; "grids": the engine's full-resolution result (exports) */
  output?: "display" | "grids";
}

export interface AnalysisOutput {
  report: AnalysisReport;
  display: Uint8Array;
  /** full-resolution grids and triangulations, packed (./outputs.ts) */
  outputs: Uint8Array;
}

/** The whole compute of one analysis, with no I/O: runs in the worker thread, or in-process in tests. */
export function computeAnalysis(
  job: AnalysisJob,
  onStage: (stage: string, fraction: number) => void = () => {},
  threads: { tipLineFitter?: TipLineFitter } = {},
): AnalysisOutput {
  const { picks, planes } = decodePickSet(job.picks);
  const { report, grids, triangulations, surfaces, pickDisplacementM } = analyzePicks(picks, {
    ...job.settings,
    kinematics: job.kinematics,
    units: job.units,
    planes,
    onStage,
    ...threads,
  });
  onStage("display", 0.98);
  return {
    report,
    display: encodeFaultDisplay(buildFaultDisplay({ report, grids, picks, surfaces, pickDisplacementM })),
    outputs: packAnalysisOutputs({ grids, triangulations, pickDisplacementM }),
  };
}

/** The engine's full-resolution grids for a stored pick set, e.g. for exports; no I/O. */
export function computeFullResolution(job: AnalysisJob, threads: { tipLineFitter?: TipLineFitter } = {}): PipelineResult {
  const { picks, planes } = decodePickSet(job.picks);
  return analyzePicks(picks, { ...job.settings, kinematics: job.kinematics, units: job.units, planes, ...threads });
}
