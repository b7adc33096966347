import "server-only";
import { timingSafeEqual } from "node:crypto";
import { and, desc, eq, inArray, or, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, outbox } from "@/db/schema";
import { requireUser } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import type { SessionUser } from "@/lib/auth/users";
import { config, type Config } from "@/lib/config";

/** True when no mail transport is configured: e-mail is only stored in the outbox table, nothing leaves the machine. */
export function mailStaysLocal(settings: Pick<Config, "SMTP_URL"> = config()) {
  return !settings.SMTP_URL;
}

/**
 * The outbox page exists whenever e-mail stays on this machine (no SMTP_URL: it is the only place to read it), in
 * development, or when SLIPFIELD_OUTBOX=on; SLIPFIELD_OUTBOX=off hides it.
 */
export function outboxEnabled(settings: Pick<Config, "SMTP_URL" | "SLIPFIELD_OUTBOX" | "NODE_ENV"> = config()) {
  if (settings.SLIPFIELD_OUTBOX === "off") return false;
  return mailStaysLocal(settings) || settings.NODE_ENV !== "production" || settings.SLIPFIELD_OUTBOX === "on";
}

export async function ownsAnyStudy(userId: string) {
  const db = await getDb();
  return Boolean(
    await db.query.memberships.findFirst({ where: and(eq(memberships.userId, userId), eq(memberships.role, "owner")), columns: { studyId: true } }),
  );
}

/**
 * What one owner may read in the outbox: the e-mail of the studies they own, and e-mail addressed to them. Digests to
 * other people (they span studies) and e-mail of other studies stay hidden.
 */
export async function listOutbox(user: Pick<SessionUser, "id" | "email">, limit = 200) {
  const db = await getDb();
  const owned = db
    .select({ studyId: memberships.studyId })
    .from(memberships)
    .where(and(eq(memberships.userId, user.id), eq(memberships.role, "owner")));
  return db
    .select()
    .from(outbox)
    .where(or(inArray(outbox.studyId, owned), sql`lower(${outbox.to}) = ${user.email.toLowerCase()}`))
    .orderBy(desc(outbox.createdAt))
    .limit(limit);
}

/**
 * Who may run the digest from the web: a scheduler holding SLIPFIELD_DIGEST_SECRET (header
 * `x-slipfield-digest-secret`), or a signed-in owner of any study. Returns the caller for the audit trail.
 */
export async function requireDigestCaller(request: Request): Promise<{ kind: "secret" } | { kind: "owner"; user: SessionUser }> {
  const secret = config().SLIPFIELD_DIGEST_SECRET;
  const offered = request.headers.get("x-slipfield-digest-secret");
  if (secret && offered !== null) {
    const a = Buffer.from(offered);
    const b = Buffer.from(secret);
    if (a.length === b.length && timingSafeEqual(a, b)) return { kind: "secret" };
    throw new ApiError(403, "The digest secret is not right.");
  }
  const user = await requireUser();
  if (!(await ownsAnyStudy(user.id))) throw new ApiError(403, "Only a study owner can run the e-mail digest.");
  return { kind: "owner", user };
}
