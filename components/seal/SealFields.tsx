"use client";
// Registers the shale gouge ratio as a colour mode of the 3D surface and the plane map (the view settings' `fields`,
// as the stress screen registers its own), whenever the fault has cut-offs and the study a stratigraphy table with
// clay fractions. Renders nothing.
import { useEffect, useMemo } from "react";
import type { FaultDisplay } from "@/lib/contracts/display";
import type { ScalarField } from "@/lib/contracts/display";
import { useSceneSettings } from "@/scene/sceneSettingsStore";
import { SGR_FIELD_KEY, SGR_GUIDE_PERCENT, SGR_NOTE, sgrField } from "@/lib/views/seal";
import { useCutoffSet, useStratigraphy } from "./useSealData";

export function SealFields({ studyId, faultId, pickSetId, display }: { studyId: string; faultId: string; pickSetId: string; display: FaultDisplay | null }) {
  const cutoffs = useCutoffSet(faultId, pickSetId);
  const stratigraphy = useStratigraphy(studyId);
  const setFields = useSceneSettings((state) => state.setFields);
  const cutoffSet = cutoffs.data?.cutoffSet ?? null;
  const units = stratigraphy.data?.units;
  const fields = useMemo<ScalarField[]>(() => {
    if (!display || !cutoffSet || !units?.some((unit) => unit.clayFraction !== null)) return [];
    const field = sgrField(display, cutoffSet.summary, units);
    if (field.computed === 0) return [];
    return [
      {
        key: SGR_FIELD_KEY,
        label: "Shale gouge ratio",
        unit: "%",
        bySegment: field.bySegment,
        range: field.range,
        reversed: true,
        guide: { value: SGR_GUIDE_PERCENT, label: "~20 % guide (Yielding et al. 1997)" },
        note: SGR_NOTE,
      },
    ];
  }, [display, cutoffSet, units]);
  useEffect(() => {
    setFields("seal:", fields);
  }, [fields, setFields]);
  useEffect(() => () => setFields("seal:", []), [setFields]);
  return null;
}
