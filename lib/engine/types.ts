// The engine's own shapes: picks in flat columns, plane fits, grids and its options. What it hands out (the analysis
// report and its parts) is the contract in lib/contracts/report.ts, re-exported here for the engine's modules.
// Coordinates: x East, y North, z Up (m); fault-plane coordinates per segment: s along strike, t down dip.

import type { FAULT_KINDS, LengthUnit, ProfileModel, RejectedRow, Ring, TipEndSide } from "@/lib/contracts/report";

export type {
  AnalysisReport,
  KinematicsSummary,
  SurfaceOffsetGrid,
  SurfaceSummary,
  LengthUnit,
  ProfileModel,
  RejectedRow,
  RelayResult,
  Ring,
  SegmentResult,
  TipEnd,
  TipEndSide,
  TipLine,
  TipProfileModel,
} from "@/lib/contracts/report";
export type { AnalysisSettings } from "@/lib/contracts/analysis-settings";

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

/** The kind of fault: the sense of its offset and, for oblique slip, the rake (lib/contracts/report.ts). */
export type FaultSense = (typeof FAULT_KINDS)[number];

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
  /** per segment (index into segmentNames): its plane, fitted without weights when the file was checked */
  planes?: (PlaneFit | null)[];
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

export interface ContourLevel {
  levelM: number;
  /** rings in (s, t) */
  rings: Ring[];
  /** the same rings in world (x, y, z) */
  worldRings: [number, number, number][][];
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
