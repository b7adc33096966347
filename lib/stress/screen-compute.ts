// The reactivation screen of one analysis, computed from what the analysis stored: its picks, each segment's plane and
// triangulation (analysis_outputs; triangulated again only for an analysis stored before them) and the display grids'
// lattice. Pure but for unpacking; runs in the worker pool (lib/analysis/worker-pool.ts), off the web server's thread.
import type { SegmentPlane } from "@/lib/contracts/report";
import type { OrientationBasis, StressParameters } from "@/lib/contracts/stress";
import type { GridSpec } from "@/lib/display/grid-sampler";
import { indicesBySegment } from "@/lib/engine/csv";
import { rasterizeTriangles } from "@/lib/engine/grid";
import { unpackAnalysisOutputs } from "@/lib/analysis/outputs";
import { decodePicks } from "@/lib/picks/codec";
import {
  ORIENTATION_RANGE_STANDARD_ERRORS,
  defaultLengthScaleM,
  gridForLengthScale,
  screenElements,
  segmentSurface,
  surfaceElements,
  type SegmentSurface,
  type TriangleScreen,
} from "./surface";

export interface StressScreenJob {
  output: "stress";
  /** the pick set as stored */
  picks: Uint8Array;
  /** the analysis' stored outputs (null for an analysis stored before them) */
  outputs: Uint8Array | null;
  segments: { id: string; plane: SegmentPlane }[];
  /** per segment id: the display grid's lattice, which the per-node fields follow */
  grids: Record<string, GridSpec>;
  parameters: StressParameters;
  lengthScaleM: number | null;
}

export interface SegmentScreen {
  segmentId: string;
  screen: TriangleScreen;
  /** three pick indices per screened triangle (rows of `screen`) */
  triangleVertices: Uint32Array;
  /** per display-grid node: slip tendency, dilation tendency, ΔP at the more critical end of the friction band */
  nodes: { slip: Float32Array; dilation: Float32Array; dp: Float32Array; columns: number; rows: number };
}

export interface FaultScreenResult {
  orientation: OrientationBasis;
  segments: SegmentScreen[];
  combined: TriangleScreen;
  /** pick coordinates (world, m) the triangles index into */
  vertices: { x: Float64Array; y: Float64Array; z: Float64Array };
}

export function computeFaultScreen(job: StressScreenJob): FaultScreenResult {
  const picks = decodePicks(job.picks);
  const stored = job.outputs ? unpackAnalysisOutputs(job.outputs).triangulations : null;
  const bySegment = indicesBySegment(picks);
  const surfaces: { segment: StressScreenJob["segments"][number]; surface: SegmentSurface; grid: GridSpec }[] = [];
  for (const segment of job.segments) {
    const nameIndex = picks.segmentNames.indexOf(segment.id);
    const ids = nameIndex >= 0 ? bySegment[nameIndex] : null;
    const grid = job.grids[segment.id];
    if (!ids || ids.length < 3 || !grid) continue;
    surfaces.push({ segment, surface: segmentSurface(picks, ids, segment.plane, stored?.[segment.id]), grid });
  }
  const spacings = surfaces.map(({ surface }) => surface.medianEdgeM).filter(Number.isFinite);
  const medianPickSpacingM = spacings.length ? Math.max(...spacings) : NaN;
  const defaultLength = defaultLengthScaleM(medianPickSpacingM);
  const length = job.lengthScaleM ?? defaultLength;
  const segments: SegmentScreen[] = surfaces.map(({ segment, surface, grid }) => {
    const screen = screenElements(surfaceElements(surface, segment.plane, gridForLengthScale(grid, length), length), job.parameters);
    const local = new Uint32Array(screen.count * 3);
    const kept = new Uint32Array(screen.count * 3);
    for (let i = 0; i < screen.count; i++) {
      local.set(surface.localTriangles.subarray(3 * screen.source[i], 3 * screen.source[i] + 3), 3 * i);
      kept.set(surface.triangles.subarray(3 * screen.source[i], 3 * screen.source[i] + 3), 3 * i);
    }
    const [slip, dilation, dp] = rasterizeTriangles(
      surface.s,
      surface.t,
      [screen.slipTendency, screen.dilationTendency, screen.pressureToFailureCriticalMPa],
      local,
      grid,
      true,
    ).map((values) => Float32Array.from(values));
    return { segmentId: segment.id, screen, triangleVertices: kept, nodes: { slip, dilation, dp, columns: grid.columns, rows: grid.rows } };
  });
  return {
    orientation: { lengthScaleM: length, defaultLengthScaleM: defaultLength, medianPickSpacingM, rangeStandardErrors: ORIENTATION_RANGE_STANDARD_ERRORS },
    segments,
    combined: concatScreens(segments.map((s) => s.screen)),
    vertices: { x: picks.x, y: picks.y, z: picks.z },
  };
}

const SCREEN_COLUMNS = [
  "centroidX",
  "centroidY",
  "centroidZ",
  "normalX",
  "normalY",
  "normalZ",
  "areaM2",
  "orientationUncertaintyDeg",
  "slopeScatterDeg",
  "depthM",
  "normalMPa",
  "shearMPa",
  "porePressureMPa",
  "effectiveNormalMPa",
  "slipTendency",
  "dilationTendency",
  "pressureToFailureLowMPa",
  "pressureToFailureHighMPa",
  "pressureToFailureCriticalMPa",
  "pressureToFailureMinMPa",
  "pressureToFailureMaxMPa",
  "slipTendencyMin",
  "slipTendencyMax",
  "dilationTendencyMin",
  "dilationTendencyMax",
] as const satisfies readonly (keyof TriangleScreen)[];

function concatScreens(screens: TriangleScreen[]): TriangleScreen {
  const count = screens.reduce((n, s) => n + s.count, 0);
  const join = (key: (typeof SCREEN_COLUMNS)[number]) => {
    const out = new Float64Array(count);
    let offset = 0;
    for (const s of screens) {
      out.set(s[key], offset);
      offset += s.count;
    }
    return out;
  };
  const source = new Uint32Array(count);
  let offset = 0;
  for (const s of screens) {
    source.set(s.source, offset);
    offset += s.count;
  }
  const columns = Object.fromEntries(SCREEN_COLUMNS.map((key) => [key, join(key)])) as Record<(typeof SCREEN_COLUMNS)[number], Float64Array>;
  return {
    count,
    source,
    ...columns,
    skippedDegenerate: screens.reduce((n, s) => n + s.skippedDegenerate, 0),
    skippedAboveDatum: screens.reduce((n, s) => n + s.skippedAboveDatum, 0),
  };
}
