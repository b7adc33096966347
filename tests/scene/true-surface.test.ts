import { describe, expect, it } from "vitest";
import { analyzePicks } from "@/lib/engine/pipeline";
import { buildFaultDisplay } from "@/lib/display/build";
import { buildContourLines, buildSurfaceMesh, buildTipLines, localOrientationAt, surfaceCoordinates, surfacePoint } from "@/scene/geometry";
import { LISTRIC, curvedFaultPicks } from "../lib/engine/curved-faults";

// The 3D view's geometry on the true surface of the synthetic listric fault (tests/engine/curved-faults.ts: a
// circular-arc profile, dip 68° at the top to 38° at the base, common practice, no source), against its construction.
describe("the 3D view draws the true fault surface", () => {
  const { picks, truth } = curvedFaultPicks(LISTRIC);
  const result = analyzePicks(picks);
  const display = buildFaultDisplay({ ...result, picks });
  const segment = display.segments[0];
  const { frame } = segment;
  const distanceFromPlane = (positions: Float32Array, vertex: number) =>
    (positions[vertex * 3] - frame.centroid[0]) * frame.normal[0] +
    (positions[vertex * 3 + 1] - frame.centroid[1]) * frame.normal[1] +
    (positions[vertex * 3 + 2] - frame.centroid[2]) * frame.normal[2];

  it("flat (no relief): the mesh's vertices stand off the plane as the surface does, its largest offset within 10 % of the report's", () => {
    const mesh = buildSurfaceMesh(segment, { colourMode: "displacement", exaggeration: 0, colorRangeM: display.displacementRangeM });
    const used = new Set(mesh.indices);
    let largest = 0;
    for (const vertex of used) largest = Math.max(largest, Math.abs(distanceFromPlane(mesh.positions, vertex)));
    const reported = result.report.segments[0].surface!.maxOffsetM;
    expect(reported).toBeGreaterThan(40);
    expect(Math.abs(largest / reported - 1)).toBeLessThan(0.1);
  });

  it("relief goes along the local normal: each vertex moves by exactly displacement × exaggeration", () => {
    const flat = buildSurfaceMesh(segment, { colourMode: "displacement", exaggeration: 0, colorRangeM: display.displacementRangeM });
    const raised = buildSurfaceMesh(segment, { colourMode: "displacement", exaggeration: 2, colorRangeM: display.displacementRangeM });
    let checked = 0;
    for (const vertex of new Set(flat.indices)) {
      const d = segment.grid.displacementM[vertex];
      const moved = Math.hypot(...[0, 1, 2].map((axis) => raised.positions[vertex * 3 + axis] - flat.positions[vertex * 3 + axis]));
      expect(Math.abs(moved - 2 * d)).toBeLessThan(0.01 + 1e-5 * d);
      checked++;
    }
    expect(checked).toBeGreaterThan(1000);
  });

  it("hover: local dip within 1.5° of the construction, and a point on the drawn surface maps back to its (s, t)", () => {
    for (const [fu, fv] of [
      [0, -0.5],
      [0, 0],
      [0, 0.5],
      [0.4, 0.3],
      [-0.4, -0.3],
    ]) {
      const p = truth.point(fu * LISTRIC.a, fv * LISTRIC.b);
      const local = [p[0] - display.origin[0], p[1] - display.origin[1], p[2] - display.origin[2]];
      const [s, t] = surfaceCoordinates(segment, local[0], local[1], local[2]);
      expect(Math.abs(localOrientationAt(segment, s, t).dipDeg - truth.dipDeg(fu * LISTRIC.a, fv * LISTRIC.b))).toBeLessThan(1.5);
      // with relief: the point raised along the local normal comes back to the same (s, t)
      const raised = new Float64Array(3);
      surfacePoint(segment, s, t, 150, raised, 0);
      const [s2, t2] = surfaceCoordinates(segment, raised[0], raised[1], raised[2], () => 150);
      expect(Math.hypot(s2 - s, t2 - t)).toBeLessThan(0.5);
    }
  });

  it("contours and tip lines lie on the surface, lifted: the lift off it along the local normal, nothing more", () => {
    const lift = Math.max(0.5, 0.002 * Math.max((segment.grid.columns - 1) * segment.grid.cellM, (segment.grid.rows - 1) * segment.grid.cellM));
    for (const lines of [buildContourLines(display, 0).positions, buildTipLines(display).positions]) {
      const misses: number[] = [];
      for (let vertex = 0; vertex < lines.length / 3; vertex++) {
        const [s, t] = surfaceCoordinates(segment, lines[vertex * 3], lines[vertex * 3 + 1], lines[vertex * 3 + 2], () => lift);
        const onSurface = new Float64Array(3);
        surfacePoint(segment, s, t, lift, onSurface, 0);
        misses.push(Math.hypot(onSurface[0] - lines[vertex * 3], onSurface[1] - lines[vertex * 3 + 1], onSurface[2] - lines[vertex * 3 + 2]));
      }
      misses.sort((a, b) => a - b);
      expect(misses.length).toBeGreaterThan(100);
      // float32 vertices: millimetres; at the display grid's edge, where the surface beyond it (a coarser grid) takes
      // over, the two disagree by up to a metre, against an offset of some 50 m
      expect(misses[Math.floor(misses.length / 2)]).toBeLessThan(0.01);
      expect(misses[Math.floor(0.99 * (misses.length - 1))]).toBeLessThan(0.25);
      expect(misses[misses.length - 1]).toBeLessThan(1);
    }
  });
});
