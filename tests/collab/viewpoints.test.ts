import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, pinReplies, pins, viewpointLinks, viewpoints } from "@/db/schema";
import type { CameraState } from "@/lib/contracts/camera";
import type { StudyRole } from "@/lib/contracts/roles";
import * as listRoute from "@/app/api/faults/[faultId]/viewpoints/route";
import * as viewpointRoute from "@/app/api/viewpoints/[viewpointId]/route";
import * as linksRoute from "@/app/api/viewpoints/[viewpointId]/links/route";
import * as linkRoute from "@/app/api/links/[linkId]/route";
import * as publicRoute from "@/app/api/v/[token]/route";
import * as publicDisplayRoute from "@/app/api/v/[token]/display/route";
import * as publicStateRoute from "@/app/api/v/[token]/state/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import * as studiesRoute from "@/app/api/studies/route";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import { runAnalysis } from "@/lib/analysis/runner";
import { decodeFaultDisplay } from "@/lib/display/payload";
import { demoCsv } from "@/lib/demo";
import { ROLE_PERMISSIONS } from "@/lib/contracts/roles";
import { hashLinkToken, LINK_TOKEN_PATTERN, linkState, newLinkToken } from "@/lib/viewpoints";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;
const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];

const camera: CameraState = { position: [1000.5, -2000.25, 800.125], target: [10, 20, -1500], up: [0, 0, 1], fov: 40 };
const settings = { layers: { surface: true, contours: false, tipLine: true, picks: true }, colourMode: "throw", exaggeration: 1.5 };

/** A study with every role, plus one viewpoint and one active link on each study's fault, both made by the interpreter / the outsider. */
async function withViewpoints() {
  const fixture = await studyWithEveryRole();
  const db = await getDb();
  const [own] = await db
    .insert(viewpoints)
    .values({ faultId: fixture.fault.id, createdBy: fixture.people.interpreter.id, title: "Relay from the east", camera, settings })
    .returning();
  const [other] = await db
    .insert(viewpoints)
    .values({ faultId: fixture.otherFault.id, createdBy: fixture.people.outsider.id, title: "Elsewhere", camera, settings })
    .returning();
  const token = newLinkToken();
  const [ownLink] = await db
    .insert(viewpointLinks)
    .values({ viewpointId: own.id, token: hashLinkToken(token), createdBy: fixture.people.interpreter.id })
    .returning();
  const [otherLink] = await db
    .insert(viewpointLinks)
    .values({ viewpointId: other.id, token: hashLinkToken(newLinkToken()), createdBy: fixture.people.outsider.id })
    .returning();
  return { ...fixture, viewpoint: { own, other }, link: { own: ownLink, other: otherLink }, token };
}
type WithViewpoints = Awaited<ReturnType<typeof withViewpoints>>;

interface Case {
  name: string;
  /** who may, among the four roles (the viewpoint and link were made by the interpreter) */
  allowed: StudyRole[];
  call: (f: WithViewpoints, scope: "own" | "other") => ReturnType<typeof callRoute>;
}

