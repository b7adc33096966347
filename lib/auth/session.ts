import "server-only";
import { eq, lt, sql } from "drizzle-orm";
import { cookies } from "next/headers";
import { getDb } from "@/db/client";
import { isListening, onListeningChange, payloadOf, publish, subscribe } from "@/db/notifications";
import { revokedSessions } from "@/db/schema";
import { lruCache } from "@/lib/lru";
import { auth, SESSION_MAX_AGE_SECONDS } from "./index";
import type { SessionUser } from "./users";

/**
 * Decoding a session costs next-auth a key derivation, a decryption and a re-encryption of the refreshed token on
 * every request (the largest single cost of a cheap read under load, measured with `npm run loadtest` and a CPU
 * profile). A decoded session is therefore remembered per exact cookie value for a short while. Roles are not part of
 * it; they are checked on every request (lib/access.ts).
 *
 * Signing out ends the session everywhere: its id (a claim of the token) is recorded in revoked_sessions until the
 * token would have expired anyway, every process is told (NOTIFY slipfield_sessions, db/notifications.ts) and forgets
 * it, and a session read afresh is checked against that table. A process that is not listening for such news
 * remembers nothing until it listens again.
 */
const REMEMBER_MS = 60_000;
const MAX_REMEMBERED = 5_000;

interface SessionMemory {
  entries: ReturnType<typeof lruCache<{ user: SessionUser; sessionId: string | null; until: number }>>;
  /** session ids signed out lately, until every remembered entry that may hold them has expired */
  revoked: Map<string, number>;
  subscribed: boolean;
}
// on globalThis: route handlers, pages and server actions are separate bundles and must share one memory
const memory = ((globalThis as unknown as { slipfieldSessionMemory?: SessionMemory }).slipfieldSessionMemory ??= {
  entries: lruCache(MAX_REMEMBERED),
  revoked: new Map(),
  subscribed: false,
});

function forgetSession(sessionId: string) {
  const now = Date.now();
  memory.revoked.set(sessionId, now + REMEMBER_MS);
  for (const [id, until] of memory.revoked) if (until < now) memory.revoked.delete(id);
}

if (!memory.subscribed) {
  memory.subscribed = true;
  subscribe("slipfield_sessions", (payload) => forgetSession(payloadOf(payload)));
  onListeningChange(() => (memory.entries = lruCache(MAX_REMEMBERED)));
}

/** The session cookie(s) of this request (next-auth splits a large token into name.0, name.1, …), or "" if none. */
async function sessionCookieKey(): Promise<string> {
  const jar = await cookies();
  return jar
    .getAll()
    .filter((cookie) => cookie.name.includes("authjs.session-token"))
    .map((cookie) => `${cookie.name}=${cookie.value}`)
    .sort()
    .join("; ");
}

async function isRevoked(sessionId: string) {
  if (memory.revoked.has(sessionId)) return true;
  const db = await getDb();
  const [row] = await db.select({ id: revokedSessions.sessionId }).from(revokedSessions).where(eq(revokedSessions.sessionId, sessionId));
  return Boolean(row);
}

/** The signed-in user, or null. The one place the app reads the session (tests replace this module). */
export async function getSessionUser(): Promise<SessionUser | null> {
  const key = await sessionCookieKey();
  if (!key) return null;
  const now = Date.now();
  const hit = memory.entries.get(key);
  if (hit && hit.until > now && !(hit.sessionId && memory.revoked.has(hit.sessionId))) return hit.user;
  if (hit) memory.entries.delete(key);
  const session = await auth();
  const user = session?.user;
  if (!user?.id || !user.email) return null;
  const sessionId = (session as { sessionId?: string }).sessionId ?? null;
  if (sessionId && (await isRevoked(sessionId))) return null;
  const found: SessionUser = { id: user.id, email: user.email, name: user.name ?? user.email };
  if (await isListening()) memory.entries.set(key, { user: found, sessionId, until: now + REMEMBER_MS });
  return found;
}

/** Ends the current session on every process (before next-auth's signOut clears the cookie in this browser). */
export async function revokeCurrentSession() {
  const session = await auth();
  const sessionId = (session as { sessionId?: string } | null)?.sessionId;
  if (!sessionId) return;
  const db = await getDb();
  await db
    .insert(revokedSessions)
    .values({ sessionId, expiresAt: sql`now() + ${SESSION_MAX_AGE_SECONDS}::int * interval '1 second'` })
    .onConflictDoNothing();
  await db.delete(revokedSessions).where(lt(revokedSessions.expiresAt, sql`now()`));
  forgetSession(sessionId);
  await publish("slipfield_sessions", sessionId, { echo: true });
}
