import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { invitations, memberships, studies, users } from "@/db/schema";
import type { StudyRole } from "@/lib/contracts/roles";
import type { StudyAccess } from "@/lib/access";
import { ApiError } from "@/lib/api/errors";
import { recordAudit } from "@/lib/audit";
import { appUrl, sendMail } from "@/lib/mail";
import { createRateLimiter } from "@/lib/rate-limit";

const INVITATION_DAYS = 7;
const inviteLimiter = createRateLimiter({ scope: "invite", limit: 30, windowMs: 60 * 60_000 });

export function hashToken(token: string) {
  return createHash("sha256").update(token).digest("hex");
}

/**
 * Adds a person to the study. Someone who already has an account joins at once (and is told by e-mail);
 * anyone else gets an invitation e-mail with a one-time link that expires.
 */
export async function inviteMember(access: StudyAccess, email: string, role: StudyRole) {
  if (!(await inviteLimiter.attempt(access.user.id))) throw new ApiError(429, "Too many invitations in the last hour; try again later.");
  const db = await getDb();
  const study = await db.query.studies.findFirst({ where: eq(studies.id, access.studyId) });
  if (!study) throw new ApiError(404, "Study not found.");
  const existingUser = await db.query.users.findFirst({ where: eq(users.email, email) });
  if (existingUser) {
    const already = await db.query.memberships.findFirst({
      where: and(eq(memberships.studyId, access.studyId), eq(memberships.userId, existingUser.id)),
    });
    if (already) throw new ApiError(409, `${email} is already a member (${already.role}).`, { fieldErrors: { email: ["Already a member of this study."] } });
  }
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600_000);
  const [invitation] = await db
    .insert(invitations)
    .values({ studyId: access.studyId, email, role, tokenHash: hashToken(token), invitedBy: access.user.id, expiresAt })
    .returning({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt });
  const link = appUrl(`/invite/${token}`);
  await sendMail({
    to: email,
    kind: "invitation",
    studyId: access.studyId,
    subject: `${access.user.name} invited you to the study "${study.name}" on Slipfield`,
    text: [
      `${access.user.name} (${access.user.email}) invited you to join "${study.name}" as ${role}.`,
      ``,
      `Open this link to accept (it works once and expires in ${INVITATION_DAYS} days):`,
      link,
    ].join("\n"),
  });
  await recordAudit({ studyId: access.studyId, userId: access.user.id, action: "member.invite", target: email, details: { role } });
  return invitation;
}

export async function listPendingInvitations(studyId: string) {
  const db = await getDb();
  return db
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(and(eq(invitations.studyId, studyId), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())));
}