const CASES: Case[] = [
  {
    name: "GET viewpoints of a fault",
    allowed: [...ROLE_PERMISSIONS.view],
    call: (f, s) => callRoute(listRoute.GET, { params: { faultId: s === "own" ? f.fault.id : f.otherFault.id } }),
  },
  {
    name: "POST viewpoint",
    allowed: [...ROLE_PERMISSIONS.share],
    call: (f, s) =>
      callRoute(listRoute.POST, {
        method: "POST",
        params: { faultId: s === "own" ? f.fault.id : f.otherFault.id },
        body: { title: "Saved", note: "", camera, settings },
      }),
  },
  {
    name: "PATCH viewpoint (made by the interpreter)",
    allowed: ["owner", "interpreter"],
    call: (f, s) => callRoute(viewpointRoute.PATCH, { method: "PATCH", params: { viewpointId: f.viewpoint[s].id }, body: { title: "Renamed" } }),
  },
  {
    name: "DELETE viewpoint (made by the interpreter)",
    allowed: ["owner", "interpreter"],
    call: (f, s) => callRoute(viewpointRoute.DELETE, { method: "DELETE", params: { viewpointId: f.viewpoint[s].id } }),
  },
  {
    name: "GET links of a viewpoint",
    allowed: [...ROLE_PERMISSIONS.share],
    call: (f, s) => callRoute(linksRoute.GET, { params: { viewpointId: f.viewpoint[s].id } }),
  },
  {
    name: "POST link",
    allowed: [...ROLE_PERMISSIONS.share],
    call: (f, s) => callRoute(linksRoute.POST, { method: "POST", params: { viewpointId: f.viewpoint[s].id }, body: { expiresInDays: 7, includePins: false } }),
  },
  {
    name: "DELETE link = revoke (made by the interpreter)",
    allowed: ["owner", "interpreter"],
    call: (f, s) => callRoute(linkRoute.DELETE, { method: "DELETE", params: { linkId: f.link[s].id } }),
  },
];

