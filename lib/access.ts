import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { isListening, onListeningChange, publish, subscribe } from "@/db/notifications";
import { faults, memberships } from "@/db/schema";
import { roleAllows, type StudyAction, type StudyRole } from "@/lib/contracts/roles";
import { getSessionUser } from "@/lib/auth/session";
import type { SessionUser } from "@/lib/auth/users";
import { ApiError, forbidden, unauthorized } from "@/lib/api/errors";
import { lruCache } from "@/lib/lru";

const ACTION_WORDS: Record<StudyAction, string> = {
  view: "view this study",
  edit: "upload picks or edit faults",
  comment: "add pins or replies",
  share: "save viewpoints or make links",
  admin: "manage people or delete the study",
};

export async function requireUser(): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) throw unauthorized();
  return user;
}

export interface StudyAccess {
  user: SessionUser;
  studyId: string;
  role: StudyRole;
}

// ---- remembered roles --------------------------------------------------------------------------------------------

/**
 * Every API request checks the session and the role; that lookup was the commonest query the server ran. Its answers
 * (and each study's list of members) are remembered in this process while nothing that could change them has
 * happened: every function that changes or removes a membership, a study or a fault runs inside `changingRoles`
 * (lib/studies.ts, lib/invitations.ts), and an answer read while such a change was under way is not kept (the
 * generation has moved on). On the embedded database only this process opens it (its folder is locked), so no one else
 * changes roles behind its back. On a PostgreSQL server other processes can: a change is announced to every process
 * (NOTIFY slipfield_roles, db/notifications.ts), each forgets what it remembered, and the change answers only once the
 * announcement came back (so it has reached every listening process too). A process that is not listening (its
 * connection dropped) remembers nothing until it listens again. Only granted roles are kept: a refusal is always read
 * afresh. The state lives on globalThis: route handlers, pages and server actions are separate bundles, each with its
 * own copy of this module, and must share one memory and one generation (tests/e2e/invitations.spec.ts fails without it).
 */
const ROLE_MEMORY_SIZE = 20_000;
interface Remembered {
  generation: number;
  value: unknown;
}
interface RoleMemory {
  generation: number;
  entries: ReturnType<typeof lruCache<Remembered>>;
  /** the listeners below are installed once per process */
  subscribed: boolean;
}
const roleMemory = ((globalThis as unknown as { slipfieldRoleMemory?: RoleMemory }).slipfieldRoleMemory ??= {
  generation: 0,
  entries: lruCache<Remembered>(ROLE_MEMORY_SIZE),
  subscribed: false,
});

function forgetRoles() {
  roleMemory.generation++;
}

if (!roleMemory.subscribed) {
  roleMemory.subscribed = true;
  subscribe("slipfield_roles", forgetRoles);
  // notifications may have been missed while not listening: forget everything both when it drops and when it is back
  onListeningChange(forgetRoles);
}

/**
 * Runs a write that changes or removes memberships, studies or faults, then drops everything remembered, also when
 * the write failed (it may have got half-way), in this process and every other. Dropping it after the commit, not
 * before, matters: a lookup made meanwhile is then either not kept or read the new state.
 */
export async function changingRoles<T>(write: () => Promise<T>): Promise<T> {
  try {
    return await write();
  } finally {
    forgetRoles();
    await publish("slipfield_roles", "", { echo: true }).catch((error) =>
      console.error("slipfield: could not tell the other processes about a role change:", error),
    );
  }
}

/**
 * `lookup` once, or its remembered answer for `key` if no role changed since it was read. `keep` decides which
 * answers are worth remembering. The answer is shared between requests: never mutate it.
 */
export async function rememberedWhileRolesStand<T>(key: string, lookup: () => Promise<T>, keep: (value: T) => boolean = () => true): Promise<T> {
  const generation = roleMemory.generation;
  const known = roleMemory.entries.get(key);
  if (known && known.generation === generation) return known.value as T;
  const found = await lookup();
  if (keep(found) && generation === roleMemory.generation && (await isListening())) {
    roleMemory.entries.set(key, { generation, value: found });
  }
  return found;
}

const granted = (found: { role: StudyRole | null } | undefined) => Boolean(found?.role);

// ---- checks ------------------------------------------------------------------------------------------------------

/** Session + membership + role check. Non-members get 404 so that ids of other studies reveal nothing. */
export async function requireStudyRole(studyId: string, action: StudyAction): Promise<StudyAccess> {
  const user = await requireUser();
  const membership = await rememberedWhileRolesStand(
    `role:study:${studyId}:${user.id}`,
    async () => {
      const db = await getDb();
      return db.query.memberships.findFirst({
        where: and(eq(memberships.studyId, studyId), eq(memberships.userId, user.id)),
        columns: { studyId: true, role: true },
      });
    },
    granted,
  );
  if (!membership?.role) throw new ApiError(404, "Study not found.");
  if (!roleAllows(membership.role, action)) throw forbidden(ACTION_WORDS[action]);
  return { user, studyId, role: membership.role };
}

/** Session, the fault's study, membership and role in one query; a fault of another study answers 404 like a missing one. */
export async function requireFaultRole(faultId: string, action: StudyAction): Promise<StudyAccess & { faultId: string }> {
  const user = await requireUser();
  const row = await rememberedWhileRolesStand(
    `role:fault:${faultId}:${user.id}`,
    async () => {
      const db = await getDb();
      const [found] = await db
        .select({ studyId: faults.studyId, role: memberships.role })
        .from(faults)
        .leftJoin(memberships, and(eq(memberships.studyId, faults.studyId), eq(memberships.userId, user.id)))
        .where(eq(faults.id, faultId))
        .limit(1);
      return found as { studyId: string; role: StudyRole | null } | undefined;
    },
    granted,
  );
  if (!row?.role) throw new ApiError(404, "Fault not found.");
  if (!roleAllows(row.role, action)) throw forbidden(ACTION_WORDS[action]);
  return { user, studyId: row.studyId, role: row.role, faultId };
}
