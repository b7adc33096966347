import { NextResponse } from "next/server";
import { requireStudyRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { deleteStudy, getStudyOverview, updateStudy } from "@/lib/studies";
import { studyPatchSchema } from "@/lib/contracts/studies";

type Params = { studyId: string };

export const GET = route<Params>(async (_request, { studyId }) => {
  const access = await requireStudyRole(studyId, "view");
  return NextResponse.json(await getStudyOverview(access));
});

export const PATCH = route<Params>(async (request, { studyId }) => {
  const access = await requireStudyRole(studyId, "admin");
  const patch = parseWith(studyPatchSchema, await readJson(request));
  return NextResponse.json({ study: await updateStudy(access, patch) });
});

export const DELETE = route<Params>(async (_request, { studyId }) => {
  const access = await requireStudyRole(studyId, "admin");
  await deleteStudy(access);
  return new NextResponse(null, { status: 204 });
});
