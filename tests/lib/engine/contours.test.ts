import { describe, expect, it } from "vitest";
import { contourGrid, contourLevels, niceInterval, ringArea } from "@/lib/engine/contours";

describe("contours", () => {
  // hand-checked case: a cone D = 100 − r has circular contours of radius 100 − level
  it("concentric circles: one ring per level, enclosed areas within 1 %", () => {
    const cellM = 1;
    const columns = 241,
      rows = 241;
    const spec = { s0: -120, t0: -120, cellM, columns, rows };
    const field = new Float64Array(columns * rows);
    for (let j = 0; j < rows; j++)
      for (let i = 0; i < columns; i++) {
        const r = Math.hypot(spec.s0 + i * cellM, spec.t0 + j * cellM);
        field[j * columns + i] = r <= 110 ? 100 - r : NaN;
      }
    const levels = contourLevels(100, 20);
    expect(levels).toEqual([20, 40, 60, 80]);
    const result = contourGrid(spec, field, levels);
    expect(result).toHaveLength(4);
    for (const c of result) {
      expect(c.rings).toHaveLength(1);
      const expected = Math.PI * (100 - c.levelM) ** 2;
      expect(Math.abs(Math.abs(ringArea(c.rings[0])) - expected) / expected).toBeLessThan(0.01);
    }
  });

  it("NaN outside the data adds no rings around the gaps (two separate bumps give two rings)", () => {
    const columns = 50,
      rows = 20;
    const field = new Float64Array(columns * rows).fill(NaN);
    for (let j = 2; j < 18; j++) for (let i = 2; i < 48; i++) if (i < 20 || i > 30) field[j * columns + i] = 10;
    const [c] = contourGrid({ s0: 0, t0: 0, cellM: 1, columns, rows }, field, [5]);
    expect(c.rings).toHaveLength(2);
  });

  // common practice, no source: "nice" steps of 1, 2, 2.5 or 5 × 10^k giving about 8–12 levels (6–13 where no nice step fits)
  it("picks a nice default interval", () => {
    expect(niceInterval(85)).toBe(10);
    expect([2, 2.5]).toContain(niceInterval(23));
    for (const max of [3.3, 17, 85, 460, 9200]) {
      const levels = contourLevels(max, niceInterval(max)).length;
      expect(levels).toBeGreaterThanOrEqual(6);
      expect(levels).toBeLessThanOrEqual(13);
    }
  });
});

describe("contours traced level by level on windows", () => {
  // Independent check (common practice, no source): the windowed tracing must give the rings d3-contour gives on
  // the whole grid, on a bumpy field with holes, several peaks and NaN gaps.
  it("matches d3-contour run on the whole grid", async () => {
    const { contours } = await import("d3-contour");
    const columns = 90,
      rows = 70;
    const spec = { s0: 100, t0: -50, cellM: 2.5, columns, rows };
    const field = new Float64Array(columns * rows);
    for (let j = 0; j < rows; j++)
      for (let i = 0; i < columns; i++) {
        const a = Math.hypot(i - 30, j - 35),
          b = Math.hypot(i - 65, j - 30);
        const v =
          40 * Math.exp(-((a / 14) ** 2)) +
          30 * Math.exp(-((b / 9) ** 2)) -
          8 * Math.exp(-((Math.hypot(i - 30, j - 35) / 3) ** 2)) +
          3 * Math.sin(i / 3) * Math.cos(j / 4);
        field[j * columns + i] = (i - 80) ** 2 + (j - 60) ** 2 < 30 || v < 1 ? NaN : v;
      }
    const levels = [25, 5, 10, 15, 20, 30, 35, 60];
    const got = contourGrid(spec, field, levels);
    const below = Math.min(...levels) - 1;
    const filled = Float64Array.from(field, (v) => (Number.isNaN(v) ? below : v));
    const reference = contours().size([columns, rows]).thresholds(levels)(filled as unknown as number[]);
    expect(got.map((c) => c.levelM)).toEqual(reference.map((r) => r.value));
    expect(got.at(-1)!.rings).toEqual([]);
    let rings = 0;
    got.forEach((c, k) => {
      const ref = reference[k].coordinates.flat();
      expect(c.rings).toHaveLength(ref.length);
      c.rings.forEach((ring, r) => {
        expect(ring).toHaveLength(ref[r].length);
        ring.forEach(([s, t], p) => {
          const gx = Math.min(Math.max(ref[r][p][0], 0.5), columns - 0.5) - 0.5;
          const gy = Math.min(Math.max(ref[r][p][1], 0.5), rows - 0.5) - 0.5;
          expect(Math.abs(s - (spec.s0 + gx * spec.cellM))).toBeLessThan(1e-9);
          expect(Math.abs(t - (spec.t0 + gy * spec.cellM))).toBeLessThan(1e-9);
        });
        rings++;
      });
    });
    expect(rings).toBeGreaterThan(8);
  });
});
