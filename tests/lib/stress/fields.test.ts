import { describe, expect, it } from "vitest";
import { decodeFloat32, stressFields, STRESS_FIELD_KEYS } from "@/lib/stress/fields";

const encode = (values: number[]) => Buffer.from(Float32Array.from(values).buffer).toString("base64");

describe("3D colour fields from the result payload (common practice, no source)", () => {
  it("decodes base64 Float32 node arrays, keeps NaN, and registers three fields with ΔP reversed", () => {
    expect(Array.from(decodeFloat32(encode([0.5, NaN, -1.25])))).toEqual([0.5, NaN, -1.25]);
    const fields = stressFields(
      {
        segments: [{ segmentId: "north", columns: 3, rows: 1, slip: encode([0.1, 0.2, NaN]), dilation: encode([0.3, 0.4, NaN]), dp: encode([5, -1, NaN]) }],
        ranges: { slip: [0, 0.8], dilation: [0, 1], dp: [-1, 5] },
      },
      { low: 0.6, high: 0.8 },
    );
    expect(fields.map((f) => f.key)).toEqual([STRESS_FIELD_KEYS.slip, STRESS_FIELD_KEYS.dilation, STRESS_FIELD_KEYS.dp]);
    expect(fields.every((f) => f.key.startsWith("stress:"))).toBe(true);
    expect(fields[2]).toMatchObject({ unit: "MPa", reversed: true, range: [-1, 5] });
    expect(fields[2].label).toBe("ΔP to failure, more critical of μ 0.6–0.8");
    expect(Array.from(fields[0].bySegment.north)).toEqual([Math.fround(0.1), Math.fround(0.2), NaN]);
  });
});
