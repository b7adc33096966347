import { NextResponse } from "next/server";
import { route } from "@/lib/api/handler";
import { publicViewpoint } from "@/lib/viewpoints";

type Params = { token: string };

/** No session: the token alone opens one fault's saved view, read-only. 404 unknown, 410 revoked or expired. */
export const GET = route<Params>(async (_request, { token }) =>
  NextResponse.json(await publicViewpoint(token), { headers: { "cache-control": "no-store", "x-robots-tag": "noindex" } }),
);
