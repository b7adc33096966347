import { describe, expect, it } from "vitest";
import { interpolateRdBu, interpolateViridis } from "d3-scale-chromatic";
import { buildFaultDisplay } from "@/lib/display/build";
import { worldToPlane } from "@/lib/display/frame";
import type { FaultDisplay } from "@/lib/contracts/display";
import {
  buildContourLines,
  buildMappedLimitLines,
  buildPeakPoints,
  buildPickPoints,
  buildSurfaceMesh,
  buildTipLines,
  depthLabels,
  contrastingLineColour,
  displayBounds,
  framingPoints,
  lineLiftM,
  linearToSrgb255,
  niceTicks,
  legendTicks,
  parseCssColor,
  surfaceValueAt,
} from "@/scene/geometry";
import { presetCamera } from "@/scene/cameraStore";
import { domeGrid, fixtureAnalysis, picksOnPlane, UTM_CENTROID } from "./fixture";

function singleSegmentDisplay(holes: number[] = [], picks: { s: number; t: number; throwM: number }[] = []): FaultDisplay {
  const grid = domeGrid({ holes });
  const report = fixtureAnalysis({ main: grid }, { main: UTM_CENTROID });
  return buildFaultDisplay({
    report,
    grids: { main: grid },
    picks: picksOnPlane(
      report,
      picks.map((pick) => ({ segment: "main", ...pick })),
    ),
  });
}

/** `tolerance` in 0–255 units: half a unit for viridis (a 256-step table in d3 too), more for interpolated scales */
function expectColor(colors: Float32Array, vertex: number, css: string, tolerance = 0.51) {
  const expected = parseCssColor(css);
  for (let channel = 0; channel < 3; channel++) {
    expect(Math.abs(linearToSrgb255(colors[vertex * 3 + channel]) - expected[channel])).toBeLessThan(tolerance);
  }
}

describe("buildSurfaceMesh", () => {
  const options = { colourMode: "displacement" as const, exaggeration: 0, colorRangeM: [0, 50] as [number, number] };

  // basis: common practice, no source (one vertex per grid node, two triangles per full cell)
  it("has one vertex per node and two triangles per cell", () => {
    const display = singleSegmentDisplay();
    const { grid } = display.segments[0];
    const mesh = buildSurfaceMesh(display.segments[0], options);
    expect(mesh.positions.length).toBe(grid.columns * grid.rows * 3);
    expect(mesh.colors.length).toBe(grid.columns * grid.rows * 3);
    expect(mesh.indices.length).toBe((grid.columns - 1) * (grid.rows - 1) * 2 * 3);
  });

  // basis: d3-scale-chromatic interpolateViridis is the reference colour scale (docs/design.md, Screens: viridis)
  it("colours nodes with viridis at known values, in three.js's linear space", () => {
    const display = singleSegmentDisplay();
    const segment = display.segments[0];
    const { grid } = segment;
    const mesh = buildSurfaceMesh(segment, options);
    const peak = 4 * grid.columns + 5; // centre node, 50 m
    const corner = 0; // 0 m
    expect(grid.displacementM[peak]).toBe(50);
    expect(grid.displacementM[corner]).toBe(0);
    expectColor(mesh.colors, peak, interpolateViridis(1));
    expectColor(mesh.colors, corner, interpolateViridis(0));
    // a node of exactly 25 m: rescale the range so a known node sits at the middle of the scale
    const node = 4 * grid.columns + 7; // s = 20, t = 0: 50·(1 − (20/40)²) = 37.5 m
    expect(grid.displacementM[node]).toBeCloseTo(37.5, 5);
    const middle = buildSurfaceMesh(segment, { ...options, colorRangeM: [25, 50] });
    expectColor(middle.colors, node, interpolateViridis(0.5));
  });

  // basis: common practice, no source
  it("colours by throw in throw mode", () => {
    const display = singleSegmentDisplay();
    const segment = display.segments[0];
    const peak = 4 * segment.grid.columns + 5;
    const throwPeak = segment.grid.throwM[peak];
    const mesh = buildSurfaceMesh(segment, { ...options, colourMode: "throw", colorRangeM: [0, throwPeak * 2] });
    expectColor(mesh.colors, peak, interpolateViridis(0.5));
  });

  // basis: common practice, no source (no interpolation across missing data)
  it("leaves NaN holes open: no triangle touches a node without data", () => {
    const hole = 4 * 11 + 3;
    const display = singleSegmentDisplay([hole]);
    const { grid } = display.segments[0];
    const mesh = buildSurfaceMesh(display.segments[0], options);
    expect(Array.from(mesh.indices)).not.toContain(hole);
    // the four cells around the hole keep one triangle each over their three good corners
    expect(mesh.indices.length / 3).toBe((grid.columns - 1) * (grid.rows - 1) * 2 - 4);
    for (const index of mesh.indices) expect(Number.isNaN(grid.displacementM[index])).toBe(false);
    for (const value of mesh.positions) expect(Number.isFinite(value)).toBe(true);
  });

  // basis: common practice, no source (vertical exaggeration drawn along the plane normal)
  it("lays nodes on the plane, raised along the normal by displacement × exaggeration", () => {
    const display = singleSegmentDisplay();
    const segment = display.segments[0];
    const { grid, frame } = segment;
    const mesh = buildSurfaceMesh(segment, { ...options, exaggeration: 3 });
    for (const node of [0, 4 * grid.columns + 5, 2 * grid.columns + 7]) {
      const [s, t, h] = worldToPlane(frame, mesh.positions[node * 3], mesh.positions[node * 3 + 1], mesh.positions[node * 3 + 2]);
      expect(s).toBeCloseTo(grid.s0 + (node % grid.columns) * grid.cellM, 3);
      expect(t).toBeCloseTo(grid.t0 + Math.floor(node / grid.columns) * grid.cellM, 3);
      expect(h).toBeCloseTo(grid.displacementM[node] * 3, 3);
    }
  });
});

