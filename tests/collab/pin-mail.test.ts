import { beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

import { eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { notifications, outbox, users } from "@/db/schema";
import * as faultPinsRoute from "@/app/api/faults/[faultId]/pins/route";
import * as pinRoute from "@/app/api/pins/[pinId]/route";
import * as repliesRoute from "@/app/api/pins/[pinId]/replies/route";
import * as digestRoute from "@/app/api/digest/route";
import { saveNotifySettings } from "@/app/settings/actions";
import { runDigest } from "@/lib/pins/notify";
import { outboxEnabled } from "@/lib/outbox";
import { readConfig } from "@/lib/config";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";
import { giveFaultDoneAnalysis, pinBody } from "./pin-fixtures";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;

async function mailTo(email: string) {
  const db = await getDb();
  return db.select().from(outbox).where(eq(outbox.to, email));
}

async function setMode(userId: string, mode: "immediate" | "digest" | "off") {
  const db = await getDb();
  await db.update(users).set({ notifyMode: mode }).where(eq(users.id, userId));
}

async function newPin(fixture: Fixture, as: keyof Fixture["people"], body: string) {
  signInAs(fixture.people[as]);
  const created = await callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: pinBody(body) });
  expect(created.status, JSON.stringify(created.json)).toBe(201);
  return created.json.pin.id as string;
}

const handle = (email: string) => email.split("@")[0];

