import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { triangulate } from "@/lib/engine/triangulate";
import { rasterizeTriangles, gridSpecFor } from "@/lib/engine/grid";
import { analyzePicks } from "@/lib/engine/pipeline";
import { generateSyntheticPicks, mulberry32 } from "@/lib/engine/synthetic";
import type { PickColumns } from "@/lib/engine/types";

// properties of linear interpolation on triangles (common practice, no source): a convex combination of the
// data never leaves the data range; the result does not depend on row order; lengths scale with coordinates.
const cloud = fc.array(
  fc.tuple(fc.double({ min: 0, max: 1000, noNaN: true }), fc.double({ min: 0, max: 1000, noNaN: true }), fc.double({ min: -50, max: 200, noNaN: true })),
  { minLength: 4, maxLength: 60 },
);

function permute(p: PickColumns, order: number[]): PickColumns {
  const pick = <T extends Float64Array | Uint32Array | Int32Array>(a: T): T => {
    const out = new (a.constructor as new (n: number) => T)(a.length);
    order.forEach((src, k) => (out[k] = a[src]));
    return out;
  };
  return {
    ...p,
    x: pick(p.x),
    y: pick(p.y),
    z: pick(p.z),
    throwM: pick(p.throwM),
    heaveM: pick(p.heaveM),
    quality: pick(p.quality),
    segment: pick(p.segment),
    horizon: pick(p.horizon),
    sourceRow: pick(p.sourceRow),
  };
}

describe("properties", () => {
  it("the grid never exceeds the data range", () => {
    fc.assert(
      fc.property(cloud, (pts) => {
        const s = Float64Array.from(pts, (p) => p[0]);
        const t = Float64Array.from(pts, (p) => p[1]);
        const v = Float64Array.from(pts, (p) => p[2]);
        const tri = triangulate(s, t);
        const spec = gridSpecFor(s, t, tri.medianEdgeM || 10, { gridCells: 64 });
        const [g] = rasterizeTriangles(s, t, [v], tri.triangles, spec);
        const lo = Math.min(...v),
          hi = Math.max(...v);
        const tol = 1e-9 * Math.max(1, Math.abs(lo), Math.abs(hi));
        for (const x of g)
          if (!Number.isNaN(x)) {
            expect(x).toBeGreaterThanOrEqual(lo - tol);
            expect(x).toBeLessThanOrEqual(hi + tol);
          }
      }),
      { numRuns: 40, seed: 1 },
    );
  });

  it("permuting rows changes nothing", () => {
    const { picks } = generateSyntheticPicks({ seed: 3, pickCount: 500, halfLengthM: 800, dmaxM: 50, throwCutoffM: 6, noiseM: 1 });
    const base = analyzePicks(picks);
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1_000_000 }), (seed) => {
        const rand = mulberry32(seed);
        const order = Array.from({ length: picks.x.length }, (_, i) => i);
        for (let i = order.length - 1; i > 0; i--) {
          const j = Math.floor(rand() * (i + 1));
          [order[i], order[j]] = [order[j], order[i]];
        }
        const other = analyzePicks(permute(picks, order));
        const a = base.report.segments[0],
          b = other.report.segments[0];
        expect(b.plane.strikeDeg).toBeCloseTo(a.plane.strikeDeg, 9);
        expect(b.max.displacementM).toBeCloseTo(a.max.displacementM, 9);
        expect(b.mappedLimit.lengthM).toBeCloseTo(a.mappedLimit.lengthM, 6);
        expect(b.tipLine.lengthM / a.tipLine.lengthM).toBeCloseTo(1, 3);
        expect(b.tipLine.heightM / a.tipLine.heightM).toBeCloseTo(1, 3);
        const ga = base.grids.main.displacementM,
          gb = other.grids.main.displacementM;
        let worst = 0;
        for (let k = 0; k < ga.length; k++) if (!Number.isNaN(ga[k]) && !Number.isNaN(gb[k])) worst = Math.max(worst, Math.abs(ga[k] - gb[k]));
        expect(worst).toBeLessThan(1e-9);
      }),
      { numRuns: 3, seed: 2 },
    );
  });

  it("scaling coordinates and throws scales lengths", () => {
    const { picks } = generateSyntheticPicks({ seed: 9, pickCount: 500, halfLengthM: 800, dmaxM: 50, throwCutoffM: 6, noiseM: 1, centre: [0, 0, -1000] });
    const base = analyzePicks(picks).report.segments[0];
    fc.assert(
      fc.property(fc.double({ min: 0.2, max: 20, noNaN: true }), (k) => {
        const scaled: PickColumns = {
          ...picks,
          x: picks.x.map((v) => v * k),
          y: picks.y.map((v) => v * k),
          z: picks.z.map((v) => v * k),
          throwM: picks.throwM.map((v) => v * k),
        };
        const seg = analyzePicks(scaled).report.segments[0];
        expect(seg.plane.dipDeg).toBeCloseTo(base.plane.dipDeg, 6);
        expect(seg.mappedLimit.lengthM / (k * base.mappedLimit.lengthM)).toBeCloseTo(1, 9);
        expect(seg.max.displacementM / (k * base.max.displacementM)).toBeCloseTo(1, 9);
        expect(seg.tipLine.lengthM / (k * base.tipLine.lengthM)).toBeCloseTo(1, 3);
        expect(seg.tipLine.heightM / (k * base.tipLine.heightM)).toBeCloseTo(1, 3);
      }),
      { numRuns: 4, seed: 3 },
    );
  });
});
