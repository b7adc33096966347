import { NextResponse } from "next/server";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { deleteReply, editReply, requirePinRole } from "@/lib/pins/service";
import { replyInputSchema } from "@/lib/contracts/pins";

type Params = { pinId: string; replyId: string };

/** Edit your own reply's text within the edit window. */
export const PATCH = route<Params>(async (request, { pinId, replyId }) => {
  const access = await requirePinRole(pinId, "comment");
  const input = parseWith(replyInputSchema, await readJson(request, 100_000));
  const reply = await editReply(access, replyId, input);
  return NextResponse.json({ reply: { id: reply.id, body: reply.body } });
});

export const DELETE = route<Params>(async (_request, { pinId, replyId }) => {
  const access = await requirePinRole(pinId, "comment");
  await deleteReply(access, replyId);
  return new NextResponse(null, { status: 204 });
});
