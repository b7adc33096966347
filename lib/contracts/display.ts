// The display payload: what the 3D view, the plane map, the printable report and the link page draw from an analysis,
// decimated, in typed arrays, as one binary payload (lib/display/payload.ts). Positions are relative to `origin` (m,
// x East, y North, z Up); grids and lines in each segment's fault-plane (s, t) frame.
import { z } from "zod";
import { finite, planePoint, vec3 } from "./json";
import { planeFrameShape } from "./report";

const float32 = z.instanceof(Float32Array);

/** A segment's fault-plane frame; `centroid` relative to the payload's origin. */
/** the normal points upward (hanging-wall side of a dipping plane) */
export const displayFrameSchema = z.object({ ...planeFrameShape, strikeDeg: finite, dipDeg: finite });
export type DisplayFrame = z.infer<typeof displayFrameSchema>;

/** Row-major grid in the segment's (s, t) frame; NaN outside the data. */
export const displayGridSchema = z.object({
  s0: finite,
  t0: finite,
  cellM: finite,
  columns: z.number().int().positive(),
  rows: z.number().int().positive(),
  displacementM: float32,
  throwM: float32,
  /** the fault surface's distance from the reference plane along its normal (m), NaN outside (absent in older payloads) */
  offPlaneM: float32.optional(),
});
export type DisplayGrid = z.infer<typeof displayGridSchema>;

/** The fault surface on a coarse grid covering the data and the tip lines, w everywhere (m): to place lines and pins on it. */
export const displaySurfaceSchema = z.object({
  s0: finite,
  t0: finite,
  cellM: finite,
  columns: z.number().int().positive(),
  rows: z.number().int().positive(),
  offPlaneM: float32,
});
export type DisplaySurface = z.infer<typeof displaySurfaceSchema>;

/**
 * Contour rings flattened: ring r spans points[2·ringStarts[r] .. 2·ringStarts[r+1]) as (s, t) pairs. The points are the
 * engine's own (Float64; version 1 payloads carried Float32 copies): the stored report keeps no rings of its own.
 */
export const displayContoursSchema = z.object({
  intervalM: finite,
  levelsM: z.array(finite),
  points: z.union([z.instanceof(Float64Array), float32]),
  ringStarts: z.instanceof(Uint32Array),
  ringLevelIndex: z.instanceof(Uint16Array),
});
export type DisplayContours = z.infer<typeof displayContoursSchema>;

export const displaySegmentSchema = z.object({
  id: z.string(),
  frame: displayFrameSchema,
  grid: displayGridSchema,
  contours: displayContoursSchema,
  /** inferred tip line (central) and mapped limit as closed polygons in (s, t) */
  tipLine: z.array(planePoint),
  mappedLimit: z.array(planePoint),
  /** the 5 % and 95 % tip lines, same vertex directions as tipLine (absent in payloads made before they existed) */
  tipBand: z.object({ inner: z.array(planePoint), outer: z.array(planePoint) }).optional(),
  /** per tipLine vertex, 1 where the line follows an open data edge (no tip inferred there) */
  tipOpen: z.array(z.number().int()).optional(),
  max: z.object({ displacementM: finite, throwM: finite, s: finite, t: finite }),
  /** the surface beyond the grid's data (absent in payloads made before the true surface: the plane) */
  surface: displaySurfaceSchema.optional(),
});
export type DisplaySegment = z.infer<typeof displaySegmentSchema>;

/** Picks for display, possibly a deterministic subsample; positions relative to the payload's origin. */
export const displayPicksSchema = z.object({
  count: z.number().int(),
  /** picks in the pick set before subsampling */
  totalCount: z.number().int(),
  position: float32,
  displacementM: float32,
  /** pick displacement minus surface displacement at the pick; NaN where the surface has no value */
  residualM: float32,
  segmentIndex: z.instanceof(Uint16Array),
});
export type DisplayPicks = z.infer<typeof displayPicksSchema>;

export const faultDisplaySchema = z.object({
  version: z.union([z.literal(1), z.literal(2)]),
  /** world position (m) of the local origin: the first segment's centroid, kept in float64 */
  origin: vec3,
  segments: z.array(displaySegmentSchema),
  picks: displayPicksSchema,
  displacementRangeM: z.tuple([finite, finite]),
  throwRangeM: z.tuple([finite, finite]),
});
export type FaultDisplay = z.infer<typeof faultDisplaySchema>;

/**
 * A value per display-grid node, per segment, for colouring the surface by something other than
 * displacement (e.g. slip tendency). Arrays match each segment's display grid (columns × rows, row-major).
 */
export interface ScalarField {
  key: string;
  label: string;
  unit: string;
  bySegment: Record<string, Float32Array>;
  range: [number, number];
  /** reverse the colour scale so that "worse" reads warm (e.g. low pressure-to-failure) */
  reversed?: boolean;
  /** a value marked on the legend as a guide (e.g. a published threshold) */
  guide?: { value: number; label: string };
  /** what a reader must know beside this colouring (its source, its caution), shown under the view */
  note?: string;
}
