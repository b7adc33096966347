import "server-only";
import { z } from "zod";
import { parseWith } from "@/lib/api/errors";
import { fileStem } from "@/lib/views/csv";
import { faultGeoJson } from "@/lib/views/geojson";
import { horizonThrowBins } from "@/lib/views/growth";
import { computedExport } from "./jobs";
import { ApiError } from "@/lib/api/errors";
import { analysisDisplay } from "@/lib/analysis/reports";
import { decodeFaultDisplay } from "@/lib/display/payload";
import { toLongitudeLatitude } from "@/lib/crs";
import { faultGltf } from "@/lib/views/gltf";
import { loadExportSource, loadPicks, studyScalingPoints } from "./load";

export const exportKindSchema = z.enum(["grid.csv", "picks.csv", "profiles.csv", "contours.geojson", "surface.glb", "scaling.json", "horizons.json"]);
export type ExportKind = z.infer<typeof exportKindSchema>;

const querySchema = z.object({
  analysis: z.string().min(1).max(64).optional(),
  mode: z.enum(["centre-line", "column-max"]).default("centre-line"),
});

function attachment(body: string | Uint8Array, type: string, fileName: string) {
  return new Response(body as BodyInit, {
    headers: {
      "content-type": typeof body === "string" ? `${type}; charset=utf-8` : type,
      "content-disposition": `attachment; filename="${fileName}"`,
      "cache-control": "private, no-store",
    },
  });
}

/** Builds one export of a fault's latest finished analysis (or the one named by ?analysis=). Access is checked by the caller. */
export async function exportResponse(faultId: string, kindParam: string, url: URL): Promise<Response> {
  const kind = parseWith(exportKindSchema, kindParam, "path (export kind)");
  const query = parseWith(querySchema, Object.fromEntries(url.searchParams), "query");
  const source = await loadExportSource(faultId, query.analysis);
  const stem = `${fileStem(source.fault.name)}-v${source.pickSet.version}`;
  switch (kind) {
    case "contours.geojson":
      return attachment(
        JSON.stringify(faultGeoJson(source.fault.name, source.report, source.coordinateReference)),
        "application/geo+json",
        `${stem}-contours.geojson`,
      );
    case "surface.glb": {
      // the stored display payload (decimated grid, surface, tip lines) is what the 3D view draws: the same model
      const payload = await analysisDisplay(faultId, source.analysis.id);
      if (!payload) throw new ApiError(404, "This analysis has no 3D surface to export; run it again.");
      const display = decodeFaultDisplay(payload);
      const reference = source.coordinateReference;
      const bytes = faultGltf(display, {
        faultName: source.fault.name,
        coordinateReference: reference,
        originLongitudeLatitude: reference ? toLongitudeLatitude(reference, display.origin[0], display.origin[1]) : null,
      });
      return attachment(bytes, "model/gltf-binary", `${stem}-surface.glb`);
    }
    case "scaling.json":
      return new Response(JSON.stringify({ studyId: source.fault.studyId, faults: await studyScalingPoints(source.fault.studyId) }), {
        headers: { "content-type": "application/json", "cache-control": "private, no-store" },
      });
    case "horizons.json": {
      const picks = await loadPicks(source);
      return new Response(JSON.stringify({ horizons: picks.horizonNames, bins: horizonThrowBins(picks, source.report) }), {
        headers: { "content-type": "application/json", "cache-control": "private, no-store" },
      });
    }
    // these recompute the full-resolution grids: a job for a worker (lib/exports/jobs.ts)
    case "grid.csv":
      return attachment(await computedExport(source, kind, query.mode, `${stem}-grid.csv`), "text/csv", `${stem}-grid.csv`);
    case "picks.csv":
      return attachment(await computedExport(source, kind, query.mode, `${stem}-picks.csv`), "text/csv", `${stem}-picks.csv`);
    case "profiles.csv": {
      const fileName = `${stem}-profiles-${query.mode}.csv`;
      return attachment(await computedExport(source, kind, query.mode, fileName), "text/csv", fileName);
    }
  }
}
