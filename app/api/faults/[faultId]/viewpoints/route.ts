import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { createViewpoint, listViewpoints } from "@/lib/viewpoints";
import { viewpointInputSchema } from "@/lib/contracts/viewpoints";

type Params = { faultId: string };

/** Every member may list and restore viewpoints. */
export const GET = route<Params>(async (_request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  return NextResponse.json({ viewpoints: await listViewpoints(access) });
});

/** Saving needs the share permission (owner, interpreter, reviewer). */
export const POST = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "share");
  const input = parseWith(viewpointInputSchema, await readJson(request, 100_000));
  return NextResponse.json({ viewpoint: await createViewpoint(access, input) }, { status: 201 });
});
