import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { invitations, memberships, studies, users } from "@/db/schema";
import type { StudyRole } from "@/lib/contracts/roles";
import { changingRoles } from "@/lib/access";
import type { SessionUser } from "@/lib/auth/users";
import { recordAudit } from "@/lib/audit";
import { hashToken } from "@/lib/members";

/** Invitation tokens are 32 random bytes in base64url (see lib/members.ts): 43 characters. */
export const invitationTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/, "This invitation link is not complete.");

export type InvitationLookup =
  | { state: "not-found" }
  | { state: "expired" | "used" | "open"; studyId: string; studyName: string; email: string; role: StudyRole; invitedByName: string | null; expiresAt: Date };

/** What the invitation page shows. Only the holder of the token sees this; the token is looked up by its hash. */
export async function lookupInvitation(token: string, now = new Date()): Promise<InvitationLookup> {
  if (!invitationTokenSchema.safeParse(token).success) return { state: "not-found" };
  const db = await getDb();
  const [row] = await db
    .select({
      studyId: invitations.studyId,
      studyName: studies.name,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      acceptedAt: invitations.acceptedAt,
      invitedByName: users.name,
    })
    .from(invitations)
    .innerJoin(studies, eq(studies.id, invitations.studyId))
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(eq(invitations.tokenHash, hashToken(token)));
  if (!row) return { state: "not-found" };
  const state = row.acceptedAt ? "used" : row.expiresAt.getTime() <= now.getTime() ? "expired" : "open";
  return {
    state,
    studyId: row.studyId,
    studyName: row.studyName,
    email: row.email,
    role: row.role,
    invitedByName: row.invitedByName,
    expiresAt: row.expiresAt,
  };
}

export type AcceptResult =
  | { ok: true; studyId: string; role: StudyRole; alreadyMember: boolean }
  | { ok: false; reason: "not-found" | "expired" | "used" | "wrong-email"; message: string };

const MESSAGES = {
  "not-found": "This invitation link is not valid. Ask the study owner to invite you again.",
  expired: "This invitation has expired. Ask the study owner to invite you again.",
  used: "This invitation has already been used.",
} as const;

/**
 * Joins the signed-in person to the study. One-time: the invitation is claimed by a conditional update (not yet
 * accepted, not expired), so two clicks or two tabs cannot use it twice. The invited e-mail must be the account's.
 * Someone who is already a member keeps the role they have.
 */
export async function acceptInvitation(user: SessionUser, token: string): Promise<AcceptResult> {
  const found = await lookupInvitation(token);
  if (found.state === "not-found") return { ok: false, reason: "not-found", message: MESSAGES["not-found"] };
  if (found.state !== "open") return { ok: false, reason: found.state, message: MESSAGES[found.state] };
  if (found.email.trim().toLowerCase() !== user.email.trim().toLowerCase()) {
    return {
      ok: false,
      reason: "wrong-email",
      message: `This invitation was sent to ${found.email}; you are signed in as ${user.email}. Sign in with the invited address.`,
    };
  }
  const db = await getDb();
  const result = await changingRoles(() =>
    db.transaction(async (tx) => {
      const [claimed] = await tx
        .update(invitations)
        .set({ acceptedAt: new Date() })
        .where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
        .returning({ studyId: invitations.studyId, role: invitations.role });
      if (!claimed) return null;
      const existing = await tx.query.memberships.findFirst({ where: and(eq(memberships.studyId, claimed.studyId), eq(memberships.userId, user.id)) });
      if (existing) return { studyId: claimed.studyId, role: existing.role, alreadyMember: true };
      await tx.insert(memberships).values({ studyId: claimed.studyId, userId: user.id, role: claimed.role });
      return { studyId: claimed.studyId, role: claimed.role, alreadyMember: false };
    }),
  );
  if (!result) return { ok: false, reason: "used", message: MESSAGES.used };
  await recordAudit({
    studyId: result.studyId,
    userId: user.id,
    action: "member.accept-invitation",
    target: user.email,
    details: { role: result.role, alreadyMember: result.alreadyMember },
  });
  return { ok: true, ...result };
}
