import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));

import { getDb } from "@/db/client";
import { pins } from "@/db/schema";
import type { CameraState } from "@/lib/contracts/camera";
import * as studyRoute from "@/app/api/studies/[studyId]/route";
import * as faultsRoute from "@/app/api/studies/[studyId]/faults/route";
import * as viewpointsRoute from "@/app/api/faults/[faultId]/viewpoints/route";
import * as linksRoute from "@/app/api/viewpoints/[viewpointId]/links/route";
import * as linkRoute from "@/app/api/links/[linkId]/route";
import * as memberRoute from "@/app/api/studies/[studyId]/members/[userId]/route";
import * as stressRoute from "@/app/api/faults/[faultId]/stress/route";
import { recordAudit } from "@/lib/audit";
import { activitySentence, quoteOf, type ActivityLookups } from "@/lib/activity/sentences";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

const camera: CameraState = { position: [0, -100, 100], target: [0, 0, 0], up: [0, 0, 1], fov: 40 };
const settings = { layers: { surface: true }, colourMode: "displacement", exaggeration: 0 };
// a database id (26 lower-case letters and digits) or a UUID must never reach the page
const RAW_ID = /\b[0-9a-z]{20,}\b|[0-9a-f]{8}-[0-9a-f]{4}-/;

type Sentence = { actor: string; parts: { text: string; href?: string }[] };
const words = (entry: Sentence) => `${entry.actor} ${entry.parts.map((part) => part.text).join("")}`;

describe("recent activity in sentences", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  let activity: Sentence[];
  let newFaultId: string;

  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole("act");
    const { study, people } = fixture;
    signInAs(people.interpreter);
    const created = await callRoute(faultsRoute.POST, { method: "POST", params: { studyId: study.id }, body: { name: "QG-7", sense: "reverse" } });
    expect(created.status).toBe(201);
    newFaultId = created.json.fault.id;
    // a pin needs an analysed surface; written as createPin writes it (lib/pins/service.ts)
    const db = await getDb();
    const [pin] = await db
      .insert(pins)
      .values({
        faultId: newFaultId,
        authorId: people.interpreter.id,
        x: 0,
        y: 0,
        z: -1000,
        s: 0,
        t: 0,
        body: "Throw **jumps** here — a mis-pick near the relay, or a real step in the throw profile?",
      })
      .returning();
    await recordAudit({ studyId: study.id, userId: people.interpreter.id, action: "pin.create", target: pin.id, details: { faultId: newFaultId } });
    const viewpoint = await callRoute(viewpointsRoute.POST, {
      method: "POST",
      params: { faultId: newFaultId },
      body: { title: "Relay from the east", note: "", camera, settings },
    });
    expect(viewpoint.status).toBe(201);
    const viewpointId = viewpoint.json.viewpoint?.id ?? viewpoint.json.id;
    const link = await callRoute(linksRoute.POST, { method: "POST", params: { viewpointId }, body: { expiresInDays: 7, includePins: true } });
    expect(link.status).toBe(201);
    const linkId = link.json.link?.id ?? link.json.id;
    expect((await callRoute(linkRoute.DELETE, { method: "DELETE", params: { linkId } })).status).toBe(200);
    const stress = await callRoute(stressRoute.POST, {
      method: "POST",
      params: { faultId: newFaultId },
      body: {
        parameters: {
          regime: "normal",
          verticalGradient: 24,
          maxHorizontalGradient: 18,
          minHorizontalGradient: 14,
          maxHorizontalAzimuthDeg: 0,
          porePressureGradient: 10,
          frictionLow: 0.6,
          frictionHigh: 0.8,
          cohesionMPa: 0,
          referenceDepthM: 2500,
        },
        source: "test",
      },
    });
    expect(stress.status, JSON.stringify(stress.json)).toBe(201);
    signInAs(people.owner);
    expect(
      (await callRoute(memberRoute.PATCH, { method: "PATCH", params: { studyId: study.id, userId: people.viewer.id }, body: { role: "reviewer" } })).status,
    ).toBe(200);
    // an event written by a later version of the product, which this page has no words for
    await recordAudit({ studyId: study.id, userId: people.owner.id, action: "horizon.rename", target: "01hzzzzzzzzzzzzzzzzzzzzzzz" });
    const overview = await callRoute(studyRoute.GET, { params: { studyId: study.id } });
    expect(overview.status).toBe(200);
    activity = overview.json.activity;
  });

  it("writes every event as a sentence with names, never ids or action codes", () => {
    expect(activity.length).toBeGreaterThanOrEqual(7);
    for (const entry of activity) {
      const sentence = words(entry);
      expect(sentence, sentence).not.toMatch(RAW_ID);
      expect(sentence, sentence).not.toMatch(/\b[a-z-]+\.[a-z-]+\b/); // "viewpoint-link.create", "stress.set"
      expect(sentence.trim().endsWith("."), sentence).toBe(true);
    }
    const all = activity.map(words);
    const interpreter = fixture.people.interpreter.name;
    expect(all).toContain(`${interpreter} added the fault QG-7.`);
    expect(all).toContain(`${interpreter} pinned a note on QG-7: “Throw jumps here — a mis-pick near the relay, or a real…”.`);
    expect(all).toContain(`${interpreter} saved the viewpoint “Relay from the east” of QG-7.`);
    expect(all).toContain(`${interpreter} shared the viewpoint “Relay from the east” of QG-7 as a read-only link (with pinned notes, for 7 days).`);
    expect(all).toContain(`${interpreter} turned off a shared link to the viewpoint “Relay from the east” of QG-7.`);
    expect(all).toContain(`${interpreter} set the stress state of QG-7 (version 1, normal faulting).`);
    expect(all).toContain(`${fixture.people.owner.name} made ${fixture.people.viewer.name} a reviewer.`);
    expect(all).toContain(`${fixture.people.owner.name} made a change (horizon rename).`);
  });

  it("links the fault and the pinned note into the study", () => {
    const faultHref = `/studies/${fixture.study.id}/faults/${newFaultId}`;
    const added = activity.find((entry) => words(entry).includes("added the fault"))!;
    expect(added.parts.find((part) => part.text === "QG-7")?.href).toBe(faultHref);
    const pinned = activity.find((entry) => words(entry).includes("pinned a note"))!;
    expect(pinned.parts.find((part) => part.text === "a note")?.href).toMatch(new RegExp(`^${faultHref}\\?pin=`));
  });
});

