import { describe, expect, it } from "vitest";
import { contourGrid, contourLevels, niceInterval, ringArea } from "@/lib/engine/contours";

describe("contours", () => {
  // hand-checked case: a cone D = 100 − r has circular contours of radius 100 − level
  it("concentric circles: one ring per level, enclosed areas within 1 %", () => {
    const cellM = 1;
    const columns = 241, rows = 241;
    const spec = { s0: -120, t0: -120, cellM, columns, rows };
    const field = new Float64Array(columns * rows);
    for (let j = 0; j < rows; j++) for (let i = 0; i < columns; i++) {
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
    const columns = 50, rows = 20;
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
