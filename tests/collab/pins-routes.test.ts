import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, pinReplies, pins } from "@/db/schema";
import { ROLE_PERMISSIONS, type StudyAction } from "@/lib/contracts/roles";
import * as faultPinsRoute from "@/app/api/faults/[faultId]/pins/route";
import * as visitRoute from "@/app/api/faults/[faultId]/pins/visit/route";
import * as pinRoute from "@/app/api/pins/[pinId]/route";
import * as repliesRoute from "@/app/api/pins/[pinId]/replies/route";
import * as replyRoute from "@/app/api/pins/[pinId]/replies/[replyId]/route";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute, type LooseJson } from "../support/requests";
import { giveFaultDoneAnalysis, insertPin, pinBody, ROLES } from "./pin-fixtures";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;
type Role = (typeof ROLES)[number];

/**
 * Each case prepares what it needs (as the acting member when that member may comment, else as the owner,
 * so "own pin" rules do not hide the role check) and makes one call, on this study or on another study.
 */
interface Case {
  name: string;
  action: StudyAction;
  call: (fixture: Fixture, actor: Role, scope: "own" | "other") => Promise<{ status: number; json: LooseJson }>;
}

const writer = (fixture: Fixture, actor: Role) => (ROLE_PERMISSIONS.comment.includes(actor) ? fixture.people[actor] : fixture.people.owner);
const faultOf = (fixture: Fixture, scope: "own" | "other") => (scope === "own" ? fixture.fault : fixture.otherFault);

async function pinFor(fixture: Fixture, actor: Role, scope: "own" | "other") {
  const fault = faultOf(fixture, scope);
  return insertPin(fault.id, scope === "own" ? writer(fixture, actor).id : fixture.people.outsider.id);
}

async function replyFor(fixture: Fixture, actor: Role, scope: "own" | "other") {
  const pin = await pinFor(fixture, actor, scope);
  const db = await getDb();
  const [reply] = await db
    .insert(pinReplies)
    .values({ pinId: pin.id, authorId: scope === "own" ? writer(fixture, actor).id : fixture.people.outsider.id, body: "a reply" })
    .returning();
  return { pin, reply };
}

const CASES: Case[] = [
  { name: "GET fault pins", action: "view", call: (f, _a, s) => callRoute(faultPinsRoute.GET, { params: { faultId: faultOf(f, s).id } }) },
  { name: "POST visit", action: "view", call: (f, _a, s) => callRoute(visitRoute.POST, { method: "POST", params: { faultId: faultOf(f, s).id } }) },
  {
    name: "POST pin",
    action: "comment",
    call: (f, _a, s) => callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: faultOf(f, s).id }, body: pinBody() }),
  },
  {
    name: "PATCH pin (edit own)",
    action: "comment",
    call: async (f, a, s) =>
      callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: (await pinFor(f, a, s)).id }, body: { action: "edit", body: "edited" } }),
  },
  {
    name: "PATCH pin (resolve own)",
    action: "comment",
    call: async (f, a, s) => callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: (await pinFor(f, a, s)).id }, body: { action: "resolve" } }),
  },
  {
    name: "PATCH pin (reopen own)",
    action: "comment",
    call: async (f, a, s) => callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: (await pinFor(f, a, s)).id }, body: { action: "reopen" } }),
  },
  {
    name: "DELETE pin (own)",
    action: "comment",
    call: async (f, a, s) => callRoute(pinRoute.DELETE, { method: "DELETE", params: { pinId: (await pinFor(f, a, s)).id } }),
  },
  {
    name: "POST reply",
    action: "comment",
    call: async (f, a, s) => callRoute(repliesRoute.POST, { method: "POST", params: { pinId: (await pinFor(f, a, s)).id }, body: { body: "agreed" } }),
  },
  {
    name: "PATCH reply (own)",
    action: "comment",
    call: async (f, a, s) => {
      const { pin, reply } = await replyFor(f, a, s);
      return callRoute(replyRoute.PATCH, { method: "PATCH", params: { pinId: pin.id, replyId: reply.id }, body: { body: "better words" } });
    },
  },
  {
    name: "DELETE reply (own)",
    action: "comment",
    call: async (f, a, s) => {
      const { pin, reply } = await replyFor(f, a, s);
      return callRoute(replyRoute.DELETE, { method: "DELETE", params: { pinId: pin.id, replyId: reply.id } });
    },
  },
];

