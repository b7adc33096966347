import "server-only";
import { cookies } from "next/headers";
import { lruCache } from "@/lib/lru";
import { auth } from "./index";
import type { SessionUser } from "./users";

/**
 * Decoding a session costs next-auth a key derivation, a decryption and a re-encryption of the refreshed token on
 * every request (the largest single cost of a cheap read under load, measured with `npm run loadtest` and a CPU
 * profile). A decoded session is therefore remembered per exact cookie value for a short while. This grants nothing
 * the cookie itself does not: the token is a stateless JWT that stays valid for days whether or not it is cached,
 * so remembering it for a minute (at most a minute past its own expiry) changes nothing an attacker could use. Roles
 * are not part of it; they are read from the database on every request.
 */
const REMEMBER_MS = 60_000;
const MAX_REMEMBERED = 5_000;
const remembered = lruCache<{ user: SessionUser; until: number }>(MAX_REMEMBERED);

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

/** The signed-in user, or null. The one place the app reads the session (tests replace this module). */
export async function getSessionUser(): Promise<SessionUser | null> {
  const key = await sessionCookieKey();
  if (!key) return null;
  const now = Date.now();
  const hit = remembered.get(key);
  if (hit && hit.until > now) return hit.user;
  if (hit) remembered.delete(key);
  const session = await auth();
  const user = session?.user;
  if (!user?.id || !user.email) return null;
  const found: SessionUser = { id: user.id, email: user.email, name: user.name ?? user.email };
  remembered.set(key, { user: found, until: now + REMEMBER_MS });
  return found;
}
