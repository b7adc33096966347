// Measures of a segment taken along its true surface rather than on the reference plane: the tip line's length, height
// and area as arc lengths (the tip-line fits themselves run in plane coordinates and are not changed), the displacement
// centroid weighted by surface area, where Dmax sits between the ends, and how far the surface departs from the plane.
import type { GridSpec } from "@/lib/display/grid-sampler";
import { extentAlongSurface, alongSurface, meanAreaStretch, reportSurfaceGrid, surfacePoint, type SurfaceModel } from "./fault-surface";
import type { PlaneFit, SurfaceSummary, TipLine } from "./types";
import { extents, ringArea } from "./tipline";

type Frame = Pick<PlaneFit, "centroid" | "strikeVector" | "dipVector" | "normal">;

/** Above this change of displacement or size, the surface's departure from its plane is said to matter (common practice, no source). */
export const SURFACE_MATTERS_FRACTION = 0.05;

/**
 * The tip line with its size measured along the surface: length and height are the arc-length extents of the central
 * line (from its centre), the 5–95 % ranges are the plane ranges scaled by the central line's arc-to-plane ratio and
 * widened to hold the inner and outer lines' own arc-length extents, the area is the plane area times the mean area
 * stretch inside it, and the world polygons lie on the surface. Returns the plane (projected) length and height too.
 */
export function tipLineOnSurface(tip: TipLine, model: SurfaceModel, frame: Frame): { tipLine: TipLine; projected: { lengthM: number; heightM: number } } {
  const { centre } = tip;
  const along = (polygon: [number, number][]) => extentAlongSurface(model, polygon, centre.s, centre.t);
  const central = along(tip.polygon);
  const inner = along(tip.innerPolygon);
  const outer = along(tip.outerPolygon);
  const projected = extents(tip.polygon);
  const lengthScale = projected.lengthM > 0 ? central.lengthM / projected.lengthM : 1;
  const heightScale = projected.heightM > 0 ? central.heightM / projected.heightM : 1;
  const range = ([low, high]: [number, number | null], scale: number, c: number, i: number, o: number): [number, number | null] => [
    Math.min(low * scale, c, i),
    high === null ? null : Math.max(high * scale, c, o),
  ];
  const lengthRangeM = range(tip.lengthRangeM, lengthScale, central.lengthM, inner.lengthM, outer.lengthM);
  const heightRangeM = range(tip.heightRangeM, heightScale, central.heightM, inner.heightM, outer.heightM);
  const world = (polygon: [number, number][]) => polygon.map(([s, t]) => surfacePoint(model, frame, s, t));
  return {
    tipLine: {
      ...tip,
      lengthM: central.lengthM,
      heightM: central.heightM,
      lengthRangeM,
      heightRangeM,
      aspectRatio: central.lengthM / central.heightM,
      areaM2: ringArea(tip.polygon) * meanAreaStretch(model, tip.polygon),
      uncertaintyM: Math.max((lengthRangeM[1] ?? central.lengthM) - lengthRangeM[0], (heightRangeM[1] ?? central.heightM) - heightRangeM[0]) / 2,
      worldPolygon: world(tip.polygon),
      innerWorldPolygon: world(tip.innerPolygon),
      outerWorldPolygon: world(tip.outerPolygon),
    },
    projected: { lengthM: projected.lengthM, heightM: projected.heightM },
  };
}

/** Where (s, t) sits between a polygon's ends along the surface, from its middle: 0 in the middle, ±1 at an end. */
export function asymmetryAlongSurface(
  model: SurfaceModel,
  polygon: [number, number][],
  centre: { s: number; t: number },
  s: number,
  t: number,
): { alongStrike: number; downDip: number } {
  const extents = extentAlongSurface(model, polygon, centre.s, centre.t);
  const { u, v } = alongSurface(model, centre.s, centre.t, s, t);
  return {
    alongStrike: (u - (extents.minU + extents.maxU) / 2) / (extents.lengthM / 2),
    downDip: (v - (extents.minV + extents.maxV) / 2) / (extents.heightM / 2),
  };
}

/** Displacement-weighted centroid (s, t) of a grid, each node weighted by its displacement times its surface area. */
export function surfaceCentroid(spec: GridSpec, displacementM: ArrayLike<number>, areaStretch: ArrayLike<number>): { s: number; t: number } {
  let w = 0,
    ws = 0,
    wt = 0;
  for (let j = 0; j < spec.rows; j++) {
    for (let i = 0; i < spec.columns; i++) {
      const k = j * spec.columns + i;
      const d = displacementM[k];
      if (!(d > 0)) continue;
      const weight = d * (Number.isFinite(areaStretch[k]) ? areaStretch[k] : 1);
      w += weight;
      ws += weight * (spec.s0 + i * spec.cellM);
      wt += weight * (spec.t0 + j * spec.cellM);
    }
  }
  return w > 0 ? { s: ws / w, t: wt / w } : { s: NaN, t: NaN };
}

