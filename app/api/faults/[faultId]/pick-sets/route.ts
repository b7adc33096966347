import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { parseWith } from "@/lib/api/errors";
import { route } from "@/lib/api/handler";
import { readUploadedFile } from "@/lib/api/multipart";
import { confirmUpload, listPickSets, MAX_UPLOAD_BYTES, previewUpload } from "@/lib/analysis/uploads";
import { uploadOptionsSchema } from "@/lib/contracts/analysis";

type Params = { faultId: string };

export const GET = route<Params>(async (_request, { faultId }) => {
  await requireFaultRole(faultId, "view");
  return NextResponse.json({ pickSets: await listPickSets(faultId) });
});

/** `?step=preview` parses and reports without saving; `?step=confirm` saves and starts the analysis. */
export const POST = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "edit");
  const step = new URL(request.url).searchParams.get("step") === "confirm" ? "confirm" : "preview";
  const { file, fields } = await readUploadedFile(request, MAX_UPLOAD_BYTES);
  const options = parseWith(uploadOptionsSchema, fields, "form");
  if (step === "preview") return NextResponse.json(await previewUpload(access, file, options));
  return NextResponse.json(await confirmUpload(access, file, options), { status: 201 });
});
