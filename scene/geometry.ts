// Geometry for the 3D view as plain typed arrays (no three.js objects), so it can be built and tested
// anywhere. All positions are in world-local metres: world position minus FaultDisplay.origin.
import { interpolateRdBu, interpolateViridis } from "d3-scale-chromatic";
import type { ColourMode } from "@/lib/contracts/scene-settings";
import type { DisplayFrame, DisplayGrid, DisplaySegment, FaultDisplay } from "@/lib/contracts/display";
import { planeToWorld, worldToPlane, writePlaneToWorld } from "@/lib/display/frame";
import { AS_DRAWN, EDGE_TOLERANT_BILINEAR, sampleGrid } from "@/lib/display/grid-sampler";
import { surfaceOffsetAt } from "@/lib/display/surface";
import { orientationOfNormal, surfaceNormal } from "@/lib/engine/surface";

export interface MeshArrays {
  positions: Float32Array;
  colors: Float32Array;
  indices: Uint32Array;
}

export interface LineArrays {
  /** consecutive pairs of points are one line segment (three.js LineSegments layout) */
  positions: Float32Array;
}

export interface PointArrays {
  positions: Float32Array;
  colors: Float32Array;
}

// ---- colour ----------------------------------------------------------------------------------------------

export type ColorInterpolator = (t: number) => string;

/** Parses "#rrggbb" or "rgb(r, g, b)" as d3-scale-chromatic returns them; 0–255 per channel. */
export function parseCssColor(color: string): [number, number, number] {
  if (color.startsWith("#")) {
    const hex = Number.parseInt(color.slice(1, 7), 16);
    return [(hex >> 16) & 255, (hex >> 8) & 255, hex & 255];
  }
  const match = /rgba?\(([^)]+)\)/.exec(color);
  if (!match) throw new Error(`Unrecognised colour "${color}".`);
  const [r, g, b] = match[1].split(",").map((part) => Number.parseFloat(part));
  return [r, g, b];
}