describe("viewpoint routes: role matrix (docs/design.md, Roles), 401 signed out, 404 across studies", () => {
  beforeAll(async () => {
    await useFreshDatabase();
  });

  for (const testCase of CASES) {
    for (const role of ROLES) {
      const allowed = testCase.allowed.includes(role);
      it(`${testCase.name} as ${role} → ${allowed ? "allowed" : "403"}`, async () => {
        const fixture = await withViewpoints();
        signInAs(fixture.people[role]);
        const { status, json } = await testCase.call(fixture, "own");
        if (allowed) expect(status, JSON.stringify(json)).toBeLessThan(300);
        else {
          expect(status).toBe(403);
          expect(json.error).toMatch(/role|Only the person/i);
        }
      });
    }
    it(`${testCase.name} signed out → 401`, async () => {
      const fixture = await withViewpoints();
      signInAs(null);
      expect((await testCase.call(fixture, "own")).status).toBe(401);
    });
    it(`${testCase.name} on another study's id → 404`, async () => {
      const fixture = await withViewpoints();
      signInAs(fixture.people.owner);
      expect((await testCase.call(fixture, "other")).status).toBe(404);
    });
  }

  it("a reviewer may rename and delete a viewpoint they saved themselves, and revoke their own link", async () => {
    const fixture = await withViewpoints();
    signInAs(fixture.people.reviewer);
    const saved = await callRoute(listRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { title: "Mine", camera, settings } });
    expect(saved.status).toBe(201);
    const id = saved.json.viewpoint.id;
    const renamed = await callRoute(viewpointRoute.PATCH, {
      method: "PATCH",
      params: { viewpointId: id },
      body: { title: "Mine, renamed", note: "tip region" },
    });
    expect(renamed.json.viewpoint).toMatchObject({ title: "Mine, renamed", note: "tip region" });
    const link = await callRoute(linksRoute.POST, { method: "POST", params: { viewpointId: id }, body: {} });
    const revoked = await callRoute(linkRoute.DELETE, { method: "DELETE", params: { linkId: link.json.link.id } });
    expect(revoked.json.link.state).toBe("revoked");
    expect((await callRoute(viewpointRoute.DELETE, { method: "DELETE", params: { viewpointId: id } })).status).toBe(204);
    const list = await callRoute(listRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(list.json.viewpoints.map((row: { id: string }) => row.id)).not.toContain(id);
  });

  it("lists say what the caller may change, and an unknown id is 404 for members", async () => {
    const fixture = await withViewpoints();
    signInAs(fixture.people.reviewer);
    const list = await callRoute(listRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(list.json.viewpoints).toHaveLength(1);
    expect(list.json.viewpoints[0]).toMatchObject({ title: "Relay from the east", canChange: false, camera, settings });
    signInAs(fixture.people.owner);
    expect((await callRoute(listRoute.GET, { params: { faultId: fixture.fault.id } })).json.viewpoints[0].canChange).toBe(true);
    expect((await callRoute(viewpointRoute.PATCH, { method: "PATCH", params: { viewpointId: "no-such-id" }, body: { title: "x" } })).status).toBe(404);
    expect((await callRoute(linkRoute.DELETE, { method: "DELETE", params: { linkId: "no-such-id" } })).status).toBe(404);
  });
});

describe("viewpoint input is validated", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  const bad: [string, unknown, string][] = [
    ["missing title", { camera, settings }, "title"],
    ["blank title", { title: "   ", camera, settings }, "title"],
    ["fov of 0°", { title: "t", camera: { ...camera, fov: 0 }, settings }, "camera"],
    ["fov of 200°", { title: "t", camera: { ...camera, fov: 200 }, settings }, "camera"],
    ["a position with two numbers", { title: "t", camera: { ...camera, position: [1, 2] }, settings }, "camera"],
    ["a coordinate as text", { title: "t", camera: { ...camera, target: [1, "2", 3] }, settings }, "camera"],
    ["position equal to target", { title: "t", camera: { ...camera, target: camera.position }, settings }, "camera"],
    ["a zero up vector", { title: "t", camera: { ...camera, up: [0, 0, 0] }, settings }, "camera"],
    ["relief beyond 5", { title: "t", camera, settings: { ...settings, exaggeration: 9 } }, "settings"],
    ["a layer that is not on/off", { title: "t", camera, settings: { ...settings, layers: { surface: "yes" } } }, "settings"],
  ];
  for (const [what, body, field] of bad) {
    it(`refuses ${what} with a 400 naming ${field}`, async () => {
      signInAs(fixture.people.interpreter);
      const response = await callRoute(listRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body });
      expect(response.status).toBe(400);
      expect(Object.keys(response.json.details.fieldErrors)).toContain(field);
    });
  }

  it("refuses a coordinate that overflows to Infinity (1e999 in the JSON)", async () => {
    signInAs(fixture.people.interpreter);
    const text = JSON.stringify({ title: "t", camera: { ...camera, position: [0, 0, 12345] }, settings }).replace("12345", "1e999");
    const response = await callRoute(listRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: text });
    expect(response.status).toBe(400);
    expect(response.json.details.fieldErrors.camera).toBeDefined();
  });

  it("stores the camera exactly as sent (full double precision round trip)", async () => {
    signInAs(fixture.people.interpreter);
    const precise = {
      position: [0.1 + 0.2, 1 / 3, -123456.78901234567],
      target: [Math.PI, Math.E, -Math.SQRT2],
      up: [0.0000012345678901, 0.7071067811865476, 0.7071067811865475],
      fov: 37.123456789012344,
    };
    const saved = await callRoute(listRoute.POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: { title: "precise", camera: precise, settings },
    });
    expect(saved.status).toBe(201);
    const list = await callRoute(listRoute.GET, { params: { faultId: fixture.fault.id } });
    const row = list.json.viewpoints.find((candidate: { id: string }) => candidate.id === saved.json.viewpoint.id);
    expect(row.camera).toEqual(precise);
  });

  it("refuses link expiry outside 1–365 days", async () => {
    signInAs(fixture.people.interpreter);
    const saved = await callRoute(listRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { title: "for links", camera, settings } });
    for (const expiresInDays of [0, 400, 2.5, "7"]) {
      const response = await callRoute(linksRoute.POST, { method: "POST", params: { viewpointId: saved.json.viewpoint.id }, body: { expiresInDays } });
      expect(response.status, String(expiresInDays)).toBe(400);
      expect(response.json.details.fieldErrors.expiresInDays).toBeDefined();
    }
  });
});

