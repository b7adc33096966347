import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import type { StudyRole } from "@/lib/contracts/roles";
import { ROLE_PERMISSIONS, type StudyAction } from "@/lib/contracts/roles";
import * as studiesRoute from "@/app/api/studies/route";
import * as studyRoute from "@/app/api/studies/[studyId]/route";
import * as membersRoute from "@/app/api/studies/[studyId]/members/route";
import * as memberRoute from "@/app/api/studies/[studyId]/members/[userId]/route";
import * as faultsRoute from "@/app/api/studies/[studyId]/faults/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;

/** A CSV of picks on a plane striking 000 and dipping 60° E, throw peaking in the middle (common practice, no source). */
function smallPickCsv() {
  const lines = ["x,y,z,throw"];
  for (let i = 0; i < 6; i++)
    for (let j = 0; j < 6; j++) {
      const along = i * 100;
      const down = j * 100;
      const x = down * Math.cos(Math.PI / 3);
      const z = -down * Math.sin(Math.PI / 3);
      const throwM = 40 - Math.abs(i - 2.5) * 5 - Math.abs(j - 2.5) * 5;
      lines.push(`${x.toFixed(3)},${along},${z.toFixed(3)},${throwM}`);
    }
  return lines.join("\n");
}

interface MutatingCase {
  name: string;
  action: StudyAction;
  call: (fixture: Fixture, scope: "own" | "other") => ReturnType<typeof callRoute>;
}

const pickForm = () => {
  const form = new FormData();
  form.set("file", new File([smallPickCsv()], "picks.csv", { type: "text/csv" }));
  form.set("units", "m");
  return form;
};

const CASES: MutatingCase[] = [
  {
    name: "PATCH study",
    action: "admin",
    call: (f, s) =>
      callRoute(studyRoute.PATCH, { method: "PATCH", params: { studyId: s === "own" ? f.study.id : f.otherStudy.id }, body: { name: "Renamed study" } }),
  },
  {
    name: "DELETE study",
    action: "admin",
    call: (f, s) => callRoute(studyRoute.DELETE, { method: "DELETE", params: { studyId: s === "own" ? f.study.id : f.otherStudy.id } }),
  },
  {
    name: "POST member (invite)",
    action: "admin",
    call: (f, s) =>
      callRoute(membersRoute.POST, {
        method: "POST",
        params: { studyId: s === "own" ? f.study.id : f.otherStudy.id },
        body: { email: `new-${Math.random().toString(36).slice(2)}@example.test`, role: "viewer" },
      }),
  },
  {
    name: "PATCH member role",
    action: "admin",
    call: (f, s) =>
      callRoute(memberRoute.PATCH, {
        method: "PATCH",
        params: { studyId: s === "own" ? f.study.id : f.otherStudy.id, userId: f.people.viewer.id },
        body: { role: "reviewer" },
      }),
  },
  {
    name: "DELETE member",
    action: "admin",
    call: (f, s) =>
      callRoute(memberRoute.DELETE, { method: "DELETE", params: { studyId: s === "own" ? f.study.id : f.otherStudy.id, userId: f.people.viewer.id } }),
  },
  {
    name: "POST fault",
    action: "edit",
    call: (f, s) =>
      callRoute(faultsRoute.POST, {
        method: "POST",
        params: { studyId: s === "own" ? f.study.id : f.otherStudy.id },
        body: { name: `New ${Math.random().toString(36).slice(2, 6)}` },
      }),
  },
  {
    name: "PATCH fault",
    action: "edit",
    call: (f, s) =>
      callRoute(faultRoute.PATCH, { method: "PATCH", params: { faultId: s === "own" ? f.fault.id : f.otherFault.id }, body: { description: "edited" } }),
  },
  {
    name: "DELETE fault",
    action: "edit",
    call: (f, s) => callRoute(faultRoute.DELETE, { method: "DELETE", params: { faultId: s === "own" ? f.fault.id : f.otherFault.id } }),
  },
  {
    name: "POST pick set (preview)",
    action: "edit",
    call: (f, s) =>
      callRoute(pickSetsRoute.POST, {
        method: "POST",
        path: "/api/x?step=preview",
        params: { faultId: s === "own" ? f.fault.id : f.otherFault.id },
        formData: pickForm(),
      }),
  },
  {
    name: "POST pick set (confirm)",
    action: "edit",
    call: (f, s) =>
      callRoute(pickSetsRoute.POST, {
        method: "POST",
        path: "/api/x?step=confirm",
        params: { faultId: s === "own" ? f.fault.id : f.otherFault.id },
        formData: pickForm(),
      }),
  },
];