/** three.js treats vertex colours as linear-sRGB; d3 gives sRGB. (IEC 61966-2-1 transfer function.) */
export function srgbToLinear(channel255: number): number {
  const c = channel255 / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

export function linearToSrgb255(linear: number): number {
  const c = linear <= 0.0031308 ? linear * 12.92 : 1.055 * linear ** (1 / 2.4) - 0.055;
  return c * 255;
}

export const COLOR_LUT_SIZE = 256;

/**
 * A lookup table of linear-RGB triples. Entry i holds the interpolator at the centre of bin i, which for
 * d3's 256-step viridis is exactly the colour it returns anywhere in that bin.
 */
export function colorLut(interpolator: ColorInterpolator, size = COLOR_LUT_SIZE): Float32Array {
  const lut = new Float32Array(size * 3);
  for (let i = 0; i < size; i++) {
    const [r, g, b] = parseCssColor(interpolator((i + 0.5) / size));
    lut[i * 3] = srgbToLinear(r);
    lut[i * 3 + 1] = srgbToLinear(g);
    lut[i * 3 + 2] = srgbToLinear(b);
  }
  return lut;
}

export function lutIndex(fraction: number, size = COLOR_LUT_SIZE): number {
  return Math.max(0, Math.min(size - 1, Math.floor(fraction * size)));
}

let viridisLut: Float32Array | null = null;
let residualLut: Float32Array | null = null;
export const surfaceInterpolator: ColorInterpolator = interpolateViridis;
export const surfaceColorLut = () => (viridisLut ??= colorLut(surfaceInterpolator));
/** diverging, reversed so that picks above the surface are red and below it blue */
export const residualInterpolator: ColorInterpolator = (t) => interpolateRdBu(1 - t);
// an odd size puts "on the surface" (residual 0) exactly on the middle entry
export const RESIDUAL_LUT_SIZE = 255;
export const residualColorLut = () => (residualLut ??= colorLut(residualInterpolator, RESIDUAL_LUT_SIZE));

// ---- the plane frame -------------------------------------------------------------------------------------

/** (s, t, h) of a world-local point in a segment's frame (lib/display/frame.ts) */
export function frameCoordinates(frame: DisplayFrame, x: number, y: number, z: number): [number, number, number] {
  return worldToPlane(frame, x, y, z);
}

// ---- the true fault surface -------------------------------------------------------------------------------
// P(s, t) = c + s·ŝ + t·d̂ + w(s, t)·n̂: the reference plane moved along its normal by the surface's offset w (the
// display grid's, or the coarse surface beyond it). Relief (displacement × exaggeration) and line lifts go along the
// surface's own local normal, n̂ − ∂w/∂s·ŝ − ∂w/∂t·d̂ normalised, so they stand off the surface where it curves.
// Displays made before the true surface have no offsets: w = 0, and everything lies on the plane as before.

export interface SurfaceFrame {
  /** offset from the reference plane along its normal (m) */
  offPlaneM: number;
  /** unit local normal, upward (hanging-wall side) */
  normal: [number, number, number];
}

/** Offset and local normal of a segment's surface at (s, t) (central differences one display cell apart). */
export function surfaceFrameAt(segment: DisplaySegment, s: number, t: number): SurfaceFrame {
  const { frame } = segment;
  const offPlaneM = surfaceOffsetAt(segment, s, t);
  if (!segment.grid.offPlaneM && !segment.surface) return { offPlaneM, normal: [...frame.normal] };
  const step = segment.grid.cellM;
  const slopeS = (surfaceOffsetAt(segment, s + step, t) - surfaceOffsetAt(segment, s - step, t)) / (2 * step);
  const slopeT = (surfaceOffsetAt(segment, s, t + step) - surfaceOffsetAt(segment, s, t - step)) / (2 * step);
  return { offPlaneM, normal: surfaceNormal(slopeS, slopeT, frame) };
}

/** The surface point at (s, t), moved h along the local normal, written into out[offset..offset+2] (world-local). */
export function surfacePoint(segment: DisplaySegment, s: number, t: number, h: number, out: Float32Array | Float64Array, offset: number) {
  const { frame } = segment;
  const { offPlaneM, normal } = h === 0 ? { offPlaneM: surfaceOffsetAt(segment, s, t), normal: frame.normal } : surfaceFrameAt(segment, s, t);
  // the plane point raised by the surface's offset along the plane's normal, then h along the surface's own normal
  const onSurface = planeToWorld(frame, s, t, offPlaneM);
  for (let axis = 0; axis < 3; axis++) out[offset + axis] = onSurface[axis] + h * normal[axis];
}

/** Local strike and dip of the surface at (s, t) (degrees; strike by the right-hand rule, as the plane's). */
export function localOrientationAt(segment: DisplaySegment, s: number, t: number): { strikeDeg: number; dipDeg: number } {
  const { strikeDeg, dipDeg } = orientationOfNormal(surfaceFrameAt(segment, s, t).normal);
  return { strikeDeg, dipDeg };
}

/**
 * (s, t) of a world-local point on the drawn surface (relief `reliefAt(s, t)` along the local normal): the point
 * projected on the plane, then corrected for the surface's offset and relief a few times (they move it by a small
 * fraction of themselves where the surface is tilted from the plane).
 */
export function surfaceCoordinates(
  segment: DisplaySegment,
  x: number,
  y: number,
  z: number,
  reliefAt: (s: number, t: number) => number = () => 0,
): [number, number] {
  let [s, t] = frameCoordinates(segment.frame, x, y, z);
  const point = new Float64Array(3);
  for (let k = 0; k < 12; k++) {
    surfacePoint(segment, s, t, reliefAt(s, t), point, 0);
    const [ds, dt] = frameCoordinates(
      segment.frame,
      x - point[0] + segment.frame.centroid[0],
      y - point[1] + segment.frame.centroid[1],
      z - point[2] + segment.frame.centroid[2],
    );
    s += ds;
    t += dt;
    if (Math.abs(ds) + Math.abs(dt) < 1e-3) break;
  }
  return [s, t];
}

/** lines sit this far off the surface along the normal so they are not hidden in it */
export function lineLiftM(display: FaultDisplay): number {
  return Math.max(0.5, displayExtentM(display) * 0.002);
}

/** the largest side of the segments' grids, m */
export function displayExtentM(display: FaultDisplay): number {
  let extent = 0;
  for (const { grid } of display.segments) {
    extent = Math.max(extent, (grid.columns - 1) * grid.cellM, (grid.rows - 1) * grid.cellM);
  }
  return extent || 1;
}

// ---- surface ---------------------------------------------------------------------------------------------

/** the colour of surface nodes where a colour field has no value (#b8bec6), linear RGB */
export const NO_VALUE_COLOUR = "#b8bec6";
const NO_VALUE_LINEAR = Float32Array.from(parseCssColor(NO_VALUE_COLOUR), srgbToLinear);

export interface SurfaceOptions {
  colourMode: ColourMode;
  /** relief off the plane per metre of displacement (0 = flat on the plane) */
  exaggeration: number;
  /** value range mapped onto the colour scale */
  colorRangeM: [number, number];
  /** values to colour by instead of displacement/throw (a ScalarField's array for this segment) */
  fieldValues?: Float32Array;
  reversed?: boolean;
}

/**
 * One vertex per grid node; two triangles per cell whose four corners have data, one triangle over the
 * three corners that have data in a cell with one empty corner, none otherwise: holes stay open.
 * Cells split along the (column, row)–(column+1, row+1) diagonal, as `surfaceValueAt` assumes.
 */
export function buildSurfaceMesh(segment: DisplaySegment, options: SurfaceOptions): MeshArrays {
  const { grid } = segment;
  const { columns, rows } = grid;
  const nodeCount = columns * rows;
  const positions = new Float32Array(nodeCount * 3);
  const colors = new Float32Array(nodeCount * 3);
  const colorValues = options.fieldValues ?? (options.colourMode === "throw" ? grid.throwM : grid.displacementM);
  const lut = surfaceColorLut();
  const [low, high] = options.colorRangeM;
  const span = high - low || 1;
  for (let row = 0; row < rows; row++) {
    for (let column = 0; column < columns; column++) {
      const node = row * columns + column;
      const displacement = grid.displacementM[node];
      const height = Number.isNaN(displacement) ? 0 : displacement * options.exaggeration;
      surfacePoint(segment, grid.s0 + column * grid.cellM, grid.t0 + row * grid.cellM, height, positions, node * 3);
      const value = colorValues[node];
      if (options.fieldValues && Number.isNaN(value)) {
        // a field with no value where the surface has one (e.g. SGR outside the described column): neutral grey
        colors.set(NO_VALUE_LINEAR, node * 3);
        continue;
      }
      const fraction = (value - low) / span;
      const entry = Number.isNaN(value) ? 0 : lutIndex(options.reversed ? 1 - fraction : fraction) * 3;
      colors[node * 3] = lut[entry];
      colors[node * 3 + 1] = lut[entry + 1];
      colors[node * 3 + 2] = lut[entry + 2];
    }
  }
  const indices: number[] = [];
  const hasData = (node: number) => !Number.isNaN(grid.displacementM[node]);
  for (let row = 0; row < rows - 1; row++) {
    for (let column = 0; column < columns - 1; column++) {
      const a = row * columns + column;
      const b = a + 1;
      const c = a + columns;
      const d = c + 1;
      const corners = [a, b, d, c].filter(hasData);
      if (corners.length === 4) indices.push(a, b, d, a, d, c);
      else if (corners.length === 3) indices.push(corners[0], corners[1], corners[2]);
    }
  }
  return { positions, colors, indices: Uint32Array.from(indices) };
}

/** The value the drawn surface shows at (s, t): linear on the same triangles as `buildSurfaceMesh` (NaN off it). */
export function surfaceValueAt(grid: DisplayGrid, values: Float32Array, s: number, t: number): number {
  return sampleGrid(grid, values, s, t, AS_DRAWN);
}

// ---- lines -----------------------------------------------------------------------------------------------

/**
 * All contour rings of all segments as one segment list. A contour at level L sits where the surface shows
 * L, so its height off the surface is L·exaggeration, plus the lift.
 */
/**
 * Every contour ring of every segment as one line-segment list. With `colourOf`, each line gets a vertex colour
 * (linear RGB) chosen from its level, e.g. one that stands out on the surface colour at that level.
 */
export function buildContourLines(
  display: FaultDisplay,
  exaggeration: number,
  colourOf?: (levelM: number) => [number, number, number],
): LineArrays & { colors?: Float32Array } {
  const lift = lineLiftM(display);
  let segmentCount = 0;
  for (const { contours } of display.segments) {
    for (let ring = 0; ring < contours.ringLevelIndex.length; ring++) {
      segmentCount += Math.max(0, contours.ringStarts[ring + 1] - contours.ringStarts[ring] - 1);
    }
  }
  const positions = new Float32Array(segmentCount * 6);
  const colors = colourOf ? new Float32Array(segmentCount * 6) : undefined;
  let offset = 0;
  for (const segment of display.segments) {
    const { contours } = segment;
    for (let ring = 0; ring < contours.ringLevelIndex.length; ring++) {
      const levelM = contours.levelsM[contours.ringLevelIndex[ring]];
      const height = levelM * exaggeration + lift;
      const colour = colourOf?.(levelM);
      for (let point = contours.ringStarts[ring]; point < contours.ringStarts[ring + 1] - 1; point++) {
        // ring points at the view's float32 precision (payloads since version 2 hold them at the engine's): a point on
        // the data's edge then reads the surface as it always did
        const at = (k: number) => Math.fround(contours.points[point * 2 + k]);
        surfacePoint(segment, at(0), at(1), height, positions, offset);
        surfacePoint(segment, at(2), at(3), height, positions, offset + 3);
        if (colors && colour) colors.set([...colour, ...colour], offset);
        offset += 6;
      }
    }
  }
  return colors ? { positions, colors } : { positions };
}

export const DARK_LINE = "#0f172a";
export const LIGHT_LINE = "#f1f5f9";

/** Relative luminance (WCAG 2.x definition) of an sRGB colour given as CSS. */
export function relativeLuminance(css: string): number {
  const [r, g, b] = parseCssColor(css).map(srgbToLinear);
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** A line colour that stands out on `backgroundCss`: dark on light colours, light on dark ones (higher contrast ratio). */
export function contrastingLineColour(backgroundCss: string): string {
  const background = relativeLuminance(backgroundCss);
  const contrastWithDark = (background + 0.05) / (relativeLuminance(DARK_LINE) + 0.05);
  const contrastWithLight = (relativeLuminance(LIGHT_LINE) + 0.05) / (background + 0.05);
  return contrastWithDark >= contrastWithLight ? DARK_LINE : LIGHT_LINE;
}

/** Closed (s, t) polygons of every segment as one segment list; `heightAt` gives each vertex's height. */
function polygonSegments(
  display: FaultDisplay,
  polygonOf: (segment: DisplaySegment) => [number, number][],
  heightAt: (segment: DisplaySegment, s: number, t: number) => number,
): LineArrays {
  return polygonPieces(
    display,
    (segment) => {
      const polygon = polygonOf(segment);
      const last = polygon.length - 1;
      const closed = last > 0 && polygon[last][0] === polygon[0][0] && polygon[last][1] === polygon[0][1];
      return [closed || polygon.length < 2 ? polygon : [...polygon, polygon[0]]];
    },
    heightAt,
  );
}

/** Line pairs along polylines in (s, t) of each segment, on the surface, each point raised by heightAt along its normal. */
function polygonPieces(
  display: FaultDisplay,
  piecesOf: (segment: DisplaySegment) => [number, number][][],
  heightAt: (segment: DisplaySegment, s: number, t: number) => number,
): LineArrays {
  const pairs: number[] = [];
  const scratch = new Float32Array(6);
  for (const segment of display.segments) {
    for (const piece of piecesOf(segment)) {
      for (let i = 0; i + 1 < piece.length; i++) {
        const [s0, t0] = piece[i];
        const [s1, t1] = piece[i + 1];
        surfacePoint(segment, s0, t0, heightAt(segment, s0, t0), scratch, 0);
        surfacePoint(segment, s1, t1, heightAt(segment, s1, t1), scratch, 3);
        for (const value of scratch) pairs.push(value);
      }
    }
  }
  return { positions: Float32Array.from(pairs) };
}

/** Edges of a closed polygon whose two ends are both flagged (or both not), as open polylines of their own. */
function flaggedEdges(polygon: [number, number][], flags: number[] | undefined, wanted: 0 | 1): [number, number][][] {
  const runs: [number, number][][] = [];
  for (let i = 0; i + 1 < polygon.length; i++) {
    const edgeOpen = flags ? (flags[i] === 1 && flags[i + 1] === 1 ? 1 : 0) : 0;
    if (edgeOpen === wanted) runs.push([polygon[i], polygon[i + 1]]);
  }
  return runs;
}

/** The inferred tip line is where displacement falls to zero: on the surface, lifted. Open parts are left out. */
export function buildTipLines(display: FaultDisplay): LineArrays {
  const lift = lineLiftM(display);
  return polygonPieces(
    display,
    (segment) => flaggedEdges(segment.tipLine, segment.tipOpen, 0),
    () => lift,
  );
}

/** Where the tip line follows an open data edge: drawn apart, since no tip was inferred there. */
export function buildOpenTipLines(display: FaultDisplay): LineArrays {
  const lift = lineLiftM(display);
  return polygonPieces(
    display,
    (segment) => flaggedEdges(segment.tipLine, segment.tipOpen, 1),
    () => lift,
  );
}

/** The inner (5 %) and outer (95 %) tip lines: the band the tip lies in. */
export function buildTipBandLines(display: FaultDisplay): LineArrays {
  const lift = lineLiftM(display);
  return polygonPieces(
    display,
    (segment) =>
      segment.tipBand ? [...flaggedEdges(segment.tipBand.inner, segment.tipOpen, 0), ...flaggedEdges(segment.tipBand.outer, segment.tipOpen, 0)] : [],
    () => lift,
  );
}

/** The mapped limit follows the surface's edge, so it takes the surface height there. */
export function buildMappedLimitLines(display: FaultDisplay, exaggeration: number): LineArrays {
  const lift = lineLiftM(display);
  return polygonSegments(
    display,
    (segment) => segment.mappedLimit,
    (segment, s, t) => {
      const displacement = sampleGrid(segment.grid, segment.grid.displacementM, s, t, EDGE_TOLERANT_BILINEAR);
      return (Number.isNaN(displacement) ? 0 : displacement * exaggeration) + lift;
    },
  );
}

// ---- points ----------------------------------------------------------------------------------------------

/** Symmetric residual range for the diverging scale: the 95th percentile of |residual|, at least 1 m. */
export function residualRangeM(residualM: Float32Array): number {
  const magnitudes = Array.from(residualM, Math.abs).filter((value) => !Number.isNaN(value));
  if (magnitudes.length === 0) return 1;
  magnitudes.sort((a, b) => a - b);
  return Math.max(1, magnitudes[Math.floor(0.95 * (magnitudes.length - 1))]);
}

/**
 * Picks at their true position, raised along the surface's local normal by displacement·exaggeration like the
 * surface, coloured by residual on a diverging scale (white = on the surface, grey = no surface there).
 */
export function buildPickPoints(display: FaultDisplay, exaggeration: number, rangeM: number): PointArrays {
  const { picks } = display;
  const positions = new Float32Array(picks.count * 3);
  const colors = new Float32Array(picks.count * 3);
  const lut = residualColorLut();
  const noSurface = srgbToLinear(150);
  for (let i = 0; i < picks.count; i++) {
    const height = (picks.displacementM[i] || 0) * exaggeration;
    let normal: readonly number[] = [0, 0, 0];
    if (height !== 0) {
      const segment = display.segments[picks.segmentIndex[i]] ?? display.segments[0];
      const [s, t] = frameCoordinates(segment.frame, picks.position[i * 3], picks.position[i * 3 + 1], picks.position[i * 3 + 2]);
      normal = surfaceFrameAt(segment, s, t).normal;
    }
    for (let axis = 0; axis < 3; axis++) positions[i * 3 + axis] = picks.position[i * 3 + axis] + normal[axis] * height;
    const residual = picks.residualM[i];
    if (Number.isNaN(residual)) {
      colors.fill(noSurface, i * 3, i * 3 + 3);
      continue;
    }
    const entry = lutIndex((residual / rangeM + 1) / 2, RESIDUAL_LUT_SIZE) * 3;
    colors[i * 3] = lut[entry];
    colors[i * 3 + 1] = lut[entry + 1];
    colors[i * 3 + 2] = lut[entry + 2];
  }
  return { positions, colors };
}

/** Where each segment's peak marker sits: its maximum displacement, on the surface, lifted twice. */
export function peakPosition(segment: DisplaySegment, exaggeration: number, liftM: number): [number, number, number] {
  const point = new Float32Array(3);
  surfacePoint(segment, segment.max.s, segment.max.t, segment.max.displacementM * exaggeration + liftM * 2, point, 0);
  return [point[0], point[1], point[2]];
}

export function buildPeakPoints(display: FaultDisplay, exaggeration: number): LineArrays {
  const lift = lineLiftM(display);
  return { positions: Float32Array.from(display.segments.flatMap((segment) => peakPosition(segment, exaggeration, lift))) };
}

// ---- bounds and labels -----------------------------------------------------------------------------------

export interface Bounds {
  min: [number, number, number];
  max: [number, number, number];
}

/**
 * Points that outline the fault for framing the camera, flat x, y, z world-local: every segment's inferred tip line
 * and mapped limit on the surface, and its peak lifted by the relief.
 */
export function framingPoints(display: FaultDisplay, exaggeration: number): Float32Array {
  const out: number[] = [];
  const point = new Float32Array(3);
  for (const segment of display.segments) {
    for (const [s, t] of [...segment.tipLine, ...segment.mappedLimit]) {
      surfacePoint(segment, s, t, 0, point, 0);
      out.push(point[0], point[1], point[2]);
    }
    out.push(...peakPosition(segment, exaggeration, 0));
  }
  return Float32Array.from(out);
}

/** Box around every surface node with data and every tip-line vertex, world-local. */
export function displayBounds(display: FaultDisplay, exaggeration: number): Bounds {
  const min: [number, number, number] = [Infinity, Infinity, Infinity];
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  const point = new Float32Array(3);
  const include = () => {
    for (let axis = 0; axis < 3; axis++) {
      min[axis] = Math.min(min[axis], point[axis]);
      max[axis] = Math.max(max[axis], point[axis]);
    }
  };
  for (const segment of display.segments) {
    const { grid, tipLine } = segment;
    for (let row = 0; row < grid.rows; row++) {
      for (let column = 0; column < grid.columns; column++) {
        const displacement = grid.displacementM[row * grid.columns + column];
        if (Number.isNaN(displacement)) continue;
        surfacePoint(segment, grid.s0 + column * grid.cellM, grid.t0 + row * grid.cellM, displacement * exaggeration, point, 0);
        include();
      }
    }
    for (const [s, t] of tipLine) {
      surfacePoint(segment, s, t, 0, point, 0);
      include();
    }
  }
  if (!Number.isFinite(min[0])) return { min: [0, 0, 0], max: [0, 0, 0] };
  return { min, max };
}

/** 1, 2 or 5 × 10^k: the smallest such step not below `rough`. */
export function niceStep(rough: number): number {
  if (!(rough > 0) || !Number.isFinite(rough)) return 1;
  const power = 10 ** Math.floor(Math.log10(rough));
  const fraction = rough / power;
  return (fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10) * power;
}

/** Round values (a nice step apart) spanning [low, high], about `count` of them. */
export function niceTicks(low: number, high: number, count: number): number[] {
  if (!(high > low)) return [];
  const step = niceStep((high - low) / Math.max(1, count));
  // multiply integers by the step and round to its decimals, so 3 × 0.2 reads 0.6, not 0.6000000000000001
  const decimals = Math.max(0, -Math.floor(Math.log10(step)));
  const ticks: number[] = [];
  for (let index = Math.ceil(low / step - 1e-9); index * step <= high + step * 1e-9; index++) {
    ticks.push(Number((index * step).toFixed(decimals)));
  }
  return ticks;
}

/**
 * Tick values for a colour legend over [low, high]: round values an even step apart, at most `maxCount`, never
 * closer than the step (the ends are not added on top of the ticks).
 */
export function legendTicks(low: number, high: number, maxCount: number): number[] {
  if (!(high > low)) return [];
  for (let count = maxCount; count >= 2; count--) {
    const ticks = niceTicks(low, high, count);
    if (ticks.length <= maxCount) return ticks;
  }
  return niceTicks(low, high, 1);
}

export interface DepthLabel {
  position: [number, number, number];
  depthM: number;
}

/**
 * Depth marks down the first segment's along-strike start edge, where the plane crosses round depths.
 * `originZ` is the world elevation of the local origin.
 */
export function depthLabels(display: FaultDisplay, originZ: number, count = 5): DepthLabel[] {
  const { grid, frame } = display.segments[0];
  const dipZ = frame.dipVector[2];
  if (Math.abs(dipZ) < 1e-6) return [];
  const s = grid.s0 - grid.cellM * 2;
  const elevationAt = (t: number) => originZ + frame.centroid[2] + s * frame.strikeVector[2] + t * dipZ;
  const depths = [-elevationAt(grid.t0), -elevationAt(grid.t0 + (grid.rows - 1) * grid.cellM)].sort((a, b) => a - b);
  const point = new Float32Array(3);
  return niceTicks(depths[0], depths[1], count).map((depthM) => {
    const t = (-depthM - originZ - frame.centroid[2] - s * frame.strikeVector[2]) / dipZ;
    writePlaneToWorld(frame, s, t, 0, point, 0);
    return { position: [point[0], point[1], point[2]], depthM };
  });
}
