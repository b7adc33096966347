"use client";
// Saved viewpoints in the viewer's view bar: save the current camera and view settings, restore one, rename,
// delete, and make or revoke viewpoint links. Viewers may restore; the rest follows the share permission.
import { useEffect, useRef, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { roleAllows, type StudyRole } from "@/lib/contracts/roles";
import type { Viewpoint, ViewpointLink } from "@/lib/contracts/viewpoints";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import { copyCameraState, useCameraStore } from "@/scene/cameraStore";
import { applySceneSettings, currentSceneSettings } from "@/scene/sceneSettingsStore";

const EXPIRY_CHOICES: { value: string; label: string }[] = [
  { value: "1", label: "1 day" },
  { value: "7", label: "7 days" },
  { value: "30", label: "30 days" },
  { value: "90", label: "90 days" },
  { value: "never", label: "until revoked" },
];

function errorText(error: unknown) {
  if (error instanceof ApiRequestError) {
    const fields = error.details?.fieldErrors;
    const first = fields ? Object.entries(fields).find(([, messages]) => messages?.length) : undefined;
    return first ? `${error.message} ${first[0]}: ${first[1][0]}` : error.message;
  }
  return error instanceof Error ? error.message : "Something went wrong.";
}

export function ViewpointsBar({ faultId, role }: { faultId: string; role: StudyRole }) {
  const canShare = roleAllows(role, "share");
  const [open, setOpen] = useState(false);
  const [mode, setMode] = useState<{ kind: "list" } | { kind: "save" } | { kind: "edit"; viewpoint: Viewpoint } | { kind: "share"; viewpoint: Viewpoint }>({
    kind: "list",
  });
  const [restoredId, setRestoredId] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const panel = useRef<HTMLDivElement>(null);
  const queryClient = useQueryClient();
  const key = ["viewpoints", faultId];

  const list = useQuery({ queryKey: key, queryFn: () => apiFetch<{ viewpoints: Viewpoint[] }>(`/api/faults/${faultId}/viewpoints`) });
  const viewpoints = list.data?.viewpoints ?? [];

  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => event.key === "Escape" && setOpen(false);
    const onClick = (event: MouseEvent) => {
      if (panel.current && !panel.current.contains(event.target as Node)) setOpen(false);
    };
    window.addEventListener("keydown", onKey);
    window.addEventListener("mousedown", onClick);
    return () => {
      window.removeEventListener("keydown", onKey);
      window.removeEventListener("mousedown", onClick);
    };
  }, [open]);

  const remove = useMutation({
    mutationFn: (id: string) => apiFetch<void>(`/api/viewpoints/${id}`, { method: "DELETE" }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: key }),
  });

  function restore(viewpoint: Viewpoint) {
    const { colourFellBack } = applySceneSettings(viewpoint.settings);
    useCameraStore.getState().applyCamera(viewpoint.camera);
    setRestoredId(viewpoint.id);
    setNotice(
      colourFellBack ? `Restored “${viewpoint.title}”; its colouring (${viewpoint.settings.colourMode}) is not loaded, so displacement is shown.` : null,
    );
  }

  return (
    <div className="relative" ref={panel}>
      <button
        type="button"
        className="btn-quiet px-2 py-1 text-xs"
        aria-expanded={open}
        aria-haspopup="dialog"
        onClick={() => {
          setOpen((value) => !value);
          setMode({ kind: "list" });
        }}
        data-testid="viewpoints-toggle"
      >
        Viewpoints{viewpoints.length > 0 ? ` (${viewpoints.length})` : ""}
      </button>
      {open && (
        <div
          role="dialog"
          aria-label="Viewpoints"
          className="absolute right-0 z-40 mt-1 w-[22rem] rounded-md bg-white p-3 text-xs shadow-lg ring-1 ring-slate-200 dark:bg-slate-900 dark:ring-slate-700"
          data-testid="viewpoints-panel"
        >
          {mode.kind === "save" && <SaveForm faultId={faultId} onDone={() => setMode({ kind: "list" })} />}
          {mode.kind === "edit" && <EditForm viewpoint={mode.viewpoint} faultId={faultId} onDone={() => setMode({ kind: "list" })} />}
          {mode.kind === "share" && <SharePanel viewpoint={mode.viewpoint} onBack={() => setMode({ kind: "list" })} />}
          {mode.kind === "list" && (
            <>
              <div className="mb-2 flex items-center justify-between">
                <span className="font-semibold">Saved viewpoints</span>
                {canShare && (
                  <button type="button" className="btn-primary px-2 py-1 text-xs" onClick={() => setMode({ kind: "save" })} data-testid="viewpoint-save-open">
                    Save view
                  </button>
                )}
              </div>
              {notice && (
                <p className="mb-2 text-slate-500" data-testid="viewpoint-notice">
                  {notice}
                </p>
              )}
              {list.isError && <p className="text-red-700 dark:text-red-300">{errorText(list.error)}</p>}
              {remove.isError && <p className="mb-2 text-red-700 dark:text-red-300">{errorText(remove.error)}</p>}
              {list.isSuccess && viewpoints.length === 0 && (
                <p className="text-slate-500">
                  {canShare ? "No viewpoints yet. Move the camera, then save the view." : "No viewpoints saved for this fault yet."}
                </p>
              )}
              <ul className="max-h-80 space-y-1 overflow-auto" data-testid="viewpoint-list">
                {viewpoints.map((viewpoint) => (
                  <li
                    key={viewpoint.id}
                    className={`rounded px-2 py-1.5 ${restoredId === viewpoint.id ? "bg-slip-50 dark:bg-slip-900/40" : "hover:bg-slate-50 dark:hover:bg-slate-800"}`}
                    data-testid="viewpoint-item"
                  >
                    <button
                      type="button"
                      className="block w-full text-left"
                      title="Restore this view"
                      onClick={() => restore(viewpoint)}
                      data-testid="viewpoint-restore"
                    >
                      <span className="font-medium">{viewpoint.title}</span>
                      {viewpoint.note && <span className="mt-0.5 line-clamp-2 block text-slate-500">{viewpoint.note}</span>}
                      <span className="mt-0.5 block text-[11px] text-slate-400">
                        {viewpoint.createdByName ?? "former member"} · {new Date(viewpoint.createdAt).toLocaleString()}
                      </span>
                    </button>
                    {canShare && (
                      <div className="mt-1 flex gap-2 text-[11px]">
                        <button
                          type="button"
                          className="text-slip-700 hover:underline dark:text-slip-300"
                          onClick={() => setMode({ kind: "share", viewpoint })}
                          data-testid="viewpoint-share"
                        >
                          Share link
                        </button>
                        {viewpoint.canChange && (
                          <>
                            <button
                              type="button"
                              className="text-slate-600 hover:underline dark:text-slate-300"
                              onClick={() => setMode({ kind: "edit", viewpoint })}
                              data-testid="viewpoint-edit"
                            >
                              Rename
                            </button>
                            <button
                              type="button"
                              className="text-red-700 hover:underline dark:text-red-300"
                              disabled={remove.isPending}
                              onClick={() => {
                                if (window.confirm(`Delete the viewpoint “${viewpoint.title}”? Its links stop working.`)) remove.mutate(viewpoint.id);
                              }}
                              data-testid="viewpoint-delete"
                            >
                              Delete
                            </button>
                          </>
                        )}
                      </div>
                    )}
                  </li>
                ))}
              </ul>
            </>
          )}
        </div>
      )}
    </div>
  );
}

