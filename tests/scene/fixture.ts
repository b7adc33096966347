// A tiny hand-made analysis for the scene tests: one or two segments whose grid is a paraboloid dome,
// contoured with d3-contour the way the engine does, on a plane striking 030° and dipping 60°.
import { contours as d3Contours } from "d3-contour";
import type { AnalysisReport, PickColumns, RegularGrid, SegmentResult } from "@/lib/engine/types";

export const STRIKE_DEG = 30;
export const DIP_DEG = 60;
const rad = (deg: number) => (deg * Math.PI) / 180;
export const strikeVector: [number, number, number] = [Math.sin(rad(STRIKE_DEG)), Math.cos(rad(STRIKE_DEG)), 0];
export const dipVector: [number, number, number] = [
  Math.sin(rad(STRIKE_DEG + 90)) * Math.cos(rad(DIP_DEG)),
  Math.cos(rad(STRIKE_DEG + 90)) * Math.cos(rad(DIP_DEG)),
  -Math.sin(rad(DIP_DEG)),
];
// strike × dip points down here; the display turns it up
export const normal: [number, number, number] = [
  strikeVector[1] * dipVector[2] - strikeVector[2] * dipVector[1],
  strikeVector[2] * dipVector[0] - strikeVector[0] * dipVector[2],
  strikeVector[0] * dipVector[1] - strikeVector[1] * dipVector[0],
];

export interface DomeOptions {
  columns?: number;
  rows?: number;
  cellM?: number;
  peakM?: number;
  /** node indices to blank out (NaN) */
  holes?: number[];
}

/** D = peak·(1 − r²), clipped at 0, with r = 1 two cells inside the grid's edges. */
export function domeGrid({ columns = 11, rows = 9, cellM = 10, peakM = 50, holes = [] }: DomeOptions = {}): RegularGrid {
  const s0 = -((columns - 1) / 2) * cellM;
  const t0 = -((rows - 1) / 2) * cellM;
  const radiusS = ((columns - 1) / 2 - 1) * cellM;
  const radiusT = ((rows - 1) / 2 - 1) * cellM;
  const displacementM = new Float64Array(columns * rows);
  for (let row = 0; row < rows; row++) {
    for (let column = 0; column < columns; column++) {
      const s = s0 + column * cellM;
      const t = t0 + row * cellM;
      const r2 = (s / radiusS) ** 2 + (t / radiusT) ** 2;
      displacementM[row * columns + column] = Math.max(0, peakM * (1 - r2));
    }
  }
  for (const hole of holes) displacementM[hole] = NaN;
  const throwM = displacementM.map((d) => d * Math.sin(rad(DIP_DEG)));
  return { s0, t0, cellM, columns, rows, displacementM, throwM };
}

/** Contour rings in (s, t); d3-contour puts grid value (i, j) at (i + 0.5, j + 0.5). */
export function contourRings(grid: RegularGrid, levelsM: number[]) {
  const values = Array.from(grid.displacementM, (d) => (Number.isNaN(d) ? -1 : d));
  return d3Contours()
    .size([grid.columns, grid.rows])
    .thresholds(levelsM)(values)
    .map((multiPolygon) => ({
      levelM: multiPolygon.value,
      rings: multiPolygon.coordinates
        .flat()
        .map((ring) => ring.map(([x, y]) => [grid.s0 + (x - 0.5) * grid.cellM, grid.t0 + (y - 0.5) * grid.cellM] as [number, number])),
    }));
}

function ellipse(aM: number, bM: number, count = 24): [number, number][] {
  return Array.from({ length: count + 1 }, (_, i) => {
    const angle = (2 * Math.PI * (i % count)) / count;
    return [aM * Math.cos(angle), bM * Math.sin(angle)];
  });
}

