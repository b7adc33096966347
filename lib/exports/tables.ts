import "server-only";
import { worldToPlane } from "@/lib/display/frame";
import { EDGE_TOLERANT_BILINEAR, sampleGrid } from "@/lib/display/grid-sampler";
import type { ReportWithGrids } from "@/lib/engine/pipeline";
import type { PickColumns } from "@/lib/engine/types";
import { toCsv, type CsvCell } from "@/lib/views/csv";
import { columnMaxProfile, strikeProfileAtT, surfacePointToWorld } from "@/lib/views/profiles";

export { GRID_CSV_HEADER, gridCsv } from "@/lib/views/grid-csv";

export const PICKS_CSV_HEADER = ["row", "segment", "horizon", "x", "y", "z", "throw", "heave", "s", "t", "displacement", "surface_displacement", "residual"];

/** Picks with their plane coordinates, displacement, the surface value at the pick and the residual (pick − surface), m. */
export function picksCsv(picks: PickColumns, { report, grids, pickDisplacementM }: ReportWithGrids, comments: string[] = []): string {
  const bySegmentName = new Map(report.segments.map((segment) => [segment.id, segment]));
  function* rows(): Generator<CsvCell[]> {
    for (let i = 0; i < picks.x.length; i++) {
      const name = picks.segmentNames[picks.segment[i]];
      const segment = bySegmentName.get(name);
      const horizon = picks.horizon[i] >= 0 ? picks.horizonNames[picks.horizon[i]] : "";
      const heave = picks.heaveM[i];
      if (!segment) {
        yield [picks.sourceRow[i], name, horizon, picks.x[i], picks.y[i], picks.z[i], picks.throwM[i], heave, NaN, NaN, NaN, NaN, NaN];
        continue;
      }
      const [s, t] = worldToPlane(segment.plane, picks.x[i], picks.y[i], picks.z[i]);
      // from the local dip and the rake, as the analysis computed it
      const displacement = pickDisplacementM[i];
      const grid = grids[segment.id];
      const surface = grid ? sampleGrid(grid, grid.displacementM, s, t, EDGE_TOLERANT_BILINEAR) : NaN;
      yield [
        picks.sourceRow[i],
        name,
        horizon,
        picks.x[i],
        picks.y[i],
        picks.z[i],
        picks.throwM[i],
        heave,
        s,
        t,
        displacement,
        surface,
        displacement - surface,
      ];
    }
  }
  return toCsv(PICKS_CSV_HEADER, rows(), comments);
}

export const PROFILE_CSV_HEADER = ["segment", "mode", "s", "t", "x", "y", "z", "displacement", "throw"];

/** Strike profiles of every segment at full resolution: the centre line through Dmax, or the maximum per column. */
export function profilesCsv({ report, grids }: Pick<ReportWithGrids, "report" | "grids">, mode: "centre-line" | "column-max", comments: string[] = []): string {
  function* rows(): Generator<CsvCell[]> {
    for (const segment of report.segments) {
      const grid = grids[segment.id];
      if (!grid) continue;
      const profile = mode === "column-max" ? columnMaxProfile(grid) : strikeProfileAtT(grid, segment.max.t);
      for (let k = 0; k < profile.s.length; k++) {
        const [x, y, z] = Number.isFinite(profile.t[k]) ? surfacePointToWorld(segment, profile.s[k], profile.t[k]) : [NaN, NaN, NaN];
        yield [segment.id, mode, profile.s[k], profile.t[k], x, y, z, profile.displacementM[k], profile.throwM[k]];
      }
    }
  }
  return toCsv(PROFILE_CSV_HEADER, rows(), comments);
}