function SaveForm({ faultId, onDone }: { faultId: string; onDone: () => void }) {
  const queryClient = useQueryClient();
  const [title, setTitle] = useState("");
  const [note, setNote] = useState("");
  const save = useMutation({
    mutationFn: () => {
      const camera = useCameraStore.getState().camera;
      if (!camera) throw new Error("The 3D view has not drawn yet; wait a moment and try again.");
      return apiFetch<{ viewpoint: Viewpoint }>(`/api/faults/${faultId}/viewpoints`, {
        method: "POST",
        json: { title, note, camera: copyCameraState(camera), settings: currentSceneSettings() },
      });
    },
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: ["viewpoints", faultId] });
      onDone();
    },
  });
  return (
    <form
      className="space-y-2"
      onSubmit={(event) => {
        event.preventDefault();
        save.mutate();
      }}
    >
      <p className="font-semibold">Save the current view</p>
      <p className="text-slate-500">Keeps the camera, the visible layers, the colouring and the relief.</p>
      <label className="block">
        <span className="text-slate-600 dark:text-slate-300">Title</span>
        <input
          className="field mt-0.5 py-1 text-xs"
          value={title}
          maxLength={120}
          required
          autoFocus
          onChange={(event) => setTitle(event.target.value)}
          data-testid="viewpoint-title"
        />
      </label>
      <label className="block">
        <span className="text-slate-600 dark:text-slate-300">Note (optional)</span>
        <textarea
          className="field mt-0.5 py-1 text-xs"
          rows={3}
          value={note}
          maxLength={2000}
          onChange={(event) => setNote(event.target.value)}
          data-testid="viewpoint-note"
        />
      </label>
      {save.isError && (
        <p className="text-red-700 dark:text-red-300" role="alert">
          {errorText(save.error)}
        </p>
      )}
      <div className="flex justify-end gap-2">
        <button type="button" className="btn-quiet px-2 py-1 text-xs" onClick={onDone}>
          Cancel
        </button>
        <button type="submit" className="btn-primary px-2 py-1 text-xs" disabled={save.isPending || !title.trim()} data-testid="viewpoint-save">
          {save.isPending ? "Saving…" : "Save"}
        </button>
      </div>
    </form>
  );
}

