import Delaunator from "delaunator";
import { describe, expect, it } from "vitest";
import path from "node:path";
import { triangulate } from "@/lib/engine/triangulate";
import { rasterizeTriangles, gridSpecFor } from "@/lib/engine/grid";
import { sampleGrid, STRICT_BILINEAR } from "@/lib/display/grid-sampler";
import { mulberry32 } from "@/lib/engine/synthetic";
import { runPythonOracle } from "../../support/python";

describe("linear interpolation on triangles", () => {
  // tiny exact case, by hand: two triangles over the unit square with v = 2s + 3t + 1 (a plane is reproduced exactly)
  it("two triangles reproduce a plane and leave nodes outside as NaN", () => {
    const s = Float64Array.from([0, 2, 0, 2]);
    const t = Float64Array.from([0, 0, 2, 2]);
    const v = Float64Array.from(s, (x, i) => 2 * x + 3 * t[i] + 1);
    const tri = triangulate(s, t, { removeSlivers: false });
    expect(tri.triangles.length).toBe(6);
    const [out] = rasterizeTriangles(s, t, [v], tri.triangles, { s0: 0, t0: 0, cellM: 1, columns: 4, rows: 3 });
    // 3×3 nodes inside, one column beyond the data
    for (let j = 0; j < 3; j++) {
      for (let i = 0; i < 3; i++) expect(out[j * 4 + i]).toBeCloseTo(2 * i + 3 * j + 1, 12);
      expect(Number.isNaN(out[j * 4 + 3])).toBe(true);
    }
  });

  // a 3×3 grid of picks: the grid at pick positions honours the data exactly (docs/check-values.md I1, 1e-9 relative)
  it("honours the picks on a 3×3 layout", () => {
    const s: number[] = [],
      t: number[] = [],
      v: number[] = [];
    for (let j = 0; j < 3; j++)
      for (let i = 0; i < 3; i++) {
        s.push(i * 10);
        t.push(j * 10);
        v.push((i - 1) ** 2 + j * 7);
      }
    const S = Float64Array.from(s),
      T = Float64Array.from(t);
    const tri = triangulate(S, T, { removeSlivers: false });
    const [out] = rasterizeTriangles(S, T, [v], tri.triangles, { s0: 0, t0: 0, cellM: 10, columns: 3, rows: 3 });
    for (let k = 0; k < 9; k++) expect(out[k]).toBeCloseTo(v[k], 9);
  });

  it("default cell follows point spacing and respects the gridCells cap", () => {
    const s = Float64Array.from([0, 1000, 0, 1000]);
    const t = Float64Array.from([0, 0, 500, 500]);
    const spec = gridSpecFor(s, t, 100);
    expect(spec.cellM).toBe(50);
    expect(spec.columns).toBe(21);
    expect(spec.rows).toBe(11);
    const capped = gridSpecFor(s, t, 1, { gridCells: 64 });
    expect(Math.max(capped.columns, capped.rows)).toBeLessThanOrEqual(64);
  });

  // docs/check-values.md I2; independent oracle: scipy.interpolate.griddata(method="linear") (Qhull Delaunay), run in the resolved Python (tests/support/python.ts)
  it("matches scipy griddata(linear) within 1e-6 of the range inside the hull", () => {
    const rand = mulberry32(42);
    const n = 400;
    const s = Float64Array.from({ length: n }, () => rand() * 1000);
    const t = Float64Array.from({ length: n }, () => rand() * 600);
    const v = Float64Array.from(s, (x, i) => 50 * Math.sin(x / 150) + 0.05 * t[i] ** 1.3 + 20 * rand());
    const tri = triangulate(s, t, { removeSlivers: false });
    const spec = { s0: 0, t0: 0, cellM: 7.3, columns: 137, rows: 83 };
    const [out] = rasterizeTriangles(s, t, [v], tri.triangles, spec);
    const nodes: [number, number][] = [];
    for (let j = 0; j < spec.rows; j++) for (let i = 0; i < spec.columns; i++) nodes.push([spec.s0 + i * spec.cellM, spec.t0 + j * spec.cellM]);
    const ref = runPythonOracle<(number | null)[]>(path.join(__dirname, "griddata_oracle.py"), {
      points: Array.from(s, (x, i) => [x, t[i]]),
      values: Array.from(v),
      nodes,
    });
    let lo = Infinity,
      hi = -Infinity;
    for (const x of v) {
      lo = Math.min(lo, x);
      hi = Math.max(hi, x);
    }
    // the convex hull of the points (delaunator's hull, counter-clockwise): both sides triangulate exactly this region
    const hull = Array.from(new Delaunator(Array.from(s, (x, i) => [x, t[i]]).flat()).hull, (i) => [s[i], t[i]]);
    const distanceToHull = (px: number, py: number) => {
      let best = Infinity;
      hull.forEach(([ax, ay], i) => {
        const [bx, by] = hull[(i + 1) % hull.length];
        const f = Math.max(0, Math.min(1, ((px - ax) * (bx - ax) + (py - ay) * (by - ay)) / ((bx - ax) ** 2 + (by - ay) ** 2)));
        best = Math.min(best, Math.hypot(px - ax - f * (bx - ax), py - ay - f * (by - ay)));
      });
      return best;
    };
    let worst = 0,
      compared = 0,
      mismatchFarFromHull = 0;
    ref.forEach((r, k) => {
      const mine = out[k];
      if (r === null || Number.isNaN(mine)) {
        // a node on the hull's edge is inside for one side's rounding and outside for the other's: a disagreement
        // about NaN is allowed only within 1e-9 of the range (1 µm here) of the hull, nowhere else
        if ((r === null) !== Number.isNaN(mine) && distanceToHull(nodes[k][0], nodes[k][1]) > 1e-9 * 1000) mismatchFarFromHull++;
        return;
      }
      compared++;
      worst = Math.max(worst, Math.abs(mine - r));
    });
    expect(compared).toBeGreaterThan(5000);
    expect(mismatchFarFromHull).toBe(0);
    // 1e-6 of the value range: double-precision barycentric weights from two different triangulation codes
    expect(worst).toBeLessThan(1e-6 * (hi - lo));
  });

  it("bilinear sampling of a grid reproduces a plane", () => {
    const spec = { s0: 0, t0: 0, cellM: 2, columns: 3, rows: 3 };
    const field = Float64Array.from({ length: 9 }, (_, k) => (k % 3) * 2 + Math.floor(k / 3) * 4);
    expect(sampleGrid(spec, field, 1, 3, STRICT_BILINEAR)).toBeCloseTo(1 + 6, 12);
    expect(Number.isNaN(sampleGrid(spec, field, 5, 1, STRICT_BILINEAR))).toBe(true);
  });
});