describe("link tokens", () => {
  it("are 32 random bytes in base64url: 43 characters, ≥ 128 bits, no repeats over 20,000", () => {
    const seen = new Set<string>();
    for (let i = 0; i < 20_000; i++) {
      const token = newLinkToken();
      expect(token).toMatch(LINK_TOKEN_PATTERN);
      seen.add(token);
    }
    expect(seen.size).toBe(20_000);
    const bytes = Buffer.from(newLinkToken(), "base64url");
    expect(bytes.length * 8).toBeGreaterThanOrEqual(256);
  });

  it("look random bit by bit: every one of the 256 bits is set in 40–60 % of 2,000 tokens (common practice, no source)", () => {
    const counts = new Array<number>(256).fill(0);
    const samples = 2000;
    for (let i = 0; i < samples; i++) {
      const bytes = Buffer.from(newLinkToken(), "base64url");
      for (let bit = 0; bit < 256; bit++) if (bytes[bit >> 3] & (1 << (bit & 7))) counts[bit]++;
    }
    // the binomial standard deviation is √(2000·¼) ≈ 22, so 40–60 % (±200) is about nine deviations wide
    for (const count of counts) {
      expect(count / samples).toBeGreaterThan(0.4);
      expect(count / samples).toBeLessThan(0.6);
    }
  });

  it("link state: active, expired at the expiry instant, revoked wins", () => {
    const now = new Date("2026-01-01T00:00:00Z");
    expect(linkState({ expiresAt: null, revokedAt: null }, now)).toBe("active");
    expect(linkState({ expiresAt: new Date("2026-01-01T00:00:01Z"), revokedAt: null }, now)).toBe("active");
    expect(linkState({ expiresAt: now, revokedAt: null }, now)).toBe("expired");
    expect(linkState({ expiresAt: new Date("2027-01-01T00:00:00Z"), revokedAt: new Date("2025-12-31T00:00:00Z") }, now)).toBe("revoked");
  });
});

