// Relay geometry in strike–normal coordinates for the relay view: tip lines and traces of two segments on their mean
// strike (u along, v across), and the along-strike ramp dip from the throw transferred over the overlap.
import { planeToWorld } from "@/lib/display/frame";
import { EDGE_TOLERANT_BILINEAR, sampleGrid } from "@/lib/display/grid-sampler";
import { rampDipDeg } from "@/lib/engine/relays";
import type { SegmentResult } from "@/lib/engine/types";
import { acrossStrike, alongStrike, commonStrikeFrame, overlapZone, tipExtent, type GridLike, type StrikeFrame } from "./profiles";

export interface RelaySketchSegment {
  id: string;
  tipLine: { u: number; v: number }[];
  /** trace at the reference elevation, inside the inferred tip line, with the gridded throw along it */
  trace: { u: number; v: number; throwM: number }[];
  extent: [number, number];
}

export interface RelaySketch {
  frame: StrikeFrame;
  referenceElevationM: number;
  segments: [RelaySketchSegment, RelaySketchSegment];
  overlap: [number, number] | null;
  /** across-strike distance between the traces at the middle of the overlap */
  separationAtMiddleM: number;
  /** throw change along each bounding segment across the overlap at the reference elevation (m) */
  throwTransferM: [number, number];
}

function traceOf(segment: SegmentResult, grid: GridLike | undefined, frame: StrikeFrame, zRef: number, samples = 120) {
  const { centroid, strikeVector, dipVector } = segment.plane;
  const { centre, semiAxes } = segment.tipLine;
  const out: { u: number; v: number; throwM: number }[] = [];
  if (Math.abs(dipVector[2]) < 1e-9) return out;
  for (let k = 0; k < samples; k++) {
    const s = centre.s - semiAxes.sM + (2 * semiAxes.sM * k) / (samples - 1);
    const t = (zRef - centroid[2] - s * strikeVector[2]) / dipVector[2];
    if (Math.hypot((s - centre.s) / semiAxes.sM, (t - centre.t) / semiAxes.tM) > 1) continue;
    const [x, y] = planeToWorld(segment.plane, s, t);
    out.push({ u: alongStrike(frame, x, y), v: acrossStrike(frame, x, y), throwM: grid ? sampleGrid(grid, grid.throwM, s, t, EDGE_TOLERANT_BILINEAR) : NaN });
  }
  return out.sort((a, b) => a.u - b.u);
}

function valueAt(trace: { u: number }[], values: number[], u: number): number {
  let best = NaN;
  let bestDistance = Infinity;
  trace.forEach((p, k) => {
    const distance = Math.abs(p.u - u);
    if (distance < bestDistance && Number.isFinite(values[k])) {
      bestDistance = distance;
      best = values[k];
    }
  });
  return best;
}

export function relaySketch(a: SegmentResult, b: SegmentResult, gridA?: GridLike, gridB?: GridLike): RelaySketch {
  const frame = commonStrikeFrame([a, b]);
  const zRef = (a.plane.centroid[2] + b.plane.centroid[2]) / 2;
  const make = (segment: SegmentResult, grid?: GridLike): RelaySketchSegment => ({
    id: segment.id,
    tipLine: segment.tipLine.worldPolygon.map(([x, y]) => ({ u: alongStrike(frame, x, y), v: acrossStrike(frame, x, y) })),
    trace: traceOf(segment, grid, frame, zRef),
    extent: tipExtent(segment, frame),
  });
  const sa = make(a, gridA);
  const sb = make(b, gridB);
  const overlap = overlapZone(sa.extent, sb.extent);
  let separationAtMiddleM = NaN;
  const throwTransferM: [number, number] = [NaN, NaN];
  if (overlap) {
    const middle = (overlap[0] + overlap[1]) / 2;
    separationAtMiddleM = Math.abs(
      valueAt(
        sa.trace,
        sa.trace.map((p) => p.v),
        middle,
      ) -
        valueAt(
          sb.trace,
          sb.trace.map((p) => p.v),
          middle,
        ),
    );
    [sa, sb].forEach((segment, i) => {
      const throws = segment.trace.map((p) => p.throwM);
      // an overlap end that is this segment's own inferred tip has zero throw by definition; elsewhere read the grid
      const at = (u: number) => (Math.abs(u - segment.extent[0]) < 1 || Math.abs(u - segment.extent[1]) < 1 ? 0 : valueAt(segment.trace, throws, u));
      throwTransferM[i] = Math.abs(at(overlap[0]) - at(overlap[1]));
    });
  }
  return { frame, referenceElevationM: zRef, segments: [sa, sb], overlap, separationAtMiddleM, throwTransferM };
}

export interface HorizonRampDip {
  horizon: string;
  /** largest throw change along either bounding segment across the overlap on this horizon (m) */
  throwTransferM: number;
  dipDeg: number;
  flag: "ok" | "approaching breaching" | "breaching likely";
}

/**
 * Along-strike ramp dip per horizon, ψ = atan(ΔT/O), from horizon picks binned along strike (lib/views/growth.ts):
 * ΔT is the throw change of a bounding segment between the two overlap ends on that horizon (zero at the segment's own
 * inferred tip, otherwise the nearest bin). Geometry after Peacock & Sanderson (1991); ~10–15° breaching onset after
 * Fossen & Rotevatn (2016).
 */
export function horizonRampDips(
  a: SegmentResult,
  b: SegmentResult,
  bins: { segment: string; horizon: string; s: number; z: number; throwM: number }[],
): HorizonRampDip[] {
  const frame = commonStrikeFrame([a, b]);
  const extents = [tipExtent(a, frame), tipExtent(b, frame)];
  const overlap = overlapZone(extents[0], extents[1]);
  if (!overlap) return [];
  const horizons = [...new Set(bins.filter((bin) => bin.segment === a.id).map((bin) => bin.horizon))].filter((h) =>
    bins.some((bin) => bin.segment === b.id && bin.horizon === h),
  );
  const out: HorizonRampDip[] = [];
  for (const horizon of horizons) {
    let transfer = NaN;
    [a, b].forEach((segment, i) => {
      const { centroid, strikeVector, dipVector } = segment.plane;
      const placed = bins
        .filter((bin) => bin.segment === segment.id && bin.horizon === horizon)
        .map((bin) => {
          const t = Math.abs(dipVector[2]) > 1e-9 ? (bin.z - centroid[2] - bin.s * strikeVector[2]) / dipVector[2] : 0;
          const [x, y] = planeToWorld(segment.plane, bin.s, t);
          return { u: alongStrike(frame, x, y), throwM: bin.throwM };
        });
      if (placed.length === 0) return;
      const at = (u: number) => {
        if (Math.abs(u - extents[i][0]) < 1 || Math.abs(u - extents[i][1]) < 1) return 0;
        let best = placed[0];
        for (const p of placed) if (Math.abs(p.u - u) < Math.abs(best.u - u)) best = p;
        return best.throwM;
      };
      const change = Math.abs(at(overlap[0]) - at(overlap[1]));
      transfer = Number.isNaN(transfer) ? change : Math.max(transfer, change);
    });
    if (Number.isNaN(transfer)) continue;
    out.push({ horizon, throwTransferM: transfer, ...rampDipDeg(transfer, overlap[1] - overlap[0]) });
  }
  return out;
}
