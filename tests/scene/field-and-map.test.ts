import { describe, expect, it } from "vitest";
import { interpolateViridis } from "d3-scale-chromatic";
import { buildFaultDisplay } from "@/lib/display/build";
import { buildSurfaceMesh, linearToSrgb255, parseCssColor } from "@/scene/geometry";
import { buildContourMap, toReferenceFrame } from "@/scene/map2d";
import { domeGrid, fixtureAnalysis, picksOnPlane, UTM_CENTROID } from "./fixture";

function display() {
  const grid = domeGrid();
  const report = fixtureAnalysis({ main: grid }, { main: UTM_CENTROID });
  return buildFaultDisplay({ report, grids: { main: grid }, picks: picksOnPlane(report, []) });
}

function colourAt(colors: Float32Array, node: number) {
  return [0, 1, 2].map((channel) => Math.round(linearToSrgb255(colors[node * 3 + channel])));
}

describe("surface coloured by a scalar field", () => {
  // basis: common practice, no source (a colour mode shows the given value per node on the same scale)
  it("uses the field's values instead of displacement, and reverses the scale on request", () => {
    const segment = display().segments[0];
    const nodes = segment.grid.columns * segment.grid.rows;
    const field = new Float32Array(nodes).fill(0.25);
    field[0] = 1;
    const mesh = buildSurfaceMesh(segment, { colourMode: "slip", exaggeration: 0, colorRangeM: [0, 1], fieldValues: field });
    const quarter = parseCssColor(interpolateViridis(0.25));
    for (let channel = 0; channel < 3; channel++) expect(Math.abs(colourAt(mesh.colors, 5)[channel] - quarter[channel])).toBeLessThanOrEqual(1);
    const top = parseCssColor(interpolateViridis(1));
    for (let channel = 0; channel < 3; channel++) expect(Math.abs(colourAt(mesh.colors, 0)[channel] - top[channel])).toBeLessThanOrEqual(1);
    const reversed = buildSurfaceMesh(segment, { colourMode: "slip", exaggeration: 0, colorRangeM: [0, 1], fieldValues: field, reversed: true });
    const bottom = parseCssColor(interpolateViridis(0));
    for (let channel = 0; channel < 3; channel++) expect(Math.abs(colourAt(reversed.colors, 0)[channel] - bottom[channel])).toBeLessThanOrEqual(1);
  });
});

describe("2D contour map", () => {
  // basis: common practice, no source (a point expressed in its own frame maps to itself)
  it("keeps a segment's own coordinates when it is the reference frame", () => {
    const segment = display().segments[0];
    const [s, t] = toReferenceFrame(segment.frame, segment.frame, 120, -40);
    expect(s).toBeCloseTo(120, 3);
    expect(t).toBeCloseTo(-40, 3);
  });

  it("draws one closed path per contour ring, a tip line and the peak at the maximum", () => {
    const fault = display();
    const map = buildContourMap(fault);
    const segment = fault.segments[0];
    expect(map.contours.length).toBe(segment.contours.ringStarts.length - 1);
    for (const contour of map.contours) expect(contour.d.endsWith("Z")).toBe(true);
    expect(map.tipLines).toHaveLength(1);
    expect(map.peaks[0].displacementM).toBe(segment.max.displacementM);
    expect(map.peaks[0].s).toBeCloseTo(segment.max.s, 3);
    expect(map.bounds.sMax).toBeGreaterThan(map.bounds.sMin);
  });
});
