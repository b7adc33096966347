import { NextResponse } from "next/server";
import { requireStudyRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { createFault, listFaults } from "@/lib/studies";
import { faultInputSchema } from "@/lib/contracts/studies";

type Params = { studyId: string };

export const GET = route<Params>(async (_request, { studyId }) => {
  await requireStudyRole(studyId, "view");
  return NextResponse.json({ faults: await listFaults(studyId) });
});

export const POST = route<Params>(async (request, { studyId }) => {
  const access = await requireStudyRole(studyId, "edit");
  const input = parseWith(faultInputSchema, await readJson(request));
  return NextResponse.json({ fault: await createFault(access, input) }, { status: 201 });
});