describe("buildContourLines", () => {
  // basis: marching squares places contour vertices on cell edges by linear interpolation (d3-contour), so the
  // triangulated surface shows exactly the contour's level there
  it("places every contour vertex on the surface at its level, lifted along the normal", () => {
    for (const exaggeration of [0, 2.5]) {
      const display = singleSegmentDisplay();
      const segment = display.segments[0];
      const lift = lineLiftM(display);
      const lines = buildContourLines(display, exaggeration);
      const pointCount = lines.positions.length / 3;
      expect(pointCount % 2).toBe(0);
      expect(pointCount).toBeGreaterThan(20);
      const levels = new Set<number>();
      for (let point = 0; point < pointCount; point++) {
        const [s, t, h] = worldToPlane(segment.frame, lines.positions[point * 3], lines.positions[point * 3 + 1], lines.positions[point * 3 + 2]);
        const level = (h - lift) / (exaggeration || 1);
        const surface = surfaceValueAt(segment.grid, segment.grid.displacementM, s, t);
        if (exaggeration > 0) {
          expect(Math.abs(surface - level)).toBeLessThan(1e-3);
          levels.add(Math.round(level));
        } else {
          expect(h).toBeCloseTo(lift, 3);
          expect(segment.contours.levelsM.some((candidate) => Math.abs(candidate - surface) < 1e-3)).toBe(true);
        }
      }
      if (exaggeration > 0) expect([...levels].sort((a, b) => a - b)).toEqual([10, 20, 30, 40]);
    }
  });
});

