"use client";
// The fault's cut-off set (for the shown pick set, else its newest) and the study's stratigraphy table, shared by the
// juxtaposition view and the SGR colour mode through react-query's cache.
import { useQuery } from "@tanstack/react-query";
import { apiFetch } from "@/lib/api/client";
import type { CutoffSummary } from "@/lib/engine/cutoff-stations";
import type { StratigraphyUnit } from "@/lib/engine/juxtaposition";
import type { VelocityModel } from "@/lib/engine/time-depth";

export interface CutoffSetView {
  id: string;
  pickSetId: string;
  pickSetVersion: number;
  fileName: string;
  checksum: string;
  domain: "depth" | "time";
  velocityModel: VelocityModel | null;
  stationSpacingM: number;
  rakeDeg: number;
  summary: CutoffSummary;
  uploadedAt: string;
  /** the shown pick set was derived from this cut-off set */
  ofShownPickSet: boolean;
}

export interface StratigraphyView {
  units: StratigraphyUnit[];
  version: number;
  updatedAt: string | null;
  updatedBy: { name: string } | null;
}

export const stratigraphyKey = (studyId: string) => ["stratigraphy", studyId];

export function useCutoffSet(faultId: string, pickSetId: string | undefined) {
  return useQuery({
    queryKey: ["cutoff-set", faultId, pickSetId ?? "newest"],
    queryFn: () =>
      apiFetch<{ cutoffSet: CutoffSetView | null }>(`/api/faults/${faultId}/cutoffs${pickSetId ? `?pickSet=${encodeURIComponent(pickSetId)}` : ""}`),
    staleTime: 60_000,
  });
}

export function useStratigraphy(studyId: string) {
  return useQuery({ queryKey: stratigraphyKey(studyId), queryFn: () => apiFetch<StratigraphyView>(`/api/studies/${studyId}/stratigraphy`), staleTime: 60_000 });
}
