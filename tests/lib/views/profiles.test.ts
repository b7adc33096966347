import { describe, expect, it } from "vitest";
import {
  columnMaxProfile,
  commonStrikeFrame,
  dipProfileAtS,
  interpolateOrZero,
  modelStrikeProfile,
  overlapZone,
  profileAlongLine,
  strikeProfileAtT,
  sumProfiles,
  tipExtent,
  toCommonProfile,
  type GridLike,
} from "@/lib/views/profiles";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { demoCsv } from "@/lib/demo";

/** A plane field D = 2 + 0.5·s + 0.25·t on a 5×4 grid (s0 = 0, t0 = 100, cell 10 m), one hole (NaN); throw = D·sin 60°. */
function planeGrid(): GridLike {
  const columns = 5,
    rows = 4;
  const d = new Float64Array(columns * rows);
  const th = new Float64Array(columns * rows);
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < columns; c++) {
      d[r * columns + c] = 2 + 0.5 * (c * 10) + 0.25 * (100 + r * 10);
      th[r * columns + c] = d[r * columns + c] * Math.sin(Math.PI / 3);
    }
  d[3 * columns + 0] = NaN;
  th[3 * columns + 0] = NaN;
  return { s0: 0, t0: 100, cellM: 10, columns, rows, displacementM: d, throwM: th };
}

describe("profile extraction on a synthetic grid (exact values; common practice, no source)", () => {
  it("reads a bilinear field exactly along an oblique line", () => {
    const grid = planeGrid();
    const p = profileAlongLine(grid, [0, 100], [40, 120], 5);
    expect(p.distanceM.at(-1)).toBeCloseTo(Math.hypot(40, 20), 12);
    p.s.forEach((s, k) => {
      expect(p.displacementM[k]).toBeCloseTo(2 + 0.5 * s + 0.25 * p.t[k], 12);
      expect(p.throwM[k]).toBeCloseTo((2 + 0.5 * s + 0.25 * p.t[k]) * Math.sin(Math.PI / 3), 12);
    });
  });

  it("gives NaN outside the grid", () => {
    const p = profileAlongLine(planeGrid(), [-20, 100], [-10, 100], 3);
    expect(p.displacementM.every(Number.isNaN)).toBe(true);
  });

  it("takes the row nearest t for the centre line and the row maximum per column", () => {
    const grid = planeGrid();
    const centre = strikeProfileAtT(grid, 113);
    expect(centre.t.every((t) => t === 110)).toBe(true);
    expect(centre.displacementM).toEqual([29.5, 34.5, 39.5, 44.5, 49.5]);
    const colMax = columnMaxProfile(grid);
    // the field grows with t, so each column's maximum is the last row, except column 0 whose last node is a hole
    expect(colMax.displacementM).toEqual([2 + 0.25 * 120, 2 + 5 + 32.5, 2 + 10 + 32.5, 2 + 15 + 32.5, 2 + 20 + 32.5]);
    expect(colMax.t).toEqual([120, 130, 130, 130, 130]);
  });

  it("reads the down-dip column through s", () => {
    const p = dipProfileAtS(planeGrid(), 21);
    expect(p.s.every((s) => s === 20)).toBe(true);
    expect(p.displacementM).toEqual([37, 39.5, 42, 44.5]);
  });
});

