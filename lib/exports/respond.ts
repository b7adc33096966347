import "server-only";
import { z } from "zod";
import { parseWith } from "@/lib/api/errors";
import { fileStem } from "@/lib/views/csv";
import { faultGeoJson } from "@/lib/views/geojson";
import { horizonThrowBins } from "@/lib/views/growth";
import { computedExport } from "./jobs";
import { loadExportSource, loadPicks, studyScalingPoints } from "./load";

export const exportKindSchema = z.enum(["grid.csv", "picks.csv", "profiles.csv", "contours.geojson", "scaling.json", "horizons.json"]);
export type ExportKind = z.infer<typeof exportKindSchema>;

const querySchema = z.object({
  analysis: z.string().min(1).max(64).optional(),
  mode: z.enum(["centre-line", "column-max"]).default("centre-line"),
});

function attachment(body: string, type: string, fileName: string) {
  return new Response(body, {
    headers: {
      "content-type": `${type}; charset=utf-8`,
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
      return attachment(JSON.stringify(faultGeoJson(source.fault.name, source.report)), "application/geo+json", `${stem}-contours.geojson`);
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
