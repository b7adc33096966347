import type { AnalysisOptions, AnalysisReport, AnalysisSettings, FaultKinematics, PickColumns, PlaneFit, RegularGrid, SegmentResult } from "./types";
import { indicesBySegment, parsePickCsv, PickInputError, type ParseOptions } from "./csv";
import { fitPlane } from "./plane";
import { projectToPlane } from "@/lib/display/frame";
import { displacementColumn } from "./displacement";
import { kinematicRowProblems, kinematicsProblems, kinematicsSummary, rakeColumn } from "./kinematics";
import { buildSurfaceModel, extentAlongSurface, localDipColumn, surfaceOnGrid, surfacePoint, type SurfaceModel } from "./fault-surface";
import { asymmetryAlongSurface, surfaceCentroid, surfaceSummary, tipLineOnSurface } from "./surface-measures";
import { triangulate } from "./triangulate";
import { buildGrid, gridSpecFor } from "./grid";
import { contourGrid, contourLevels, niceInterval } from "./contours";
import { summariseTipLine, tipLineFromFits, type TipLineSummary } from "./tipline";
import { fitTipLine } from "./tipline-fit";
import { tipLineInputs, type TipLineInputs } from "./tipline-inputs";
import { aspectRatioNote, gridGradients, scalingNote } from "./metrics";
import { analyzeRelays } from "./relays";
import { pickWeights, pullTowardNeighbours, qualityNote, weightsMatter } from "./quality";
import { smoothGrid } from "./surface";

export const ENGINE_VERSION = "2.1.0";

export type Stage = "parse" | "plane" | "triangulate" | "surface" | "grid" | "contours" | "tipline" | "metrics" | "relays" | "done";

/**
 * Starts the tip-line profile fits of one segment and returns a function that waits for their result. The pipeline
 * starts them right after triangulation and waits after contouring, so a fitter that hands them to another thread
 * (lib/analysis/tipline-thread.ts) overlaps them with gridding and contouring. The results are the same either way.
 */
export type TipLineFitter = (inputs: TipLineInputs) => () => TipLineSummary;

/** The fits and their summary: everything about the tip line that does not need every pick. */
export function fitAndSummariseTipLine(inputs: TipLineInputs): TipLineSummary {
  return summariseTipLine(fitTipLine(inputs));
}

/** The default: the fits run in this thread when waited for. */
export const inlineTipLineFitter: TipLineFitter = (inputs) => () => fitAndSummariseTipLine(inputs);

export interface PipelineOptions extends AnalysisOptions {
  onStage?: (stage: Stage, fraction: number) => void;
  tipLineFitter?: TipLineFitter;
  /**
   * Per segment (index into segmentNames), its plane as fitted without weights when the picks were read
   * (ParseResult.planes, kept with a stored pick set): used as it is for segments whose picks all weigh the same, so
   * the plane is fitted once. A quality-weighted segment is fitted here with its weights.
   */
  planes?: (PlaneFit | null)[] | null;
}

/** A segment's Delaunay triangulation of its picks: three local pick numbers (order of the segment's picks) per triangle. */
export interface SegmentTriangulation {
  triangles: Uint32Array;
  medianEdgeM: number;
}

/**
 * A report with the full-resolution grids it was made with (and each pick's displacement, from its local dip and rake):
 * what the grid, picks and profile exports are made from.
 */
export interface ReportWithGrids {
  report: AnalysisReport;
  grids: Record<string, RegularGrid>;
  pickDisplacementM: Float64Array;
}

export interface PipelineResult {
  report: AnalysisReport;
  grids: Record<string, RegularGrid>;
  /** per segment id, the triangulation the grids were made on (the stress screen reuses it) */
  triangulations: Record<string, SegmentTriangulation>;
  /** each segment's fault surface (keyed like grids) */
  surfaces: Record<string, SurfaceModel>;
  /** displacement of every pick from its local dip and rake (input order; NaN for picks of skipped segments) */
  pickDisplacementM: Float64Array;
}

