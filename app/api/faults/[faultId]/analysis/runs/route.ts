import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { analysisRuns } from "@/lib/analysis/reports";

type Params = { faultId: string };

/** Every run of a pick set's analysis (?pickSet=…, default the newest pick set), newest first, with headline numbers. */
export const GET = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  const pickSetId = new URL(request.url).searchParams.get("pickSet") ?? undefined;
  return NextResponse.json(await analysisRuns(faultId, pickSetId));
});
