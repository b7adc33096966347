import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { latestAnalysisResponseBody } from "@/lib/analysis/runner";

type Params = { faultId: string };

export const GET = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  const pickSetId = new URL(request.url).searchParams.get("pickSet") ?? undefined;
  return new Response(await latestAnalysisResponseBody(faultId, pickSetId), { headers: { "content-type": "application/json" } });
});
