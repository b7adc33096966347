import { describe, expect, it } from "vitest";
import type { AnalysisReport } from "@/lib/engine/types";
import { strikeProjection } from "@/lib/views/projection";

// Two vertical segments striking north (exact by construction; strike projection is common practice, no source):
// s runs north, t straight down, so a point (s, t) of a segment centred at (x0, y0, z0) is at u = y0 − y_ref + s, depth = −z0 + t.
function segment(id: string, centroid: [number, number, number]) {
  return {
    id,
    plane: { strikeDeg: 0, dipDeg: 90, dipDirectionDeg: 90, rmsM: 0, centroid, strikeVector: [0, 1, 0], dipVector: [0, 0, -1], normal: [1, 0, 0] },
    contours: [
      {
        levelM: 10,
        rings: [
          [
            [0, 0],
            [100, 0],
            [100, 50],
            [0, 0],
          ],
        ],
      },
    ],
    tipLine: {
      polygon: [
        [-200, -100],
        [200, -100],
        [200, 100],
        [-200, 100],
      ],
    },
    mappedLimit: {
      polygon: [
        [-150, -80],
        [150, -80],
        [150, 80],
        [-150, -80],
      ],
    },
    max: { s: 10, t: 20, displacementM: 42 },
  };
}

describe("strike projection of a fault's segments", () => {
  const report = { segments: [segment("north", [1000, 5000, -2000]), segment("south", [1060, 4500, -2100])] } as unknown as Pick<AnalysisReport, "segments">;
  const projection = strikeProjection(report);

  it("puts every segment on one along-strike axis and depth", () => {
    expect(projection.strikeAzimuthDeg).toBeCloseTo(0, 9);
    const north = projection.contours.filter((row) => row.segment === "north").map(({ u, depthM }) => [u, depthM]);
    expect(north).toEqual([
      [0, 2000],
      [100, 2000],
      [100, 2050],
      [0, 2000],
    ]);
    const south = projection.contours.filter((row) => row.segment === "south").map(({ u, depthM }) => [u, depthM]);
    expect(south).toEqual([
      [-500, 2100],
      [-400, 2100],
      [-400, 2150],
      [-500, 2100],
    ]);
    expect(projection.peaks).toEqual([
      { u: 10, depthM: 2020, segment: "north", displacementM: 42 },
      { u: -490, depthM: 2120, segment: "south", displacementM: 42 },
    ]);
  });

  it("closes the tip lines and keeps closed mapped limits as they are", () => {
    const tips = projection.tipLines.filter((row) => row.segment === "north");
    expect(tips).toHaveLength(5);
    expect(tips[0]).toEqual(tips[4]);
    expect(projection.mappedLimits.filter((row) => row.segment === "north")).toHaveLength(4);
  });
});
