import { describe, expect, it } from "vitest";
import { createRequire } from "node:module";
import { analyzePicks } from "@/lib/engine/pipeline";
import { buildFaultDisplay } from "@/lib/display/build";
import { checkCoordinateReference, toLongitudeLatitude } from "@/lib/crs";
import { faultGltf } from "@/lib/views/gltf";
import { LISTRIC, curvedFaultPicks } from "../engine/curved-faults";

// The Khronos glTF-Validator (the `gltf-validator` package, compiled from the reference validator) checks the file
const validator = createRequire(import.meta.url)("gltf-validator") as {
  validateBytes(
    data: Uint8Array,
    options?: { maxIssues?: number },
  ): Promise<{ issues: { numErrors: number; numWarnings: number; messages: { code: string; message: string; severity: number; pointer?: string }[] } }>;
};

function readGlb(bytes: Uint8Array) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const jsonLength = view.getUint32(12, true);
  const json = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength)));
  const bin = bytes.slice(20 + jsonLength + 8);
  return { magic: view.getUint32(0, true), version: view.getUint32(4, true), length: view.getUint32(8, true), json, bin };
}

describe("glTF 2.0 export of the displacement surface", () => {
  const { picks } = curvedFaultPicks(LISTRIC);
  const result = analyzePicks(picks);
  const display = buildFaultDisplay({ ...result, picks, maxCells: 192 });
  const reference = checkCoordinateReference({ epsg: 32631, verticalEpsg: 5714 });
  const bytes = faultGltf(display, {
    faultName: "listric test",
    coordinateReference: reference,
    originLongitudeLatitude: toLongitudeLatitude(reference, display.origin[0], display.origin[1]),
  });

  it("passes the Khronos glTF validator with no errors and no warnings", async () => {
    const report = await validator.validateBytes(bytes, { maxIssues: 50 });
    const serious = report.issues.messages.filter((message) => message.severity <= 1);
    expect(serious).toEqual([]);
    expect(report.issues.numErrors).toBe(0);
    expect(report.issues.numWarnings).toBe(0);
  });

  it("is in world coordinates: the root node puts the origin back, the axes and the coordinate reference are recorded", () => {
    const { magic, version, length, json, bin } = readGlb(bytes);
    expect(magic).toBe(0x46546c67);
    expect(version).toBe(2);
    expect(length).toBe(bytes.byteLength);
    const [east, north, up] = display.origin;
    expect(json.nodes[0].translation).toEqual([east, up, -north]);
    expect(json.asset.extras.coordinateReference).toMatchObject({ horizontal: "EPSG:32631", vertical: "EPSG:5714", verticalName: "MSL height" });
    expect(json.asset.extras.axes).toMatch(/\+X East, \+Y Up/);
    // a surface vertex plus the translation is a world point on the fault surface: its distance from the reference plane
    // is the surface offset the analysis reported there (within float32 rounding of the local position)
    const segment = result.report.segments[0];
    const primitive = json.meshes[0].primitives[0];
    expect(primitive.mode).toBe(4);
    const accessor = json.accessors[primitive.attributes.POSITION];
    const view = json.bufferViews[accessor.bufferView];
    const positions = new Float32Array(bin.buffer.slice(view.byteOffset, view.byteOffset + view.byteLength));
    let largest = 0;
    for (let i = 0; i < accessor.count; i++) {
      const x = positions[3 * i] + east,
        y = -positions[3 * i + 2] + north,
        z = positions[3 * i + 1] + up;
      const { centroid, normal } = segment.plane;
      largest = Math.max(largest, Math.abs((x - centroid[0]) * normal[0] + (y - centroid[1]) * normal[1] + (z - centroid[2]) * normal[2]));
    }
    expect(Math.abs(largest / segment.surface!.maxOffsetM - 1)).toBeLessThan(0.05);
    // vertex colours, and the tip lines as line primitives
    expect(primitive.attributes.COLOR_0).toBeGreaterThanOrEqual(0);
    expect(json.meshes[0].primitives.some((p: { mode: number }) => p.mode === 1)).toBe(true);
  });
});
