import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { deleteFault, getFault, updateFault } from "@/lib/studies";
import { faultPatchSchema } from "@/lib/contracts/studies";

type Params = { faultId: string };

export const GET = route<Params>(async (_request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  return NextResponse.json({ fault: await getFault(faultId) });
});

export const PATCH = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "edit");
  const patch = parseWith(faultPatchSchema, await readJson(request));
  return NextResponse.json({ fault: await updateFault(access, faultId, patch) });
});

export const DELETE = route<Params>(async (_request, { faultId }) => {
  const access = await requireFaultRole(faultId, "edit");
  await deleteFault(access, faultId);
  return new NextResponse(null, { status: 204 });
});
