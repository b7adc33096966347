import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { markPinsVisited } from "@/lib/pins/service";

type Params = { faultId: string };

/** Records that the signed-in member has seen this fault's pins (unread markers count from now). */
export const POST = route<Params>(async (_request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  return NextResponse.json(await markPinsVisited(access));
});
