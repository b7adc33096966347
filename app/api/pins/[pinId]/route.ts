import { NextResponse } from "next/server";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { deletePin, requirePinRole, updatePin } from "@/lib/pins/service";
import { pinPatchSchema } from "@/lib/contracts/pins";

type Params = { pinId: string };

/** `{ action: "edit", body }` (own pin, within the edit window), `{ action: "resolve" }` or `{ action: "reopen" }` (author or owner). */
export const PATCH = route<Params>(async (request, { pinId }) => {
  const access = await requirePinRole(pinId, "comment");
  const patch = parseWith(pinPatchSchema, await readJson(request, 100_000));
  const pin = await updatePin(access, patch);
  return NextResponse.json({ pin: { id: pin.id, state: pin.state, body: pin.body } });
});

export const DELETE = route<Params>(async (_request, { pinId }) => {
  const access = await requirePinRole(pinId, "comment");
  await deletePin(access);
  return new NextResponse(null, { status: 204 });
});
