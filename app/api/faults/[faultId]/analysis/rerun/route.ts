import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { ApiError, parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { rerunAnalysis } from "@/lib/analysis/runner";
import { rerunInputSchema } from "@/lib/contracts/analysis";

type Params = { faultId: string };
export const POST = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "edit");
  const { pickSetId, settings } = parseWith(rerunInputSchema, await readJson(request));
  const analysisId = await rerunAnalysis(faultId, pickSetId, settings);
  if (!analysisId) throw new ApiError(404, "Pick set not found for this fault.");
  return NextResponse.json({ analysisId }, { status: 202 });
});
