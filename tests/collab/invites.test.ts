import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { invitations, memberships, outbox, users } from "@/db/schema";
import type { StudyRole } from "@/lib/contracts/roles";
import * as membersRoute from "@/app/api/studies/[studyId]/members/route";
import * as memberRoute from "@/app/api/studies/[studyId]/members/[userId]/route";
import { acceptInvitationAction } from "@/app/invite/[token]/actions";
import { acceptInvitation, lookupInvitation } from "@/lib/invitations";
import { hashToken } from "@/lib/members";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;

/** The owner invites `email`; returns the token from the link in the e-mail written to the outbox. */
async function invite(fixture: Fixture, email: string, role: StudyRole = "reviewer") {
  signInAs(fixture.people.owner);
  const response = await callRoute(membersRoute.POST, { method: "POST", params: { studyId: fixture.study.id }, body: { email, role } });
  expect(response.status, JSON.stringify(response.json)).toBeLessThan(300);
  const db = await getDb();
  const [mail] = await db.select().from(outbox).where(eq(outbox.to, email)).orderBy(desc(outbox.createdAt)).limit(1);
  expect(mail.kind).toBe("invitation");
  const match = mail.text.match(/\/invite\/([A-Za-z0-9_-]+)\s*$/m);
  expect(match, mail.text).not.toBeNull();
  return match![1];
}

async function newUser(email: string) {
  const db = await getDb();
  const [user] = await db
    .insert(users)
    .values({ email, name: email.split("@")[0], passwordHash: "not-used" })
    .returning({ id: users.id, email: users.email, name: users.name });
  return user;
}

async function roleOf(studyId: string, userId: string) {
  const db = await getDb();
  return (await db.query.memberships.findFirst({ where: and(eq(memberships.studyId, studyId), eq(memberships.userId, userId)) }))?.role ?? null;
}

/** Server actions end with redirect(), which throws; this returns where it pointed. */
async function actionRedirect(run: () => Promise<unknown>): Promise<{ redirectedTo?: string; result?: unknown }> {
  try {
    return { result: await run() };
  } catch (error) {
    const digest = (error as { digest?: string }).digest;
    if (typeof digest === "string" && digest.startsWith("NEXT_REDIRECT")) return { redirectedTo: digest.split(";")[2] };
    throw error;
  }
}

const tag = () => Math.random().toString(36).slice(2, 8);