describe("summing segment profiles across a relay (displacement transfer; Dawers & Anders 1995 for the coherent sum)", () => {
  it("sums two opposing linear tapers to a constant inside the overlap", () => {
    // segment A tapers from 100 m at u = 0 to 0 at u = 1000; segment B rises from 0 at u = 600 to 100 at u = 1600
    const a = { id: "a", u: [0, 1000], displacementM: [100, 0], throwM: [80, 0] };
    const b = { id: "b", u: [600, 1600], displacementM: [0, 100], throwM: [0, 80] };
    const sum = sumProfiles([a, b], 17);
    expect(sum.u[0]).toBe(0);
    expect(sum.u.at(-1)).toBe(1600);
    sum.u.forEach((u, k) => {
      const expected = (u <= 1000 ? 100 - u / 10 : 0) + (u >= 600 ? (u - 600) / 10 : 0);
      expect(sum.displacementM[k]).toBeCloseTo(expected, 9);
    });
    const inOverlap = sum.u.map((u, k) => [u, sum.displacementM[k]]).filter(([u]) => u >= 600 && u <= 1000);
    expect(inOverlap.length).toBeGreaterThan(2);
    for (const [, d] of inOverlap) expect(d).toBeCloseTo(40, 9);
    // the sum differs from each segment only where both have data
    sum.u.forEach((u, k) => expect(sum.contributors[k], `u = ${u}`).toBe(u >= 600 && u <= 1000 ? 2 : 1));
    expect(overlapZone([0, 1000], [600, 1600])).toEqual([600, 1000]);
    expect(overlapZone([0, 500], [600, 1600])).toBeNull();
  });

  it("leaves a gap (NaN) where no segment has data, instead of a false zero", () => {
    const a = { id: "a", u: [0, 100, 200], displacementM: [10, 20, NaN], throwM: [8, 16, NaN] };
    const b = { id: "b", u: [400, 500], displacementM: [30, 30], throwM: [24, 24] };
    const sum = sumProfiles([a, b], 6); // u = 0, 100, 200, 300, 400, 500
    expect(sum.displacementM[0]).toBe(10);
    expect(sum.displacementM[1]).toBe(20);
    expect(sum.displacementM[2]).toBeNaN(); // the node at 200 has no data
    expect(sumProfiles([a, b], 11).displacementM[1]).toBe(15); // u = 50 lies between two nodes with data
    expect(sum.displacementM[3]).toBeNaN();
    expect(sum.contributors).toEqual([1, 1, 0, 0, 1, 1]);
    expect(sum.displacementM[4]).toBe(30);
  });

  it("counts no data as zero displacement", () => {
    expect(interpolateOrZero([0, 10], [5, NaN], 2)).toBe(5);
    expect(interpolateOrZero([0, 10], [5, 7], 20)).toBe(0);
  });

  it("on the QG-1 demo: segments placed in one along-strike coordinate: overlap equals the engine's relay overlap, sum bounds each profile", () => {
    const { report, grids } = analyzeCsv(demoCsv("QG-1"));
    expect(report.segments).toHaveLength(2);
    const frame = commonStrikeFrame(report.segments);
    const profiles = report.segments.map((seg) => toCommonProfile(seg.id, seg.plane, columnMaxProfile(grids[seg.id]), frame));
    const extents = report.segments.map((seg) => tipExtent(seg, frame));
    const zone = overlapZone(extents[0], extents[1])!;
    expect(zone[1] - zone[0]).toBeCloseTo(report.relays[0].overlapM, 6);
    const sum = sumProfiles(profiles, 300);
    const peak = Math.max(...sum.displacementM.filter(Number.isFinite));
    // the sum never falls below either segment's own profile
    for (const p of profiles)
      for (let k = 0; k < sum.u.length; k += 10)
        if (Number.isFinite(sum.displacementM[k]))
          expect(sum.displacementM[k] + 1e-9).toBeGreaterThanOrEqual(interpolateOrZero(p.u, p.displacementM, sum.u[k]));
    // the sum of non-negative profiles peaks at least at the larger segment's own peak (the column maxima of its grid,
    // whose top is the segment's Dmax up to the 300-sample resampling) and at most at the two peaks added
    const [dA, dB] = report.segments.map((seg) => seg.max.displacementM);
    expect(peak).toBeGreaterThanOrEqual(0.99 * Math.max(dA, dB));
    expect(peak).toBeLessThanOrEqual(dA + dB);
  });

  it("the leading profile's curve is zero beyond its own tips and peaks at its Dmax; the band brackets the central tips", () => {
    const { report } = analyzeCsv(demoCsv("QG-4"));
    const seg = report.segments[0];
    const model = modelStrikeProfile(seg, seg.tipLine.profile.centre.t)!;
    expect(model.name).toMatch(/profile/);
    expect(model.tipsS).not.toBeNull();
    expect(model.bandS).not.toBeNull();
    const [lo, hi] = model.tipsS!;
    const band = model.bandS!;
    // outer ≤ central ≤ inner at the strike start, inner ≤ central ≤ outer at the strike end
    expect(band.start[0]).toBeLessThanOrEqual(lo);
    expect(lo).toBeLessThanOrEqual(band.start[1]);
    expect(band.end[0]).toBeLessThanOrEqual(hi);
    expect(hi).toBeLessThanOrEqual(band.end[1]);
    const at = (s: number) => interpolateOrZero(model.s, model.displacementM, s);
    const { centre, reach } = seg.tipLine.profile;
    expect(at(centre.s - reach.strikeStartM * 1.01)).toBe(0);
    expect(at(centre.s + reach.strikeEndM * 1.01)).toBe(0);
    expect(at(centre.s - reach.strikeStartM * 0.9)).toBeGreaterThan(0);
    // the curve through the model's centre peaks at the profile's own Dmax (to the sampling of 161 points)
    expect(Math.max(...model.displacementM)).toBeCloseTo(seg.tipLine.profile.dmaxM, 0);
  });
});