/** Analyse parsed picks: every segment, then relays between overlapping segments. */
export function analyzePicks(
  picks: PickColumns,
  options: PipelineOptions & { input?: Partial<AnalysisReport["input"]>; warnings?: string[] } = {},
): PipelineResult {
  const stage = (s: Stage, segIndex: number, within: number) => options.onStage?.(s, (segIndex + within) / Math.max(1, picks.segmentNames.length));
  const warnings = [...(options.warnings ?? [])];
  const kinematics: FaultKinematics = options.kinematics ?? { sense: "normal" };
  const typeProblems = kinematicsProblems(kinematics);
  if (typeProblems.length) throw new Error(`The fault's type cannot be used: ${typeProblems.join("; ")}.`);
  const rowProblems = kinematicRowProblems(picks, kinematics, 200);
  if (rowProblems.length) {
    const shown = rowProblems.slice(0, 10).map((r) => `row ${r.row}, column ${r.column}: ${r.reason}`);
    throw new PickInputError(
      `${rowProblems.length}${rowProblems.length >= 200 ? "+" : ""} picks do not fit the fault's type: ${shown.join("; ")}`,
      rowProblems,
      rowProblems.length >= 200,
    );
  }
  const segments: SegmentResult[] = [];
  const grids: Record<string, RegularGrid> = {};
  const triangulations: Record<string, SegmentTriangulation> = {};
  const surfaces: Record<string, SurfaceModel> = {};
  const pickDisplacementM = new Float64Array(picks.x.length).fill(NaN);
  const bySegment = indicesBySegment(picks);
  let picksBelowOne = 0;
  bySegment.forEach((ids, k) => {
    const id = picks.segmentNames[k];
    if (ids.length < 3) {
      warnings.push(`segment "${id}" skipped: fewer than 3 picks`);
      return;
    }
    stage("plane", k, 0.05);
    // pick quality: weights of the plane fit and of each pick's influence on the grids (lib/engine/quality.ts)
    const weights = pickWeights(picks.quality, ids);
    const weighted = weightsMatter(weights);
    for (const weight of weights) if (weight < 1) picksBelowOne++;
    const plane = (!weighted && options.planes?.[k]) || fitPlane(picks.x, picks.y, picks.z, ids, weighted ? weights : undefined);
    if (plane.planarityWarning) warnings.push(`segment "${id}": ${plane.planarityWarning}`);
    const { s, t, w } = projectToPlane(picks.x, picks.y, picks.z, plane, ids);
    const throwM = new Float64Array(ids.length);
    const heaveM = new Float64Array(ids.length);
    for (let i = 0; i < ids.length; i++) {
      throwM[i] = picks.throwM[ids[i]];
      heaveM[i] = picks.heaveM[ids[i]];
    }
    stage("triangulate", k, 0.15);
    const tri = triangulate(s, t);
    triangulations[id] = { triangles: tri.triangles, medianEdgeM: tri.medianEdgeM };
    const outline: [number, number][] = tri.outline.map((v) => [s[v], t[v]]);
    if (outline.length) outline.push(outline[0]);

    // the true surface: the picks' distance from the plane, smoothed; its local dip turns throw into displacement
    stage("surface", k, 0.2);
    const [surfaceW] = weighted ? pullTowardNeighbours([w], weights, tri.triangles) : [w];
    const surface = buildSurfaceModel(s, t, surfaceW, tri.triangles, tri.medianEdgeM);
    surfaces[id] = surface;
    const localDipDeg = localDipColumn(surface, plane, s, t);
    const displacementM = displacementColumn(throwM, heaveM, localDipDeg, rakeColumn(picks, ids, kinematics));
    for (let i = 0; i < ids.length; i++) pickDisplacementM[ids[i]] = displacementM[i];

    if (options.throwCutoffM !== undefined) {
      let below = 0;
      for (let i = 0; i < throwM.length; i++) if (throwM[i] < options.throwCutoffM) below++;
      if (below > 0.01 * throwM.length)
        warnings.push(
          `segment "${id}": ${((100 * below) / throwM.length).toFixed(1)} % of the picks have less throw than the ${options.throwCutoffM} m cut-off that was set; a resolution cut-off is the smallest throw that could be picked, so check the value`,
        );
    }
    const fitInputs = tipLineInputs(
      s,
      t,
      displacementM,
      tri.outline,
      tri.triangles,
      tri.medianEdgeM,
      {
        cutoffM: options.throwCutoffM !== undefined ? options.throwCutoffM * displacementPerThrow(throwM, displacementM) : undefined,
        models: options.profiles,
        ends: options.ends,
      },
      weighted ? weights : undefined,
    );
    const waitForFits = (options.tipLineFitter ?? inlineTipLineFitter)(fitInputs);
    stage("grid", k, 0.35);
    const spec = gridSpecFor(s, t, tri.medianEdgeM, options);
    const [griddedDisplacementM, griddedThrowM] = weighted ? pullTowardNeighbours([displacementM, throwM], weights, tri.triangles) : [displacementM, throwM];
    const grid = buildGrid(s, t, griddedDisplacementM, griddedThrowM, tri.triangles, spec);
    const onGrid = surfaceOnGrid(surface, plane, spec, grid.displacementM);
    grid.offPlaneM = onGrid.offPlaneM;
    grid.localDipDeg = onGrid.localDipDeg;
    grid.localStrikeDeg = onGrid.localStrikeDeg;
    if (options.smoothingM && options.smoothingM > 0) {
      // the interpreter's smoothing: contours and views read the smoothed grids; picks, maximum and tip line do not
      grid.displacementM = smoothGrid(grid.displacementM, spec, options.smoothingM);
      grid.throwM = smoothGrid(grid.throwM, spec, options.smoothingM);
    }
    grids[id] = grid;

    let maxIndex = 0;
    for (let i = 1; i < ids.length; i++) if (griddedDisplacementM[i] > griddedDisplacementM[maxIndex]) maxIndex = i;
    const maxWorld = surfacePoint(surface, plane, s[maxIndex], t[maxIndex]);

    stage("contours", k, 0.5);
    const intervalM = options.intervalM && options.intervalM > 0 ? options.intervalM : niceInterval(griddedDisplacementM[maxIndex]);
    const contours = contourGrid(spec, grid.displacementM, contourLevels(griddedDisplacementM[maxIndex], intervalM));

    stage("tipline", k, 0.7);
    const fitted = tipLineFromFits(s, t, displacementM, plane, waitForFits());
    // the fits run on the reference plane; their lines are measured and placed on the surface
    const { tipLine, projected } = tipLineOnSurface(fitted.tipLine, surface, plane);
    const { fittedDmax, gradientTips: tips } = fitted;
    const aspectWarning = aspectRatioNote(tipLine.aspectRatio);
    if (aspectWarning) warnings.push(`segment "${id}": ${aspectWarning}`);

    stage("metrics", k, 0.9);
    const gradients = gridGradients(grid);
    const mapped = extentAlongSurface(surface, outline, 0, 0);
    const summary = surfaceSummary(
      surface,
      { ...spec, displacementM: grid.displacementM, offPlaneM: onGrid.offPlaneM, localDipDeg: onGrid.localDipDeg },
      plane.dipDeg,
      tipLine,
      projected,
    );
    segments.push({
      id,
      pickCount: ids.length,
      plane: {
        strikeDeg: plane.strikeDeg,
        dipDeg: plane.dipDeg,
        dipDirectionDeg: plane.dipDirectionDeg,
        rmsM: plane.rmsM,
        planarityWarning: plane.planarityWarning,
        centroid: plane.centroid,
        strikeVector: plane.strikeVector,
        dipVector: plane.dipVector,
        normal: plane.normal,
      },
      max: {
        displacementM: griddedDisplacementM[maxIndex],
        throwM: griddedThrowM[maxIndex],
        s: s[maxIndex],
        t: t[maxIndex],
        x: maxWorld[0],
        y: maxWorld[1],
        z: maxWorld[2],
        fittedDisplacementM: fittedDmax.displacementM,
        fittedDisplacementRangeM: fittedDmax.rangeM,
      },
      mappedLimit: {
        lengthM: mapped.lengthM,
        heightM: mapped.heightM,
        polygon: outline,
        worldPolygon: outline.map(([ps, pt]) => surfacePoint(surface, plane, ps, pt)),
      },
      tipLine,
      gradients: {
        meanPerM: gradients.meanPerM,
        maxPerM: gradients.maxPerM,
        tips: { strikeStartPerM: tips.strikeStartPerM, strikeEndPerM: tips.strikeEndPerM, upDipPerM: tips.upDipPerM, downDipPerM: tips.downDipPerM },
      },
      centroidOfDisplacement: surfaceCentroid(spec, grid.displacementM, onGrid.areaStretch),
      asymmetry: asymmetryAlongSurface(surface, tipLine.polygon, tipLine.centre, s[maxIndex], t[maxIndex]),
      surface: summary,
      scaling: scalingNote(fittedDmax.displacementM, tipLine.lengthM),
      contourIntervalM: intervalM,
      contours: contours.map((c) => ({ levelM: c.levelM, rings: c.rings })),
    });
  });
  options.onStage?.("relays", 0.98);
  const relays = analyzeRelays(segments, grids, picks);
  options.onStage?.("done", 1);
  return {
    report: {
      engineVersion: ENGINE_VERSION,
      input: { rows: picks.x.length, accepted: picks.x.length, rejected: [], units: options.units ?? "m", ...options.input },
      quality: { picksBelowOne, note: qualityNote(picksBelowOne) },
      settings: settingsOf(options),
      kinematics: kinematicsSummary(kinematics, picks),
      segments,
      relays,
      warnings,
    },
    grids,
    triangulations,
    surfaces,
    pickDisplacementM,
  };
}

