// The 2D contour map: every segment's contour rings, tip line, mapped limit and peak drawn in one (s, t)
// frame (the first segment's), so a multi-segment fault reads as one map. Pure; used by the SVG fallback.
import type { DisplayFrame, FaultDisplay } from "@/lib/contracts/display";
import { planeToWorld, worldToPlane } from "@/lib/display/frame";

export interface MapPath {
  segmentId: string;
  /** SVG path data in map coordinates (s right, t down) */
  d: string;
}

export interface MapContour extends MapPath {
  levelM: number;
}

export interface MapPeak {
  segmentId: string;
  s: number;
  t: number;
  displacementM: number;
}

export interface ContourMap {
  bounds: { sMin: number; sMax: number; tMin: number; tMax: number };
  contours: MapContour[];
  /** central tip lines, without the parts that follow an open data edge */
  tipLines: MapPath[];
  /** the inner (5 %) and outer (95 %) tip lines */
  tipBands: MapPath[];
  /** where the line follows an open data edge: no tip was inferred there */
  openEdges: MapPath[];
  mappedLimits: MapPath[];
  peaks: MapPeak[];
  labels: { segmentId: string; s: number; t: number }[];
}

/** (s, t) of one segment's plane point in the reference frame; both frames relative to the same origin */
export function toReferenceFrame(from: DisplayFrame, reference: DisplayFrame, s: number, t: number): [number, number] {
  const [sRef, tRef] = worldToPlane(reference, ...planeToWorld(from, s, t));
  return [sRef, tRef];
}

const round = (value: number) => Math.round(value * 10) / 10;

export function buildContourMap(display: FaultDisplay): ContourMap {
  const reference = display.segments[0].frame;
  let sMin = Infinity;
  let sMax = -Infinity;
  let tMin = Infinity;
  let tMax = -Infinity;
  const widen = (s: number, t: number) => {
    if (s < sMin) sMin = s;
    if (s > sMax) sMax = s;
    if (t < tMin) tMin = t;
    if (t > tMax) tMax = t;
  };
  const contours: MapContour[] = [];
  const tipLines: MapPath[] = [];
  const tipBands: MapPath[] = [];
  const openEdges: MapPath[] = [];
  const mappedLimits: MapPath[] = [];
  const peaks: MapPeak[] = [];
  const labels: ContourMap["labels"] = [];

  for (const segment of display.segments) {
    const project = (s: number, t: number) => toReferenceFrame(segment.frame, reference, s, t);
    const ringPath = (points: ArrayLike<number>, start: number, end: number) => {
      let d = "";
      for (let i = start; i < end; i++) {
        const [s, t] = project(points[2 * i], points[2 * i + 1]);
        widen(s, t);
        d += `${i === start ? "M" : "L"}${round(s)} ${round(t)}`;
      }
      return `${d}Z`;
    };
    const polygonPath = (polygon: [number, number][]) => {
      const flat = polygon.flat();
      return polygon.length > 1 ? ringPath(flat, 0, polygon.length) : "";
    };

    const { contours: rings } = segment;
    for (let ring = 0; ring + 1 < rings.ringStarts.length; ring++) {
      contours.push({
        segmentId: segment.id,
        levelM: rings.levelsM[rings.ringLevelIndex[ring]],
        d: ringPath(rings.points, rings.ringStarts[ring], rings.ringStarts[ring + 1]),
      });
    }
    /** the edges of a closed polygon whose ends are both flagged `wanted` (1 open, 0 not), as one path */
    const edgesPath = (polygon: [number, number][], wanted: 0 | 1) => {
      let d = "";
      let drawing = false;
      for (let i = 0; i + 1 < polygon.length; i++) {
        const flags = segment.tipOpen;
        const open = flags && flags[i] === 1 && flags[i + 1] === 1 ? 1 : 0;
        if (open !== wanted) {
          drawing = false;
          continue;
        }
        const [s0, t0] = project(polygon[i][0], polygon[i][1]);
        const [s1, t1] = project(polygon[i + 1][0], polygon[i + 1][1]);
        widen(s0, t0);
        widen(s1, t1);
        d += `${drawing ? "" : `M${round(s0)} ${round(t0)}`}L${round(s1)} ${round(t1)}`;
        drawing = true;
      }
      return d;
    };
    const tip = edgesPath(segment.tipLine, 0);
    if (tip) tipLines.push({ segmentId: segment.id, d: tip });
    const open = edgesPath(segment.tipLine, 1);
    if (open) openEdges.push({ segmentId: segment.id, d: open });
    for (const band of segment.tipBand ? [segment.tipBand.inner, segment.tipBand.outer] : []) {
      const d = edgesPath(band, 0);
      if (d) tipBands.push({ segmentId: segment.id, d });
    }
    const limit = polygonPath(segment.mappedLimit);
    if (limit) mappedLimits.push({ segmentId: segment.id, d: limit });
    const [peakS, peakT] = project(segment.max.s, segment.max.t);
    peaks.push({ segmentId: segment.id, s: peakS, t: peakT, displacementM: segment.max.displacementM });
    const top = segment.tipLine.reduce((best, point) => (point[1] < best[1] ? point : best), segment.tipLine[0] ?? [0, 0]);
    const [labelS, labelT] = project(top[0], top[1]);
    labels.push({ segmentId: segment.id, s: labelS, t: labelT });
  }
  if (!Number.isFinite(sMin)) {
    sMin = tMin = -1;
    sMax = tMax = 1;
  }
  return { bounds: { sMin, sMax, tMin, tMax }, contours, tipLines, tipBands, openEdges, mappedLimits, peaks, labels };
}