describe("relay sketch (strike–normal coordinates)", () => {
  it("on QG-1: separation of the traces and the ramp dip ψ = atan(ΔT/O) (geometry after Peacock & Sanderson 1991)", async () => {
    const { relaySketch } = await import("@/lib/views/relay");
    const { rampDipDeg } = await import("@/lib/engine/relays");
    const { report, grids } = analyzeCsv(demoCsv("QG-1"));
    const [a, b] = report.segments;
    const sketch = relaySketch(a, b, grids[a.id], grids[b.id]);
    expect(sketch.overlap![1] - sketch.overlap![0]).toBeCloseTo(report.relays[0].overlapM, 6);
    // lib/demo.ts centres the south plane 260 m across strike (toward the dip direction, 242°) and 40 m below the north
    // one, dipping 61° against 58°. At the reference elevation z_ref a plane's trace lies (z_C − z_ref)/tan δ across
    // from its centre, so the expected separation follows from the two planes alone. The picks scatter 2 m off their
    // planes, which moves the fitted planes, and so the separation, by a fraction of a metre: within 1 m.
    const [north, south] = [a, b];
    const zRef = (north.plane.centroid[2] + south.plane.centroid[2]) / 2;
    const centreZ = { north: -2150, south: -2190 };
    const offset = (zCentre: number, dipDeg: number) => (zCentre - zRef) / Math.tan((dipDeg * Math.PI) / 180);
    const expected = 260 + offset(centreZ.south, 61) - offset(centreZ.north, 58);
    expect(Math.abs(sketch.separationAtMiddleM - expected)).toBeLessThan(1);
    expect(Math.abs(report.relays[0].separationM - expected)).toBeLessThan(1);
    // ΔT is a difference of two throws along one segment, each between 0 and that segment's maximum throw; the far end
    // of the overlap lies inside the other segment's picks, every one at or above the 10 m resolution cut-off
    const transfer = Math.max(...sketch.throwTransferM);
    expect(transfer).toBeGreaterThanOrEqual(10);
    expect(transfer).toBeLessThanOrEqual(Math.max(north.max.throwM, south.max.throwM));
    // docs/check-values.md, relay ramp dip: ΔT = 100 m over O = 600 m gives 9.462° (derived)
    expect(rampDipDeg(100, 600).dipDeg).toBeCloseTo(9.462, 3);
  });
});

describe("relay ramp dip per horizon", () => {
  it("ψ = atan(ΔT/O) from horizon bins: ΔT = throw at the far overlap end minus zero at the segment's own tip (geometry after Peacock & Sanderson 1991)", async () => {
    const { horizonRampDips } = await import("@/lib/views/relay");
    const { report } = analyzeCsv(demoCsv("QG-1"));
    const [a, b] = report.segments;
    const frame = commonStrikeFrame([a, b]);
    const zone = overlapZone(tipExtent(a, frame), tipExtent(b, frame))!;
    // bins of a horizon at the centroid elevation of segment a: throw 40 m everywhere on a, 10 m everywhere on b
    const binsFor = (segment: typeof a, throwM: number) =>
      Array.from({ length: 41 }, (_, k) => ({ segment: segment.id, horizon: "top reservoir", s: -2000 + k * 100, z: segment.plane.centroid[2], throwM }));
    const dips = horizonRampDips(a, b, [...binsFor(a, 40), ...binsFor(b, 10)]);
    expect(dips).toHaveLength(1);
    // the segment whose own tip ends the overlap contributes its full throw (40 m on a); b contributes 10 m
    expect(dips[0].throwTransferM).toBe(40);
    expect(dips[0].dipDeg).toBeCloseTo((Math.atan(40 / (zone[1] - zone[0])) * 180) / Math.PI, 9);
    expect(dips[0].flag).toBe("ok");
  });
});
