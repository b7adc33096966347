import { NextResponse } from "next/server";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { replyToPin, requirePinRole } from "@/lib/pins/service";
import { replyInputSchema } from "@/lib/contracts/pins";

type Params = { pinId: string };

export const POST = route<Params>(async (request, { pinId }) => {
  const access = await requirePinRole(pinId, "comment");
  const input = parseWith(replyInputSchema, await readJson(request, 100_000));
  const { reply } = await replyToPin(access, input);
  return NextResponse.json({ reply: { id: reply.id } }, { status: 201 });
});
