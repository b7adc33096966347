"use client";
// Pinned notes beside the 3D view: the fault's pins (also handed to the scene and the 2D map as markers),
// "Pin a note" (the next click on the surface gives the place), threads with replies, resolve / reopen,
// edit within the window, delete. Clicking a note flies the camera to its pin.
import { useEffect, useMemo, useRef, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { roleAllows, type StudyRole } from "@/lib/contracts/roles";
import type { FaultDisplay } from "@/lib/contracts/display";
import type { Vec3 } from "@/lib/contracts/json";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import type { PinList, PinView, ReplyView } from "@/lib/contracts/pins";
import { useAnnotationStore } from "@/scene/annotationStore";
import { DEFAULT_FOV_DEG, useCameraStore } from "@/scene/cameraStore";
import { MentionTextarea, type Mentionable } from "./MentionTextarea";
import { PinText } from "./PinText";

/** how far from the pin the camera stops when flying to it, m */
const FLY_DISTANCE_M = 800;

type Filter = "all" | "mine" | "open";

function errorText(error: unknown) {
  if (error instanceof ApiRequestError) {
    const fields = error.details?.fieldErrors;
    const first = fields ? Object.entries(fields).find(([, messages]) => messages?.length) : undefined;
    return first ? `${error.message} (${first[0]}: ${first[1][0]})` : error.message;
  }
  return error instanceof Error ? error.message : "Something went wrong.";
}

const when = (iso: string) => new Date(iso).toLocaleString(undefined, { dateStyle: "medium", timeStyle: "short" });
const minutesLeft = (iso: string) => Math.max(0, Math.ceil((new Date(iso).getTime() - Date.now()) / 60_000));

/** Keeps the pin in view: same viewing direction as now, from ~800 m away. */
export function flyToPin(pin: { x: number; y: number; z: number }) {
  const current = useCameraStore.getState().camera;
  const target: Vec3 = [pin.x, pin.y, pin.z];
  let direction: Vec3 = current
    ? [current.position[0] - current.target[0], current.position[1] - current.target[1], current.position[2] - current.target[2]]
    : [0, -1, 1];
  const length = Math.hypot(...direction);
  direction = length > 0 ? [direction[0] / length, direction[1] / length, direction[2] / length] : [0, -Math.SQRT1_2, Math.SQRT1_2];
  useCameraStore.getState().applyCamera({
    position: [target[0] + direction[0] * FLY_DISTANCE_M, target[1] + direction[1] * FLY_DISTANCE_M, target[2] + direction[2] * FLY_DISTANCE_M],
    target,
    up: [0, 0, 1],
    fov: current?.fov ?? DEFAULT_FOV_DEG,
  });
}

export function PinsPanel({
  faultId,
  role,
  currentPickSetVersion,
  display,
  linkedPinId = null,
}: {
  studyId: string;
  faultId: string;
  role: StudyRole;
  currentPickSetVersion: number | null;
  display: FaultDisplay | null;
  /** a pin named by the page's link (?pin=…, from an e-mail): its thread starts open and the camera flies to it */
  linkedPinId?: string | null;
}) {
  const canComment = roleAllows(role, "comment");
  const queryClient = useQueryClient();
  const key = useMemo(() => ["pins", faultId], [faultId]);
  const [filter, setFilter] = useState<Filter>("all");
  const [selected, setSelected] = useState<string | null>(linkedPinId);
  const [unreadSeen, setUnreadSeen] = useState<Set<string>>(() => new Set());
  const [countedList, setCountedList] = useState<PinList | undefined>(undefined);
  const visited = useRef(false);
  const setPins = useAnnotationStore((state) => state.setPins);
  const placing = useAnnotationStore((state) => state.placing);
  const setPlacing = useAnnotationStore((state) => state.setPlacing);
  const pendingHit = useAnnotationStore((state) => state.pendingHit);
  const setPendingHit = useAnnotationStore((state) => state.setPendingHit);

  const pins = useQuery({ queryKey: key, queryFn: () => apiFetch<PinList>(`/api/faults/${faultId}/pins`), refetchOnWindowFocus: true });

  // markers in the 3D view and the 2D map
  useEffect(() => {
    setPins((pins.data?.pins ?? []).map((pin) => ({ id: pin.id, x: pin.x, y: pin.y, z: pin.z, resolved: pin.state === "resolved" })));
  }, [pins.data, setPins]);
  useEffect(
    () => () => {
      setPins([]);
      setPlacing(false);
    },
    [setPins, setPlacing],
  );

  // Unread markers stay for this visit; once the list has been on screen the server counts from then on. Each new list
  // adds its unread pins while rendering (the state follows the data without an effect).
  if (pins.data && pins.data !== countedList) {
    setCountedList(pins.data);
    const fresh = pins.data.pins.filter((pin) => pin.unread).map((pin) => pin.id);
    if (fresh.length && !fresh.every((id) => unreadSeen.has(id))) setUnreadSeen(new Set([...unreadSeen, ...fresh]));
  }
  const root = useRef<HTMLDivElement>(null);
  const loaded = Boolean(pins.data);
  useEffect(() => {
    const element = root.current;
    if (!element || !loaded || visited.current) return;
    const observer = new IntersectionObserver((entries) => {
      if (visited.current || !entries.some((entry) => entry.isIntersecting)) return;
      visited.current = true;
      observer.disconnect();
      void apiFetch(`/api/faults/${faultId}/pins/visit`, { method: "POST" }).catch(() => undefined);
    });
    observer.observe(element);
    return () => observer.disconnect();
  }, [loaded, faultId]);

  // a link from an e-mail (?pin=…) opened that thread: once the surface and the list are there, fly to its pin
  const flewToLinkedPin = useRef(false);
  useEffect(() => {
    if (flewToLinkedPin.current || !linkedPinId || !pins.data || !display) return;
    flewToLinkedPin.current = true;
    const pin = pins.data.pins.find((candidate) => candidate.id === linkedPinId);
    if (pin) flyToPin(pin);
  }, [linkedPinId, pins.data, display]);

  const list = (pins.data?.pins ?? []).filter((pin) => (filter === "mine" ? pin.mine : filter === "open" ? pin.state === "open" : true));
  const counts = {
    all: pins.data?.pins.length ?? 0,
    mine: pins.data?.pins.filter((pin) => pin.mine).length ?? 0,
    open: pins.data?.pins.filter((pin) => pin.state === "open").length ?? 0,
  };
  const invalidate = () => queryClient.invalidateQueries({ queryKey: key });

  return (
    <div ref={root} className="space-y-3" data-testid="pins-panel">
      <div className="flex items-center justify-between gap-2">
        <h2 className="font-semibold">Pinned notes</h2>
        {canComment &&
          (placing ? (
            <button className="btn-quiet py-1.5" onClick={() => setPlacing(false)} data-testid="pin-cancel-placing">
              Cancel
            </button>
          ) : (
            <button className="btn-primary py-1.5" onClick={() => setPlacing(true)} disabled={!display || Boolean(pendingHit)} data-testid="pin-a-note">
              Pin a note
            </button>
          ))}
      </div>
      {placing && (
        <p className="rounded-lg bg-slip-50 px-3 py-2 text-sm text-slip-900 dark:bg-slip-950 dark:text-slip-100" data-testid="pin-placing-hint">
          Click a place on the fault surface in the 3D view to pin your note there.
        </p>
      )}
      {pendingHit && canComment && (
        <NewPinForm
          faultId={faultId}
          hit={pendingHit}
          mentionable={pins.data?.mentionable ?? []}
          onDone={(pinId) => {
            setPendingHit(null);
            if (pinId) setSelected(pinId);
          }}
          onSaved={invalidate}
        />
      )}

      <div className="flex gap-1 rounded-lg bg-slate-100 p-1 text-sm dark:bg-slate-800" role="group" aria-label="Show">
        {(["all", "mine", "open"] as const).map((value) => (
          <button
            key={value}
            onClick={() => setFilter(value)}
            aria-pressed={filter === value}
            data-testid={`pin-filter-${value}`}
            className={`flex-1 rounded-md px-2 py-1 ${filter === value ? "bg-white font-medium shadow-sm dark:bg-slate-900" : "text-slate-600 hover:text-slate-900 dark:text-slate-400"}`}
          >
            {value === "all" ? "All" : value === "mine" ? "Mine" : "Open"} <span className="num text-xs text-slate-500">{counts[value]}</span>
          </button>
        ))}
      </div>

      {pins.isPending && <p className="text-sm text-slate-500">Loading notes…</p>}
      {pins.isError && (
        <p className="field-error" role="alert">
          {errorText(pins.error)}
        </p>
      )}
      {pins.data && list.length === 0 && (
        <p className="text-sm text-slate-500" data-testid="pins-empty">
          {filter === "all"
            ? canComment
              ? "No notes yet. Use “Pin a note” and click the surface."
              : "No notes on this fault yet."
            : filter === "mine"
              ? "You have not pinned a note here."
              : "No open notes."}
        </p>
      )}
      <ol className="space-y-2">
        {list.map((pin) => (
          <PinCard
            key={pin.id}
            pin={pin}
            faultId={faultId}
            expanded={selected === pin.id}
            unread={unreadSeen.has(pin.id)}
            currentPickSetVersion={currentPickSetVersion}
            editWindowMinutes={pins.data?.editWindowMinutes ?? 15}
            mentionable={pins.data?.mentionable ?? []}
            onSelect={() => {
              setSelected((current) => (current === pin.id ? null : pin.id));
              flyToPin(pin);
              setUnreadSeen((seen) => {
                const next = new Set(seen);
                next.delete(pin.id);
                return next;
              });
            }}
            onChanged={invalidate}
          />
        ))}
      </ol>
    </div>
  );
}

function MentionHint({ mentionable }: { mentionable: Mentionable[] }) {
  if (mentionable.length === 0) return null;
  return (
    <p className="text-xs text-slate-500">
      **bold**, `code`, links. Type @ to mention someone:{" "}
      {mentionable.slice(0, 6).map((person, index) => (
        <span key={person.handle}>
          {index > 0 && ", "}
          <span className="font-mono" title={person.name}>
            @{person.handle}
          </span>
        </span>
      ))}
      .
    </p>
  );
}

function NewPinForm({
  faultId,
  hit,
  mentionable,
  onDone,
  onSaved,
}: {
  faultId: string;
  hit: { x: number; y: number; z: number; s: number; t: number; segmentId: string };
  mentionable: Mentionable[];
  onDone: (pinId: string | null) => void;
  onSaved: () => void;
}) {
  const [body, setBody] = useState("");
  const queryClient = useQueryClient();
  const key = ["pins", faultId];
  const create = useMutation({
    mutationFn: () => apiFetch<{ pin: { id: string } }>(`/api/faults/${faultId}/pins`, { method: "POST", json: { ...hit, body } }),
    onMutate: async () => {
      await queryClient.cancelQueries({ queryKey: key });
      const previous = queryClient.getQueryData<PinList>(key);
      if (previous) {
        const optimistic: PinView = {
          id: `pending-${Date.now()}`,
          x: hit.x,
          y: hit.y,
          z: hit.z,
          s: hit.s,
          t: hit.t,
          segmentName: hit.segmentId,
          pickSetVersion: null,
          body,
          state: "open",
          author: { id: "me", name: "You" },
          createdAt: new Date().toISOString(),
          edited: false,
          resolvedBy: null,
          resolvedAt: null,
          unread: false,
          mine: true,
          editableUntil: new Date().toISOString(),
          can: { edit: false, resolve: false, delete: false, reply: false },
          replies: [],
        };
        queryClient.setQueryData<PinList>(key, { ...previous, pins: [optimistic, ...previous.pins] });
      }
      return { previous };
    },
    onError: (_error, _vars, context) => {
      if (context?.previous) queryClient.setQueryData(key, context.previous);
    },
    onSuccess: (data) => onDone(data.pin.id),
    onSettled: onSaved,
  });
  return (
    <form
      className="card space-y-2 border-slip-300 p-3 dark:border-slip-800"
      data-testid="pin-form"
      onSubmit={(event) => {
        event.preventDefault();
        create.mutate();
      }}
    >
      <p className="text-xs text-slate-500">
        New note on segment <span className="font-medium">{hit.segmentId}</span> at along-strike <span className="num">{Math.round(hit.s)} m</span>, down-dip{" "}
        <span className="num">{Math.round(hit.t)} m</span>
      </p>
      <label className="label" htmlFor="pin-body">
        Note
      </label>
      <MentionTextarea
        id="pin-body"
        className="field min-h-[84px]"
        value={body}
        onValueChange={setBody}
        mentionable={mentionable}
        maxLength={4000}
        autoFocus
        placeholder="Throw jumps here — mis-pick?"
        data-testid="pin-body-input"
      />
      <MentionHint mentionable={mentionable} />
      {create.isError && (
        <p className="field-error" role="alert" data-testid="pin-form-error">
          {errorText(create.error)}
        </p>
      )}
      <div className="flex gap-2">
        <button className="btn-primary" disabled={create.isPending || body.trim() === ""} data-testid="pin-save">
          {create.isPending ? "Saving…" : "Save note"}
        </button>
        <button type="button" className="btn-quiet" onClick={() => onDone(null)} data-testid="pin-form-cancel">
          Cancel
        </button>
      </div>
    </form>
  );
}

function PinCard({
  pin,
  faultId,
  expanded,
  unread,
  currentPickSetVersion,
  editWindowMinutes,
  mentionable,
  onSelect,
  onChanged,
}: {
  pin: PinView;
  mentionable: Mentionable[];
  faultId: string;
  expanded: boolean;
  unread: boolean;
  currentPickSetVersion: number | null;
  editWindowMinutes: number;
  onSelect: () => void;
  onChanged: () => void;
}) {
  const [editing, setEditing] = useState(false);
  const [draft, setDraft] = useState(pin.body);
  const [error, setError] = useState<string | null>(null);
  const pending = pin.id.startsWith("pending-");
  const act = useMutation({
    mutationFn: (request: { method: "PATCH" | "DELETE"; json?: unknown }) => apiFetch(`/api/pins/${pin.id}`, { method: request.method, json: request.json }),
    onMutate: () => setError(null),
    onError: (failure) => setError(errorText(failure)),
    onSuccess: () => setEditing(false),
    onSettled: onChanged,
  });
  const otherVersion = pin.pickSetVersion !== null && currentPickSetVersion !== null && pin.pickSetVersion !== currentPickSetVersion;
  const left = minutesLeft(pin.editableUntil);
  return (
    <li
      className={`card overflow-hidden ${pin.state === "resolved" ? "opacity-80" : ""} ${expanded ? "ring-2 ring-slip-300 dark:ring-slip-800" : ""}`}
      data-testid="pin-item"
      data-pin-id={pin.id}
      data-state={pin.state}
    >
      <div
        role="button"
        tabIndex={pending ? -1 : 0}
        aria-disabled={pending}
        aria-expanded={expanded}
        className="block w-full cursor-pointer p-3 text-left hover:bg-slate-50 focus:outline-none focus-visible:ring-2 focus-visible:ring-slip-400 dark:hover:bg-slate-800/60"
        onClick={() => {
          if (!pending) onSelect();
        }}
        onKeyDown={(event) => {
          if (!pending && (event.key === "Enter" || event.key === " ") && event.target === event.currentTarget) {
            event.preventDefault();
            onSelect();
          }
        }}
        data-testid="pin-goto"
        title="Show this place in the 3D view and open the thread"
      >
        <div className="flex items-center gap-2 text-xs text-slate-500">
          {unread && <span className="h-2 w-2 shrink-0 rounded-full bg-slip-500" aria-label="unread" data-testid="pin-unread" />}
          <span className="font-medium text-slate-800 dark:text-slate-200">{pin.author?.name ?? "Former member"}</span>
          <span>·</span>
          <time dateTime={pin.createdAt}>{when(pin.createdAt)}</time>
          {pin.edited && <span>(edited)</span>}
          <span
            className={`ml-auto rounded px-1.5 py-0.5 font-medium ${pin.state === "resolved" ? "bg-slate-100 text-slate-600 dark:bg-slate-800 dark:text-slate-300" : "bg-slip-50 text-slip-800 dark:bg-slip-950 dark:text-slip-200"}`}
            data-testid="pin-state"
          >
            {pin.state === "resolved" ? "Resolved" : "Open"}
          </span>
        </div>
        {!editing && (
          <div className="mt-1.5 text-slate-800 dark:text-slate-100">
            <PinText text={pin.body} />
          </div>
        )}
        <div className="mt-1.5 flex flex-wrap gap-x-3 text-xs text-slate-500">
          {pin.segmentName && <span>Segment {pin.segmentName}</span>}
          {otherVersion && (
            <span className="text-amber-700 dark:text-amber-400" data-testid="pin-version">
              made on pick set v{pin.pickSetVersion}
            </span>
          )}
          {pin.replies.length > 0 && (
            <span>
              {pin.replies.length} repl{pin.replies.length === 1 ? "y" : "ies"}
            </span>
          )}
          {pin.state === "resolved" && pin.resolvedBy && <span>resolved by {pin.resolvedBy.name}</span>}
        </div>
      </div>

      {editing && (
        <form
          className="space-y-2 px-3 pb-3"
          onSubmit={(event) => {
            event.preventDefault();
            act.mutate({ method: "PATCH", json: { action: "edit", body: draft } });
          }}
        >
          <textarea
            className="field min-h-[72px]"
            value={draft}
            onChange={(event) => setDraft(event.target.value)}
            maxLength={4000}
            aria-label="Edit note"
            data-testid="pin-edit-input"
          />
          <p className="text-xs text-slate-500">
            You can edit for {left} more minute{left === 1 ? "" : "s"} ({editWindowMinutes} minutes after writing).
          </p>
          <div className="flex gap-2">
            <button className="btn-primary py-1.5" disabled={act.isPending || draft.trim() === ""} data-testid="pin-edit-save">
              Save
            </button>
            <button
              type="button"
              className="btn-quiet py-1.5"
              onClick={() => {
                setEditing(false);
                setDraft(pin.body);
              }}
            >
              Cancel
            </button>
          </div>
        </form>
      )}

      {expanded && !pending && (
        <div className="space-y-2 border-t border-slate-200 bg-slate-50/60 p-3 dark:border-slate-800 dark:bg-slate-950/40" data-testid="pin-thread">
          {(pin.can.resolve || pin.can.edit || pin.can.delete) && (
            <div className="flex flex-wrap gap-2">
              {pin.can.resolve &&
                (pin.state === "open" ? (
                  <button
                    className="btn-quiet py-1 text-xs"
                    disabled={act.isPending}
                    onClick={() => act.mutate({ method: "PATCH", json: { action: "resolve" } })}
                    data-testid="pin-resolve"
                  >
                    Resolve
                  </button>
                ) : (
                  <button
                    className="btn-quiet py-1 text-xs"
                    disabled={act.isPending}
                    onClick={() => act.mutate({ method: "PATCH", json: { action: "reopen" } })}
                    data-testid="pin-reopen"
                  >
                    Reopen
                  </button>
                ))}
              {pin.can.edit && !editing && (
                <button
                  className="btn-quiet py-1 text-xs"
                  onClick={() => {
                    setDraft(pin.body);
                    setEditing(true);
                  }}
                  title={`Editable for ${left} more minutes`}
                  data-testid="pin-edit"
                >
                  Edit ({left} min left)
                </button>
              )}
              {pin.can.delete && (
                <button
                  className="btn-danger py-1 text-xs"
                  disabled={act.isPending}
                  onClick={() => {
                    if (window.confirm("Delete this note and its thread?")) act.mutate({ method: "DELETE" });
                  }}
                  data-testid="pin-delete"
                >
                  Delete
                </button>
              )}
            </div>
          )}
          {pin.mine && !pin.can.edit && pin.can.delete && (
            <p className="text-xs text-slate-500">Notes can be edited only in the first {editWindowMinutes} minutes; reply to add to it.</p>
          )}
          {error && (
            <p className="field-error mt-0" role="alert" data-testid="pin-error">
              {error}
            </p>
          )}
          <ol className="space-y-2">
            {pin.replies.map((reply) => (
              <ReplyItem key={reply.id} reply={reply} pinId={pin.id} editWindowMinutes={editWindowMinutes} onChanged={onChanged} />
            ))}
          </ol>
          {pin.can.reply && <ReplyBox pinId={pin.id} faultId={faultId} mentionable={mentionable} onChanged={onChanged} />}
        </div>
      )}
    </li>
  );
}

function ReplyItem({ reply, pinId, editWindowMinutes, onChanged }: { reply: ReplyView; pinId: string; editWindowMinutes: number; onChanged: () => void }) {
  const [editing, setEditing] = useState(false);
  const [draft, setDraft] = useState(reply.body);
  const [error, setError] = useState<string | null>(null);
  const act = useMutation({
    mutationFn: (request: { method: "PATCH" | "DELETE"; json?: unknown }) =>
      apiFetch(`/api/pins/${pinId}/replies/${reply.id}`, { method: request.method, json: request.json }),
    onMutate: () => setError(null),
    onError: (failure) => setError(errorText(failure)),
    onSuccess: () => setEditing(false),
    onSettled: onChanged,
  });
  const left = minutesLeft(reply.editableUntil);
  return (
    <li className="rounded-lg bg-white p-2 ring-1 ring-slate-200 dark:bg-slate-900 dark:ring-slate-800" data-testid="reply-item">
      <div className="flex items-center gap-2 text-xs text-slate-500">
        {reply.unread && <span className="h-1.5 w-1.5 rounded-full bg-slip-500" aria-label="unread" />}
        <span className="font-medium text-slate-800 dark:text-slate-200">{reply.author?.name ?? "Former member"}</span>
        <time dateTime={reply.createdAt}>{when(reply.createdAt)}</time>
        {reply.edited && <span>(edited)</span>}
        <span className="ml-auto flex gap-2">
          {reply.can.edit && !editing && (
            <button
              className="hover:text-slip-700"
              onClick={() => setEditing(true)}
              title={`Editable for ${left} more minutes (${editWindowMinutes} minutes after writing)`}
            >
              Edit
            </button>
          )}
          {reply.can.delete && (
            <button
              className="hover:text-red-700"
              onClick={() => {
                if (window.confirm("Delete this reply?")) act.mutate({ method: "DELETE" });
              }}
            >
              Delete
            </button>
          )}
        </span>
      </div>
      {editing ? (
        <form
          className="mt-1 space-y-1"
          onSubmit={(event) => {
            event.preventDefault();
            act.mutate({ method: "PATCH", json: { body: draft } });
          }}
        >
          <textarea className="field min-h-[56px]" value={draft} onChange={(event) => setDraft(event.target.value)} maxLength={4000} aria-label="Edit reply" />
          <div className="flex gap-2 text-xs">
            <button className="btn-primary py-1" disabled={act.isPending || draft.trim() === ""}>
              Save
            </button>
            <button type="button" className="btn-quiet py-1" onClick={() => setEditing(false)}>
              Cancel
            </button>
            <span className="self-center text-slate-500">{left} min left to edit</span>
          </div>
        </form>
      ) : (
        <div className="mt-1">
          <PinText text={reply.body} />
        </div>
      )}
      {error && (
        <p className="field-error mt-1" role="alert">
          {error}
        </p>
      )}
    </li>
  );
}

function ReplyBox({ pinId, faultId, mentionable, onChanged }: { pinId: string; faultId: string; mentionable: Mentionable[]; onChanged: () => void }) {
  const [body, setBody] = useState("");
  const queryClient = useQueryClient();
  const key = ["pins", faultId];
  const send = useMutation({
    mutationFn: (text: string) => apiFetch(`/api/pins/${pinId}/replies`, { method: "POST", json: { body: text } }),
    onMutate: async (text) => {
      await queryClient.cancelQueries({ queryKey: key });
      const previous = queryClient.getQueryData<PinList>(key);
      if (previous) {
        const optimistic: ReplyView = {
          id: `pending-${Date.now()}`,
          author: { id: "me", name: "You" },
          body: text,
          createdAt: new Date().toISOString(),
          edited: false,
          unread: false,
          mine: true,
          editableUntil: new Date().toISOString(),
          can: { edit: false, delete: false },
        };
        queryClient.setQueryData<PinList>(key, {
          ...previous,
          pins: previous.pins.map((pin) => (pin.id === pinId ? { ...pin, replies: [...pin.replies, optimistic] } : pin)),
        });
      }
      setBody("");
      return { previous, text };
    },
    onError: (_error, text, context) => {
      if (context?.previous) queryClient.setQueryData(key, context.previous);
      setBody(text);
    },
    onSettled: onChanged,
  });
  return (
    <form
      className="space-y-1"
      onSubmit={(event) => {
        event.preventDefault();
        if (body.trim()) send.mutate(body);
      }}
    >
      <label className="sr-only" htmlFor={`reply-${pinId}`}>
        Reply
      </label>
      <MentionTextarea
        id={`reply-${pinId}`}
        className="field min-h-[56px]"
        placeholder="Reply… (@ to mention)"
        value={body}
        onValueChange={setBody}
        mentionable={mentionable}
        maxLength={4000}
        data-testid="reply-input"
      />
      {send.isError && (
        <p className="field-error mt-0" role="alert" data-testid="reply-error">
          {errorText(send.error)}
        </p>
      )}
      <button className="btn-primary py-1.5" disabled={send.isPending || body.trim() === ""} data-testid="reply-send">
        {send.isPending ? "Sending…" : "Reply"}
      </button>
    </form>
  );
}
