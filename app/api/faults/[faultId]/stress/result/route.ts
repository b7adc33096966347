import { NextResponse } from "next/server";
import { requireFaultRole } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { route } from "@/lib/api/handler";
import { LENGTH_SCALE_LIMITS_M, parseLengthScale, parseThresholds } from "@/lib/stress/parameters";
import { stressResult } from "@/lib/stress/service";

type Params = { faultId: string };

/** The reactivation screen of the latest analysis: summary, per-node fields (base64 Float32), Mohr points. */
export const GET = route<Params>(async (request, { faultId }) => {
  const access = await requireFaultRole(faultId, "view");
  const query = new URL(request.url).searchParams;
  const thresholds = parseThresholds(query.get("thresholds"));
  if (!thresholds) throw new ApiError(400, "thresholds must be up to 10 comma-separated numbers in MPa between −1000 and 1000, e.g. 1,2,5.");
  const lengthScaleM = parseLengthScale(query.get("lengthScaleM"));
  if (Number.isNaN(lengthScaleM))
    throw new ApiError(400, `lengthScaleM must be a length in metres between ${LENGTH_SCALE_LIMITS_M[0]} and ${LENGTH_SCALE_LIMITS_M[1]}, e.g. 200.`);
  return NextResponse.json(await stressResult(access.studyId, faultId, thresholds, lengthScaleM), { headers: { "cache-control": "private, no-store" } });
});
