// The browser-safe display primitives on tiny exact cases: the one typed-array codec, the one grid sampler with its
// missing-data rules, the one plane↔world transform.
import { describe, expect, it } from "vitest";
import { decodeRecord, encodeRecord, recordMagic } from "@/lib/display/codec";
import { AS_DRAWN, EDGE_TOLERANT_BILINEAR, sampleGrid, STRICT_BILINEAR, type SampleRule } from "@/lib/display/grid-sampler";
import { planeToWorld, projectToPlane, shiftedFrame, worldToPlane, writePlaneToWorld } from "@/lib/display/frame";

describe("the typed-array codec", () => {
  it("round-trips typed arrays of every kind, nested JSON and non-finite numbers, each array 8-byte aligned", () => {
    const record = {
      name: "QG-4",
      nested: { values: Float64Array.from([1.5, NaN, -0, 2 ** 53]), counts: Uint16Array.from([1, 2, 3]) },
      bytes: Uint8Array.from([7]),
      list: [Float32Array.from([0.25]), Int32Array.from([-4]), Uint32Array.from([4_000_000_000])],
      limits: [Infinity, -Infinity, NaN, 3],
    };
    const bytes = encodeRecord(record, "TEST");
    expect(recordMagic(bytes)).toBe("TEST");
    const decoded = decodeRecord(bytes, "TEST") as typeof record;
    expect(decoded.name).toBe("QG-4");
    expect(Array.from(decoded.nested.values)).toEqual([1.5, NaN, -0, 2 ** 53]);
    expect(Object.is(decoded.nested.values[2], -0)).toBe(true);
    expect(decoded.nested.counts).toBeInstanceOf(Uint16Array);
    expect(Array.from(decoded.nested.counts)).toEqual([1, 2, 3]);
    expect(Array.from(decoded.bytes)).toEqual([7]);
    expect(decoded.list[0]).toBeInstanceOf(Float32Array);
    expect(Array.from(decoded.list[1])).toEqual([-4]);
    expect(Array.from(decoded.list[2])).toEqual([4_000_000_000]);
    expect(decoded.limits).toEqual([Infinity, -Infinity, NaN, 3]);
    for (const array of [decoded.nested.values, decoded.nested.counts, decoded.bytes]) expect(array.byteOffset % 8).toBe(0);
  });

  it("reads a record that starts at an odd offset of a larger buffer (as database drivers hand them)", () => {
    const bytes = encodeRecord({ v: Float64Array.from([3, 4]) }, "TEST");
    const shifted = new Uint8Array(bytes.length + 3);
    shifted.set(bytes, 3);
    const decoded = decodeRecord(shifted.subarray(3), "TEST") as { v: Float64Array };
    expect(Array.from(decoded.v)).toEqual([3, 4]);
  });

  it("refuses another kind of record and a record cut short, naming what was expected", () => {
    const bytes = encodeRecord({ v: Float64Array.from([1, 2, 3]) }, "TEST");
    expect(() => decodeRecord(bytes, "ELSE", "display payload")).toThrow("Not a Slipfield display payload.");
    expect(() => decodeRecord(bytes.subarray(0, bytes.length - 8), "TEST", "pick set")).toThrow("The pick set is cut short.");
    expect(() => encodeRecord({}, "TOOLONG")).toThrow(/four ASCII characters/);
  });
});