/** The q-quantile of the finite values (linear between order statistics); NaN when there are none. */
function quantile(values: number[], q: number): number {
  if (!values.length) return NaN;
  const sorted = values.slice().sort((a, b) => a - b);
  const position = q * (sorted.length - 1);
  const lo = Math.floor(position),
    hi = Math.ceil(position);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (position - lo);
}

/**
 * How far the surface departs from the reference plane over the mapped area (nodes with data), what that does to
 * displacement (ratio of local-dip to plane-dip displacement, sin δ_plane / sin δ_local) and to the tip line's size,
 * and a sentence saying whether it matters.
 */
export function surfaceSummary(
  model: SurfaceModel,
  grid: GridSpec & { displacementM: ArrayLike<number>; offPlaneM: ArrayLike<number>; localDipDeg: ArrayLike<number> },
  planeDipDeg: number,
  tip: { lengthM: number; heightM: number; outerPolygon: [number, number][] },
  projected: { lengthM: number; heightM: number },
): SurfaceSummary {
  let maxOffsetM = 0,
    sumSquares = 0,
    count = 0;
  const dips: number[] = [];
  const ratios: number[] = [];
  const sinPlane = Math.sin((planeDipDeg * Math.PI) / 180);
  // every node would be slow to sort on a 512² grid: a regular sample of at most ~40,000 for the percentiles
  const n = grid.columns * grid.rows;
  const stride = Math.max(1, Math.floor(n / 40_000));
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(grid.displacementM[k]) || !Number.isFinite(grid.offPlaneM[k])) continue;
    const w = grid.offPlaneM[k];
    maxOffsetM = Math.max(maxOffsetM, Math.abs(w));
    sumSquares += w * w;
    count++;
    if (k % stride === 0 && Number.isFinite(grid.localDipDeg[k])) {
      dips.push(grid.localDipDeg[k]);
      ratios.push(sinPlane / Math.sin((grid.localDipDeg[k] * Math.PI) / 180));
    }
  }
  const rmsOffsetM = count ? Math.sqrt(sumSquares / count) : 0;
  const localDipRangeDeg: [number, number] = [quantile(dips, 0.05), quantile(dips, 0.95)];
  const displacementRatioRange: [number, number] = [quantile(ratios, 0.05), quantile(ratios, 0.95)];
  const displacementChange = Math.max(Math.abs(displacementRatioRange[0] - 1), Math.abs(displacementRatioRange[1] - 1));
  const lengthChange = projected.lengthM > 0 ? tip.lengthM / projected.lengthM - 1 : 0;
  const heightChange = projected.heightM > 0 ? tip.heightM / projected.heightM - 1 : 0;
  const matters =
    displacementChange > SURFACE_MATTERS_FRACTION ||
    Math.abs(lengthChange) > SURFACE_MATTERS_FRACTION / 2 ||
    Math.abs(heightChange) > SURFACE_MATTERS_FRACTION / 2;
  const m = (v: number) => `${v.toFixed(v < 10 ? 1 : 0)} m`;
  const deg = (v: number) => `${v.toFixed(0)}°`;
  const percent = (v: number) => `${Math.round(100 * Math.abs(v))} %`;
  const note = matters
    ? `The fault surface departs from its reference plane by up to ${m(maxOffsetM)} (RMS ${m(rmsOffsetM)}): its local dip runs from ${deg(localDipRangeDeg[0])} to ${deg(localDipRangeDeg[1])} (5–95 % of the mapped area) against the plane's ${deg(planeDipDeg)}, so throw divided by the plane's dip would misstate displacement by up to ${percent(displacementChange)}. Displacement here uses the local dip, and L and H are measured along the surface (on the plane they would read ${m(projected.lengthM)} and ${m(projected.heightM)}).`
    : `The fault surface stays within ${m(maxOffsetM)} of its reference plane (RMS ${m(rmsOffsetM)}; local dip ${deg(localDipRangeDeg[0])}–${deg(localDipRangeDeg[1])}): the plane describes it well, and displacement from the local dip is within ${percent(displacementChange)} of that from the plane's dip.`;
  // the coarse copy covers the data and the outer tip line, a cell beyond
  let minS = grid.s0,
    maxS = grid.s0 + (grid.columns - 1) * grid.cellM,
    minT = grid.t0,
    maxT = grid.t0 + (grid.rows - 1) * grid.cellM;
  for (const [s, t] of tip.outerPolygon) {
    minS = Math.min(minS, s);
    maxS = Math.max(maxS, s);
    minT = Math.min(minT, t);
    maxT = Math.max(maxT, t);
  }
  const margin = model.spec.cellM;
  return {
    maxOffsetM,
    rmsOffsetM,
    lengthScaleM: model.lengthScaleM,
    localDipRangeDeg,
    displacementRatioRange,
    projectedLengthM: projected.lengthM,
    projectedHeightM: projected.heightM,
    matters,
    note,
    grid: reportSurfaceGrid(model, minS - margin, maxS + margin, minT - margin, maxT + margin),
  };
}
