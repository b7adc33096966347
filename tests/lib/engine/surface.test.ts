import path from "node:path";
import { describe, expect, it } from "vitest";
import { fitPlane } from "@/lib/engine/plane";
import { projectToPlane } from "@/lib/display/frame";
import { triangulate } from "@/lib/engine/triangulate";
import { gridSpecFor } from "@/lib/engine/grid";
import { mulberry32 } from "@/lib/engine/synthetic";
import { effectivePickCount, localPolynomialFit, offPlaneGrid, orientationOfNormal, slopeScatterDeg, smoothGrid, surfaceNormal } from "@/lib/engine/surface";
import { planeNormal } from "@/lib/stress/tensor";
import { runPythonOracle } from "../../support/python";

const RAD = Math.PI / 180;

/** A 30 × 20 grid, cell 10 m, holding f(s, t) with a rectangular hole and a ragged right edge (NaN). */
function holedField(f: (s: number, t: number) => number) {
  const spec = { s0: 0, t0: 0, cellM: 10, columns: 30, rows: 20 };
  const field = new Float64Array(spec.columns * spec.rows);
  for (let j = 0; j < spec.rows; j++) {
    for (let i = 0; i < spec.columns; i++) {
      const hole = i >= 12 && i <= 15 && j >= 6 && j <= 9;
      const ragged = i >= 26 - (j % 3);
      field[j * spec.columns + i] = hole || ragged ? NaN : f(i * 10, j * 10);
    }
  }
  return { spec, field };
}

describe("the off-plane distance grid", () => {
  it("interpolates w linearly on the picks' triangles: a tilted plane of picks gives w = 0.1 s − 0.05 t + 3 exactly (by hand)", () => {
    const s: number[] = [],
      t: number[] = [],
      w: number[] = [];
    for (let j = 0; j <= 6; j++)
      for (let i = 0; i <= 8; i++) {
        s.push(i * 25 + (j % 2) * 3);
        t.push(j * 20);
        w.push(0.1 * s.at(-1)! - 0.05 * t.at(-1)! + 3);
      }
    const S = Float64Array.from(s),
      T = Float64Array.from(t);
    const spec = gridSpecFor(S, T, 20, { cellM: 7 });
    const grid = offPlaneGrid(S, T, w, triangulate(S, T, { removeSlivers: false }).triangles, spec);
    let finite = 0;
    grid.forEach((value, k) => {
      if (!Number.isFinite(value)) return;
      finite++;
      const ss = spec.s0 + (k % spec.columns) * spec.cellM,
        tt = spec.t0 + Math.floor(k / spec.columns) * spec.cellM;
      expect(value).toBeCloseTo(0.1 * ss - 0.05 * tt + 3, 9);
    });
    expect(finite).toBeGreaterThan(500);
  });
});

