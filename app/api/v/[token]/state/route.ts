import { NextResponse } from "next/server";
import { route } from "@/lib/api/handler";
import { linkStateResponse } from "@/lib/viewpoints";

type Params = { token: string };

/** No session: whether a link works, and nothing else. 200 active, 404 unknown, 410 revoked or expired. */
export const GET = route<Params>(async (_request, { token }) => {
  const { status, state } = await linkStateResponse(token);
  return NextResponse.json({ state }, { status, headers: { "cache-control": "no-store", "x-robots-tag": "noindex" } });
});