describe("pin e-mails land in the outbox for the right people", () => {
  let fixture: Fixture;
  beforeEach(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    await giveFaultDoneAnalysis(fixture.fault.id);
  });

  it("a mention e-mails the mentioned member (viewers too), not the writer nor outsiders", async () => {
    const { interpreter, viewer, reviewer, outsider } = fixture.people;
    await newPin(
      fixture,
      "reviewer",
      `@${handle(interpreter.email)} and @${handle(viewer.email)}: throw jumps here. @${handle(outsider.email)} @${handle(reviewer.email)}`,
    );
    const [toInterpreter] = await mailTo(interpreter.email);
    expect(toInterpreter).toMatchObject({ kind: "mention", studyId: fixture.study.id });
    expect(toInterpreter.subject).toBe(`${reviewer.name} mentioned you on ${fixture.fault.name}`);
    expect(toInterpreter.text).toContain("throw jumps here");
    expect(toInterpreter.text).toMatch(new RegExp(`/studies/${fixture.study.id}/faults/${fixture.fault.id}\\?pin=`));
    expect(await mailTo(viewer.email)).toHaveLength(1);
    expect(await mailTo(outsider.email)).toHaveLength(0);
    expect(await mailTo(reviewer.email)).toHaveLength(0);
  });

  it("a note's markup reaches the e-mail's HTML part as text, never as markup", async () => {
    const { interpreter } = fixture.people;
    await newPin(fixture, "reviewer", `@${handle(interpreter.email)} <img src=x onerror=alert(1)> & "quotes"`);
    const [mail] = (await mailTo(interpreter.email)).filter((message) => message.text.includes("onerror"));
    expect(mail.html).not.toContain("<img");
    expect(mail.html).toContain("&lt;img src=x onerror=alert(1)&gt; &amp; &quot;quotes&quot;");
  });

  it("a reply e-mails the pin's author once, even when the reply also mentions them", async () => {
    const { interpreter, reviewer, owner } = fixture.people;
    const pinId = await newPin(fixture, "reviewer", "Is this a mis-pick?");
    signInAs(interpreter);
    await callRoute(repliesRoute.POST, { method: "POST", params: { pinId }, body: { body: `Yes, @${handle(reviewer.email)}; fixed in v2.` } });
    const toReviewer = await mailTo(reviewer.email);
    expect(toReviewer).toHaveLength(1);
    expect(toReviewer[0]).toMatchObject({ kind: "pin-reply", subject: `${interpreter.name} replied to your pin on ${fixture.fault.name}` });
    expect(toReviewer[0].text).toContain("fixed in v2");
    // the HTML part says the same, escaped, with the link to the pin clickable
    expect(toReviewer[0].html).toContain("fixed in v2");
    expect(toReviewer[0].html).toMatch(new RegExp(`<a href="http[^"]+/studies/${fixture.study.id}/faults/${fixture.fault.id}\\?pin=${pinId}"`));
    expect(await mailTo(owner.email)).toHaveLength(0);
    // replying in your own thread sends nothing
    signInAs(reviewer);
    await callRoute(repliesRoute.POST, { method: "POST", params: { pinId }, body: { body: "Thanks." } });
    expect(await mailTo(reviewer.email)).toHaveLength(1);
  });

  it("resolving e-mails the author, but not when the author resolves their own pin", async () => {
    const { owner, reviewer } = fixture.people;
    const pinId = await newPin(fixture, "reviewer", "Check the tip here");
    signInAs(owner);
    await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId }, body: { action: "resolve" } });
    const toReviewer = await mailTo(reviewer.email);
    expect(toReviewer.map((mail) => mail.kind)).toEqual(["pin-resolved"]);
    expect(toReviewer[0].subject).toBe(`${owner.name} resolved your pin on ${fixture.fault.name}`);
    signInAs(reviewer);
    await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId }, body: { action: "reopen" } });
    await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId }, body: { action: "resolve" } });
    expect(await mailTo(reviewer.email)).toHaveLength(1);
  });

  it("an edit tells only people newly mentioned", async () => {
    const { interpreter, owner } = fixture.people;
    const pinId = await newPin(fixture, "reviewer", `@${handle(interpreter.email)} look`);
    await callRoute(pinRoute.PATCH, {
      method: "PATCH",
      params: { pinId },
      body: { action: "edit", body: `@${handle(interpreter.email)} @${handle(owner.email)} look` },
    });
    expect(await mailTo(interpreter.email)).toHaveLength(1);
    expect(await mailTo(owner.email)).toHaveLength(1);
  });

  it("off sends nothing; digest queues until the digest, which sends one e-mail per person with everything", async () => {
    const { interpreter, reviewer, viewer } = fixture.people;
    await setMode(interpreter.id, "digest");
    await setMode(viewer.id, "off");
    const first = await newPin(fixture, "reviewer", `@${handle(interpreter.email)} @${handle(viewer.email)} first note`);
    await newPin(fixture, "owner", `@${handle(interpreter.email)} second note`);
    signInAs(interpreter);
    await callRoute(repliesRoute.POST, { method: "POST", params: { pinId: first }, body: { body: "on it" } });
    expect(await mailTo(interpreter.email)).toHaveLength(0);
    expect(await mailTo(viewer.email)).toHaveLength(0);
    expect(await mailTo(reviewer.email)).toHaveLength(1); // immediate: the reply

    const summary = await runDigest();
    expect(summary).toEqual({ emails: 1, notifications: 2, dropped: 0 });
    const digest = await mailTo(interpreter.email);
    expect(digest).toHaveLength(1);
    expect(digest[0]).toMatchObject({ kind: "digest", subject: "Slipfield digest: 2 notifications" });
    expect(digest[0].text).toContain("first note");
    expect(digest[0].text).toContain("second note");
    expect(await mailTo(viewer.email)).toHaveLength(0);
    const db = await getDb();
    expect((await db.select().from(notifications).where(isNull(notifications.sentAt))).length).toBe(0);
    expect((await db.query.users.findFirst({ where: eq(users.id, interpreter.id) }))?.lastDigestAt).toBeInstanceOf(Date);
    // nothing pending: nothing sent
    expect(await runDigest()).toEqual({ emails: 0, notifications: 0, dropped: 0 });
  });

  it("a person who turns e-mail off after queueing gets no digest", async () => {
    const { interpreter } = fixture.people;
    await setMode(interpreter.id, "digest");
    await newPin(fixture, "reviewer", `@${handle(interpreter.email)} queued`);
    await setMode(interpreter.id, "off");
    expect(await runDigest()).toEqual({ emails: 0, notifications: 0, dropped: 1 });
    expect(await mailTo(interpreter.email)).toHaveLength(0);
  });
});