export function segmentResult(id: string, grid: RegularGrid, centroid: [number, number, number]): SegmentResult {
  let peak = 0;
  for (let i = 0; i < grid.displacementM.length; i++) if (grid.displacementM[i] > grid.displacementM[peak]) peak = i;
  const s = grid.s0 + (peak % grid.columns) * grid.cellM;
  const t = grid.t0 + Math.floor(peak / grid.columns) * grid.cellM;
  const levels = [10, 20, 30, 40];
  const halfLength = ((grid.columns - 1) / 2) * grid.cellM;
  const halfHeight = ((grid.rows - 1) / 2) * grid.cellM;
  return {
    id,
    pickCount: 0,
    plane: {
      strikeDeg: STRIKE_DEG,
      dipDeg: DIP_DEG,
      dipDirectionDeg: STRIKE_DEG + 90,
      rmsM: 0,
      planarityWarning: null,
      centroid,
      strikeVector,
      dipVector,
      normal,
    },
    max: {
      displacementM: grid.displacementM[peak],
      throwM: grid.throwM[peak],
      s,
      t,
      x: centroid[0] + s * strikeVector[0] + t * dipVector[0],
      y: centroid[1] + s * strikeVector[1] + t * dipVector[1],
      z: centroid[2] + s * strikeVector[2] + t * dipVector[2],
      fittedDisplacementM: grid.displacementM[peak],
      fittedDisplacementRangeM: [grid.displacementM[peak] - 1, grid.displacementM[peak] + 1],
    },
    mappedLimit: { lengthM: 0, heightM: 0, polygon: ellipse(halfLength - 20, halfHeight - 20), worldPolygon: [] },
    tipLine: {
      lengthM: 2 * halfLength,
      heightM: 2 * halfHeight,
      lengthRangeM: [2 * halfLength - 10, 2 * halfLength + 10],
      heightRangeM: [2 * halfHeight - 10, 2 * halfHeight + 10],
      lengthIsMinimum: false,
      heightIsMinimum: false,
      aspectRatio: halfLength / halfHeight,
      areaM2: Math.PI * halfLength * halfHeight,
      centre: { s: 0, t: 0 },
      semiAxes: { sM: halfLength, tM: halfHeight },
      model: "elliptical-crack",
      profile: {
        model: "elliptical-crack",
        shape: [],
        centre: { s: 0, t: 0 },
        reach: { strikeStartM: halfLength, strikeEndM: halfLength, upDipM: halfHeight, downDipM: halfHeight },
        exponent: 2,
        dmaxM: grid.displacementM[peak],
      },
      candidates: [],
      modelMisfits: {},
      uncertaintyM: 5,
      cutoff: { displacementM: 5, source: "estimated" },
      noiseM: 1,
      ends: [
        { side: "strike-start", status: "inferred", source: "detected" },
        { side: "strike-end", status: "inferred", source: "detected" },
        { side: "up-dip", status: "inferred", source: "detected" },
        { side: "down-dip", status: "inferred", source: "detected" },
      ],
      openRays: new Array(96).fill(0),
      selection: "fixture",
      method: "fixture",
      polygon: ellipse(halfLength, halfHeight),
      innerPolygon: ellipse(halfLength - 5, halfHeight - 5),
      outerPolygon: ellipse(halfLength + 5, halfHeight + 5),
      worldPolygon: [],
      innerWorldPolygon: [],
      outerWorldPolygon: [],
    },
    gradients: { meanPerM: 0, maxPerM: 0, tips: { strikeStartPerM: 0, strikeEndPerM: 0, upDipPerM: 0, downDipPerM: 0 } },
    centroidOfDisplacement: { s: 0, t: 0 },
    asymmetry: { alongStrike: 0, downDip: 0 },
    scaling: { dOverL: 0, note: "", plausible: true },
    contourIntervalM: 10,
    contours: contourRings(grid, levels),
  };
}

export const UTM_CENTROID: [number, number, number] = [450123.456, 6700456.789, -2000.25];

export function fixtureAnalysis(grids: Record<string, RegularGrid>, centroids: Record<string, [number, number, number]>) {
  const report: AnalysisReport = {
    engineVersion: "fixture",
    input: { rows: 0, accepted: 0, rejected: [], units: "m" },
    segments: Object.keys(grids).map((id) => segmentResult(id, grids[id], centroids[id])),
    relays: [],
    warnings: [],
  };
  return report;
}

/** Picks at given (segment, s, t, throw) placed exactly on the plane. */
export function picksOnPlane(report: AnalysisReport, rows: { segment: string; s: number; t: number; throwM: number; heaveM?: number }[]): PickColumns {
  const names = report.segments.map((segment) => segment.id);
  const position = rows.map(({ segment, s, t }) => {
    const { centroid } = report.segments[names.indexOf(segment)].plane;
    return [0, 1, 2].map((axis) => centroid[axis] + s * strikeVector[axis] + t * dipVector[axis]);
  });
  const n = rows.length;
  return {
    x: Float64Array.from(position, (p) => p[0]),
    y: Float64Array.from(position, (p) => p[1]),
    z: Float64Array.from(position, (p) => p[2]),
    throwM: Float64Array.from(rows, (r) => r.throwM),
    heaveM: Float64Array.from(rows, (r) => r.heaveM ?? NaN),
    quality: new Float64Array(n).fill(NaN),
    segment: Uint32Array.from(rows, (r) => names.indexOf(r.segment)),
    horizon: new Int32Array(n).fill(-1),
    segmentNames: names,
    horizonNames: [],
    sourceRow: Uint32Array.from(rows, (_, i) => i + 2),
  };
}
