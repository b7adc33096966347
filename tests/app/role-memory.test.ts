import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));

import { getDb } from "@/db/client";
import { memberships } from "@/db/schema";
import { changingRoles, requireFaultRole } from "@/lib/access";
import * as studyRoute from "@/app/api/studies/[studyId]/route";
import * as membersRoute from "@/app/api/studies/[studyId]/members/route";
import * as memberRoute from "@/app/api/studies/[studyId]/members/[userId]/route";
import * as pinsRoute from "@/app/api/faults/[faultId]/pins/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

// Remembered roles (lib/access.ts) must never outlive a change: each case first makes the server remember a granted
// role, then changes it through the app, then checks the very next request sees the change.

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;
const getFault = (faultId: string) => callRoute(faultRoute.GET, { params: { faultId } });
const editFault = (faultId: string) => callRoute(faultRoute.PATCH, { method: "PATCH", params: { faultId }, body: { description: `edited ${Math.random()}` } });

describe("remembered roles", () => {
  let handle: Awaited<ReturnType<typeof useFreshDatabase>>;
  beforeAll(async () => {
    handle = await useFreshDatabase();
  });

  async function fixture(): Promise<Fixture> {
    return studyWithEveryRole();
  }

  it("a member removed by the owner is refused on their next request", async () => {
    const f = await fixture();
    signInAs(f.people.reviewer);
    expect((await getFault(f.fault.id)).status).toBe(200);
    expect((await getFault(f.fault.id)).status).toBe(200);
    signInAs(f.people.owner);
    expect((await callRoute(memberRoute.DELETE, { method: "DELETE", params: { studyId: f.study.id, userId: f.people.reviewer.id } })).status).toBe(204);
    signInAs(f.people.reviewer);
    expect((await getFault(f.fault.id)).status).toBe(404);
  });

  it("a demoted interpreter loses the right to edit at once", async () => {
    const f = await fixture();
    signInAs(f.people.interpreter);
    expect((await editFault(f.fault.id)).status).toBe(200);
    signInAs(f.people.owner);
    expect(
      (await callRoute(memberRoute.PATCH, { method: "PATCH", params: { studyId: f.study.id, userId: f.people.interpreter.id }, body: { role: "viewer" } }))
        .status,
    ).toBe(200);
    signInAs(f.people.interpreter);
    expect((await editFault(f.fault.id)).status).toBe(403);
    expect((await getFault(f.fault.id)).status).toBe(200);
  });

  it("a deleted fault and a deleted study answer 404 to members who had them remembered", async () => {
    // pins and members: routes whose lists would otherwise answer 200 with nothing in them
    const getPins = () => callRoute(pinsRoute.GET, { params: { faultId: f.fault.id } });
    const getMembers = () => callRoute(membersRoute.GET, { params: { studyId: f.study.id } });
    const f = await fixture();
    signInAs(f.people.owner);
    expect((await getPins()).status).toBe(200);
    expect((await getMembers()).status).toBe(200);
    expect((await callRoute(faultRoute.DELETE, { method: "DELETE", params: { faultId: f.fault.id } })).status).toBe(204);
    expect((await getPins()).status).toBe(404);
    expect((await getFault(f.fault.id)).status).toBe(404);
    expect((await callRoute(studyRoute.DELETE, { method: "DELETE", params: { studyId: f.study.id } })).status).toBe(204);
    expect((await getMembers()).status).toBe(404);
    expect((await callRoute(studyRoute.GET, { params: { studyId: f.study.id } })).status).toBe(404);
  });

  it("a refusal is not remembered: a new member is let in on their first request after joining", async () => {
    const f = await fixture();
    signInAs(f.people.outsider);
    expect((await getFault(f.fault.id)).status).toBe(404);
    await (await getDb()).insert(memberships).values({ studyId: f.study.id, userId: f.people.outsider.id, role: "viewer" });
    expect((await getFault(f.fault.id)).status).toBe(200);
  });

  it("the role is read once and then remembered until a change runs through changingRoles (embedded database only)", async () => {
    const f = await fixture();
    signInAs(f.people.reviewer);
    expect((await requireFaultRole(f.fault.id, "view")).role).toBe("reviewer");
    // a change made behind the app's back (never done by the app) shows whether the answer came from memory
    await (await getDb()).delete(memberships).where(and(eq(memberships.studyId, f.study.id), eq(memberships.userId, f.people.reviewer.id)));
    const again = requireFaultRole(f.fault.id, "view");
    if (handle.kind === "pglite") await expect(again).resolves.toMatchObject({ role: "reviewer" });
    else await expect(again).rejects.toMatchObject({ status: 404 }); // external PostgreSQL: nothing is remembered
    await changingRoles(async () => undefined);
    await expect(requireFaultRole(f.fault.id, "view")).rejects.toMatchObject({ status: 404 });
  });

  it("a failed change still drops what was remembered", async () => {
    await expect(changingRoles(async () => Promise.reject(new Error("half-way")))).rejects.toThrow("half-way");
    const f = await fixture();
    signInAs(f.people.viewer);
    expect((await requireFaultRole(f.fault.id, "view")).role).toBe("viewer");
    await (
      await getDb()
    )
      .update(memberships)
      .set({ role: "interpreter" })
      .where(and(eq(memberships.studyId, f.study.id), eq(memberships.userId, f.people.viewer.id)));
    await expect(changingRoles(async () => Promise.reject(new Error("half-way")))).rejects.toThrow("half-way");
    expect((await requireFaultRole(f.fault.id, "edit")).role).toBe("interpreter");
  });
});
