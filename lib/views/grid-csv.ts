// The grid export: every grid node with data, as CSV rows in plane and world coordinates — x, y, z on the true fault
// surface, its offset from the reference plane and its local dip and strike. Pure, shared by the export route and the
// command line. With a coordinate reference, a comment line before the header states it.
import { planeToWorld } from "@/lib/display/frame";
import type { PipelineResult } from "@/lib/engine/pipeline";
import { toCsv, type CsvCell } from "./csv";

export const GRID_CSV_HEADER = ["segment", "s", "t", "x", "y", "z", "displacement", "throw", "offset", "local_dip", "local_strike"];

/** Every grid node that has data, at the engine's full resolution (m, degrees). */
export function gridCsv({ report, grids }: Pick<PipelineResult, "report" | "grids">, comments: string[] = []): string {
  function* rows(): Generator<CsvCell[]> {
    for (const segment of report.segments) {
      const grid = grids[segment.id];
      if (!grid) continue;
      const [nx, ny, nz] = segment.plane.normal;
      for (let row = 0; row < grid.rows; row++) {
        for (let column = 0; column < grid.columns; column++) {
          const k = row * grid.columns + column;
          const d = grid.displacementM[k];
          if (Number.isNaN(d)) continue;
          const s = grid.s0 + column * grid.cellM;
          const t = grid.t0 + row * grid.cellM;
          const w = grid.offPlaneM && Number.isFinite(grid.offPlaneM[k]) ? grid.offPlaneM[k] : 0;
          const [x, y, z] = planeToWorld(segment.plane, s, t);
          yield [segment.id, s, t, x + w * nx, y + w * ny, z + w * nz, d, grid.throwM[k], w, grid.localDipDeg?.[k] ?? NaN, grid.localStrikeDeg?.[k] ?? NaN];
        }
      }
    }
  }
  return toCsv(GRID_CSV_HEADER, rows(), comments);
}

/** The comment lines that state a coordinate reference (lib/crs.ts describeCoordinateReference) and the columns' meaning. */
export function coordinateComments(description: string | null): string[] {
  return description
    ? [
        `coordinate reference: ${description}`,
        "x, y, z lie on the fault surface; offset is its distance from the segment's reference plane (m, along the plane's upward normal)",
      ]
    : [];
}