describe("activity sentences for what has gone since", () => {
  const lookups: ActivityLookups = {
    studyId: "s1",
    faults: new Map(),
    faultIdsByName: new Map([["QG-1", "f1"]]),
    users: new Map(),
    pins: new Map(),
    replies: new Map(),
    viewpoints: new Map(),
    links: new Map(),
  };
  const say = (action: string, target: string, details: Record<string, unknown> = {}) =>
    activitySentence({ action, target, details }, lookups)
      .map((part) => part.text)
      .join("");

  it("names removed faults, people and viewpoints by what was recorded, without links", () => {
    expect(say("fault.delete", "QG-9", { faultId: "gone" })).toBe("removed the fault QG-9.");
    expect(say("member.remove", "u-gone")).toBe("removed a former member from the study.");
    expect(say("viewpoint.delete", "v-gone", { title: "North tip" })).toBe("deleted the viewpoint “North tip”.");
    expect(say("pin.delete", "p-gone", { faultId: "gone", body: "check the tip" })).toBe("deleted a note on a fault since removed: “check the tip”.");
    // entries from before fault ids were recorded still link by name
    const parts = activitySentence({ action: "fault.create", target: "QG-1", details: {} }, lookups);
    expect(parts.find((part) => part.text === "QG-1")?.href).toBe("/studies/s1/faults/f1");
  });

  it("quotes the start of a note without its markup", () => {
    expect(quoteOf("**bold** and `code`")).toBe("“bold and code”");
    expect(quoteOf("a".repeat(80))).toBe(`“${"a".repeat(60)}…”`);
  });
});
