"use client";
import Link from "next/link";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import { FieldError } from "@/components/ui/FieldError";
import { RoleBadge } from "./RoleBadge";
import type { StudiesResponse } from "@/lib/contracts/studies";

export function StudiesBoard() {
  const queryClient = useQueryClient();
  const studies = useQuery({ queryKey: ["studies"], queryFn: () => apiFetch<StudiesResponse>("/api/studies") });
  const [creating, setCreating] = useState(false);
  return (
    <div className="mt-6 space-y-6">
      <div className="flex items-center justify-between">
        <p className="text-sm text-slate-600 dark:text-slate-400">A study groups faults and the people who interpret and review them.</p>
        <button className="btn-primary" onClick={() => setCreating((open) => !open)} data-testid="new-study">
          New study
        </button>
      </div>
      {creating && (
        <NewStudyForm
          onDone={() => {
            setCreating(false);
            queryClient.invalidateQueries({ queryKey: ["studies"] });
          }}
        />
      )}
      {studies.isPending && <p className="text-sm text-slate-500">Loading studies…</p>}
      {studies.isError && <p className="text-sm text-red-600">Could not load studies: {studies.error.message}</p>}
      {studies.data && studies.data.studies.length === 0 && (
        <div className="card p-10 text-center">
          <h2 className="font-semibold">No studies yet</h2>
          <p className="mt-2 text-sm text-slate-600 dark:text-slate-400">Create one, or ask a study owner to invite you.</p>
        </div>
      )}
      {studies.data && studies.data.studies.length > 0 && (
        <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" data-testid="study-list">
          {studies.data.studies.map((study) => (
            <li key={study.id}>
              <Link href={`/studies/${study.id}`} className="card block h-full p-5 transition hover:border-slip-400 hover:shadow-md">
                <div className="flex items-start justify-between gap-2">
                  <h2 className="font-semibold">{study.name}</h2>
                  <RoleBadge role={study.role} />
                </div>
                <p className="mt-2 line-clamp-3 text-sm text-slate-600 dark:text-slate-400">{study.description || "No description."}</p>
                <p className="mt-4 text-xs text-slate-500">
                  <span className="num">{study.faultCount}</span> {study.faultCount === 1 ? "fault" : "faults"}
                </p>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function NewStudyForm({ onDone }: { onDone: () => void }) {
  const [name, setName] = useState("");
  const [description, setDescription] = useState("");
  const create = useMutation({
    mutationFn: () => apiFetch("/api/studies", { method: "POST", json: { name, description } }),
    onSuccess: onDone,
  });
  const fieldErrors = create.error instanceof ApiRequestError ? create.error.details?.fieldErrors : undefined;
  return (
    <form
      className="card space-y-4 p-5"
      onSubmit={(event) => {
        event.preventDefault();
        create.mutate();
      }}
      noValidate
    >
      <div>
        <label className="label" htmlFor="study-name">
          Study name
        </label>
        <input
          id="study-name"
          className="field"
          value={name}
          onChange={(event) => setName(event.target.value)}
          placeholder="e.g. Northern margin storage screen"
        />
        <FieldError errors={fieldErrors?.name} />
      </div>
      <div>
        <label className="label" htmlFor="study-description">
          Description
        </label>
        <textarea id="study-description" className="field" rows={2} value={description} onChange={(event) => setDescription(event.target.value)} />
        <FieldError errors={fieldErrors?.description} />
      </div>
      {create.error && !fieldErrors && <p className="field-error">{create.error.message}</p>}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={create.isPending}>
          Create study
        </button>
        <button type="button" className="btn-quiet" onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}
