import { NextResponse } from "next/server";
import { route } from "@/lib/api/handler";
import { revokeViewpointLink } from "@/lib/viewpoints";

type Params = { linkId: string };

/** Revokes the link (it stays listed as revoked; the token stops working at once). */
export const DELETE = route<Params>(async (_request, { linkId }) => NextResponse.json({ link: await revokeViewpointLink(linkId) }));