const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];

describe("role matrix (docs/design.md, Roles) on every mutating route", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  for (const testCase of CASES) {
    for (const role of ROLES) {
      const allowed = ROLE_PERMISSIONS[testCase.action].includes(role);
      it(`${testCase.name} as ${role} → ${allowed ? "allowed" : "403"}`, async () => {
        const fixture = await studyWithEveryRole();
        signInAs(fixture.people[role]);
        const { status, json } = await testCase.call(fixture, "own");
        if (allowed) expect(status, JSON.stringify(json)).toBeLessThan(300);
        else {
          expect(status).toBe(403);
          expect(json.error).toMatch(/role/i);
        }
      });
    }
    it(`${testCase.name} signed out → 401`, async () => {
      const fixture = await studyWithEveryRole();
      signInAs(null);
      const { status } = await testCase.call(fixture, "own");
      expect(status).toBe(401);
    });
    it(`${testCase.name} on another study's id → 404 (no IDOR)`, async () => {
      const fixture = await studyWithEveryRole();
      signInAs(fixture.people.owner);
      const { status } = await testCase.call(fixture, "other");
      expect(status).toBe(404);
    });
  }

  it("creating a study needs only a session, and makes the creator its owner", async () => {
    const fixture = await studyWithEveryRole();
    signInAs(null);
    expect((await callRoute(studiesRoute.POST, { method: "POST", body: { name: "Mine" } })).status).toBe(401);
    signInAs(fixture.people.viewer);
    const created = await callRoute(studiesRoute.POST, { method: "POST", body: { name: "Mine", description: "" } });
    expect(created.status).toBe(201);
    const detail = await callRoute(studyRoute.GET, { params: { studyId: created.json.study.id } });
    expect(detail.json.role).toBe("owner");
  });
});

describe("bad bodies → 400 with field errors", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  it("names each invalid field", async () => {
    const fixture = await studyWithEveryRole();
    signInAs(fixture.people.owner);
    const study = await callRoute(studiesRoute.POST, { method: "POST", body: { name: "x", description: 5 } });
    expect(study.status).toBe(400);
    expect(study.json.details.fieldErrors.name[0]).toMatch(/at least 2/);
    expect(study.json.details.fieldErrors.description).toBeDefined();
    const invite = await callRoute(membersRoute.POST, {
      method: "POST",
      params: { studyId: fixture.study.id },
      body: { email: "not-an-address", role: "boss" },
    });
    expect(invite.status).toBe(400);
    expect(Object.keys(invite.json.details.fieldErrors).sort()).toEqual(["email", "role"]);
    const fault = await callRoute(faultsRoute.POST, { method: "POST", params: { studyId: fixture.study.id }, body: { name: "<script>" } });
    expect(fault.status).toBe(400);
    expect(fault.json.details.fieldErrors.name[0]).toMatch(/letters, digits/);
  });

  it("rejects malformed JSON and empty bodies with a message, not a stack trace", async () => {
    const fixture = await studyWithEveryRole();
    signInAs(fixture.people.owner);
    const malformed = await callRoute(studiesRoute.POST, { method: "POST", body: "{not json" });
    expect(malformed.status).toBe(400);
    expect(malformed.json.error).toBe("The request body is not valid JSON.");
    expect(JSON.stringify(malformed.json)).not.toMatch(/at .*\.ts/);
  });

  it("refuses to demote the last owner", async () => {
    const fixture = await studyWithEveryRole();
    signInAs(fixture.people.owner);
    const demote = await callRoute(memberRoute.PATCH, {
      method: "PATCH",
      params: { studyId: fixture.study.id, userId: fixture.people.owner.id },
      body: { role: "viewer" },
    });
    expect(demote.status).toBe(409);
    expect(demote.json.error).toMatch(/at least one owner/);
  });
});
