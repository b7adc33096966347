import { NextResponse } from "next/server";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { createViewpointLink, listViewpointLinks, requireViewpointRole } from "@/lib/viewpoints";
import { linkInputSchema } from "@/lib/contracts/viewpoints";

type Params = { viewpointId: string };

/** Links are managed by those who may share (owner, interpreter, reviewer); tokens are never listed. */
export const GET = route<Params>(async (_request, { viewpointId }) => {
  const access = await requireViewpointRole(viewpointId, "share");
  return NextResponse.json({ links: await listViewpointLinks(access) });
});

/** Makes a link; the response carries the token once. Rate-limited per person. */
export const POST = route<Params>(async (request, { viewpointId }) => {
  const access = await requireViewpointRole(viewpointId, "share");
  const input = parseWith(linkInputSchema, await readJson(request, 10_000));
  return NextResponse.json({ link: await createViewpointLink(access, input) }, { status: 201 });
});