describe("tip line, mapped limit, peak", () => {
  // basis: common practice, no source (the tip line is where displacement falls to zero: height 0 + lift)
  it("draws the tip line on the plane and the mapped limit on the surface, as closed outlines", () => {
    const display = singleSegmentDisplay();
    const segment = display.segments[0];
    const lift = lineLiftM(display);
    const tip = buildTipLines(display).positions;
    // a closed polygon of n distinct vertices gives n segments
    expect(tip.length / 6).toBe(segment.tipLine.length - 1);
    for (let point = 0; point < tip.length / 3; point++) {
      const [s, t, h] = worldToPlane(segment.frame, tip[point * 3], tip[point * 3 + 1], tip[point * 3 + 2]);
      expect(h).toBeCloseTo(lift, 3);
      expect((s / segment.tipLine[0][0]) ** 2 + (t / segment.tipLine[6][1]) ** 2).toBeCloseTo(1, 4);
    }
    const mapped = buildMappedLimitLines(display, 2).positions;
    for (let point = 0; point < mapped.length / 3; point++) {
      const [, , h] = worldToPlane(segment.frame, mapped[point * 3], mapped[point * 3 + 1], mapped[point * 3 + 2]);
      expect(h).toBeGreaterThan(lift);
    }
  });

  // basis: common practice, no source
  it("marks the peak at the maximum displacement", () => {
    const display = singleSegmentDisplay();
    const segment = display.segments[0];
    const [x, y, z] = buildPeakPoints(display, 1).positions;
    const [s, t, h] = worldToPlane(segment.frame, x, y, z);
    expect([s, t]).toEqual([expect.closeTo(0, 3), expect.closeTo(0, 3)]);
    expect(h).toBeCloseTo(50 + 2 * lineLiftM(display), 3);
  });
});

describe("buildPickPoints", () => {
  // basis: d3-scale-chromatic interpolateRdBu (diverging) read so that red = pick above the surface
  it("colours picks by residual: white on the surface, red above, blue below", () => {
    const display = singleSegmentDisplay(
      [],
      [
        { s: 20, t: 0, throwM: 37.5 * Math.sin(Math.PI / 3) },
        { s: 20, t: 0, throwM: 47.5 * Math.sin(Math.PI / 3) },
        { s: 20, t: 0, throwM: 27.5 * Math.sin(Math.PI / 3) },
      ],
    );
    expect(display.picks.residualM[0]).toBeCloseTo(0, 3);
    const points = buildPickPoints(display, 0, 10);
    expect(points.positions.length).toBe(9);
    expectColor(points.colors, 0, interpolateRdBu(0.5));
    // the table's end entries sit half a step in from the scale's ends
    expectColor(points.colors, 1, interpolateRdBu(0), 2);
    expectColor(points.colors, 2, interpolateRdBu(1), 2);
  });
});