describe("the grid sampler (common practice, no source: bilinear and split-cell linear interpolation)", () => {
  // 3 × 2 nodes, cell 10 m, origin (100, 50): values v = s + 2t at the nodes, one node (column 2, row 1) missing
  const grid = { s0: 100, t0: 50, cellM: 10, columns: 3, rows: 2 };
  const values = Float64Array.from([100 + 100, 110 + 100, 120 + 100, 100 + 120, 110 + 120, NaN]);

  it("reproduces a plane exactly inside a complete cell, whatever the rule", () => {
    for (const rule of [STRICT_BILINEAR, EDGE_TOLERANT_BILINEAR, AS_DRAWN]) expect(sampleGrid(grid, values, 104, 53, rule)).toBeCloseTo(104 + 106, 12);
  });

  it("strict: a missing corner with weight makes the value missing; a point off the grid is missing", () => {
    expect(sampleGrid(grid, values, 115, 55, STRICT_BILINEAR)).toBeNaN();
    expect(sampleGrid(grid, values, 99, 55, STRICT_BILINEAR)).toBeNaN();
    // on the cell's edge away from the missing corner the weight of that corner is zero... and NaN·0 is NaN: still missing
    expect(sampleGrid(grid, values, 115, 50, STRICT_BILINEAR)).toBeNaN();
  });

  it("edge-tolerant: the missing corner is left out and the others' weights renormalised", () => {
    // at (115, 55): corners 210 (w .25), 220 (w .25), 230 (w .25), missing (w .25) → (210 + 220 + 230) / 3
    expect(sampleGrid(grid, values, 115, 55, EDGE_TOLERANT_BILINEAR)).toBeCloseTo(220, 12);
    expect(sampleGrid(grid, values, 99, 55, EDGE_TOLERANT_BILINEAR)).toBeNaN();
    const allMissing = new Float64Array(6).fill(NaN);
    expect(sampleGrid(grid, allMissing, 105, 55, EDGE_TOLERANT_BILINEAR)).toBeNaN();
  });

  it("clamped: a point off the grid reads the nearest edge", () => {
    const clamped: SampleRule = { interpolation: "bilinear", missing: "renormalise", outside: "clamp" };
    expect(sampleGrid(grid, values, 90, 40, clamped)).toBe(200);
    const clampedStrict: SampleRule = { ...clamped, missing: "missing" };
    expect(sampleGrid(grid, values, 130, 70, clampedStrict)).toBeNaN();
  });

  it("as drawn: linear on the triangle of the cell the mesh draws, missing only when that triangle has a missing node", () => {
    // second cell, point below its diagonal (fu ≥ fv): triangle (a, b, d) holds the missing node d
    expect(sampleGrid(grid, values, 118, 51, AS_DRAWN)).toBeNaN();
    // a cell split along its diagonal is not bilinear: a saddle shows it (nodes 0, 0 / 0, 1 → on the diagonal 0.5·1)
    const saddle = { s0: 0, t0: 0, cellM: 1, columns: 2, rows: 2 };
    const saddleValues = Float64Array.from([0, 0, 0, 1]);
    expect(sampleGrid(saddle, saddleValues, 0.5, 0.5, AS_DRAWN)).toBeCloseTo(0.5, 12);
    expect(sampleGrid(saddle, saddleValues, 0.5, 0.5, STRICT_BILINEAR)).toBeCloseTo(0.25, 12);
  });
});

describe("the plane↔world transform", () => {
  // a plane striking north (strike vector +y), dipping 90° to the east: dip vector straight down, normal east
  const frame = { centroid: [1000, 2000, -500], strikeVector: [0, 1, 0], dipVector: [0, 0, -1], normal: [1, 0, 0] };

  it("places a plane point in the world and reads it back", () => {
    expect(planeToWorld(frame, 10, 20, 3)).toEqual([1003, 2010, -520]);
    expect(worldToPlane(frame, 1003, 2010, -520)).toEqual([10, 20, 3]);
    const out = new Float32Array(6);
    writePlaneToWorld(shiftedFrame({ ...frame, centroid: [0, 0, 0] }, [1, 2, 3]), 10, 20, 0, out, 3);
    expect(Array.from(out)).toEqual([0, 0, 0, 1, 12, -17]);
  });

  it("projects columns of points, optionally a subset", () => {
    const x = [1000, 1005, 999];
    const y = [2000, 2003, 1990];
    const z = [-500, -510, -490];
    const { s, t, w } = projectToPlane(x, y, z, frame, [1, 2]);
    expect(Array.from(s)).toEqual([3, -10]);
    expect(Array.from(t)).toEqual([10, -10]);
    expect(Array.from(w)).toEqual([5, -1]);
  });
});