describe("pins: role matrix (docs/design.md, Roles) on every route", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  for (const testCase of CASES) {
    for (const role of ROLES) {
      const allowed = ROLE_PERMISSIONS[testCase.action].includes(role);
      it(`${testCase.name} as ${role} → ${allowed ? "allowed" : "403"}`, async () => {
        const fixture = await studyWithEveryRole();
        await giveFaultDoneAnalysis(fixture.fault.id);
        signInAs(fixture.people[role]);
        const { status, json } = await testCase.call(fixture, role, "own");
        if (allowed) expect(status, JSON.stringify(json)).toBeLessThan(300);
        else {
          expect(status).toBe(403);
          expect(json.error).toMatch(/role/i);
        }
      });
    }
    it(`${testCase.name} signed out → 401`, async () => {
      const fixture = await studyWithEveryRole();
      await giveFaultDoneAnalysis(fixture.fault.id);
      signInAs(null);
      const { status } = await testCase.call(fixture, "owner", "own");
      expect(status).toBe(401);
    });
    it(`${testCase.name} on another study's fault or pin → 404`, async () => {
      const fixture = await studyWithEveryRole();
      await giveFaultDoneAnalysis(fixture.otherFault.id);
      signInAs(fixture.people.owner);
      const { status } = await testCase.call(fixture, "owner", "other");
      expect(status).toBe(404);
    });
  }
});

