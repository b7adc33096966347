// A strike projection of a whole fault: every segment's contours, tip line, mapped limit and peak projected onto one
// vertical plane along the fault's mean strike, as distance along strike (m) against depth below datum (m). Several
// segments then sit side by side as they do in the ground, instead of each in its own plane coordinates (common
// practice for fault-zone displacement maps, no single source). Pure: report in, plot rows out.
import { planeToWorld } from "@/lib/display/frame";
import type { AnalysisReport } from "@/lib/engine/types";
import { alongStrike, commonStrikeFrame, type StrikeFrame } from "./profiles";

export interface ProjectedPoint {
  /** distance along the mean strike from the first segment's centre, m */
  u: number;
  /** depth below datum (−z), m */
  depthM: number;
}

export interface StrikeProjection {
  frame: StrikeFrame;
  /** azimuth of the mean strike, degrees clockwise from north (0–360) */
  strikeAzimuthDeg: number;
  /** one row per vertex; `line` groups a ring, `levelM` its displacement */
  contours: (ProjectedPoint & { line: string; levelM: number; segment: string })[];
  tipLines: (ProjectedPoint & { segment: string })[];
  mappedLimits: (ProjectedPoint & { segment: string })[];
  peaks: (ProjectedPoint & { segment: string; displacementM: number })[];
}

export function strikeProjection(report: Pick<AnalysisReport, "segments">): StrikeProjection {
  const frame = commonStrikeFrame(report.segments);
  const project = (plane: AnalysisReport["segments"][number]["plane"], s: number, t: number): ProjectedPoint => {
    const [x, y, z] = planeToWorld(plane, s, t);
    return { u: alongStrike(frame, x, y), depthM: -z };
  };
  const out: StrikeProjection = {
    frame,
    strikeAzimuthDeg: ((Math.atan2(frame.strike[0], frame.strike[1]) * 180) / Math.PI + 360) % 360,
    contours: [],
    tipLines: [],
    mappedLimits: [],
    peaks: [],
  };
  for (const segment of report.segments) {
    segment.contours.forEach((level, levelIndex) =>
      level.rings.forEach((ring, ringIndex) => {
        for (const [s, t] of ring)
          out.contours.push({ ...project(segment.plane, s, t), line: `${segment.id}-${levelIndex}-${ringIndex}`, levelM: level.levelM, segment: segment.id });
      }),
    );
    for (const [s, t] of closed(segment.tipLine.polygon)) out.tipLines.push({ ...project(segment.plane, s, t), segment: segment.id });
    for (const [s, t] of closed(segment.mappedLimit.polygon)) out.mappedLimits.push({ ...project(segment.plane, s, t), segment: segment.id });
    out.peaks.push({ ...project(segment.plane, segment.max.s, segment.max.t), segment: segment.id, displacementM: segment.max.displacementM });
  }
  return out;
}

function closed(polygon: [number, number][]): [number, number][] {
  if (polygon.length < 2) return polygon;
  const [first, last] = [polygon[0], polygon[polygon.length - 1]];
  return first[0] === last[0] && first[1] === last[1] ? polygon : [...polygon, first];
}
