// The analysis engine's public contract: what the CLI prints with --json, what the API stores and what the
// 3D view draws. Coordinates: x East, y North, z Up (m). Fault-plane coordinates per segment: s along strike
// (right-hand-rule strike direction), t down dip (positive downward), origin at the segment's pick centroid.

export type LengthUnit = "m" | "ft";

export interface RejectedRow {
  /** 1-based data row number as the user sees it in a spreadsheet (header is row 1, first data row is 2). */
  row: number;
  column: string;
  reason: string;
}

/** Picks in flat columns; NaN marks an absent optional value. Lengths in metres. */
export interface PickColumns {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  throwM: Float64Array;
  heaveM: Float64Array;
  quality: Float64Array;
  /** index into segmentNames per pick */
  segment: Uint32Array;
  /** index into horizonNames per pick, or -1 */
  horizon: Int32Array;
  segmentNames: string[];
  horizonNames: string[];
  /** spreadsheet row number per accepted pick, for messages */
  sourceRow: Uint32Array;
  /** optional hw_thickness / fw_thickness columns: interval thickness below the pick's horizon (m), NaN where blank */
  hwThicknessM?: Float64Array;
  fwThicknessM?: Float64Array;
}

export interface ParseResult {
  picks: PickColumns;
  rows: number;
  accepted: number;
  rejected: RejectedRow[];
  /** true when more rejections exist than are listed */
  rejectedTruncated: boolean;
  warnings: string[];
}

export interface PlaneFit {
  strikeDeg: number;
  dipDeg: number;
  dipDirectionDeg: number;
  rmsM: number;
  centroid: [number, number, number];
  /** unit vectors, ENU */
  strikeVector: [number, number, number];
  dipVector: [number, number, number];
  normal: [number, number, number];
  /** singular values s1 >= s2 >= s3 of the centred points */
  singularValues: [number, number, number];
  planarityWarning: string | null;
}

export type Ring = [number, number][];

export interface ContourLevel {
  levelM: number;
  /** rings in (s, t) */
  rings: Ring[];
  /** the same rings in world (x, y, z) */
  worldRings: [number, number, number][][];
}

export type ProfileModel = "walsh-watterson-1989" | "elliptical-crack" | "linear";

export interface TipLine {
  lengthM: number;
  heightM: number;
  aspectRatio: number;
  areaM2: number;
  centre: { s: number; t: number };
  /** semi-axes of the elliptical tip line (along strike, down dip) */
  semiAxes: { sM: number; tM: number };
  model: ProfileModel;
  /** how well each candidate model fitted, rms misfit in m */
  modelMisfits: Partial<Record<ProfileModel, number>>;
  uncertaintyM: number;
  method: string;
  polygon: [number, number][];
  worldPolygon: [number, number, number][];
}

export interface RegularGrid {
  /** s of column 0, t of row 0, cell size (m) */
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
  /** row-major, NaN outside the data */
  displacementM: Float64Array;
  throwM: Float64Array;
  /** off-plane distance w of the fault surface from the segment's reference plane (m, along its normal), NaN outside */
  offPlaneM?: Float64Array;
}

export interface SegmentResult {
  id: string;
  pickCount: number;
  plane: Omit<PlaneFit, "centroid" | "strikeVector" | "dipVector" | "normal" | "singularValues"> & {
    centroid: [number, number, number];
    strikeVector: [number, number, number];
    dipVector: [number, number, number];
    normal: [number, number, number];
  };
  max: { displacementM: number; throwM: number; s: number; t: number; x: number; y: number; z: number };
  mappedLimit: { lengthM: number; heightM: number; polygon: [number, number][]; worldPolygon: [number, number, number][] };
  tipLine: TipLine;
  gradients: {
    meanPerM: number;
    maxPerM: number;
    tips: {
      strikeStartPerM: number;
      strikeEndPerM: number;
      upDipPerM: number;
      downDipPerM: number;
    };
  };
  centroidOfDisplacement: { s: number; t: number };
  asymmetry: { alongStrike: number; downDip: number };
  scaling: { dOverL: number; note: string; plausible: boolean };
  contourIntervalM: number;
  contours: { levelM: number; rings: Ring[] }[];
}

export interface RelayResult {
  segments: [string, string];
  overlapM: number;
  separationM: number;
  overlapToSeparation: number;
  linkage: "soft" | "breached" | "hard";
  /** what the label rests on, in words (the mapped connection, or its absence), and the summed-profile transfer */
  evidence: string;
  /** the published basis of the labels */
  basis?: string;
  /** the mapped structure the label rests on: a merge, a connecting segment or picks, or none */
  connection?: {
    kind: "none" | "picks" | "segment" | "merged";
    via: string | null;
    pickCount: number;
    throwRangeM: [number, number] | null;
    /** closest distance of a pick of one segment to the other's mapped surface (m) */
    closestApproachM: number;
  };
  /** smallest summed displacement inside the overlap as a fraction of the summed profile's peak */
  summedMinimumFraction?: number;
  comparison: string;
  /** sum of both segments' displacement along mean strike at their mean centroid elevation */
  summedProfile: { alongStrikeM: number[]; displacementM: number[] };
}

export interface AnalysisReport {
  engineVersion: string;
  input: { rows: number; accepted: number; rejected: RejectedRow[]; units: LengthUnit };
  /** how the optional quality column was used (absent in reports made before it was) */
  quality?: { picksBelowOne: number; note: string };
  segments: SegmentResult[];
  relays: RelayResult[];
  warnings: string[];
}

export interface AnalysisOptions {
  units?: LengthUnit;
  /** contour interval in metres; default a "nice" interval giving ~8-12 levels */
  intervalM?: number;
  /** grid cell size in metres; default from point spacing */
  cellM?: number;
  /** cap on grid columns/rows */
  gridCells?: number;
  /** exactly gridCells square cells across the longer side of the data, centred on the shorter (benchmark grids) */
  square?: boolean;
}