describe("smoothing and local plane fits of a grid with holes", () => {
  it("match scipy (ndimage.gaussian_filter normalised convolution; numpy weighted least squares) to 1e-9 (docs/check-values.md I3, I4)", () => {
    const rand = mulberry32(3);
    const { spec, field } = holedField((s, t) => 0.002 * (s - 120) ** 2 - 0.3 * t + 5 * Math.sin(s / 40) + 3 * rand());
    const lengthM = 30; // 3 cells, so scipy's truncate = 3 gives the same 9-cell radius
    const nodes = [0, 31, 215, 6 * 30 + 11, 10 * 30 + 14, 19 * 30 + 24, 5 * 30 + 25, 7 * 30 + 13];
    const ref = runPythonOracle<{ smooth: (number | null)[]; fits: number[][]; fits2: number[][] }>(path.join(__dirname, "surface_oracle.py"), {
      columns: spec.columns,
      rows: spec.rows,
      cellM: spec.cellM,
      lengthM,
      field: Array.from(field, (v) => (Number.isFinite(v) ? v : null)),
      nodes,
    });
    const smooth = smoothGrid(field, spec, lengthM);
    smooth.forEach((value, k) => {
      if (ref.smooth[k] === null) expect(value).toBeNaN();
      else expect(Math.abs(value - ref.smooth[k]!)).toBeLessThan(1e-9);
    });
    for (const [degree, fits] of [
      [1, ref.fits],
      [2, ref.fits2],
    ] as const) {
      const fit = localPolynomialFit(field, spec, lengthM, degree);
      nodes.forEach((k, n) => {
        const [a, b, c] = fits[n];
        // node 6·30 + 13 lies inside the hole: the fit reaches it from the data around
        expect(Math.abs(fit.offPlaneM[k] - a)).toBeLessThan(1e-8);
        expect(Math.abs(fit.gradientS[k] - b)).toBeLessThan(1e-9);
        expect(Math.abs(fit.gradientT[k] - c)).toBeLessThan(1e-9);
      });
    }
  });

  it("a quadratic surface keeps its exact slopes under the degree-2 fit, edges included; a local plane bends them on the edges (docs/check-values.md I5)", () => {
    const { spec, field } = holedField((s, t) => 0.001 * (s - 100) ** 2 + 0.0005 * s * t - 0.002 * t * t);
    const quadratic = localPolynomialFit(field, spec, 40, 2);
    const plane = localPolynomialFit(field, spec, 40, 1);
    let worst = 0;
    for (let k = 0; k < field.length; k++) {
      if (!Number.isFinite(field[k])) continue;
      const s = (k % spec.columns) * 10,
        t = Math.floor(k / spec.columns) * 10;
      worst = Math.max(worst, Math.abs(quadratic.gradientS[k] - (0.002 * (s - 100) + 0.0005 * t)), Math.abs(quadratic.gradientT[k] - (0.0005 * s - 0.004 * t)));
    }
    expect(worst).toBeLessThan(1e-9);
    // on the bottom edge (t = 190 m) the plane's slope lags the true −0.004·190 + … by about curvature × window shift
    const edge = 19 * 30 + 5;
    expect(Math.abs(plane.gradientT[edge] - (0.0005 * 50 - 0.004 * 190))).toBeGreaterThan(0.05);
  });

  it("a plane survives the local fit exactly, also on edges and corners; plain smoothing bends its slope there (why the fit is used)", () => {
    const { spec, field } = holedField((s, t) => 0.2 * s - 0.1 * t + 7);
    const fit = localPolynomialFit(field, spec, 40);
    const smooth = smoothGrid(field, spec, 40);
    let worstFit = 0;
    for (let k = 0; k < field.length; k++) {
      if (!Number.isFinite(field[k])) continue;
      worstFit = Math.max(worstFit, Math.abs(fit.offPlaneM[k] - field[k]), Math.abs(fit.gradientS[k] - 0.2), Math.abs(fit.gradientT[k] + 0.1));
    }
    expect(worstFit).toBeLessThan(1e-9);
    // at the corner node (0, 0) the one-sided average is pulled inward by metres (0.2·Δs − 0.1·Δt over a shift of ≈ 0.8 L)
    expect(Math.abs(smooth[0] - field[0])).toBeGreaterThan(2);
    // support: about a quarter of the window at a corner (a little more: the node's own row and column count fully,
    // Σ_{i≥0} g / Σ g = 0.55 per axis for L = 4 cells), about half on an edge, more inside
    expect(fit.support[0]).toBeGreaterThan(0.2);
    expect(fit.support[0]).toBeLessThan(0.35);
    expect(fit.support[19 * 30 + 5]).toBeLessThan(0.56);
    expect(fit.support[19 * 30 + 5]).toBeGreaterThan(fit.support[0]);
    expect(fit.support[10 * 30 + 5]).toBeGreaterThan(fit.support[19 * 30 + 5]);
  });

  it("slope scatter is 0 on a plane and equals the known slope spread of a corrugation (by hand)", () => {
    const plane = holedField((s, t) => 0.2 * s - 0.1 * t);
    const planeFit = localPolynomialFit(plane.field, plane.spec, 40);
    const flat = slopeScatterDeg(plane.field, planeFit, plane.spec, 40);
    for (let k = 0; k < flat.length; k++) if (Number.isFinite(plane.field[k])) expect(flat[k]).toBeLessThan(1e-6);
    // w = 2·sin(2π t / 40 m) sampled every 10 m: node slopes by central differences are ±0.2 (0, ±4 over 20 m … every
    // other row), so the RMS slope about the mean is 0.2/√2 in the interior: atan(0.1414) = 8.05°
    const corrugated = { spec: { s0: 0, t0: 0, cellM: 10, columns: 60, rows: 60 }, field: new Float64Array(3600) };
    for (let j = 0; j < 60; j++) for (let i = 0; i < 60; i++) corrugated.field[j * 60 + i] = 2 * Math.sin((2 * Math.PI * j * 10) / 40);
    const fit = localPolynomialFit(corrugated.field, corrugated.spec, 60);
    const scatter = slopeScatterDeg(corrugated.field, fit, corrugated.spec, 60);
    expect(scatter[30 * 60 + 30]).toBeCloseTo((Math.atan(0.2 / Math.SQRT2) * 180) / Math.PI, 1);
  });

  it("effective pick count of one pick per node is 4πL²/cell² inside a large grid (docs/check-values.md I6; Kish 1965)", () => {
    const s: number[] = [],
      t: number[] = [];
    for (let j = 0; j < 80; j++)
      for (let i = 0; i < 80; i++) {
        s.push(i * 5);
        t.push(j * 5);
      }
    const spec = { s0: 0, t0: 0, cellM: 5, columns: 80, rows: 80 };
    const count = effectivePickCount(s, t, spec, 20);
    // (Σ K)² / Σ K² with Σ K ≈ 2πL²/cell² and Σ K² ≈ πL²/cell²: 4π·400/25 = 201.1. The kernel is cut at 3 L, which
    // drops 0.27 % of each 1-D sum of K (so about 1.1 % of (Σ K)²) and nothing measurable of Σ K²: allow 1.5 %
    expect(Math.abs(count[40 * 80 + 40] / ((4 * Math.PI * 400) / 25) - 1)).toBeLessThan(0.015);
    // a corner sees a quarter of the window
    expect(count[0] / count[40 * 80 + 40]).toBeCloseTo(0.25, 1);
  });
});

