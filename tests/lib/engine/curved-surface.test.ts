import { describe, expect, it } from "vitest";
import { analyzePicks } from "@/lib/engine/pipeline";
import { alongSurface } from "@/lib/engine/fault-surface";
import { sampleGrid, STRICT_BILINEAR } from "@/lib/display/grid-sampler";
import type { SegmentResult } from "@/lib/engine/types";
import { CORRUGATED, LISTRIC, curvedFaultPicks, type CurvedFault } from "./curved-faults";

// The curved faults are built in tests/engine/curved-faults.ts: a circular-arc listric fault (dip 68° → 38°) and a
// plane with a sine corrugation along strike, each carrying a symmetric elliptical-crack displacement field
// (Pollard & Segall 1987) laid out along the surface, picks scattered 2 m off the surface.

function planeCoordinates(plane: SegmentResult["plane"], p: readonly number[]): [number, number] {
  const d = [p[0] - plane.centroid[0], p[1] - plane.centroid[1], p[2] - plane.centroid[2]];
  const dot = (v: readonly number[]) => d[0] * v[0] + d[1] * v[1] + d[2] * v[2];
  return [dot(plane.strikeVector), dot(plane.dipVector)];
}

function analyse(fault: CurvedFault) {
  const made = curvedFaultPicks(fault);
  const result = analyzePicks(made.picks);
  return { ...made, result, segment: result.report.segments[0] };
}

describe.each([
  ["listric (circular arc, dip 68° to 38°)", LISTRIC],
  ["corrugated (sine undulation along strike)", CORRUGATED],
])("the true surface of a %s fault", (_name, fault) => {
  const { truth, truePositions, result, segment } = analyse(fault);
  const { plane } = segment;
  const surface = segment.surface!;

  it("recovers the surface's offset from the reference plane within 10 % (largest and RMS)", () => {
    // truth: the distance of the picks' true positions (before scatter) from the plane the analysis fitted
    let max = 0,
      squares = 0;
    for (const p of truePositions) {
      const w = (p[0] - plane.centroid[0]) * plane.normal[0] + (p[1] - plane.centroid[1]) * plane.normal[1] + (p[2] - plane.centroid[2]) * plane.normal[2];
      max = Math.max(max, Math.abs(w));
      squares += w * w;
    }
    const rms = Math.sqrt(squares / truePositions.length);
    expect(max).toBeGreaterThan(40);
    expect(Math.abs(surface.maxOffsetM / max - 1)).toBeLessThan(0.1);
    expect(Math.abs(surface.rmsOffsetM / rms - 1)).toBeLessThan(0.1);
    expect(surface.matters).toBe(true);
    expect(surface.note).toMatch(/departs from its reference plane by up to/);
  });

  it("reads the local dip at sample nodes within 1.5°", () => {
    const grid = result.grids.main;
    let checked = 0;
    for (const fu of [-0.6, -0.3, 0, 0.3, 0.6]) {
      for (const fv of [-0.6, -0.3, 0, 0.3, 0.6]) {
        const [s, t] = planeCoordinates(plane, truth.point(fu * fault.a, fv * fault.b));
        const estimate = sampleGrid(grid, grid.localDipDeg!, s, t, STRICT_BILINEAR);
        expect(Number.isFinite(estimate)).toBe(true);
        expect(Math.abs(estimate - truth.dipDeg(fu * fault.a, fv * fault.b))).toBeLessThan(1.5);
        checked++;
      }
    }
    expect(checked).toBe(25);
  });

  it("measures L and H along the surface within 3 % of the arc-length truth", () => {
    expect(Math.abs(segment.tipLine.lengthM / (2 * fault.a) - 1)).toBeLessThan(0.03);
    expect(Math.abs(segment.tipLine.heightM / (2 * fault.b) - 1)).toBeLessThan(0.03);
    expect(segment.tipLine.aspectRatio).toBeCloseTo(segment.tipLine.lengthM / segment.tipLine.heightM, 9);
  });

  it("keeps a symmetric displacement field symmetric: the displacement centroid within 2 % of H of the truth", () => {
    const [s0, t0] = planeCoordinates(plane, truth.point(0, 0));
    const { u, v } = alongSurface(result.surfaces.main, s0, t0, segment.centroidOfDisplacement.s, segment.centroidOfDisplacement.t);
    expect(Math.abs(v)).toBeLessThan(0.02 * 2 * fault.b);
    expect(Math.abs(u)).toBeLessThan(0.02 * 2 * fault.a);
  });

  it("puts the tip line and the maximum on the surface, not on the plane", () => {
    for (const [x, y, z] of [segment.tipLine.worldPolygon[0], [segment.max.x, segment.max.y, segment.max.z]]) {
      const w = (x - plane.centroid[0]) * plane.normal[0] + (y - plane.centroid[1]) * plane.normal[1] + (z - plane.centroid[2]) * plane.normal[2];
      const [s, t] = planeCoordinates(plane, [x, y, z]);
      // the surface's own offset there, from the report's coarse copy of the surface
      const g = surface.grid;
      const gx = Math.min(Math.max((s - g.s0) / g.cellM, 0), g.columns - 1),
        gy = Math.min(Math.max((t - g.t0) / g.cellM, 0), g.rows - 1);
      const nearest = g.offsetM[Math.round(gy) * g.columns + Math.round(gx)];
      expect(Math.abs(w - nearest)).toBeLessThan(Math.max(1, 0.05 * surface.maxOffsetM));
    }
  });
});

describe("the listric check can tell", () => {
  it("dividing throw by the plane's one dip moves the displacement centroid of the symmetric field up dip by ~2 % of H; the local dip keeps it within 0.5 %", () => {
    // the failure the local dip fixes, measured on the same picks: the centroid along the true dip coordinate v,
    // weighted by displacement from the plane's dip, against weights from the true local dip (common practice, no source)
    const { picks, truth, truePositions, segment } = analyse(LISTRIC);
    const sinPlane = Math.sin((segment.plane.dipDeg * Math.PI) / 180);
    // the true v of each pick from its position: v is the arc length down the circular profile from the centre, found
    // by bisection on the depth of the truth's profile (depth falls monotonically down the fault)
    const depthOf = (v: number) => truth.point(0, v)[2];
    const vOf = (z: number) => {
      let lo = -LISTRIC.b * 1.2,
        hi = LISTRIC.b * 1.2;
      for (let k = 0; k < 60; k++) {
        const mid = (lo + hi) / 2;
        if (depthOf(mid) > z) lo = mid;
        else hi = mid;
      }
      return (lo + hi) / 2;
    };
    let plainWeight = 0,
      plainSum = 0,
      localWeight = 0,
      localSum = 0;
    truePositions.forEach((p, i) => {
      const v = vOf(p[2]);
      const byPlane = picks.throwM[i] / sinPlane;
      const byLocal = picks.throwM[i] / Math.sin((truth.dipDeg(0, v) * Math.PI) / 180);
      plainWeight += byPlane;
      plainSum += byPlane * v;
      localWeight += byLocal;
      localSum += byLocal * v;
    });
    const height = 2 * LISTRIC.b;
    expect(Math.abs(localSum / localWeight)).toBeLessThan(0.005 * height);
    // up dip is −v: the steep top is overweighted by the plane's gentler mean dip
    expect(plainSum / plainWeight).toBeLessThan(-0.015 * height);
  });
});
