import { requireFaultRole } from "@/lib/access";
import { route } from "@/lib/api/handler";
import { exportResponse } from "@/lib/exports/respond";

type Params = { faultId: string; kind: string };

/** Downloads of a fault's analysis: grid.csv, picks.csv, profiles.csv, contours.geojson, scaling.json (see lib/exports). */
export const GET = route<Params>(async (request, { faultId, kind }) => {
  await requireFaultRole(faultId, "view");
  return exportResponse(faultId, kind, new URL(request.url));
});
