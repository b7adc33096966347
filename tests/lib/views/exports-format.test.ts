import { check } from "@placemarkio/check-geojson";
import { describe, expect, it } from "vitest";
import { analyzeCsv } from "@/lib/engine/pipeline";
import { demoCsv } from "@/lib/demo";
import { numericColumn, readCsv, toCsv } from "@/lib/views/csv";
import { faultGeoJson } from "@/lib/views/geojson";
import { gridCsv, picksCsv, GRID_CSV_HEADER } from "@/lib/exports/tables";
import { parsePickCsv } from "@/lib/engine/csv";

describe("GeoJSON export (validated with @placemarkio/check-geojson, an RFC 7946 checker)", () => {
  const { report } = analyzeCsv(demoCsv("QG-1"));
  const collection = faultGeoJson("QG-1", report);

  it("is a valid FeatureCollection of contours, tip lines and mapped limits with level/kind/units", () => {
    const parsed = check(JSON.stringify(collection));
    expect(parsed.type).toBe("FeatureCollection");
    const kinds = new Set(collection.features.map((f) => f.properties.kind));
    expect([...kinds].sort()).toEqual(["contour", "mapped-limit", "tip-line"]);
    const contourCount = report.segments.reduce((n, s) => n + s.contours.reduce((m, l) => m + l.rings.length, 0), 0);
    expect(collection.features.filter((f) => f.properties.kind === "contour")).toHaveLength(contourCount);
    for (const f of collection.features) {
      expect(f.properties.units).toBe("m");
      for (const p of f.geometry.coordinates) expect(p).toHaveLength(3);
    }
  });

  it("puts the tip line at the engine's world positions (x, y, z)", () => {
    const tip = collection.features.find((f) => f.properties.kind === "tip-line" && f.properties.segment === report.segments[0].id)!;
    const [x, y, z] = report.segments[0].tipLine.worldPolygon[0];
    expect(tip.geometry.coordinates[0][0]).toBeCloseTo(x, 2);
    expect(tip.geometry.coordinates[0][1]).toBeCloseTo(y, 2);
    expect(tip.geometry.coordinates[0][2]).toBeCloseTo(z, 2);
    expect(tip.properties.level).toBe(0);
  });

  it("a broken collection is rejected by the validator (so the check above has teeth)", () => {
    const broken = JSON.parse(JSON.stringify(collection));
    broken.features[0].geometry.coordinates = [[1, "a", 3]];
    expect(() => check(JSON.stringify(broken))).toThrow();
  });
});

describe("CSV exports round trip", () => {
  it("writes and reads back numbers exactly, NaN as empty, text quoted", () => {
    const values = [Math.PI, -1e-9, 123456789.123, NaN, 0.1 + 0.2];
    const text = toCsv(
      ["name", "value"],
      values.map((v, i) => [i === 2 ? 'a "quoted", name' : `n${i}`, v]),
    );
    const table = readCsv(text);
    expect(table.header).toEqual(["name", "value"]);
    expect(table.rows[2][0]).toBe('a "quoted", name');
    const back = numericColumn(table, "value");
    back.forEach((v, i) => (Number.isNaN(values[i]) ? expect(v).toBeNaN() : expect(v).toBe(values[i])));
  });

  it("the full-resolution grid CSV holds every node with data; picks CSV residuals vanish at picks (linear interpolation honours data)", () => {
    const csv = demoCsv("QG-4");
    const result = analyzeCsv(csv);
    const grid = result.grids[result.report.segments[0].id];
    const table = readCsv(gridCsv(result));
    expect(table.header).toEqual(GRID_CSV_HEADER);
    let withData = 0;
    for (const v of grid.displacementM) if (!Number.isNaN(v)) withData++;
    expect(table.rows).toHaveLength(withData);
    const d = numericColumn(table, "displacement");
    expect(Math.max(...d)).toBeCloseTo(Math.max(...Array.from(grid.displacementM).filter((v) => !Number.isNaN(v))), 9);
    const picks = parsePickCsv(csv).picks;
    const pickTable = readCsv(picksCsv(picks, result));
    expect(pickTable.rows).toHaveLength(picks.x.length);
    const x = numericColumn(pickTable, "x");
    expect(x[5]).toBe(picks.x[5]);
    const residual = numericColumn(pickTable, "residual").filter(Number.isFinite);
    expect(residual.length).toBeGreaterThan(picks.x.length * 0.9);
    const median = residual.map(Math.abs).sort((a, b) => a - b)[Math.floor(residual.length / 2)];
    // grid nodes are not at the picks, so residuals are small but not zero: well under the 1.5 m pick noise of the demo
    expect(median).toBeLessThan(1.5);
  });
});
