import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, pickSets } from "@/db/schema";
import * as analysisRoute from "@/app/api/faults/[faultId]/analysis/route";
import * as rerunRoute from "@/app/api/faults/[faultId]/analysis/rerun/route";
import * as faultRoute from "@/app/api/faults/[faultId]/route";
import { confirmUpload } from "@/lib/analysis/uploads";
import { demoCsv } from "@/lib/demo";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;

/** Waits for the queued analysis to settle (polling the row the UI polls; the deadline only guards against a stuck test). */
async function settled(analysisId: string) {
  const db = await getDb();
  let row = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
  for (let attempt = 0; attempt < 600 && row && (row.status === "queued" || row.status === "running"); attempt++) {
    await new Promise((resolve) => setTimeout(resolve, 100));
    row = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
  }
  return row!;
}

// Both execution paths: the bundled worker thread (production) and in-process (tests and development without a worker build).
describe.each([
  { mode: "worker thread", inline: "0" },
  { mode: "in-process", inline: "1" },
])("an analysis that throws or runs too long ($mode)", ({ inline }) => {
  let fixture: Fixture;
  let access: Parameters<typeof confirmUpload>[0];

  beforeAll(async () => {
    process.env.SLIPFIELD_INLINE_ANALYSIS = inline;
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    access = { user: fixture.people.interpreter, studyId: fixture.study.id, role: "interpreter", faultId: fixture.fault.id };
  });
  afterAll(() => {
    process.env.SLIPFIELD_INLINE_ANALYSIS = "1";
    delete process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS;
  });

  const upload = () =>
    confirmUpload(access, { name: "qg-4.csv", bytes: new TextEncoder().encode(demoCsv("QG-4")) }, { units: "m", dropBadRows: false, problemPage: 0 });

  it("a compute that throws is marked failed with a readable message; a retry after the cause is fixed completes", async () => {
    const db = await getDb();
    const { analysisId, pickSetId } = await upload();
    expect((await settled(analysisId)).status).toBe("done");
    // Damage the stored picks so the compute throws, then re-run through the API as the interpreter would.
    const [stored] = await db.select({ picks: pickSets.picks }).from(pickSets).where(eq(pickSets.id, pickSetId));
    await db
      .update(pickSets)
      .set({ picks: new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8]) })
      .where(eq(pickSets.id, pickSetId));
    signInAs(fixture.people.interpreter);
    const rerun = await callRoute(rerunRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { pickSetId } });
    expect(rerun.status).toBe(202);
    const failed = await settled(rerun.json.analysisId);
    expect(failed.status).toBe("failed");
    expect(failed.errorMessage?.length).toBeGreaterThan(0);
    expect(failed.errorMessage).not.toMatch(/\n\s+at /);

    // The server still answers, and shows the failure to the user.
    const shown = await callRoute(analysisRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(shown.status).toBe(200);
    expect(shown.json.analysis.status).toBe("failed");
    expect(shown.json.analysis.errorMessage).toBe(failed.errorMessage);

    await db.update(pickSets).set({ picks: stored.picks }).where(eq(pickSets.id, pickSetId));
    const retry = await callRoute(rerunRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { pickSetId } });
    expect(retry.status).toBe(202);
    expect((await settled(retry.json.analysisId)).status).toBe("done");
  });

  // The time limit stops the worker thread; in-process compute (tests, development) cannot be interrupted, so only the
  // worker path, the one production uses, has this case.
  if (inline === "0")
    it("a compute past the time limit is stopped and marked failed; the retry with a normal limit completes", async () => {
      process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS = "5";
      const { analysisId, pickSetId } = await upload();
      const timedOut = await settled(analysisId);
      expect(timedOut.status).toBe("failed");
      expect(timedOut.errorMessage).toMatch(/time limit/);
      delete process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS;

      signInAs(fixture.people.interpreter);
      const retry = await callRoute(rerunRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { pickSetId } });
      expect(retry.status).toBe(202);
      expect((await settled(retry.json.analysisId)).status).toBe("done");
      const page = await callRoute(faultRoute.GET, { params: { faultId: fixture.fault.id } });
      expect(page.status).toBe(200);
    });

  it("a viewer cannot trigger a re-run, and a pick set of another fault is not found", async () => {
    const { pickSetId } = await upload();
    signInAs(fixture.people.viewer);
    expect((await callRoute(rerunRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { pickSetId } })).status).toBe(403);
    signInAs(fixture.people.outsider);
    expect((await callRoute(rerunRoute.POST, { method: "POST", params: { faultId: fixture.otherFault.id }, body: { pickSetId } })).status).toBe(404);
  });
});
