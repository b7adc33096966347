// The display payload: what the 3D view needs from an analysis, decimated and in Float32, plus a compact
// binary encoding for the wire. Pure; usable on the server and in the browser. The AnalysisReport (metrics,
// words) travels separately as JSON.
import type { AnalysisReport, PickColumns, RegularGrid, SegmentResult } from "@/lib/engine/types";

export type Vec3 = [number, number, number];

/** A segment's fault-plane frame. `centroid` is relative to FaultDisplay.origin (m, East/North/Up). */
export interface DisplayFrame {
  centroid: Vec3;
  strikeVector: Vec3;
  dipVector: Vec3;
  /** unit, pointing upward (hanging-wall side of a dipping plane) */
  normal: Vec3;
  strikeDeg: number;
  dipDeg: number;
}

/** Row-major grid in the segment's (s, t) frame; NaN outside the data. */
export interface DisplayGrid {
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
  displacementM: Float32Array;
  throwM: Float32Array;
  /** the fault surface's distance from the reference plane along its normal (m), NaN outside (absent in older payloads) */
  offPlaneM?: Float32Array;
}

/** The fault surface on a coarse grid covering the data and the tip lines, w everywhere (m): to place lines and pins on it. */
export interface DisplaySurface {
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
  offPlaneM: Float32Array;
}

/** Contour rings flattened: ring r spans points[2*ringStarts[r] .. 2*ringStarts[r+1]) as (s, t) pairs. */
export interface DisplayContours {
  intervalM: number;
  levelsM: number[];
  points: Float32Array;
  ringStarts: Uint32Array;
  ringLevelIndex: Uint16Array;
}

export interface DisplaySegment {
  id: string;
  frame: DisplayFrame;
  grid: DisplayGrid;
  contours: DisplayContours;
  /** inferred tip line (central) and mapped limit as closed polygons in (s, t) */
  tipLine: [number, number][];
  mappedLimit: [number, number][];
  /** the 5 % and 95 % tip lines, same vertex directions as tipLine (empty in displays made before they existed) */
  tipBand?: { inner: [number, number][]; outer: [number, number][] };
  /** per tipLine vertex, 1 where the line follows an open data edge (no tip inferred there) */
  tipOpen?: number[];
  max: { displacementM: number; throwM: number; s: number; t: number };
  /** the surface beyond the grid's data (absent in payloads made before the true surface: the plane) */
  surface?: DisplaySurface;
}

/** Picks for display, possibly a deterministic subsample. Positions relative to FaultDisplay.origin. */
export interface DisplayPicks {
  count: number;
  /** picks in the pick set before subsampling */
  totalCount: number;
  position: Float32Array;
  displacementM: Float32Array;
  /** pick displacement minus surface displacement at the pick; NaN where the surface has no value */
  residualM: Float32Array;
  segmentIndex: Uint16Array;
}

export interface FaultDisplay {
  version: 1;
  /** world position (m) of the local origin: the first segment's centroid, kept in float64 */
  origin: Vec3;
  segments: DisplaySegment[];
  picks: DisplayPicks;
  displacementRangeM: [number, number];
  throwRangeM: [number, number];
}

