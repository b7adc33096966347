import { requireFaultRole } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { route } from "@/lib/api/handler";
import { LENGTH_SCALE_LIMITS_M, parseLengthScale } from "@/lib/stress/parameters";
import { stressExport } from "@/lib/stress/service";

type Params = { faultId: string };

/** Per-triangle screening values as CSV or GeoJSON (?format=csv|geojson, optional ?lengthScaleM=). */
export const GET = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  const query = new URL(request.url).searchParams;
  const format = query.get("format") ?? "csv";
  if (format !== "csv" && format !== "geojson") throw new ApiError(400, `format must be csv or geojson, not "${format}".`);
  const lengthScaleM = parseLengthScale(query.get("lengthScaleM"));
  if (Number.isNaN(lengthScaleM))
    throw new ApiError(400, `lengthScaleM must be a length in metres between ${LENGTH_SCALE_LIMITS_M[0]} and ${LENGTH_SCALE_LIMITS_M[1]}, e.g. 200.`);
  const { body, contentType, fileName } = await stressExport(access.studyId, faultId, format, lengthScaleM);
  return new Response(body, {
    headers: { "content-type": contentType, "content-disposition": `attachment; filename="${fileName}"`, "cache-control": "private, no-store" },
  });
});