function EditForm({ viewpoint, faultId, onDone }: { viewpoint: Viewpoint; faultId: string; onDone: () => void }) {
  const queryClient = useQueryClient();
  const [title, setTitle] = useState(viewpoint.title);
  const [note, setNote] = useState(viewpoint.note);
  const update = useMutation({
    mutationFn: () => apiFetch(`/api/viewpoints/${viewpoint.id}`, { method: "PATCH", json: { title, note } }),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: ["viewpoints", faultId] });
      onDone();
    },
  });
  return (
    <form
      className="space-y-2"
      onSubmit={(event) => {
        event.preventDefault();
        update.mutate();
      }}
    >
      <p className="font-semibold">Rename viewpoint</p>
      <label className="block">
        <span className="text-slate-600 dark:text-slate-300">Title</span>
        <input
          className="field mt-0.5 py-1 text-xs"
          value={title}
          maxLength={120}
          required
          autoFocus
          onChange={(event) => setTitle(event.target.value)}
          data-testid="viewpoint-edit-title"
        />
      </label>
      <label className="block">
        <span className="text-slate-600 dark:text-slate-300">Note</span>
        <textarea
          className="field mt-0.5 py-1 text-xs"
          rows={3}
          value={note}
          maxLength={2000}
          onChange={(event) => setNote(event.target.value)}
          data-testid="viewpoint-edit-note"
        />
      </label>
      {update.isError && (
        <p className="text-red-700 dark:text-red-300" role="alert">
          {errorText(update.error)}
        </p>
      )}
      <div className="flex justify-end gap-2">
        <button type="button" className="btn-quiet px-2 py-1 text-xs" onClick={onDone}>
          Cancel
        </button>
        <button type="submit" className="btn-primary px-2 py-1 text-xs" disabled={update.isPending || !title.trim()} data-testid="viewpoint-edit-save">
          {update.isPending ? "Saving…" : "Save"}
        </button>
      </div>
    </form>
  );
}

