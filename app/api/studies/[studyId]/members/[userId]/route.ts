import { NextResponse } from "next/server";
import { requireStudyRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { changeRole, removeMember } from "@/lib/studies";
import { rolePatchSchema } from "@/lib/contracts/studies";

type Params = { studyId: string; userId: string };

export const PATCH = route<Params>(async (request, { studyId, userId }) => {
  const access = await requireStudyRole(studyId, "admin");
  const { role } = parseWith(rolePatchSchema, await readJson(request));
  await changeRole(access, userId, role);
  return NextResponse.json({ ok: true });
});

export const DELETE = route<Params>(async (_request, { studyId, userId }) => {
  const access = await requireStudyRole(studyId, "admin");
  await removeMember(access, userId);
  return new NextResponse(null, { status: 204 });
});