describe("invitation acceptance", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  it("the e-mailed link names the study and role; accepting with the invited address joins once", async () => {
    const email = `new-${tag()}@example.test`;
    const token = await invite(fixture, email, "reviewer");
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const found = await lookupInvitation(token);
    expect(found).toMatchObject({ state: "open", studyName: fixture.study.name, role: "reviewer", email, invitedByName: fixture.people.owner.name });

    const person = await newUser(email);
    const accepted = await acceptInvitation(person, token);
    expect(accepted).toEqual({ ok: true, studyId: fixture.study.id, role: "reviewer", alreadyMember: false });
    expect(await roleOf(fixture.study.id, person.id)).toBe("reviewer");
    expect((await lookupInvitation(token)).state).toBe("used");

    const again = await acceptInvitation(person, token);
    expect(again).toMatchObject({ ok: false, reason: "used" });
  });

  it("the e-mail address is compared without regard to case", async () => {
    const email = `mixed-${tag()}@example.test`;
    const token = await invite(fixture, email, "viewer");
    const person = await newUser(email);
    expect(await acceptInvitation({ ...person, email: email.toUpperCase() }, token)).toMatchObject({ ok: true, role: "viewer" });
  });

  it("refuses a signed-in person with another address, and leaves the invitation open", async () => {
    const email = `intended-${tag()}@example.test`;
    const token = await invite(fixture, email);
    const someoneElse = await newUser(`other-${tag()}@example.test`);
    const refused = await acceptInvitation(someoneElse, token);
    expect(refused).toMatchObject({ ok: false, reason: "wrong-email" });
    if (!refused.ok) expect(refused.message).toContain(email);
    expect(await roleOf(fixture.study.id, someoneElse.id)).toBeNull();
    expect((await lookupInvitation(token)).state).toBe("open");
  });

  it("refuses an expired invitation", async () => {
    const email = `late-${tag()}@example.test`;
    const token = await invite(fixture, email);
    const db = await getDb();
    await db
      .update(invitations)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(invitations.email, email));
    expect((await lookupInvitation(token)).state).toBe("expired");
    const person = await newUser(email);
    expect(await acceptInvitation(person, token)).toMatchObject({ ok: false, reason: "expired" });
    expect(await roleOf(fixture.study.id, person.id)).toBeNull();
  });

  it("two accepts at the same time: exactly one joins", async () => {
    const email = `twice-${tag()}@example.test`;
    const token = await invite(fixture, email, "interpreter");
    const person = await newUser(email);
    const results = await Promise.all([acceptInvitation(person, token), acceptInvitation(person, token)]);
    expect(results.filter((result) => result.ok)).toHaveLength(1);
    expect(results.filter((result) => !result.ok && result.reason === "used")).toHaveLength(1);
    expect(await roleOf(fixture.study.id, person.id)).toBe("interpreter");
  });

  it("someone already in the study keeps their role", async () => {
    const token = await invite(fixture, `x-${tag()}@example.test`);
    const db = await getDb();
    // re-point the invitation at the existing viewer's address (inviteMember refuses existing members up front)
    await db
      .update(invitations)
      .set({ email: fixture.people.viewer.email, role: "owner" })
      .where(eq(invitations.tokenHash, hashToken(token)));
    expect(await acceptInvitation(fixture.people.viewer, token)).toMatchObject({ ok: true, role: "viewer", alreadyMember: true });
    expect(await roleOf(fixture.study.id, fixture.people.viewer.id)).toBe("viewer");
  });

  it("unknown and malformed tokens are 'not-found'", async () => {
    for (const token of ["", "short", "A".repeat(43), "../../etc/passwd"]) {
      expect((await lookupInvitation(token)).state).toBe("not-found");
      expect(await acceptInvitation(fixture.people.viewer, token)).toMatchObject({ ok: false, reason: "not-found" });
    }
  });

  it("the accept action wants a session, then opens the study", async () => {
    const email = `action-${tag()}@example.test`;
    const token = await invite(fixture, email, "reviewer");
    const form = new FormData();
    form.set("token", token);

    signInAs(null);
    const signedOut = await actionRedirect(() => acceptInvitationAction({}, form));
    expect(signedOut.redirectedTo).toBe(`/sign-in?next=${encodeURIComponent(`/invite/${token}`)}`);
    expect((await lookupInvitation(token)).state).toBe("open");

    signInAs(fixture.people.reviewer);
    const wrong = await actionRedirect(() => acceptInvitationAction({}, form));
    expect(wrong.result).toMatchObject({ message: expect.stringContaining(email) });

    const person = await newUser(email);
    signInAs(person);
    const accepted = await actionRedirect(() => acceptInvitationAction({}, form));
    expect(accepted.redirectedTo).toBe(`/studies/${fixture.study.id}`);
    expect(await roleOf(fixture.study.id, person.id)).toBe("reviewer");

    const bad = new FormData();
    bad.set("token", "<script>");
    expect(await acceptInvitationAction({}, bad)).toEqual({ message: "This invitation link is not complete." });
  });
});

describe("owners and the last-owner guard", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  it("the only owner can neither demote nor remove themselves; with a second owner both work", async () => {
    const fixture = await studyWithEveryRole();
    signInAs(fixture.people.owner);
    const owner = { studyId: fixture.study.id, userId: fixture.people.owner.id };
    const demote = await callRoute(memberRoute.PATCH, { method: "PATCH", params: owner, body: { role: "interpreter" } });
    expect(demote.status).toBe(409);
    expect(demote.json.error).toMatch(/at least one owner/);
    const remove = await callRoute(memberRoute.DELETE, { method: "DELETE", params: owner });
    expect(remove.status).toBe(409);
    expect(await roleOf(fixture.study.id, fixture.people.owner.id)).toBe("owner");

    const promote = await callRoute(memberRoute.PATCH, {
      method: "PATCH",
      params: { studyId: fixture.study.id, userId: fixture.people.interpreter.id },
      body: { role: "owner" },
    });
    expect(promote.status).toBe(200);
    expect((await callRoute(memberRoute.PATCH, { method: "PATCH", params: owner, body: { role: "reviewer" } })).status).toBe(200);
    expect(await roleOf(fixture.study.id, fixture.people.owner.id)).toBe("reviewer");

    // the new sole owner is now the last one
    signInAs(fixture.people.interpreter);
    const last = await callRoute(memberRoute.DELETE, { method: "DELETE", params: { studyId: fixture.study.id, userId: fixture.people.interpreter.id } });
    expect(last.status).toBe(409);
    expect((await callRoute(memberRoute.DELETE, { method: "DELETE", params: { studyId: fixture.study.id, userId: fixture.people.owner.id } })).status).toBe(
      204,
    );
    expect(await roleOf(fixture.study.id, fixture.people.owner.id)).toBeNull();
  });
});
