import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, pickSets } from "@/db/schema";
import * as faultsRoute from "@/app/api/studies/[studyId]/faults/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import { runAnalysis } from "@/lib/analysis/runner";
import type { AnalysisReport } from "@/lib/engine/types";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

/** A plane dipping 50° east, 6 × 6 picks, the first one with the given throw. */
function csv(firstThrow: number) {
  const rows = ["x,y,z,throw"];
  for (let j = 0; j < 6; j++)
    for (let i = 0; i < 6; i++)
      rows.push(
        `${500_000 + 40 * i},${6_000_000 + 40 * j},${(-1000 - 40 * i * Math.tan((50 * Math.PI) / 180)).toFixed(3)},${i + j === 0 ? firstThrow : 10 + 3 * Math.min(i, 5 - i) + 3 * Math.min(j, 5 - j)}`,
      );
  return rows.join("\n") + "\n";
}

function form(text: string) {
  const data = new FormData();
  data.set("file", new File([text], "picks.csv", { type: "text/csv" }));
  data.set("units", "m");
  return data;
}

describe("a fault's type: normal, reverse or oblique with a rake, and inversion", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole("kin");
    signInAs(fixture.people.interpreter);
  });

  it("refuses an oblique fault without a usable rake, naming the field", async () => {
    const missing = await callRoute(faultsRoute.POST, { method: "POST", params: { studyId: fixture.study.id }, body: { name: "QG-9", sense: "oblique" } });
    expect(missing.status).toBe(400);
    expect(JSON.stringify(missing.json)).toMatch(/rakeDeg.*an oblique fault needs its rake/i);
    const strikeSlip = await callRoute(faultsRoute.POST, {
      method: "POST",
      params: { studyId: fixture.study.id },
      body: { name: "QG-9", sense: "oblique", rakeDeg: 170 },
    });
    expect(strikeSlip.status).toBe(400);
    expect(JSON.stringify(strikeSlip.json)).toMatch(/within 20° of pure strike-slip/);
  });

  it("keeps the rake of an oblique fault, and an upload of negative throw is refused until the type expects inversion", async () => {
    const created = await callRoute(faultsRoute.POST, {
      method: "POST",
      params: { studyId: fixture.study.id },
      body: { name: "QG-9", sense: "oblique", rakeDeg: -45 },
    });
    expect(created.status).toBe(201);
    expect(created.json.fault).toMatchObject({ sense: "oblique", rakeDeg: -45, inversion: false });
    const faultId = created.json.fault.id;
    const refused = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId }, formData: form(csv(-3)) });
    expect(refused.status).toBe(422);
    expect(JSON.stringify(refused.json)).toMatch(/negative throw is offset opposite to the fault's normal-oblique sense/);

    const patched = await callRoute(faultRoute.PATCH, { method: "PATCH", params: { faultId }, body: { inversion: true } });
    expect(patched.status).toBe(200);
    const accepted = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId }, formData: form(csv(-3)) });
    expect(accepted.status).toBe(201);
    await runAnalysis(accepted.json.analysisId);
    const db = await getDb();
    const [row] = await db.select({ result: analyses.result }).from(analyses).where(eq(analyses.id, accepted.json.analysisId));
    const report = row.result as AnalysisReport;
    expect(report.kinematics).toMatchObject({ sense: "oblique", rakeDeg: -45, inversion: true, oppositeSensePicks: 1 });
    // throw 22 m at the four centre picks, δ = 50°, r = −45°: D = 22 / (sin 50° · sin 45°) = 40.615 m
    expect(report.segments[0].max.displacementM).toBeCloseTo(40.615, 2);
  });

  it("a change of type analyses the newest pick set again with it", async () => {
    const db = await getDb();
    const [fault] = await db.select({ faultId: pickSets.faultId }).from(pickSets).orderBy(desc(pickSets.uploadedAt)).limit(1);
    const before = await db.select({ id: analyses.id }).from(analyses);
    const patched = await callRoute(faultRoute.PATCH, { method: "PATCH", params: { faultId: fault.faultId }, body: { sense: "reverse" } });
    expect(patched.status).toBe(200);
    expect(patched.json.fault).toMatchObject({ sense: "reverse", rakeDeg: null });
    const after = await db.select({ id: analyses.id, status: analyses.status }).from(analyses).orderBy(desc(analyses.createdAt));
    expect(after.length).toBe(before.length + 1);
    expect(after[0].status).toBe("queued");
    // a rake only for an oblique fault
    const wrong = await callRoute(faultRoute.PATCH, { method: "PATCH", params: { faultId: fault.faultId }, body: { rakeDeg: -60 } });
    expect(wrong.status).toBe(400);
    expect(JSON.stringify(wrong.json)).toMatch(/Only an oblique fault takes a rake/);
  });
});