/** Median displacement per metre of throw over the picks with throw: turns a cut-off given as throw into displacement. */
function displacementPerThrow(throwM: ArrayLike<number>, displacementM: ArrayLike<number>): number {
  const ratios: number[] = [];
  for (let i = 0; i < throwM.length; i++) if (throwM[i] > 0 && displacementM[i] > 0) ratios.push(displacementM[i] / throwM[i]);
  if (!ratios.length) return 1;
  ratios.sort((a, b) => a - b);
  return ratios[ratios.length >> 1];
}

/** The settings given, without the ones left to their defaults. */
function settingsOf(options: AnalysisOptions): AnalysisSettings {
  const settings: AnalysisSettings = {};
  if (options.intervalM) settings.intervalM = options.intervalM;
  if (options.cellM) settings.cellM = options.cellM;
  if (options.throwCutoffM !== undefined) settings.throwCutoffM = options.throwCutoffM;
  if (options.profiles?.length) settings.profiles = options.profiles;
  if (options.ends && Object.keys(options.ends).length) settings.ends = options.ends;
  if (options.smoothingM) settings.smoothingM = options.smoothingM;
  return settings;
}

/** Parse a pick CSV and analyse it (the parsed picks come back too); throws PickInputError when the input cannot be used. */
export function analyzeCsv(text: string, options: PipelineOptions & Omit<ParseOptions, "units"> = {}): PipelineResult & { picks: PickColumns } {
  options.onStage?.("parse", 0);
  const parsed = parsePickCsv(text, {
    units: options.units,
    dropBadRows: options.dropBadRows,
    dedupe: options.dedupe,
    kinematics: options.kinematics,
    velocityModel: options.velocityModel,
  });
  const result = analyzePicks(parsed.picks, {
    ...options,
    planes: parsed.planes,
    input: { rows: parsed.rows, accepted: parsed.accepted, rejected: parsed.rejected, units: options.units ?? "m" },
    warnings: parsed.warnings,
  });
  return { ...result, picks: parsed.picks };
}
