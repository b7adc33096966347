import { NextResponse } from "next/server";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { deleteViewpoint, requireViewpointRole, updateViewpoint } from "@/lib/viewpoints";
import { viewpointPatchSchema } from "@/lib/contracts/viewpoints";

type Params = { viewpointId: string };

/** Rename or edit the note: the person who saved it or an owner. */
export const PATCH = route<Params>(async (request, { viewpointId }) => {
  const access = await requireViewpointRole(viewpointId, "share");
  const patch = parseWith(viewpointPatchSchema, await readJson(request, 100_000));
  return NextResponse.json({ viewpoint: await updateViewpoint(access, patch) });
});

export const DELETE = route<Params>(async (_request, { viewpointId }) => {
  await deleteViewpoint(await requireViewpointRole(viewpointId, "share"));
  return new NextResponse(null, { status: 204 });
});