describe("bounds, depth labels and camera presets", () => {
  // basis: common practice, no source
  it("labels round depths along the plane, at the right elevation", () => {
    const display = singleSegmentDisplay();
    const labels = depthLabels(display, display.origin[2]);
    expect(labels.length).toBeGreaterThan(1);
    for (const { position, depthM } of labels) {
      expect(position[2] + display.origin[2]).toBeCloseTo(-depthM, 2);
      expect(depthM % 5).toBe(0);
    }
  });

  // basis: common practice, no source
  it("picks round tick values", () => {
    expect(niceTicks(1983, 2041, 6)).toEqual([1990, 2000, 2010, 2020, 2030, 2040]);
    expect(niceTicks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
  });

  it("legend ticks are evenly spaced round values, at most the count asked for (common practice, no source)", () => {
    expect(legendTicks(0, 81.5, 7)).toEqual([0, 20, 40, 60, 80]);
    expect(legendTicks(10.2, 50.1, 7)).toEqual([20, 30, 40, 50]);
    expect(legendTicks(-3.2, 0.4, 7)).toEqual([-3, -2, -1, 0]);
    for (const [low, high] of [
      [0, 81.5],
      [10.2, 50.1],
      [0, 0.87],
      [-12, 140],
    ]) {
      const ticks = legendTicks(low, high, 7);
      expect(ticks.length).toBeLessThanOrEqual(7);
      expect(ticks.length).toBeGreaterThanOrEqual(2);
      const steps = ticks.slice(1).map((tick, k) => tick - ticks[k]);
      for (const step of steps) expect(step).toBeCloseTo(steps[0], 9);
    }
  });

  // basis: common practice, no source (map view: looking straight down with north up on the screen)
  it("puts presets in world coordinates: map view from above, face-on along the normal", () => {
    const display = singleSegmentDisplay();
    const bounds = displayBounds(display, 0);
    const input = { bounds, frame: display.segments[0].frame, origin: display.origin };
    const map = presetCamera("map", input);
    const look = map.target.map((value, axis) => value - map.position[axis]);
    expect(look[2]).toBeLessThan(0);
    expect(Math.hypot(look[0], look[1]) / Math.abs(look[2])).toBeLessThan(0.01);
    expect(look[1]).toBeGreaterThan(0); // the camera sits a hair south, so north is up the screen
    expect(map.target[0]).toBeGreaterThan(display.origin[0] - 200);
    const face = presetCamera("faceOn", input);
    const direction = face.position.map((value, axis) => value - face.target[axis]);
    const length = Math.hypot(...direction);
    display.segments[0].frame.normal.forEach((component, axis) => expect(direction[axis] / length).toBeCloseTo(component, 6));
  });

  // basis: pinhole camera geometry (common practice, no source): a point is in view when its offset from the axis
  // is at most its depth times tan(fov/2) (times the aspect ratio horizontally)
  it("fits the camera to the fault's outline from any preset: every point in view right of the legend's strip, the widest one at the margin", () => {
    const display = singleSegmentDisplay();
    const points = framingPoints(display, 0);
    const aspect = 1.65;
    const leftInset = 0.25;
    const rightInset = 0.1;
    for (const preset of ["overview", "map", "faceOn", "alongStrike"] as const) {
      const camera = presetCamera(preset, {
        bounds: displayBounds(display, 0),
        frame: display.segments[0].frame,
        origin: display.origin,
        points,
        aspect,
        leftInset,
        rightInset,
      });
      const forward = camera.target.map((value, axis) => value - camera.position[axis]);
      const length = Math.hypot(...forward);
      const back = forward.map((value) => -value / length) as [number, number, number];
      // right = world up × back, as three.js's lookAt builds it
      const right = [-back[1], back[0], 0];
      const r = Math.hypot(...right) > 1e-9 ? right.map((v) => v / Math.hypot(...right)) : [1, 0, 0];
      const up = [back[1] * r[2] - back[2] * r[1], back[2] * r[0] - back[0] * r[2], back[0] * r[1] - back[1] * r[0]];
      const tanV = Math.tan((camera.fov / 2) * (Math.PI / 180));
      let widest = 0;
      let leftmost = Infinity;
      let rightmost = -Infinity;
      for (let i = 0; i < points.length; i += 3) {
        const relative = [0, 1, 2].map((axis) => points[i + axis] + display.origin[axis] - camera.position[axis]);
        const depth = -(relative[0] * back[0] + relative[1] * back[1] + relative[2] * back[2]);
        expect(depth, preset).toBeGreaterThan(0);
        const x = (relative[0] * r[0] + relative[1] * r[1] + relative[2] * r[2]) / (depth * tanV * aspect);
        const y = (relative[0] * up[0] + relative[1] * up[1] + relative[2] * up[2]) / (depth * tanV);
        // x in the free part of the view, re-centred: −1 at the left strip's edge, 1 at the right strip's
        const free = (x - (leftInset - rightInset)) / (1 - leftInset - rightInset);
        leftmost = Math.min(leftmost, x);
        rightmost = Math.max(rightmost, x);
        widest = Math.max(widest, Math.abs(free), Math.abs(y));
      }
      expect(leftmost, preset).toBeGreaterThan(-1 + 2 * leftInset - 0.02);
      expect(rightmost, preset).toBeLessThan(1 - 2 * rightInset + 0.02);
      expect(widest, preset).toBeLessThanOrEqual(1 / 1.1 + 0.02);
      expect(widest, preset).toBeGreaterThan(1 / 1.1 - 0.05);
    }
  });

  // basis: WCAG 2.x relative luminance and contrast ratio
  it("draws contour lines light on the dark end of the colour scale and dark on the light end", () => {
    expect(contrastingLineColour(interpolateViridis(0))).toBe("#f1f5f9");
    expect(contrastingLineColour(interpolateViridis(0.15))).toBe("#f1f5f9");
    expect(contrastingLineColour(interpolateViridis(0.85))).toBe("#0f172a");
    expect(contrastingLineColour(interpolateViridis(1))).toBe("#0f172a");
    expect(contrastingLineColour("#ffffff")).toBe("#0f172a");
    expect(contrastingLineColour("#000000")).toBe("#f1f5f9");
  });
});
