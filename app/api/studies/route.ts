import { NextResponse } from "next/server";
import { requireUser } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { createStudy, listStudiesFor } from "@/lib/studies";
import { studyInputSchema } from "@/lib/contracts/studies";

export const GET = route(async () => {
  const user = await requireUser();
  return NextResponse.json({ studies: await listStudiesFor(user) });
});

export const POST = route(async (request) => {
  const user = await requireUser();
  const input = parseWith(studyInputSchema, await readJson(request));
  return NextResponse.json({ study: await createStudy(user, input) }, { status: 201 });
});
