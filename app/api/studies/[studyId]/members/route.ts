import { NextResponse } from "next/server";
import { requireStudyRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { inviteMember, listPendingInvitations } from "@/lib/members";
import { listMembers } from "@/lib/studies";
import { memberInputSchema } from "@/lib/contracts/studies";

type Params = { studyId: string };

export const GET = route<Params>(async (_request, { studyId }) => {
  const access = await requireStudyRole(studyId, "view");
  const invitations = access.role === "owner" ? await listPendingInvitations(studyId) : [];
  return NextResponse.json({ members: await listMembers(studyId), invitations });
});

export const POST = route<Params>(async (request, { studyId }) => {
  const access = await requireStudyRole(studyId, "admin");
  const input = parseWith(memberInputSchema, await readJson(request));
  return NextResponse.json({ invitation: await inviteMember(access, input.email, input.role) }, { status: 201 });
});