describe("hull sliver removal", () => {
  // common practice, no source: long thin triangles bridging a concave outline are peeled
  it("removes triangles bridging the notch of an L-shaped pick layout", () => {
    const s: number[] = [],
      t: number[] = [];
    for (let j = 0; j <= 20; j++)
      for (let i = 0; i <= 20; i++)
        if (i <= 5 || j <= 5) {
          s.push(i * 10 + (j % 2) * 0.01);
          t.push(j * 10);
        }
    const S = Float64Array.from(s),
      T = Float64Array.from(t);
    const all = triangulate(S, T, { removeSlivers: false });
    const peeled = triangulate(S, T);
    expect(peeled.removedSlivers).toBeGreaterThan(0);
    expect(peeled.triangles.length).toBeLessThan(all.triangles.length);
    // no kept triangle has an edge longer than 3 × the median edge
    for (let k = 0; k < peeled.triangles.length; k += 3) {
      const a = peeled.triangles[k],
        b = peeled.triangles[k + 1],
        c = peeled.triangles[k + 2];
      const e = Math.max(Math.hypot(S[a] - S[b], T[a] - T[b]), Math.hypot(S[b] - S[c], T[b] - T[c]), Math.hypot(S[c] - S[a], T[c] - T[a]));
      expect(e).toBeLessThanOrEqual(3 * peeled.medianEdgeM);
    }
  });
});
