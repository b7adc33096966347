import { NextResponse } from "next/server";
import { z } from "zod";
import { requireFaultRole } from "@/lib/access";
import { ApiError, parseWith } from "@/lib/api/errors";
import { readJson, route } from "@/lib/api/handler";
import { rerunAnalysis } from "@/lib/analysis/runner";
import { analysisSettingsSchema } from "@/lib/analysis/settings";

type Params = { faultId: string };
const rerunSchema = z.object({ pickSetId: z.string().min(1), settings: analysisSettingsSchema.optional() });

export const POST = route<Params>(async (request, { faultId }) => {
  await requireFaultRole(faultId, "edit");
  const { pickSetId, settings } = parseWith(rerunSchema, await readJson(request));
  const analysisId = await rerunAnalysis(faultId, pickSetId, settings);
  if (!analysisId) throw new ApiError(404, "Pick set not found for this fault.");
  return NextResponse.json({ analysisId }, { status: 202 });
});
