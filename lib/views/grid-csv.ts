// The grid export: every grid node with data, as CSV rows in plane and world coordinates. Pure, shared by the
// export route and the command line.
import { planeToWorld } from "@/lib/display/frame";
import type { ReportWithGrids } from "@/lib/engine/pipeline";
import { toCsv, type CsvCell } from "./csv";

export const GRID_CSV_HEADER = ["segment", "s", "t", "x", "y", "z", "displacement", "throw"];

/** Every grid node that has data, at the engine's full resolution (m). */
export function gridCsv({ report, grids }: ReportWithGrids): string {
  function* rows(): Generator<CsvCell[]> {
    for (const segment of report.segments) {
      const grid = grids[segment.id];
      if (!grid) continue;
      for (let row = 0; row < grid.rows; row++) {
        for (let column = 0; column < grid.columns; column++) {
          const k = row * grid.columns + column;
          const d = grid.displacementM[k];
          if (Number.isNaN(d)) continue;
          const s = grid.s0 + column * grid.cellM;
          const t = grid.t0 + row * grid.cellM;
          const [x, y, z] = planeToWorld(segment.plane, s, t);
          yield [segment.id, s, t, x, y, z, d, grid.throwM[k]];
        }
      }
    }
  }
  return toCsv(GRID_CSV_HEADER, rows());
}