function SharePanel({ viewpoint, onBack }: { viewpoint: Viewpoint; onBack: () => void }) {
  const queryClient = useQueryClient();
  const key = ["viewpoint-links", viewpoint.id];
  const [expiry, setExpiry] = useState("7");
  const [includePins, setIncludePins] = useState(false);
  const [madeUrl, setMadeUrl] = useState<string | null>(null);
  const links = useQuery({ queryKey: key, queryFn: () => apiFetch<{ links: ViewpointLink[] }>(`/api/viewpoints/${viewpoint.id}/links`) });
  const make = useMutation({
    mutationFn: () =>
      apiFetch<{ link: ViewpointLink & { path: string } }>(`/api/viewpoints/${viewpoint.id}/links`, {
        method: "POST",
        json: { expiresInDays: expiry === "never" ? null : Number(expiry), includePins },
      }),
    onSuccess: ({ link }) => {
      setMadeUrl(new URL(link.path, window.location.origin).toString());
      void queryClient.invalidateQueries({ queryKey: key });
    },
  });
  const revoke = useMutation({
    mutationFn: (id: string) => apiFetch(`/api/links/${id}`, { method: "DELETE" }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: key }),
  });

  return (
    <div className="space-y-3" data-testid="share-panel">
      <div className="flex items-center justify-between">
        <span className="font-semibold">Share “{viewpoint.title}”</span>
        <button type="button" className="text-slate-500 hover:underline" onClick={onBack}>
          Back
        </button>
      </div>
      <p className="text-slate-500">Anyone with the link sees this fault read-only, in this view, without signing in. Nothing else in the study is shown.</p>
      <div className="flex flex-wrap items-center gap-3">
        <label className="flex items-center gap-1.5">
          <span className="text-slate-600 dark:text-slate-300">Lasts</span>
          <select className="field w-auto py-0.5 text-xs" value={expiry} onChange={(event) => setExpiry(event.target.value)} data-testid="link-expiry">
            {EXPIRY_CHOICES.map((choice) => (
              <option key={choice.value} value={choice.value}>
                {choice.label}
              </option>
            ))}
          </select>
        </label>
        <label className="flex items-center gap-1.5">
          <input type="checkbox" checked={includePins} onChange={(event) => setIncludePins(event.target.checked)} data-testid="link-include-pins" />
          include pins
        </label>
        <button
          type="button"
          className="btn-primary ml-auto px-2 py-1 text-xs"
          disabled={make.isPending}
          onClick={() => make.mutate()}
          data-testid="link-create"
        >
          {make.isPending ? "Making…" : "Make link"}
        </button>
      </div>
      {make.isError && (
        <p className="text-red-700 dark:text-red-300" role="alert">
          {errorText(make.error)}
        </p>
      )}
      {madeUrl && <CopyableUrl url={madeUrl} />}
      <div>
        <p className="mb-1 font-medium">Links of this viewpoint</p>
        {links.isError && <p className="text-red-700 dark:text-red-300">{errorText(links.error)}</p>}
        {revoke.isError && <p className="text-red-700 dark:text-red-300">{errorText(revoke.error)}</p>}
        {links.isSuccess && links.data.links.length === 0 && <p className="text-slate-500">None yet.</p>}
        <ul className="max-h-40 space-y-1 overflow-auto" data-testid="link-list">
          {links.data?.links.map((link) => (
            <li
              key={link.id}
              className="flex items-center justify-between gap-2 rounded bg-slate-50 px-2 py-1 dark:bg-slate-800/60"
              data-testid="link-item"
              data-state={link.state}
            >
              <span>
                made {new Date(link.createdAt).toLocaleDateString()} · {link.includePins ? "with pins" : "no pins"} ·{" "}
                {link.state === "revoked"
                  ? "revoked"
                  : link.state === "expired"
                    ? "expired"
                    : link.expiresAt
                      ? `until ${new Date(link.expiresAt).toLocaleDateString()}`
                      : "until revoked"}
              </span>
              {link.state === "active" && link.canRevoke && (
                <button
                  type="button"
                  className="text-red-700 hover:underline dark:text-red-300"
                  disabled={revoke.isPending}
                  onClick={() => revoke.mutate(link.id)}
                  data-testid="link-revoke"
                >
                  Revoke
                </button>
              )}
            </li>
          ))}
        </ul>
        <p className="mt-1 text-[11px] text-slate-400">A link&apos;s address is shown only when it is made; make a new one if you lose it.</p>
      </div>
    </div>
  );
}

function CopyableUrl({ url }: { url: string }) {
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<"yes" | "select" | null>(null);
  async function copy() {
    try {
      if (!navigator.clipboard) throw new Error("no clipboard");
      await navigator.clipboard.writeText(url);
      setCopied("yes");
    } catch {
      // no clipboard access (insecure origin, permission): select the text so Ctrl+C / ⌘C copies it
      input.current?.focus();
      input.current?.select();
      setCopied("select");
    }
  }
  return (
    <div className="rounded border border-slip-200 bg-slip-50 p-2 dark:border-slip-800 dark:bg-slip-900/30" data-testid="link-made">
      <div className="flex gap-1.5">
        <input
          ref={input}
          readOnly
          className="field num flex-1 py-0.5 text-[11px]"
          value={url}
          onFocus={(event) => event.target.select()}
          data-testid="link-url"
          aria-label="Link address"
        />
        <button type="button" className="btn-primary px-2 py-0.5 text-xs" onClick={copy} data-testid="link-copy">
          Copy
        </button>
      </div>
      {copied === "yes" && (
        <p className="mt-1 text-slip-700 dark:text-slip-300" role="status">
          Copied to the clipboard.
        </p>
      )}
      {copied === "select" && (
        <p className="mt-1 text-slate-600 dark:text-slate-300" role="status">
          The address is selected: press Ctrl+C (⌘C) to copy it.
        </p>
      )}
    </div>
  );
}