describe("viewpoint links: the token alone opens one fault, read-only", () => {
  let fixture: Fixture;
  let viewpointId: string;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    signInAs(fixture.people.interpreter);
    const saved = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId: fixture.fault.id }, formData: demoForm() });
    expect(saved.status).toBe(201);
    await runAnalysis(saved.json.analysisId);
    const viewpoint = await callRoute(listRoute.POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: { title: "Tip region", note: "look at the NE tip", camera, settings },
    });
    viewpointId = viewpoint.json.viewpoint.id;
    const db = await getDb();
    const [pin] = await db
      .insert(pins)
      .values({ faultId: fixture.fault.id, authorId: fixture.people.reviewer.id, x: 1, y: 2, z: 3, s: 4, t: 5, body: "throw **jumps** here" })
      .returning();
    await db.insert(pinReplies).values([
      { pinId: pin.id, authorId: fixture.people.interpreter.id, body: "a mis-pick on inline 1204, fixed in v2" },
      { pinId: pin.id, authorId: fixture.people.owner.id, body: "withdrawn", deletedAt: new Date() },
    ]);
  });

  function demoForm() {
    const data = new FormData();
    data.set("file", new File([demoCsv("QG-4")], "qg-4.csv", { type: "text/csv" }));
    data.set("units", "m");
    return data;
  }

  async function makeLink(body: Record<string, unknown> = {}) {
    signInAs(fixture.people.interpreter);
    const made = await callRoute(linksRoute.POST, { method: "POST", params: { viewpointId }, body });
    expect(made.status).toBe(201);
    signInAs(null);
    return made.json.link as { id: string; token: string; path: string; state: string };
  }

  it("stores only a hash of the token, and returns the token once", async () => {
    const link = await makeLink();
    expect(link.token).toMatch(LINK_TOKEN_PATTERN);
    expect(link.path).toBe(`/v/${link.token}`);
    const db = await getDb();
    const row = await db.query.viewpointLinks.findFirst({ where: eq(viewpointLinks.id, link.id) });
    expect(row!.token).not.toBe(link.token);
    expect(row!.token).toBe(hashLinkToken(link.token));
    signInAs(fixture.people.interpreter);
    const listed = await callRoute(linksRoute.GET, { params: { viewpointId } });
    expect(JSON.stringify(listed.json)).not.toContain(link.token);
    expect(listed.json.links.find((candidate: { id: string }) => candidate.id === link.id).state).toBe("active");
  });

  it("signed out, the token gives the fault's name, the saved view and the surface, and nothing of the study or its people", async () => {
    const link = await makeLink();
    const response = await callRoute(publicRoute.GET, { params: { token: link.token } });
    expect(response.status).toBe(200);
    expect(Object.keys(response.json).sort()).toEqual(["analysis", "fault", "link", "pins", "viewpoint"]);
    expect(response.json.fault).toEqual({ name: fixture.fault.name, sense: "normal" });
    expect(response.json.viewpoint).toEqual({ title: "Tip region", note: "look at the NE tip", camera, settings });
    expect(response.json.pins).toBeNull();
    expect(response.json.analysis.report.segments).toHaveLength(1);
    expect(response.json.analysis.report.input.rejected).toEqual([]);
    const text = JSON.stringify(response.json);
    for (const secret of [
      fixture.study.id,
      fixture.study.name,
      fixture.fault.id,
      fixture.otherFault.name,
      viewpointId,
      ...Object.values(fixture.people).flatMap((person) => [person.id, person.email, person.name]),
    ]) {
      expect(text).not.toContain(secret);
    }
    const display = await publicDisplayRoute.GET(new Request(`http://localhost:3000/api/v/${link.token}/display`), {
      params: Promise.resolve({ token: link.token }),
    });
    expect(display.status).toBe(200);
    const decoded = decodeFaultDisplay(new Uint8Array(await display.arrayBuffer()));
    expect(decoded.segments).toHaveLength(1);
    // the same token opens nothing else: the fault and study APIs still want a session
    expect((await callRoute(faultRoute.GET, { params: { faultId: fixture.fault.id } })).status).toBe(401);
    expect((await callRoute(studiesRoute.GET, {})).status).toBe(401);
  });

  it("shows pins and their replies (without authors, without deleted replies) only when the link includes them", async () => {
    const link = await makeLink({ includePins: true });
    const response = await callRoute(publicRoute.GET, { params: { token: link.token } });
    expect(response.json.pins).toHaveLength(1);
    expect(response.json.pins[0]).toMatchObject({ body: "throw **jumps** here", state: "open", x: 1, y: 2, z: 3 });
    expect(response.json.pins[0].replies).toEqual([{ body: "a mis-pick on inline 1204, fixed in v2", createdAt: expect.any(String) }]);
    expect(Object.keys(response.json.pins[0])).not.toContain("authorId");
    const text = JSON.stringify(response.json);
    for (const person of [fixture.people.reviewer, fixture.people.interpreter, fixture.people.owner]) {
      expect(text).not.toContain(person.id);
      expect(text).not.toContain(person.name);
    }
  });

  it("a revoked link answers 410 'revoked' on both token routes, at once", async () => {
    const link = await makeLink();
    signInAs(fixture.people.owner);
    expect((await callRoute(linkRoute.DELETE, { method: "DELETE", params: { linkId: link.id } })).json.link.state).toBe("revoked");
    signInAs(null);
    const response = await callRoute(publicRoute.GET, { params: { token: link.token } });
    expect(response.status).toBe(410);
    expect(response.json).toEqual({ error: "This link was revoked.", details: { state: "revoked" } });
    expect((await callRoute(publicDisplayRoute.GET, { params: { token: link.token } })).status).toBe(410);
    const state = await callRoute(publicStateRoute.GET, { params: { token: link.token } });
    expect(state).toEqual({ status: 410, json: { state: "revoked" } });
    const db = await getDb();
    const audit = await db.select().from(auditLog).where(eq(auditLog.target, link.id));
    expect(audit.map((entry) => entry.action).sort()).toEqual(["viewpoint-link.create", "viewpoint-link.revoke"]);
  });

  it("an expired link answers 410 'expired'; a link that lasts 1 day expires one day after it is made", async () => {
    const before = Date.now();
    const link = await makeLink({ expiresInDays: 1 });
    const db = await getDb();
    const row = await db.query.viewpointLinks.findFirst({ where: eq(viewpointLinks.id, link.id) });
    const lifetimeMs = row!.expiresAt!.getTime() - before;
    expect(lifetimeMs).toBeGreaterThanOrEqual(24 * 3600_000);
    expect(lifetimeMs).toBeLessThan(24 * 3600_000 + 60_000);
    expect((await callRoute(publicRoute.GET, { params: { token: link.token } })).status).toBe(200);
    expect(await callRoute(publicStateRoute.GET, { params: { token: link.token } })).toEqual({ status: 200, json: { state: "active" } });
    await db
      .update(viewpointLinks)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(viewpointLinks.id, link.id));
    const response = await callRoute(publicRoute.GET, { params: { token: link.token } });
    expect(response.status).toBe(410);
    expect(response.json.error).toBe("This link has expired.");
    expect((await callRoute(publicDisplayRoute.GET, { params: { token: link.token } })).status).toBe(410);
    expect(await callRoute(publicStateRoute.GET, { params: { token: link.token } })).toEqual({ status: 410, json: { state: "expired" } });
  });

  it("a link made 'until revoked' has no expiry", async () => {
    const link = await makeLink({ expiresInDays: null });
    const db = await getDb();
    expect((await db.query.viewpointLinks.findFirst({ where: eq(viewpointLinks.id, link.id) }))!.expiresAt).toBeNull();
  });

  it("unknown, malformed and near-miss tokens are 404", async () => {
    const link = await makeLink();
    const nearMiss = (link.token[0] === "A" ? "B" : "A") + link.token.slice(1);
    for (const token of [newLinkToken(), "short", `${link.token}x`, nearMiss, "../../api/studies", hashLinkToken(link.token)]) {
      const response = await callRoute(publicRoute.GET, { params: { token } });
      expect(response.status, token).toBe(404);
      expect(response.json.error).toBe("This link does not exist.");
      expect(await callRoute(publicStateRoute.GET, { params: { token } }), token).toEqual({ status: 404, json: { state: "not-found" } });
    }
  });

  it("deleting the viewpoint ends its links", async () => {
    signInAs(fixture.people.interpreter);
    const viewpoint = await callRoute(listRoute.POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: { title: "Short-lived", camera, settings },
    });
    const made = await callRoute(linksRoute.POST, { method: "POST", params: { viewpointId: viewpoint.json.viewpoint.id }, body: {} });
    await callRoute(viewpointRoute.DELETE, { method: "DELETE", params: { viewpointId: viewpoint.json.viewpoint.id } });
    signInAs(null);
    expect((await callRoute(publicRoute.GET, { params: { token: made.json.link.token } })).status).toBe(404);
  });

  it("link creation is rate-limited per person (30 an hour)", async () => {
    const fresh = await studyWithEveryRole();
    signInAs(fresh.people.reviewer);
    const viewpoint = await callRoute(listRoute.POST, { method: "POST", params: { faultId: fresh.fault.id }, body: { title: "Busy", camera, settings } });
    const statuses: number[] = [];
    for (let i = 0; i < 31; i++)
      statuses.push((await callRoute(linksRoute.POST, { method: "POST", params: { viewpointId: viewpoint.json.viewpoint.id }, body: {} })).status);
    expect(statuses.slice(0, 30).every((status) => status === 201)).toBe(true);
    expect(statuses[30]).toBe(429);
  });
});