describe("digest route and settings", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  it.each([
    ["signed out", null, 401],
    ["a reviewer who owns no study", "reviewer", 403],
    ["an interpreter who owns no study", "interpreter", 403],
    ["an owner", "owner", 200],
    ["an owner of another study", "outsider", 200],
  ] as const)("POST /api/digest by %s → %i", async (_label, who, expected) => {
    signInAs(who ? fixture.people[who] : null);
    const { status, json } = await callRoute(digestRoute.POST, { method: "POST" });
    expect(status).toBe(expected);
    if (expected === 200) expect(json).toMatchObject({ emails: expect.any(Number), notifications: expect.any(Number) });
  });

  it("accepts the scheduler's secret header and refuses a wrong one", async () => {
    vi.stubEnv("SLIPFIELD_DIGEST_SECRET", "s3cret-for-tests");
    try {
      signInAs(null);
      const call = (secret: string) =>
        digestRoute.POST(
          new Request("http://localhost:3000/api/digest", { method: "POST", headers: { host: "localhost:3000", "x-slipfield-digest-secret": secret } }),
          { params: Promise.resolve({}) },
        );
      expect((await call("s3cret-for-tests")).status).toBe(200);
      expect((await call("wrong")).status).toBe(403);
    } finally {
      vi.unstubAllEnvs();
    }
  });

  it("the settings action saves a valid mode for the signed-in person only", async () => {
    const form = (mode: string) => {
      const data = new FormData();
      data.set("notifyMode", mode);
      return data;
    };
    signInAs(null);
    expect(await saveNotifySettings({}, form("off"))).toMatchObject({ ok: false, message: expect.stringMatching(/sign in/) });
    signInAs(fixture.people.viewer);
    expect(await saveNotifySettings({}, form("weekly"))).toMatchObject({ ok: false, message: expect.stringMatching(/immediate, daily digest or off/) });
    expect(await saveNotifySettings({}, form("digest"))).toMatchObject({ ok: true, mode: "digest" });
    const db = await getDb();
    const [row] = await db.select({ mode: users.notifyMode }).from(users).where(eq(users.id, fixture.people.viewer.id));
    expect(row.mode).toBe("digest");
    const [other] = await db.select({ mode: users.notifyMode }).from(users).where(eq(users.id, fixture.people.owner.id));
    expect(other.mode).toBe("immediate");
  });

  it("the outbox exists whenever no mail server is configured (the only place to read the mail), in development, or with SLIPFIELD_OUTBOX=on", () => {
    const smtp = "smtp://mail.example.test:587";
    const enabled = (env: Record<string, string>) => outboxEnabled(readConfig(env));
    expect(enabled({ NODE_ENV: "production" })).toBe(true);
    expect(enabled({ NODE_ENV: "development", SMTP_URL: smtp })).toBe(true);
    expect(enabled({ NODE_ENV: "test", SMTP_URL: smtp })).toBe(true);
    expect(enabled({ NODE_ENV: "production", SMTP_URL: smtp })).toBe(false);
    expect(enabled({ NODE_ENV: "production", SMTP_URL: smtp, SLIPFIELD_OUTBOX: "on" })).toBe(true);
    expect(enabled({ NODE_ENV: "production", SLIPFIELD_OUTBOX: "off" })).toBe(false);
    // a value that is neither on nor off stops with the variable named, rather than silently counting as "not on"
    expect(() => enabled({ NODE_ENV: "production", SMTP_URL: smtp, SLIPFIELD_OUTBOX: "yes" })).toThrow(/SLIPFIELD_OUTBOX="yes": must be on or off/);
  });

  it("the outbox page is a 404 for members who own no study and lists their studies' messages for owners", async () => {
    const { default: OutboxPage } = await import("@/app/outbox/page");
    const { renderToStaticMarkup } = await import("react-dom/server");
    const db = await getDb();
    await db
      .insert(outbox)
      .values({ to: "someone@example.test", subject: "Hello <b>there</b>", text: "Body text", kind: "mention", studyId: fixture.study.id });
    signInAs(fixture.people.reviewer);
    await expect(OutboxPage()).rejects.toMatchObject({ digest: expect.stringContaining("404") });
    signInAs(fixture.people.owner);
    const html = renderToStaticMarkup(await OutboxPage());
    expect(html).toContain('data-testid="outbox-message"');
    expect(html).toContain("someone@example.test");
    expect(html).toContain("Hello &lt;b&gt;there&lt;/b&gt;");
    expect(html).toContain("Body text");
  });
});
