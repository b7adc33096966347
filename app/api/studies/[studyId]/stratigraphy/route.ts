import { NextResponse } from "next/server";
import { requireStudyRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { stratigraphySchema } from "@/lib/seal/schemas";
import { getStratigraphy, saveStratigraphy } from "@/lib/seal/service";

type Params = { studyId: string };

/** The study's stratigraphy table: units top to bottom with their top horizon, kind and clay fraction. */
export const GET = route<Params>(async (_request, { studyId }) => {
  await requireStudyRole(studyId, "view");
  return NextResponse.json(await getStratigraphy(studyId));
});

/** Replaces the table (owners and interpreters). */
export const PUT = route<Params>(async (request, { studyId }) => {
  const access = await requireStudyRole(studyId, "edit");
  const input = parseWith(stratigraphySchema, await readJson(request, 100_000));
  return NextResponse.json(await saveStratigraphy(access, input));
});