describe("orientation of the smoothed surface", () => {
  it("a surface tilted by its slopes has the normal of that plane (strike and dip checked against planeNormal)", () => {
    // reference plane: strike 030, dip 50; the surface w = 0.1·s − 0.2·t relative to it
    const frame = fitPlane(
      [0, 1000 * Math.sin(30 * RAD), 700 * Math.cos(50 * RAD) * Math.sin(120 * RAD)],
      [0, 1000 * Math.cos(30 * RAD), 700 * Math.cos(50 * RAD) * Math.cos(120 * RAD)],
      [0, 0, -700 * Math.sin(50 * RAD)],
    );
    expect(frame.dipDeg).toBeCloseTo(50, 9);
    const normal = surfaceNormal(0.1, -0.2, frame);
    // independently: three points of the surface P = c + s ŝ + t d̂ + w n̂, and their cross product
    const point = (s: number, t: number) => {
      const w = 0.1 * s - 0.2 * t;
      return [0, 1, 2].map((k) => frame.centroid[k] + s * frame.strikeVector[k] + t * frame.dipVector[k] + w * frame.normal[k]);
    };
    const [a, b, c] = [point(0, 0), point(100, 0), point(0, 100)];
    const u = [0, 1, 2].map((k) => b[k] - a[k]),
      v = [0, 1, 2].map((k) => c[k] - a[k]);
    const cross = [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]];
    const length = Math.hypot(...cross) * Math.sign(cross[2]);
    cross.forEach((value, k) => expect(normal[k]).toBeCloseTo(value / length, 12));
    const orientation = orientationOfNormal(normal);
    const back = planeNormal(orientation.strikeDeg, orientation.dipDeg);
    back.forEach((value, k) => expect(value).toBeCloseTo(normal[k], 12));
    // zero slopes give the reference plane back
    expect(orientationOfNormal(surfaceNormal(0, 0, frame)).strikeDeg).toBeCloseTo(30, 9);
    expect(orientationOfNormal(surfaceNormal(0, 0, frame)).dipDeg).toBeCloseTo(50, 9);
  });

  it("picks projected to their own best plane have w of zero mean and a flat fitted surface", () => {
    const x = [0, 100, 0, 100, 50],
      y = [0, 0, 100, 100, 50],
      z = [0, -30, -10, -40, -20];
    const plane = fitPlane(x, y, z);
    const { w } = projectToPlane(x, y, z, plane);
    expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(0, 9);
  });
});
