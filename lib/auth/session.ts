import "server-only";
import { auth } from "./index";
import type { SessionUser } from "./users";

/** The signed-in user, or null. The one place the app reads the session (tests replace this module). */
export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await auth();
  const user = session?.user;
  if (!user?.id || !user.email) return null;
  return { id: user.id, email: user.email, name: user.name ?? user.email };
}