describe("pins: rules beyond the role", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    await giveFaultDoneAnalysis(fixture.fault.id, { version: 1 });
  });

  it("stores the pick set version and segment; later versions show the version the pin was made on", async () => {
    signInAs(fixture.people.reviewer);
    const created = await callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: pinBody("on v1") });
    expect(created.status).toBe(201);
    expect(created.json.pin.pickSetVersion).toBe(1);
    await giveFaultDoneAnalysis(fixture.fault.id, { version: 2 });
    const later = await callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: pinBody("on v2") });
    expect(later.json.pin.pickSetVersion).toBe(2);
    const list = await callRoute(faultPinsRoute.GET, { params: { faultId: fixture.fault.id } });
    const versions = Object.fromEntries(list.json.pins.map((pin: LooseJson) => [pin.body, pin.pickSetVersion]));
    expect(versions).toMatchObject({ "on v1": 1, "on v2": 2 });
    expect(list.json.pins.find((pin: LooseJson) => pin.body === "on v1")).toMatchObject({
      x: 462_400,
      s: 120,
      t: 340,
      segmentName: "north",
      author: { name: fixture.people.reviewer.name },
    });
  });

  it("refuses a pin on a fault without a finished analysis, and on an unknown segment", async () => {
    const bare = await studyWithEveryRole();
    signInAs(bare.people.owner);
    const none = await callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: bare.fault.id }, body: pinBody() });
    expect(none.status).toBe(409);
    expect(none.json.error).toMatch(/no finished analysis/);
    signInAs(fixture.people.owner);
    const wrong = await callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { ...pinBody(), segmentId: "west" } });
    expect(wrong.status).toBe(400);
    expect(wrong.json.details.fieldErrors.segmentId).toBeDefined();
  });

  it("names each invalid field of a pin", async () => {
    signInAs(fixture.people.owner);
    const bad = await callRoute(faultPinsRoute.POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: { ...pinBody("   "), x: "east", t: null },
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.json.details.fieldErrors).sort()).toEqual(["body", "t", "x"]);
  });

  it("lets only the author or an owner resolve or reopen", async () => {
    const pin = await insertPin(fixture.fault.id, fixture.people.reviewer.id);
    signInAs(fixture.people.interpreter);
    const other = await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: pin.id }, body: { action: "resolve" } });
    expect(other.status).toBe(403);
    expect(other.json.error).toMatch(/author or an owner/);
    signInAs(fixture.people.owner);
    const byOwner = await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: pin.id }, body: { action: "resolve" } });
    expect(byOwner.json.pin.state).toBe("resolved");
    signInAs(fixture.people.reviewer);
    const reopened = await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: pin.id }, body: { action: "reopen" } });
    expect(reopened.json.pin.state).toBe("open");
  });

  it("lets only the author edit, and only within 15 minutes", async () => {
    const pin = await insertPin(fixture.fault.id, fixture.people.reviewer.id, "first words");
    signInAs(fixture.people.owner);
    const notMine = await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: pin.id }, body: { action: "edit", body: "owner rewrites" } });
    expect(notMine.status).toBe(403);
    signInAs(fixture.people.reviewer);
    const ok = await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: pin.id }, body: { action: "edit", body: "second words" } });
    expect(ok.json.pin.body).toBe("second words");
    const db = await getDb();
    await db
      .update(pins)
      .set({ createdAt: new Date(Date.now() - 16 * 60_000) })
      .where(eq(pins.id, pin.id));
    const late = await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: pin.id }, body: { action: "edit", body: "third words" } });
    expect(late.status).toBe(403);
    expect(late.json.error).toMatch(/within 15 minutes/);
  });

  it("soft-deletes own pins only, logs it, and hides the pin afterwards", async () => {
    const pin = await insertPin(fixture.fault.id, fixture.people.interpreter.id, "to be removed");
    signInAs(fixture.people.owner);
    expect((await callRoute(pinRoute.DELETE, { method: "DELETE", params: { pinId: pin.id } })).status).toBe(403);
    signInAs(fixture.people.interpreter);
    expect((await callRoute(pinRoute.DELETE, { method: "DELETE", params: { pinId: pin.id } })).status).toBe(204);
    const db = await getDb();
    const row = await db.query.pins.findFirst({ where: eq(pins.id, pin.id) });
    expect(row?.deletedAt).toBeInstanceOf(Date);
    const audit = await db.select().from(auditLog).where(eq(auditLog.target, pin.id));
    expect(audit.map((entry) => entry.action)).toContain("pin.delete");
    const list = await callRoute(faultPinsRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(list.json.pins.map((p: LooseJson) => p.id)).not.toContain(pin.id);
    expect((await callRoute(repliesRoute.POST, { method: "POST", params: { pinId: pin.id }, body: { body: "late" } })).status).toBe(404);
  });

  it("filters mine and open, and marks unread since the last visit", async () => {
    const fresh = await studyWithEveryRole();
    await giveFaultDoneAnalysis(fresh.fault.id);
    const mine = await insertPin(fresh.fault.id, fresh.people.viewer.id, "viewer's old pin");
    const theirs = await insertPin(fresh.fault.id, fresh.people.owner.id, "owner's pin");
    signInAs(fresh.people.owner);
    await callRoute(pinRoute.PATCH, { method: "PATCH", params: { pinId: theirs.id }, body: { action: "resolve" } });
    signInAs(fresh.people.viewer);
    const first = await callRoute(faultPinsRoute.GET, { params: { faultId: fresh.fault.id } });
    expect(first.json.lastVisitAt).toBeNull();
    expect(Object.fromEntries(first.json.pins.map((p: LooseJson) => [p.id, p.unread]))).toEqual({ [mine.id]: false, [theirs.id]: true });
    expect(first.json.pins.every((p: LooseJson) => p.can.reply === false)).toBe(true);
    const onlyMine = await callRoute(faultPinsRoute.GET, { path: "/api/x?filter=mine", params: { faultId: fresh.fault.id } });
    expect(onlyMine.json.pins.map((p: LooseJson) => p.id)).toEqual([mine.id]);
    const open = await callRoute(faultPinsRoute.GET, { path: "/api/x?filter=open", params: { faultId: fresh.fault.id } });
    expect(open.json.pins.map((p: LooseJson) => p.id)).toEqual([mine.id]);
    const bad = await callRoute(faultPinsRoute.GET, { path: "/api/x?filter=everything", params: { faultId: fresh.fault.id } });
    expect(bad.status).toBe(400);

    await callRoute(visitRoute.POST, { method: "POST", params: { faultId: fresh.fault.id } });
    const afterVisit = await callRoute(faultPinsRoute.GET, { params: { faultId: fresh.fault.id } });
    expect(afterVisit.json.pins.some((p: LooseJson) => p.unread)).toBe(false);

    signInAs(fresh.people.owner);
    await callRoute(repliesRoute.POST, { method: "POST", params: { pinId: mine.id }, body: { body: "new reply after the visit" } });
    signInAs(fresh.people.viewer);
    const afterReply = await callRoute(faultPinsRoute.GET, { params: { faultId: fresh.fault.id } });
    const thread = afterReply.json.pins.find((p: LooseJson) => p.id === mine.id);
    expect(thread.unread).toBe(true);
    expect(thread.replies).toHaveLength(1);
    expect(thread.replies[0]).toMatchObject({ body: "new reply after the visit", unread: true, author: { name: fresh.people.owner.name } });
  });

  it("lists each pin with its own live replies in order; deleted pins and replies stay out, filters keep their pins' threads", async () => {
    const fresh = await studyWithEveryRole();
    await giveFaultDoneAnalysis(fresh.fault.id);
    const first = await insertPin(fresh.fault.id, fresh.people.reviewer.id, "first pin");
    const second = await insertPin(fresh.fault.id, fresh.people.interpreter.id, "second pin");
    const gone = await insertPin(fresh.fault.id, fresh.people.reviewer.id, "pin deleted later");
    const reply = async (pinId: string, body: string) =>
      (await callRoute(repliesRoute.POST, { method: "POST", params: { pinId }, body: { body } })).json.reply.id as string;
    signInAs(fresh.people.reviewer);
    await reply(first.id, "a on first");
    const deletedReply = await reply(second.id, "deleted on second");
    await reply(gone.id, "on the deleted pin");
    signInAs(fresh.people.interpreter);
    await reply(first.id, "b on first");
    await reply(second.id, "c on second");
    signInAs(fresh.people.reviewer);
    expect((await callRoute(replyRoute.DELETE, { method: "DELETE", params: { pinId: second.id, replyId: deletedReply } })).status).toBe(204);
    expect((await callRoute(pinRoute.DELETE, { method: "DELETE", params: { pinId: gone.id } })).status).toBe(204);

    const threads = (path?: string) =>
      callRoute(faultPinsRoute.GET, { path, params: { faultId: fresh.fault.id } }).then((listed) =>
        Object.fromEntries(listed.json.pins.map((p: LooseJson) => [p.body, p.replies.map((r: LooseJson) => r.body)])),
      );
    expect(await threads()).toEqual({ "first pin": ["a on first", "b on first"], "second pin": ["c on second"] });
    signInAs(fresh.people.interpreter);
    expect(await threads("/api/x?filter=mine")).toEqual({ "second pin": ["c on second"] });
  });

  it("lets only the author edit or delete a reply", async () => {
    const pin = await insertPin(fixture.fault.id, fixture.people.reviewer.id);
    signInAs(fixture.people.interpreter);
    const created = await callRoute(repliesRoute.POST, { method: "POST", params: { pinId: pin.id }, body: { body: "first" } });
    expect(created.status).toBe(201);
    const replyId = created.json.reply.id;
    signInAs(fixture.people.owner);
    expect((await callRoute(replyRoute.PATCH, { method: "PATCH", params: { pinId: pin.id, replyId }, body: { body: "x" } })).status).toBe(403);
    expect((await callRoute(replyRoute.DELETE, { method: "DELETE", params: { pinId: pin.id, replyId } })).status).toBe(403);
    signInAs(fixture.people.interpreter);
    expect((await callRoute(replyRoute.PATCH, { method: "PATCH", params: { pinId: pin.id, replyId }, body: { body: "second" } })).json.reply.body).toBe(
      "second",
    );
    expect((await callRoute(replyRoute.DELETE, { method: "DELETE", params: { pinId: pin.id, replyId } })).status).toBe(204);
    const other = await insertPin(fixture.fault.id, fixture.people.reviewer.id);
    expect((await callRoute(replyRoute.DELETE, { method: "DELETE", params: { pinId: other.id, replyId } })).status).toBe(404);
  });

  it("rate-limits a burst of writes from one person", async () => {
    const burst = await studyWithEveryRole();
    await giveFaultDoneAnalysis(burst.fault.id);
    signInAs(burst.people.reviewer);
    const statuses: number[] = [];
    for (let i = 0; i < 45; i++)
      statuses.push((await callRoute(faultPinsRoute.POST, { method: "POST", params: { faultId: burst.fault.id }, body: pinBody(`pin ${i}`) })).status);
    expect(statuses.filter((status) => status === 201)).toHaveLength(40);
    expect(statuses.at(-1)).toBe(429);
  });
});
