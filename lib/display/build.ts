// Making the display payload from an engine result: the grids decimated, the contour rings flattened, a deterministic
// subsample of the picks with their residual against the surface. Runs in the analysis worker beside the engine.
import type { DisplayContours, DisplayGrid, DisplayPicks, DisplaySegment, DisplaySurface, FaultDisplay } from "@/lib/contracts/display";
import { pickDisplacement, sinOfDip } from "@/lib/engine/displacement";
import type { AnalysisReport, PickColumns, RegularGrid, SegmentResult } from "@/lib/engine/types";
import { worldToPlane } from "./frame";
import { EDGE_TOLERANT_BILINEAR, sampleGrid } from "./grid-sampler";

type Vec3 = [number, number, number];

export interface BuildFaultDisplayInput {
  /** the engine's report, with its contour rings */
  report: AnalysisReport;
  /** engine grids keyed by segment id */
  grids: Record<string, RegularGrid>;
  picks: PickColumns;
  /** displacement of every pick as the analysis computed it (local dip, rake); from the plane's dip when absent */
  pickDisplacementM?: Float64Array;
  /** unused here; accepted so the pipeline's result can be passed whole */
  surfaces?: unknown;
  /** most grid nodes per side in the display */
  maxCells?: number;
  maxPicks?: number;
}

export const DEFAULT_DISPLAY_CELLS = 192;
export const DEFAULT_DISPLAY_PICKS = 20_000;
/** share of the pick budget reserved for the largest residuals, so outliers always show */
const OUTLIER_SHARE = 0.05;

export function buildFaultDisplay({
  report,
  grids,
  picks,
  pickDisplacementM,
  maxCells = DEFAULT_DISPLAY_CELLS,
  maxPicks = DEFAULT_DISPLAY_PICKS,
}: BuildFaultDisplayInput): FaultDisplay {
  if (report.segments.length === 0) throw new Error("The analysis has no segments to display.");
  const origin: Vec3 = [...report.segments[0].plane.centroid];
  const segments = report.segments.map((segment) => {
    const grid = grids[segment.id];
    if (!grid) throw new Error(`No grid for segment "${segment.id}".`);
    return displaySegment(segment, grid, origin, maxCells);
  });
  return {
    version: 2,
    origin,
    segments,
    picks: buildDisplayPicks(report, grids, picks, origin, maxPicks, pickDisplacementM),
    displacementRangeM: [0, Math.max(...report.segments.map((s) => s.max.displacementM))],
    throwRangeM: [0, Math.max(...report.segments.map((s) => s.max.throwM))],
  };
}

function displaySegment(segment: SegmentResult, grid: RegularGrid, origin: Vec3, maxCells: number): DisplaySegment {
  const { plane } = segment;
  return {
    id: segment.id,
    frame: {
      centroid: subtract(plane.centroid, origin),
      strikeVector: [...plane.strikeVector],
      dipVector: [...plane.dipVector],
      // relief is drawn along the normal: point it up (into the hanging wall) so displacement reads as a dome
      normal: plane.normal[2] < 0 ? [-plane.normal[0], -plane.normal[1], -plane.normal[2]] : [...plane.normal],
      strikeDeg: plane.strikeDeg,
      dipDeg: plane.dipDeg,
    },
    grid: decimateGrid(grid, maxCells),
    contours: flattenContours(segment),
    tipLine: segment.tipLine.polygon.map(([s, t]) => [s, t]),
    tipBand: { inner: segment.tipLine.innerPolygon.map(([s, t]) => [s, t]), outer: segment.tipLine.outerPolygon.map(([s, t]) => [s, t]) },
    // the polygon repeats its first vertex to close: so does the flag list
    tipOpen: [...segment.tipLine.openRays, segment.tipLine.openRays[0] ?? 0],
    mappedLimit: segment.mappedLimit.polygon.map(([s, t]) => [s, t]),
    max: { displacementM: segment.max.displacementM, throwM: segment.max.throwM, s: segment.max.s, t: segment.max.t },
    ...(segment.surface ? { surface: displaySurface(segment.surface.grid) } : {}),
  };
}

function displaySurface({ s0, t0, cellM, columns, rows, offsetM }: NonNullable<SegmentResult["surface"]>["grid"]): DisplaySurface {
  return { s0, t0, cellM, columns, rows, offPlaneM: Float32Array.from(offsetM) };
}

/**
 * Keeps every k-th node so that at most maxCells nodes remain per side. The sampling lattice is shifted so
 * that the node of maximum displacement is on it (the peak survives exactly); values are copied, never
 * averaged, so NaN stays NaN and any hole at least k cells wide stays open.
 */
export function decimateGrid(grid: RegularGrid, maxCells: number): DisplayGrid {
  const stride = Math.max(1, Math.ceil((Math.max(grid.columns, grid.rows) - 1) / Math.max(1, maxCells - 1)));
  const peak = argMaxIgnoringNaN(grid.displacementM);
  const peakColumn = peak < 0 ? 0 : peak % grid.columns;
  const peakRow = peak < 0 ? 0 : Math.floor(peak / grid.columns);
  const firstColumn = peakColumn % stride;
  const firstRow = peakRow % stride;
  const columns = Math.floor((grid.columns - 1 - firstColumn) / stride) + 1;
  const rows = Math.floor((grid.rows - 1 - firstRow) / stride) + 1;
  const displacementM = new Float32Array(columns * rows);
  const throwM = new Float32Array(columns * rows);
  const offPlaneM = grid.offPlaneM ? new Float32Array(columns * rows) : undefined;
  for (let row = 0; row < rows; row++) {
    const sourceRow = firstRow + row * stride;
    for (let column = 0; column < columns; column++) {
      const source = sourceRow * grid.columns + firstColumn + column * stride;
      displacementM[row * columns + column] = grid.displacementM[source];
      throwM[row * columns + column] = grid.throwM[source];
      if (offPlaneM) offPlaneM[row * columns + column] = grid.offPlaneM![source];
    }
  }
  return {
    s0: grid.s0 + firstColumn * grid.cellM,
    t0: grid.t0 + firstRow * grid.cellM,
    cellM: grid.cellM * stride,
    columns,
    rows,
    displacementM,
    throwM,
    ...(offPlaneM ? { offPlaneM } : {}),
  };
}

