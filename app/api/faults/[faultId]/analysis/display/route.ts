import { requireFaultRole } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { route } from "@/lib/api/handler";
import { analysisDisplay } from "@/lib/analysis/reports";

type Params = { faultId: string };

/** The decimated display grid as compact binary (see lib/display/payload.ts). */
export const GET = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  const analysisId = new URL(request.url).searchParams.get("analysis");
  if (!analysisId) throw new ApiError(400, "Name the analysis (?analysis=…).");
  const display = await analysisDisplay(faultId, analysisId);
  if (!display) throw new ApiError(404, "No display data for this analysis yet.");
  return new Response(Buffer.from(display), { headers: { "content-type": "application/octet-stream", "cache-control": "private, max-age=3600" } });
});
