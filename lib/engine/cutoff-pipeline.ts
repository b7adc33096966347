// A cut-off line file end to end: read and check it, pair the walls at stations (the derived pick set), check that the
// derived picks span a surface, and analyse them like any pick set. The same function serves the command line, the
// upload and the tests.
import { CutoffInputError, parseCutoffCsv, type CutoffParseOptions, type CutoffParseResult } from "./cutoffs";
import { deriveFromCutoffs, derivedPickProblems, type CutoffDeriveOptions, type CutoffDerivation, type CutoffSummary } from "./cutoff-stations";
import { MAX_REJECTED_LISTED } from "./input-error";
import { analyzePicks, type PipelineOptions, type PipelineResult } from "./pipeline";
import { describeVelocityModel, DEPTH_CONVERSION_CAUTION, type VelocityModel } from "./time-depth";
import type { PickColumns } from "./types";

export type CutoffOptions = CutoffParseOptions & CutoffDeriveOptions;

/** Reads a cut-off file and derives its pick set; throws CutoffInputError (every problem with its row) when it cannot. */
export function deriveCutoffCsv(text: string, options: CutoffOptions = {}): { parsed: CutoffParseResult; derivation: CutoffDerivation } {
  return deriveChecked(parseCutoffCsv(text, options), options);
}

/** Derives the pick set of a read cut-off file and checks that its picks span a surface in each segment. */
export function deriveChecked(parsed: CutoffParseResult, options: CutoffDeriveOptions = {}): { parsed: CutoffParseResult; derivation: CutoffDerivation } {
  const derivation = deriveFromCutoffs(parsed, options);
  const problems = derivedPickProblems(derivation.picks);
  if (problems.length) {
    const rejected = [...parsed.rejected, ...problems].slice(0, MAX_REJECTED_LISTED);
    throw new CutoffInputError(`the derived picks cannot be analysed: ${problems.map((p) => p.reason).join("; ")}`, rejected);
  }
  return { parsed, derivation };
}

/** The cut-off summary as the command line's JSON states it. */
export function cutoffReport(summary: CutoffSummary) {
  return {
    horizons: summary.horizons.map(({ name, stations, maxThrowM, meanThrowM }) => ({ name, stations, maxThrowM, meanThrowM })),
    missingStations: summary.missingStations,
    stationSpacingM: summary.stationSpacingM,
    rakeDeg: summary.rakeDeg,
    domain: summary.domain,
  };
}

/** How a file in two-way time was brought to depth, with the caution, for reports. */
export function depthConversionReport(model: VelocityModel) {
  return { velocityModel: model, description: describeVelocityModel(model), caution: DEPTH_CONVERSION_CAUTION };
}

/** Reads, derives and analyses a cut-off file. */
export function analyzeCutoffCsv(
  text: string,
  options: PipelineOptions & CutoffOptions = {},
): PipelineResult & { cutoffs: CutoffSummary; parsed: CutoffParseResult; picks: PickColumns } {
  options.onStage?.("parse", 0);
  const { parsed, derivation } = deriveCutoffCsv(text, options);
  const result = analyzePicks(derivation.picks, {
    ...options,
    input: { rows: parsed.rows, accepted: derivation.picks.x.length, rejected: parsed.rejected, units: options.units ?? "m" },
    warnings: derivation.summary.warnings,
  });
  return { ...result, cutoffs: derivation.summary, parsed, picks: derivation.picks };
}
