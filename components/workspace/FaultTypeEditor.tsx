"use client";
// The fault's type under its name: normal, reverse or oblique with its rake, and whether inversion is expected. An
// interpreter can change it; the analysis of the newest pick set then runs again with it (throw becomes displacement
// through the rake).
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import { describeFaultType, type FaultSense } from "@/lib/fault-types";
import { FaultTypeFields, faultTypeJson, type FaultTypeValues } from "@/components/faults/FaultTypeFields";

interface FaultRow {
  id: string;
  sense: FaultSense;
  rakeDeg: number | null;
  inversion: boolean;
}

export function FaultTypeEditor({ faultId, canEdit }: { faultId: string; canEdit: boolean }) {
  const queryClient = useQueryClient();
  const fault = useQuery({ queryKey: ["fault", faultId], queryFn: () => apiFetch<{ fault: FaultRow }>(`/api/faults/${faultId}`) });
  const [editing, setEditing] = useState<FaultTypeValues | null>(null);
  const save = useMutation({
    mutationFn: (values: FaultTypeValues) => apiFetch<{ fault: FaultRow }>(`/api/faults/${faultId}`, { method: "PATCH", json: faultTypeJson(values) }),
    onSuccess: () => {
      setEditing(null);
      void queryClient.invalidateQueries({ queryKey: ["fault", faultId] });
      void queryClient.invalidateQueries({ queryKey: ["analysis", faultId] });
    },
  });
  const current = fault.data?.fault;
  if (!current) return null;
  const fieldErrors = save.error instanceof ApiRequestError ? save.error.details?.fieldErrors : undefined;
  return (
    <div className="text-xs text-slate-500" data-testid="fault-type">
      <span>
        Type:{" "}
        <span className="font-medium text-slate-700 dark:text-slate-200" data-testid="fault-type-text">
          {describeFaultType(current)}
        </span>
      </span>
      {canEdit && !editing && (
        <button
          className="ml-2 text-slip-700 underline-offset-2 hover:underline dark:text-slip-300"
          onClick={() => setEditing({ sense: current.sense, rake: current.rakeDeg === null ? "" : String(current.rakeDeg), inversion: current.inversion })}
          data-testid="edit-fault-type"
        >
          Change
        </button>
      )}
      {editing && (
        <form
          className="card mt-2 max-w-md space-y-3 p-4 text-slate-700 dark:text-slate-200"
          data-testid="fault-type-form"
          onSubmit={(event) => {
            event.preventDefault();
            save.mutate(editing);
          }}
        >
          <FaultTypeFields idPrefix="edit-fault" values={editing} onChange={setEditing} fieldErrors={fieldErrors} />
          {save.error && !fieldErrors && <p className="field-error">{save.error.message}</p>}
          <p className="text-xs text-slate-500">Saving runs the analysis of the newest pick set again with this type.</p>
          <div className="flex justify-end gap-2">
            <button type="button" className="btn-quiet" onClick={() => setEditing(null)}>
              Cancel
            </button>
            <button className="btn-primary" disabled={save.isPending} data-testid="fault-type-save">
              {save.isPending ? "Saving…" : "Save type"}
            </button>
          </div>
        </form>
      )}
    </div>
  );
}
