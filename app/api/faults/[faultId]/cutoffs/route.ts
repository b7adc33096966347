import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { cutoffSetForFault } from "@/lib/seal/service";

type Params = { faultId: string };

/** The cut-off set of the pick set named (?pickSet=), else the fault's newest: stations, traces and provenance. */
export const GET = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  const pickSetId = new URL(request.url).searchParams.get("pickSet") ?? undefined;
  return NextResponse.json({ cutoffSet: await cutoffSetForFault(faultId, pickSetId) });
});
