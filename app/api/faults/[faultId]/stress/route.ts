import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { stressStateInputSchema } from "@/lib/contracts/stress";
import { saveStressState, stressStateForFault } from "@/lib/stress/service";

type Params = { faultId: string };

/** The stress state that applies to the fault (its own, else the study default) with both version lists. */
export const GET = route<Params>(async (_request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  return NextResponse.json(await stressStateForFault(access.studyId, faultId));
});

/** Saves a new version of the fault's (or, with studyWide, the study's) stress state. */
export const POST = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "edit");
  const input = parseWith(stressStateInputSchema, await readJson(request));
  const saved = await saveStressState({ studyId: access.studyId, faultId, userId: access.user.id }, input);
  return NextResponse.json({ id: saved.id, version: saved.version, scope: saved.faultId ? "fault" : "study" }, { status: 201 });
});
