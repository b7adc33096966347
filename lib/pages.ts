import "server-only";
import { notFound, redirect } from "next/navigation";
import { requireFaultRole, requireStudyRole } from "@/lib/access";
import type { StudyAction } from "@/lib/contracts/roles";
import { ApiError } from "@/lib/api/errors";
import { getSessionUser } from "@/lib/auth/session";

/** Server components: signed-in user or a redirect to sign-in. */
export async function pageUser(returnTo: string) {
  const user = await getSessionUser();
  if (!user) redirect(`/sign-in?next=${encodeURIComponent(returnTo)}`);
  return user;
}

async function orNotFound<T>(returnTo: string, check: () => Promise<T>): Promise<T> {
  await pageUser(returnTo);
  try {
    return await check();
  } catch (error) {
    if (error instanceof ApiError && (error.status === 404 || error.status === 403)) notFound();
    throw error;
  }
}

export const pageStudyAccess = (studyId: string, returnTo: string, action: StudyAction = "view") =>
  orNotFound(returnTo, () => requireStudyRole(studyId, action));

export const pageFaultAccess = (faultId: string, returnTo: string, action: StudyAction = "view") =>
  orNotFound(returnTo, () => requireFaultRole(faultId, action));
