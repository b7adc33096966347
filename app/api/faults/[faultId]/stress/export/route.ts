import { requireFaultRole } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { route } from "@/lib/api/handler";
import { stressExport } from "@/lib/stress/service";

type Params = { faultId: string };

/** Per-triangle screening values as CSV or GeoJSON (?format=csv|geojson). */
export const GET = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  const format = new URL(request.url).searchParams.get("format") ?? "csv";
  if (format !== "csv" && format !== "geojson") throw new ApiError(400, `format must be csv or geojson, not "${format}".`);
  const { body, contentType, fileName } = await stressExport(access.studyId, faultId, format);
  return new Response(body, { headers: { "content-type": contentType, "content-disposition": `attachment; filename="${fileName}"`, "cache-control": "private, no-store" } });
});
