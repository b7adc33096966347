import { vi } from "vitest";
import type { SessionUser } from "@/lib/auth/users";

/** Shared with the vi.mock of @/lib/auth/session in each test file: whoever is "signed in" now. */
export const sessionState: { user: SessionUser | null } = { user: null };

export function signInAs(user: SessionUser | null) {
  sessionState.user = user;
}

export const getSessionUserMock = vi.fn(async () => sessionState.user);
