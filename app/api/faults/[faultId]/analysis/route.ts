import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { latestAnalysisForFault } from "@/lib/analysis/runner";

type Params = { faultId: string };

export const GET = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  const pickSetId = new URL(request.url).searchParams.get("pickSet") ?? undefined;
  return NextResponse.json({ analysis: await latestAnalysisForFault(faultId, pickSetId) });
});
