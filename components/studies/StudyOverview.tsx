"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import { FieldError } from "@/components/ui/FieldError";
import { metres as formatM } from "@/lib/format";
import { faultSenseLabel } from "@/lib/fault-types";
import { FaultTypeFields, faultTypeJson, type FaultTypeValues } from "@/components/faults/FaultTypeFields";
import { RoleBadge } from "./RoleBadge";
import { CoordinateReferenceEditor } from "./CoordinateReferenceEditor";
import { STUDY_ROLES, type StudyRole } from "@/lib/contracts/roles";
import type { StudyOverview as StudyOverviewData } from "@/lib/contracts/studies";

export function StudyOverview({ studyId, currentUserId, canEdit, canAdmin }: { studyId: string; currentUserId: string; canEdit: boolean; canAdmin: boolean }) {
  const overview = useQuery({ queryKey: ["study", studyId], queryFn: () => apiFetch<StudyOverviewData>(`/api/studies/${studyId}`) });
  if (overview.isPending) return <p className="text-sm text-slate-500">Loading study…</p>;
  if (overview.isError) return <p className="text-sm text-red-600">Could not load the study: {overview.error.message}</p>;
  const { study, faults, people, activity, role } = overview.data;
  return (
    <div className="space-y-8">
      <div>
        <Link href="/studies" className="text-sm text-slip-700 hover:underline dark:text-slip-300">
          ← Studies
        </Link>
        <div className="mt-2 flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-semibold" data-testid="study-title">
            {study.name}
          </h1>
          <RoleBadge role={role} />
        </div>
        {study.description && <p className="mt-2 max-w-3xl text-slate-600 dark:text-slate-300">{study.description}</p>}
        <CoordinateReferenceEditor studyId={studyId} reference={study.coordinateReference ?? null} canAdmin={canAdmin} />
      </div>
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <section className="card overflow-hidden">
          <div className="flex items-center justify-between border-b border-slate-200 px-5 py-3 dark:border-slate-800">
            <h2 className="font-semibold">Faults</h2>
            {canEdit && <NewFault studyId={studyId} />}
          </div>
          {faults.length === 0 ? (
            <p className="px-5 py-10 text-center text-sm text-slate-500">No faults yet.{canEdit ? " Add one, then upload its pick set." : ""}</p>
          ) : (
            <table className="w-full text-sm" data-testid="fault-table">
              <thead className="bg-slate-50 text-left text-xs text-slate-500 dark:bg-slate-950">
                <tr>
                  <th className="px-5 py-2 font-medium">Fault</th>
                  <th className="px-3 py-2 font-medium">Segments</th>
                  <th className="px-3 py-2 text-right font-medium">Dmax</th>
                  <th className="px-3 py-2 text-right font-medium">Length</th>
                  <th className="whitespace-nowrap px-5 py-2 text-right font-medium">Pick set</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-slate-100 dark:divide-slate-800">
                {faults.map((fault) => (
                  <tr key={fault.id} className="hover:bg-slate-50 dark:hover:bg-slate-800/50">
                    <td className="px-5 py-3">
                      <Link href={`/studies/${studyId}/faults/${fault.id}`} className="font-medium text-slip-700 hover:underline dark:text-slip-300">
                        {fault.name}
                      </Link>
                      <div className="text-xs text-slate-500">
                        {faultSenseLabel(fault.sense)} fault{fault.description ? ` · ${fault.description}` : ""}
                      </div>
                    </td>
                    <td className="num px-3 py-3">{fault.analysis?.segmentCount ?? "—"}</td>
                    <td className="num whitespace-nowrap px-3 py-3 text-right">{formatM(fault.analysis?.dMaxM)}</td>
                    <td className="num whitespace-nowrap px-3 py-3 text-right">{formatM(fault.analysis?.lengthM)}</td>
                    <td className="whitespace-nowrap px-5 py-3 text-right text-xs text-slate-500">
                      {fault.latestVersion ? (
                        <>
                          v{fault.latestVersion} · {fault.analysis?.status ?? "not analysed"}
                        </>
                      ) : (
                        "none yet"
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </section>
        <section className="card">
          <div className="border-b border-slate-200 px-5 py-3 dark:border-slate-800">
            <h2 className="font-semibold">People</h2>
          </div>
          <ul className="divide-y divide-slate-100 dark:divide-slate-800" data-testid="people">
            {people.map((person) => (
              <PersonRow key={person.userId} studyId={studyId} person={person} isYou={person.userId === currentUserId} canAdmin={canAdmin} />
            ))}
          </ul>
          {canAdmin && <InviteForm studyId={studyId} />}
        </section>
      </div>
      <section className="card">
        <div className="border-b border-slate-200 px-5 py-3 dark:border-slate-800">
          <h2 className="font-semibold">Recent activity</h2>
        </div>
        {activity.length === 0 ? (
          <p className="px-5 py-6 text-sm text-slate-500">Nothing yet.</p>
        ) : (
          <ul className="divide-y divide-slate-100 text-sm dark:divide-slate-800">
            {activity.map((entry) => (
              <li key={entry.id} className="flex justify-between gap-4 px-5 py-2" data-testid="activity-entry">
                <span>
                  <span className="font-medium">{entry.actor}</span>{" "}
                  {entry.parts.map((part, index) =>
                    part.href ? (
                      <Link key={index} href={part.href} className="text-slip-700 hover:underline dark:text-slip-300">
                        {part.text}
                      </Link>
                    ) : (
                      <span key={index}>{part.text}</span>
                    ),
                  )}
                </span>
                <time className="shrink-0 text-xs text-slate-500" dateTime={entry.createdAt}>
                  {new Date(entry.createdAt).toLocaleString()}
                </time>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

function useStudyMutation<T>(studyId: string, mutationFn: (input: T) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn, onSuccess: () => queryClient.invalidateQueries({ queryKey: ["study", studyId] }) });
}

/** Add a fault: its name and what the analysis needs to know about it (its type), then straight to its page to upload picks. */
function NewFault({ studyId }: { studyId: string }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [name, setName] = useState("");
  const [type, setType] = useState<FaultTypeValues>({ sense: "normal", rake: "", inversion: false });
  const [description, setDescription] = useState("");
  const create = useMutation({
    mutationFn: () =>
      apiFetch<{ fault: { id: string } }>(`/api/studies/${studyId}/faults`, {
        method: "POST",
        json: { name, description, ...faultTypeJson(type) },
      }),
    onSuccess: ({ fault }) => router.push(`/studies/${studyId}/faults/${fault.id}`),
  });
  const fieldErrors = create.error instanceof ApiRequestError ? create.error.details?.fieldErrors : undefined;
  if (!open)
    return (
      <button className="btn-quiet" onClick={() => setOpen(true)} data-testid="new-fault">
        Add fault
      </button>
    );
  return (
    <div
      className="fixed inset-0 z-40 flex items-start justify-center bg-slate-900/40 px-4 pt-24"
      role="dialog"
      aria-modal="true"
      aria-labelledby="new-fault-title"
      onClick={(event) => event.target === event.currentTarget && setOpen(false)}
      onKeyDown={(event) => event.key === "Escape" && setOpen(false)}
    >
      <form
        className="card w-full max-w-md space-y-4 p-5"
        data-testid="new-fault-form"
        onSubmit={(event) => {
          event.preventDefault();
          create.mutate();
        }}
      >
        <h3 id="new-fault-title" className="font-semibold">
          Add a fault
        </h3>
        <div>
          <label className="label" htmlFor="new-fault-name">
            Name
          </label>
          <input id="new-fault-name" className="field" placeholder="e.g. QG-7" value={name} onChange={(event) => setName(event.target.value)} autoFocus />
          <FieldError errors={fieldErrors?.name} />
        </div>
        <FaultTypeFields idPrefix="new-fault" values={type} onChange={setType} fieldErrors={fieldErrors} />
        <div>
          <label className="label" htmlFor="new-fault-description">
            Description <span className="font-normal text-slate-500">(optional)</span>
          </label>
          <textarea
            id="new-fault-description"
            className="field"
            rows={2}
            placeholder="Where it is, what it bounds"
            value={description}
            onChange={(event) => setDescription(event.target.value)}
          />
          <FieldError errors={fieldErrors?.description} />
        </div>
        {create.error && !fieldErrors && <p className="field-error">{create.error.message}</p>}
        <p className="text-xs text-slate-500">Next you upload its throw picks (a CSV) on the fault&apos;s page.</p>
        <div className="flex justify-end gap-2">
          <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
            Cancel
          </button>
          <button className="btn-primary" disabled={create.isPending} data-testid="new-fault-submit">
            {create.isPending ? "Adding…" : "Add fault"}
          </button>
        </div>
      </form>
    </div>
  );
}

function RoleSelect({ studyId, userId, role }: { studyId: string; userId: string; role: StudyRole }) {
  const change = useStudyMutation(studyId, (next: StudyRole) =>
    apiFetch(`/api/studies/${studyId}/members/${userId}`, { method: "PATCH", json: { role: next } }),
  );
  return (
    <div className="text-right">
      <select className="field w-auto py-1 text-xs" aria-label="StudyRole" value={role} onChange={(event) => change.mutate(event.target.value as StudyRole)}>
        {STUDY_ROLES.map((option) => (
          <option key={option} value={option}>
            {option}
          </option>
        ))}
      </select>
      {change.error && <p className="field-error text-xs">{change.error.message}</p>}
    </div>
  );
}

/** One member: name and address, and for owners their role and (for others) a remove that a second click confirms. */
function PersonRow({ studyId, person, isYou, canAdmin }: { studyId: string; person: StudyOverviewData["people"][number]; isYou: boolean; canAdmin: boolean }) {
  const [askingToRemove, setAskingToRemove] = useState(false);
  // their pins and replies stay, signed with their name
  const remove = useStudyMutation(studyId, () => apiFetch(`/api/studies/${studyId}/members/${person.userId}`, { method: "DELETE" }));
  return (
    <li className="px-5 py-2.5 text-sm" data-user-id={person.userId}>
      <div className="flex items-center justify-between gap-2">
        <div className="min-w-0">
          <div className="truncate font-medium">
            {person.name}
            {isYou && <span className="text-slate-400"> (you)</span>}
          </div>
          <div className="truncate text-xs text-slate-500">{person.email}</div>
        </div>
        {canAdmin ? (
          <div className="flex flex-col items-end gap-1">
            <RoleSelect studyId={studyId} userId={person.userId} role={person.role} />
            {!isYou && !askingToRemove && (
              <button
                type="button"
                className="text-xs text-slate-500 hover:text-red-700 dark:hover:text-red-300"
                onClick={() => setAskingToRemove(true)}
                data-testid="remove-member"
              >
                Remove
              </button>
            )}
          </div>
        ) : (
          <RoleBadge role={person.role} />
        )}
      </div>
      {askingToRemove && (
        <div className="mt-2 flex flex-wrap items-center justify-end gap-x-3 gap-y-1 text-xs" data-testid="remove-member-confirm">
          <span className="text-slate-600 dark:text-slate-300">Remove {person.name} from this study?</span>
          <button
            type="button"
            className="font-medium text-red-700 hover:underline dark:text-red-300"
            disabled={remove.isPending}
            onClick={() => remove.mutate(undefined)}
            data-testid="remove-member-yes"
          >
            Remove
          </button>
          <button type="button" className="text-slate-500 hover:underline" onClick={() => setAskingToRemove(false)}>
            Keep
          </button>
          {remove.error && <p className="field-error basis-full text-right">{remove.error.message}</p>}
        </div>
      )}
    </li>
  );
}

function InviteForm({ studyId }: { studyId: string }) {
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<StudyRole>("reviewer");
  const invite = useStudyMutation(studyId, () => apiFetch(`/api/studies/${studyId}/members`, { method: "POST", json: { email, role } }));
  const fieldErrors = invite.error instanceof ApiRequestError ? invite.error.details?.fieldErrors : undefined;
  return (
    <form
      className="space-y-2 border-t border-slate-200 px-5 py-4 dark:border-slate-800"
      data-testid="invite-form"
      onSubmit={(event) => {
        event.preventDefault();
        invite.mutate(undefined, { onSuccess: () => setEmail("") });
      }}
      noValidate
    >
      <h3 className="text-sm font-semibold">Invite someone</h3>
      <div className="flex gap-2">
        <input
          className="field"
          type="email"
          placeholder="name@company.com"
          aria-label="E-mail to invite"
          value={email}
          onChange={(event) => setEmail(event.target.value)}
        />
        <select className="field w-auto" aria-label="StudyRole for the invitation" value={role} onChange={(event) => setRole(event.target.value as StudyRole)}>
          {STUDY_ROLES.map((option) => (
            <option key={option} value={option}>
              {option}
            </option>
          ))}
        </select>
      </div>
      <FieldError errors={fieldErrors?.email ?? (invite.error && !fieldErrors ? [invite.error.message] : undefined)} />
      {invite.isSuccess && <p className="text-sm text-slip-700 dark:text-slip-300">Invitation sent.</p>}
      <button className="btn-primary" disabled={invite.isPending}>
        Send invitation
      </button>
    </form>
  );
}
