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
  /** optional rake column: rake of the slip in the fault surface from its strike (degrees, −180…180), NaN where blank */
  rakeDeg?: Float64Array;
  /** picks read in two-way time: each pick's original time and time throw (ms), kept beside the depth-converted values */
  twtMs?: Float64Array;
  throwMs?: Float64Array;
}

/** The kind of fault: the sense of its offset and, for oblique slip, the rake. */
export type FaultSense = "normal" | "reverse" | "oblique";

export interface FaultKinematics {
  sense: FaultSense;
  /**
   * Rake of the slip vector in the fault surface, measured from the strike direction (degrees, −180…180; negative for
   * normal slip, positive for reverse: Aki & Richards 1980). Required for oblique faults; normal is −90 and reverse +90
   * when absent. A pick's own `rake` column overrides it.
   */
  rakeDeg?: number;
  /** throw of the opposite sense (negative throw in the file) is expected in places: the fault was inverted */
  inversion?: boolean;
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

export type ProfileModel = "walsh-watterson-1987" | "elliptical-crack" | "linear" | "parabolic" | "flat-topped" | "flexible";

/** The four ends of a fault: along strike towards lower / higher s, and up dip (shallower) / down dip. */
export type TipEndSide = "strike-start" | "strike-end" | "up-dip" | "down-dip";

export interface TipEnd {
  side: TipEndSide;
  /** inferred: displacement falls toward the cut-off there and a tip is inferred beyond; open: the data stop first */
  status: "inferred" | "open";
  /** detected from the picks, or set by the interpreter */
  source: "detected" | "set";
}

/** The fault model of the profile that carries most weight: Dmax·f(r) with a reach to the tip on each side. */
export interface TipProfileModel {
  model: ProfileModel;
  /** shape numbers as fitted (unbounded; see PROFILE_CANDIDATES) */
  shape: number[];
  centre: { s: number; t: number };
  reach: { strikeStartM: number; strikeEndM: number; upDipM: number; downDipM: number };
  /** superellipse exponent of the tip line: 2 an ellipse, larger boxier (layer-bound faults), smaller more pointed */
  exponent: number;
  dmaxM: number;
}

export interface TipLine {
  /** central estimate, along strike and down dip, measured along the fault surface (arc length, m) */
  lengthM: number;
  heightM: number;
  /** 5–95 % range; the upper end is null where an end is open (the length or height is then a minimum) */
  lengthRangeM: [number, number | null];
  heightRangeM: [number, number | null];
  lengthIsMinimum: boolean;
  heightIsMinimum: boolean;
  aspectRatio: number;
  /** area inside the central tip line, on the fault surface (m²) */
  areaM2: number;
  /** where the weighted fits put the displacement maximum; the tip lines are built around it */
  centre: { s: number; t: number };
  /** half the length and height */
  semiAxes: { sM: number; tM: number };
  /** the profile with most weight */
  model: ProfileModel;
  profile: TipProfileModel;
  /** every profile tried, most weight first */
  candidates: { model: ProfileModel; weight: number; aicc: number; rmsM: number; lengthM: number; heightM: number; dmaxM: number }[];
  /** how well each candidate model fitted, rms misfit in m */
  modelMisfits: Partial<Record<ProfileModel, number>>;
  /** half the wider of the length and height ranges (m) */
  uncertaintyM: number;
  /** displacement below which nothing could be picked */
  cutoff: { displacementM: number; source: "estimated" | "set" };
  /** interpretation noise near the edges (m) */
  noiseM: number;
  ends: TipEnd[];
  /** per polygon vertex (ray from the centre), 1 where the line follows an open data edge */
  openRays: number[];
  /** which profiles were compared, how, and what carried the weight, in a sentence */
  selection: string;
  method: string;
  /** central tip line in (s, t), closed */
  polygon: [number, number][];
  /** 5 % and 95 % tip lines in (s, t), closed, with the same vertex directions */
  innerPolygon: [number, number][];
  outerPolygon: [number, number][];
  worldPolygon: [number, number, number][];
  innerWorldPolygon: [number, number, number][];
  outerWorldPolygon: [number, number, number][];
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
  /**
   * The fault surface's distance w from the segment's reference plane (m, along its normal), NaN outside the data: the
   * picks' w interpolated on the same triangles, then smoothed at the surface's length scale (lib/engine/fault-surface.ts)
   */
  offPlaneM?: Float64Array;
  /** local dip and strike (right-hand rule) of the smoothed surface at each node (degrees), NaN outside the data */
  localDipDeg?: Float64Array;
  localStrikeDeg?: Float64Array;
}

/** A smoothed fault surface resampled on a coarse grid that covers the tip lines: w everywhere (no NaN), m. */
export interface SurfaceOffsetGrid {
  s0: number;
  t0: number;
  cellM: number;
  columns: number;
  rows: number;
  /** row-major w (m), continued beyond the data along the tangent plane of the data's edge */
  offsetM: number[];
}

/** How far the fault surface departs from its reference plane, and what that changes. */
export interface SurfaceSummary {
  /** largest and RMS distance of the surface from the reference plane within the mapped area (m) */
  maxOffsetM: number;
  rmsOffsetM: number;
  /** the Gaussian length scale at which the surface was smoothed to read its local dip (m) */
  lengthScaleM: number;
  /** 5th and 95th percentile of the local dip over the mapped area (degrees) */
  localDipRangeDeg: [number, number];
  /** displacement from the local dip against displacement from the plane's dip: 5th and 95th percentile of the ratio */
  displacementRatioRange: [number, number];
  /** length and height of the tip line measured on the reference plane (projection), for comparison (m) */
  projectedLengthM: number;
  projectedHeightM: number;
  /** true when the surface departs from the plane enough to change displacement or size by more than the threshold */
  matters: boolean;
  /** one sentence for the fault sheet */
  note: string;
  /** the surface itself, coarse, for positions anywhere on it (exports, views) */
  grid: SurfaceOffsetGrid;
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
  /** observed maximum (biased upward by noise) and the fitted one with its 5–95 % range */
  max: {
    displacementM: number;
    throwM: number;
    s: number;
    t: number;
    x: number;
    y: number;
    z: number;
    fittedDisplacementM: number;
    fittedDisplacementRangeM: [number, number];
  };
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
  /** displacement-weighted centroid (s, t), weighted by surface area */
  centroidOfDisplacement: { s: number; t: number };
  /** where Dmax sits between the tip line's ends, measured along the surface: 0 in the middle, ±1 at an end */
  asymmetry: { alongStrike: number; downDip: number };
  /** the fault surface against its reference plane (absent in reports made before the surface was read) */
  surface?: SurfaceSummary;
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
  /** the interpreter's settings this analysis ran with (absent: every default) */
  settings?: AnalysisSettings;
  /** the fault's type as the analysis used it (absent in reports made before fault types: normal) */
  kinematics?: KinematicsSummary;
  segments: SegmentResult[];
  relays: RelayResult[];
  warnings: string[];
}

export interface KinematicsSummary extends FaultKinematics {
  /** the rake used where a pick has none (degrees) */
  rakeDeg: number;
  hangingWall: "down" | "up";
  /** picks with their own rake */
  picksWithRake: number;
  /** picks with throw of the opposite sense (inversion) */
  oppositeSensePicks: number;
  /** how throw became displacement, in a sentence for the fault sheet */
  note: string;
}

export interface AnalysisOptions {
  units?: LengthUnit;
  /** the fault's type (default: normal, dip-slip) */
  kinematics?: FaultKinematics;
  /** contour interval in metres; default a "nice" interval giving ~8-12 levels */
  intervalM?: number;
  /** grid cell size in metres; default from point spacing */
  cellM?: number;
  /** cap on grid columns/rows */
  gridCells?: number;
  /** exactly gridCells square cells across the longer side of the data, centred on the shorter (benchmark grids) */
  square?: boolean;
  /** the resolution cut-off as a throw (m); estimated from the picks when absent */
  throwCutoffM?: number;
  /** the displacement profiles the tip-line fit may use; every automatic candidate when absent */
  profiles?: ProfileModel[];
  /** the interpreter's word on each end of the fault: open (the data stop there) or inferred */
  ends?: Partial<Record<TipEndSide, "open" | "inferred">>;
  /** Gaussian smoothing of the displacement and throw grids before contouring, as a length (m); none when absent */
  smoothingM?: number;
}

/** The settings an interpreter can give an analysis run; every one optional (absent: the default). */
export type AnalysisSettings = Pick<AnalysisOptions, "intervalM" | "cellM" | "throwCutoffM" | "profiles" | "ends" | "smoothingM">;
