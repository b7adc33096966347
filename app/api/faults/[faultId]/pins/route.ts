import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { createPin, listPins } from "@/lib/pins/service";
import { pinFilterSchema, pinInputSchema } from "@/lib/contracts/pins";

type Params = { faultId: string };

/** The fault's pins with replies; `?filter=all|mine|open`. Unread flags are relative to the last recorded visit. */
export const GET = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  const filter = parseWith(pinFilterSchema, new URL(request.url).searchParams.get("filter") ?? undefined, "filter");
  return NextResponse.json(await listPins(access, filter));
});

export const POST = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "comment");
  const input = parseWith(pinInputSchema, await readJson(request, 100_000));
  const { pin, mentioned } = await createPin(access, input);
  return NextResponse.json({ pin: { id: pin.id, pickSetVersion: pin.pickSetVersion }, mentioned: mentioned.length }, { status: 201 });
});