export interface BuildFaultDisplayInput {
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
  const displayPicks = buildDisplayPicks(report, grids, picks, origin, maxPicks, pickDisplacementM);
  return {
    version: 1,
    origin,
    segments,
    picks: displayPicks,
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

/**
 * The surface's distance from the reference plane at (s, t) of a segment (m): the display grid's own where it has data
 * around (s, t), else the coarse surface (which covers the tip lines), else 0 (payloads made before the true surface).
 */
export function surfaceOffsetAt(segment: DisplaySegment, s: number, t: number): number {
  const { grid, surface } = segment;
  if (grid.offPlaneM) {
    const w = sampleGrid(grid, grid.offPlaneM, s, t);
    if (!Number.isNaN(w)) return w;
  }
  if (surface) {
    const u = Math.min(Math.max(s, surface.s0), surface.s0 + (surface.columns - 1) * surface.cellM);
    const v = Math.min(Math.max(t, surface.t0), surface.t0 + (surface.rows - 1) * surface.cellM);
    const w = sampleGrid(surface, surface.offPlaneM, u, v);
    if (!Number.isNaN(w)) return w;
  }
  return 0;
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
  const points = new Float32Array(pointCount * 2);
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

/**
 * Value of a row-major grid at (s, t) by bilinear interpolation over the corners that have data (weights
 * renormalised), NaN when none do or (s, t) is outside the grid.
 */
export function sampleGrid(
  grid: { s0: number; t0: number; cellM: number; columns: number; rows: number },
  values: ArrayLike<number>,
  s: number,
  t: number,
): number {
  const u = (s - grid.s0) / grid.cellM;
  const v = (t - grid.t0) / grid.cellM;
  if (!(u >= 0 && v >= 0 && u <= grid.columns - 1 && v <= grid.rows - 1)) return NaN;
  const column = Math.min(Math.floor(u), grid.columns - 2);
  const row = Math.min(Math.floor(v), grid.rows - 2);
  if (column < 0 || row < 0) {
    // a single row or column: nearest node
    return values[Math.round(v) * grid.columns + Math.round(u)];
  }
  const fu = u - column;
  const fv = v - row;
  let sum = 0;
  let weightSum = 0;
  const corners: [number, number, number][] = [
    [0, 0, (1 - fu) * (1 - fv)],
    [1, 0, fu * (1 - fv)],
    [0, 1, (1 - fu) * fv],
    [1, 1, fu * fv],
  ];
  for (const [dc, dr, weight] of corners) {
    const value = values[(row + dr) * grid.columns + column + dc];
    if (Number.isNaN(value) || weight === 0) continue;
    sum += value * weight;
    weightSum += weight;
  }
  return weightSum > 0 ? sum / weightSum : NaN;
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
    const { centroid, strikeVector, dipVector, dipDeg } = segment.plane;
    const heave = picks.heaveM[i];
    displacementM[i] = pickDisplacementM
      ? pickDisplacementM[i]
      : Number.isNaN(heave)
        ? picks.throwM[i] / Math.sin((dipDeg * Math.PI) / 180)
        : Math.hypot(picks.throwM[i], heave);
    const dx = picks.x[i] - centroid[0];
    const dy = picks.y[i] - centroid[1];
    const dz = picks.z[i] - centroid[2];
    const s = dx * strikeVector[0] + dy * strikeVector[1] + dz * strikeVector[2];
    const t = dx * dipVector[0] + dy * dipVector[1] + dz * dipVector[2];
    const grid = grids[segment.id];
    residualM[i] = displacementM[i] - (grid ? sampleGrid(grid, grid.displacementM, s, t) : NaN);
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
  return {
    count: kept.length,
    totalCount: total,
    position,
    displacementM: keptDisplacement,
    residualM: keptResidual,
    segmentIndex,
  };
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

// ---- binary encoding -------------------------------------------------------------------------------------
// Layout: "SLFD" | u32 header byte length (little endian) | UTF-8 JSON header | padding to 8 | array bodies,
// each starting on an 8-byte boundary. In the header every typed array is replaced by { $array: index } and
// listed in `arrays` with its type, element count and byte offset from the start of the bodies.

const MAGIC = [0x53, 0x4c, 0x46, 0x44];
const typedArrayKinds = {
  Float32Array,
  Float64Array,
  Uint32Array,
  Uint16Array,
  Uint8Array,
} as const;
type TypedArrayKind = keyof typeof typedArrayKinds;
type AnyTypedArray = InstanceType<(typeof typedArrayKinds)[TypedArrayKind]>;

interface ArrayEntry {
  kind: TypedArrayKind;
  length: number;
  offset: number;
}

const align8 = (n: number) => Math.ceil(n / 8) * 8;

function typedArrayKind(value: unknown): TypedArrayKind | null {
  for (const kind of Object.keys(typedArrayKinds) as TypedArrayKind[]) {
    if (value instanceof typedArrayKinds[kind]) return kind;
  }
  return null;
}

export function encodeFaultDisplay(display: FaultDisplay): Uint8Array {
  const arrays: AnyTypedArray[] = [];
  const entries: ArrayEntry[] = [];
  let bodyBytes = 0;
  const body = JSON.stringify(display, (_key, value: unknown) => {
    const kind = typedArrayKind(value);
    if (!kind) return typeof value === "number" && !Number.isFinite(value) ? { $number: String(value) } : value;
    const array = value as AnyTypedArray;
    entries.push({ kind, length: array.length, offset: bodyBytes });
    arrays.push(array);
    bodyBytes = align8(bodyBytes + array.byteLength);
    return { $array: arrays.length - 1 };
  });
  const header = new TextEncoder().encode(JSON.stringify({ arrays: entries, body }));
  const bodiesStart = align8(8 + header.length);
  const bytes = new Uint8Array(bodiesStart + bodyBytes);
  bytes.set(MAGIC, 0);
  new DataView(bytes.buffer).setUint32(4, header.length, true);
  bytes.set(header, 8);
  arrays.forEach((array, i) => {
    bytes.set(new Uint8Array(array.buffer, array.byteOffset, array.byteLength), bodiesStart + entries[i].offset);
  });
  return bytes;
}

export function decodeFaultDisplay(input: Uint8Array): FaultDisplay {
  // typed-array views need aligned offsets: work on a fresh buffer when the input is a view into another one
  const bytes = input.byteOffset % 8 === 0 ? input : input.slice();
  if (bytes.length < 8 || MAGIC.some((byte, i) => bytes[i] !== byte)) {
    throw new Error("Not a Slipfield display payload.");
  }
  const headerLength = new DataView(bytes.buffer, bytes.byteOffset).getUint32(4, true);
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(8, 8 + headerLength))) as {
    arrays: ArrayEntry[];
    body: string;
  };
  const bodiesStart = bytes.byteOffset + align8(8 + headerLength);
  const arrays = header.arrays.map(({ kind, length, offset }) => {
    const Kind = typedArrayKinds[kind];
    return new Kind(bytes.buffer as ArrayBuffer, bodiesStart + offset, length);
  });
  const display = JSON.parse(header.body, (_key, value: unknown) => {
    if (value && typeof value === "object") {
      if ("$array" in value) return arrays[(value as { $array: number }).$array];
      if ("$number" in value) return Number((value as { $number: string }).$number);
    }
    return value;
  }) as FaultDisplay;
  if (display.version !== 1) throw new Error(`Unsupported display payload version ${String(display.version)}.`);
  return display;
}
