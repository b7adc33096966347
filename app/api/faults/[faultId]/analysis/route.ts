import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { latestAnalysisResponseBody } from "@/lib/analysis/reports";

type Params = { faultId: string };

export const GET = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  const query = new URL(request.url).searchParams;
  // ?contours=0: the report without contour rings, as the workspace reads it (it draws contours from the display payload)
  // ?analysis=<id>: one run exactly (runs of the same pick set are kept side by side)
  const body = await latestAnalysisResponseBody(faultId, {
    pickSetId: query.get("pickSet") ?? undefined,
    analysisId: query.get("analysis") ?? undefined,
    contourRings: query.get("contours") !== "0",
  });
  return new Response(body, { headers: { "content-type": "application/json" } });
});
