"use client";
// The study's coordinate reference under its title: the projected CRS of the pick files' x and y and what z is
// measured from. The owner sets it by EPSG code (checked on the server against the EPSG index and the projection
// library); exports state it.
import { useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import { FieldError } from "@/components/ui/FieldError";

export interface StudyCoordinateReference {
  horizontal: { epsg: number; name: string };
  vertical: { epsg: number | null; name: string };
}

function describe(reference: StudyCoordinateReference | null): string {
  if (!reference) return "not recorded (exports give map coordinates without a stated system)";
  const vertical = reference.vertical.epsg ? `EPSG:${reference.vertical.epsg} ${reference.vertical.name}` : reference.vertical.name;
  return `EPSG:${reference.horizontal.epsg} ${reference.horizontal.name}; z above ${vertical}, metres`;
}

export function CoordinateReferenceEditor({
  studyId,
  reference,
  canAdmin,
}: {
  studyId: string;
  reference: StudyCoordinateReference | null;
  canAdmin: boolean;
}) {
  const queryClient = useQueryClient();
  const [form, setForm] = useState<{ epsg: string; vertical: string } | null>(null);
  const save = useMutation({
    mutationFn: (values: { epsg: string; vertical: string }) => {
      const vertical = values.vertical.trim().replace(/^EPSG:/i, "");
      return apiFetch(`/api/studies/${studyId}`, {
        method: "PATCH",
        json: {
          coordinateReference: {
            epsg: Number(values.epsg.trim().replace(/^EPSG:/i, "")),
            ...(vertical === "" ? {} : /^\d+$/.test(vertical) ? { verticalEpsg: Number(vertical) } : { verticalDatum: vertical }),
          },
        },
      });
    },
    onSuccess: () => {
      setForm(null);
      void queryClient.invalidateQueries({ queryKey: ["study", studyId] });
    },
  });
  const fieldErrors = save.error instanceof ApiRequestError ? save.error.details?.fieldErrors : undefined;
  return (
    <div className="mt-2 text-sm text-slate-600 dark:text-slate-300" data-testid="study-crs">
      <span className="text-slate-500">Coordinate reference:</span> <span data-testid="study-crs-text">{describe(reference)}</span>
      {canAdmin && !form && (
        <button
          className="ml-2 text-slip-700 underline-offset-2 hover:underline dark:text-slip-300"
          onClick={() =>
            setForm({
              epsg: reference ? String(reference.horizontal.epsg) : "",
              vertical: reference ? (reference.vertical.epsg ? String(reference.vertical.epsg) : reference.vertical.name) : "",
            })
          }
          data-testid="edit-study-crs"
        >
          {reference ? "Change" : "Set"}
        </button>
      )}
      {form && (
        <form
          className="card mt-2 max-w-lg space-y-3 p-4"
          data-testid="study-crs-form"
          onSubmit={(event) => {
            event.preventDefault();
            save.mutate(form);
          }}
        >
          <div>
            <label className="label" htmlFor="crs-epsg">
              Projected CRS of x, y (EPSG code, metres)
            </label>
            <input
              id="crs-epsg"
              className="field w-40"
              inputMode="numeric"
              placeholder="e.g. 32631"
              value={form.epsg}
              onChange={(event) => setForm({ ...form, epsg: event.target.value })}
              data-testid="crs-epsg"
            />
            <FieldError errors={fieldErrors?.["coordinateReference.epsg"] ?? fieldErrors?.epsg} />
          </div>
          <div>
            <label className="label" htmlFor="crs-vertical">
              Vertical reference of z (EPSG code of a height system, or the datum&apos;s name)
            </label>
            <input
              id="crs-vertical"
              className="field w-64"
              placeholder="e.g. 5714 (MSL height)"
              value={form.vertical}
              onChange={(event) => setForm({ ...form, vertical: event.target.value })}
              data-testid="crs-vertical"
            />
            <FieldError errors={fieldErrors?.["coordinateReference.verticalEpsg"] ?? fieldErrors?.verticalEpsg} />
          </div>
          {save.error && (
            <p className="field-error" data-testid="study-crs-error">
              {save.error.message}
            </p>
          )}
          <div className="flex justify-end gap-2">
            <button type="button" className="btn-quiet" onClick={() => setForm(null)}>
              Cancel
            </button>
            <button className="btn-primary" disabled={save.isPending} data-testid="study-crs-save">
              {save.isPending ? "Checking…" : "Save"}
            </button>
          </div>
        </form>
      )}
    </div>
  );
}
