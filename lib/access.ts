import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { faults, memberships, type StudyRole } from "@/db/schema";
import { getSessionUser } from "@/lib/auth/session";
import type { SessionUser } from "@/lib/auth/users";
import { ApiError, forbidden, unauthorized } from "@/lib/api/errors";

/** What a member may do in a study. The single source of the role matrix (design.md). */
export type StudyAction = "view" | "edit" | "comment" | "share" | "admin";

export const ROLE_PERMISSIONS: Record<StudyAction, readonly StudyRole[]> = {
  view: ["owner", "interpreter", "reviewer", "viewer"],
  edit: ["owner", "interpreter"],
  comment: ["owner", "interpreter", "reviewer"],
  share: ["owner", "interpreter", "reviewer"],
  admin: ["owner"],
};

const ACTION_WORDS: Record<StudyAction, string> = {
  view: "view this study",
  edit: "upload picks or edit faults",
  comment: "add pins or replies",
  share: "save viewpoints or make links",
  admin: "manage people or delete the study",
};

export function roleAllows(role: StudyRole, action: StudyAction): boolean {
  return ROLE_PERMISSIONS[action].includes(role);
}

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

/** Session + membership + role check. Non-members get 404 so that ids of other studies reveal nothing. */
export async function requireStudyRole(studyId: string, action: StudyAction): Promise<StudyAccess> {
  const user = await requireUser();
  const db = await getDb();
  const membership = await db.query.memberships.findFirst({
    where: and(eq(memberships.studyId, studyId), eq(memberships.userId, user.id)),
  });
  if (!membership) throw new ApiError(404, "Study not found.");
  if (!roleAllows(membership.role, action)) throw forbidden(ACTION_WORDS[action]);
  return { user, studyId, role: membership.role };
}

/** Session, the fault's study, membership and role in one query; a fault of another study answers 404 like a missing one. */
export async function requireFaultRole(faultId: string, action: StudyAction): Promise<StudyAccess & { faultId: string }> {
  const user = await requireUser();
  const db = await getDb();
  const [row] = await db
    .select({ studyId: faults.studyId, role: memberships.role })
    .from(faults)
    .leftJoin(memberships, and(eq(memberships.studyId, faults.studyId), eq(memberships.userId, user.id)))
    .where(eq(faults.id, faultId))
    .limit(1);
  if (!row?.role) throw new ApiError(404, "Fault not found.");
  if (!roleAllows(row.role, action)) throw forbidden(ACTION_WORDS[action]);
  return { user, studyId: row.studyId, role: row.role, faultId };
}