function argMaxIgnoringNaN(values: ArrayLike<number>): number {
  let best = -1;
  let bestValue = -Infinity;
  for (let i = 0; i < values.length; i++) {
    if (values[i] > bestValue) {
      bestValue = values[i];
      best = i;
    }
  }
  return best;
}

/** The segment's contour rings as flat arrays, at the engine's own precision (the stored report keeps no copy). */
function flattenContours(segment: SegmentResult): DisplayContours {
  const levelsM = segment.contours.map((level) => level.levelM);
  let pointCount = 0;
  let ringCount = 0;
  for (const level of segment.contours) {
    for (const ring of level.rings) {
      pointCount += ring.length;
      ringCount++;
    }
  }
  const points = new Float64Array(pointCount * 2);
  const ringStarts = new Uint32Array(ringCount + 1);
  const ringLevelIndex = new Uint16Array(ringCount);
  let point = 0;
  let ringIndex = 0;
  segment.contours.forEach((level, levelIndex) => {
    for (const ring of level.rings) {
      ringStarts[ringIndex] = point;
      ringLevelIndex[ringIndex] = levelIndex;
      for (const [s, t] of ring) {
        points[point * 2] = s;
        points[point * 2 + 1] = t;
        point++;
      }
      ringIndex++;
    }
  });
  ringStarts[ringCount] = point;
  return { intervalM: segment.contourIntervalM, levelsM, points, ringStarts, ringLevelIndex };
}

function buildDisplayPicks(
  report: AnalysisReport,
  grids: Record<string, RegularGrid>,
  picks: PickColumns,
  origin: Vec3,
  maxPicks: number,
  pickDisplacementM?: Float64Array,
): DisplayPicks {
  const total = picks.x.length;
  const segmentIndexByName = picks.segmentNames.map((name) => report.segments.findIndex((s) => s.id === name));
  const sinDipOf = report.segments.map((segment) => sinOfDip(segment.plane.dipDeg));
  const displacementM = new Float64Array(total);
  const residualM = new Float64Array(total);
  for (let i = 0; i < total; i++) {
    const segmentIndex = segmentIndexByName[picks.segment[i]];
    const segment = report.segments[segmentIndex];
    if (!segment) {
      displacementM[i] = NaN;
      residualM[i] = NaN;
      continue;
    }
    displacementM[i] = pickDisplacementM ? pickDisplacementM[i] : pickDisplacement(picks.throwM[i], picks.heaveM[i], sinDipOf[segmentIndex]);
    const [s, t] = worldToPlane(segment.plane, picks.x[i], picks.y[i], picks.z[i]);
    const grid = grids[segment.id];
    residualM[i] = displacementM[i] - (grid ? sampleGrid(grid, grid.displacementM, s, t, EDGE_TOLERANT_BILINEAR) : NaN);
  }
  const kept = selectDisplayPicks(residualM, maxPicks);
  const position = new Float32Array(kept.length * 3);
  const keptDisplacement = new Float32Array(kept.length);
  const keptResidual = new Float32Array(kept.length);
  const segmentIndex = new Uint16Array(kept.length);
  kept.forEach((source, i) => {
    position[i * 3] = picks.x[source] - origin[0];
    position[i * 3 + 1] = picks.y[source] - origin[1];
    position[i * 3 + 2] = picks.z[source] - origin[2];
    keptDisplacement[i] = displacementM[source];
    keptResidual[i] = residualM[source];
    segmentIndex[i] = Math.max(0, segmentIndexByName[picks.segment[source]]);
  });
  return { count: kept.length, totalCount: total, position, displacementM: keptDisplacement, residualM: keptResidual, segmentIndex };
}

/**
 * Deterministic subsample: the largest |residual| picks (a small share of the budget) plus evenly spaced
 * picks from the rest, returned in their original order.
 */
export function selectDisplayPicks(residualM: ArrayLike<number>, maxPicks: number): number[] {
  const total = residualM.length;
  if (total <= maxPicks) return Array.from({ length: total }, (_, i) => i);
  const outlierBudget = Math.floor(maxPicks * OUTLIER_SHARE);
  const byResidual = Array.from({ length: total }, (_, i) => i)
    .filter((i) => !Number.isNaN(residualM[i]))
    .sort((a, b) => Math.abs(residualM[b]) - Math.abs(residualM[a]) || a - b);
  const chosen = new Uint8Array(total);
  for (const i of byResidual.slice(0, outlierBudget)) chosen[i] = 1;
  const rest: number[] = [];
  for (let i = 0; i < total; i++) if (!chosen[i]) rest.push(i);
  const evenBudget = maxPicks - Math.min(outlierBudget, byResidual.length);
  for (let j = 0; j < evenBudget; j++) chosen[rest[Math.floor((j * rest.length) / evenBudget)]] = 1;
  const result: number[] = [];
  for (let i = 0; i < total; i++) if (chosen[i]) result.push(i);
  return result;
}

function subtract(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}
