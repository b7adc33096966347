import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { cutoffSets, pickSets } from "@/db/schema";
import { ROLE_PERMISSIONS, type StudyRole } from "@/lib/contracts/roles";
import * as runner from "@/lib/analysis/runner";
import { decodePicks } from "@/lib/picks/codec";
import { depthFromTwtLinear } from "@/lib/engine/time-depth";
import { uploadPreviewSchema } from "@/lib/contracts/analysis";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import * as analysisRoute from "@/app/api/faults/[faultId]/analysis/route";
import * as cutoffsRoute from "@/app/api/faults/[faultId]/cutoffs/route";
import * as stratigraphyRoute from "@/app/api/studies/[studyId]/stratigraphy/route";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";
import { timeCutoffCsv } from "../lib/engine/cutoff-fixtures";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;
const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];
const LINEAR = JSON.stringify({ kind: "linear", v0MPerS: 1800, kPerS: 0.6 });

function form(csv: string, fields: Record<string, string> = {}, name = "qg-cutoffs.csv") {
  const data = new FormData();
  data.set("file", new File([csv], name, { type: "text/csv" }));
  for (const [key, value] of Object.entries({ units: "m", ...fields })) data.set(key, value);
  return data;
}
const upload = (faultId: string, step: "preview" | "confirm", formData: FormData) =>
  callRoute(pickSetsRoute.POST, { method: "POST", path: `/x?step=${step}`, params: { faultId }, formData });

async function rowsOf(faultId: string) {
  const db = await getDb();
  return {
    pickSets: await db.select({ id: pickSets.id }).from(pickSets).where(eq(pickSets.faultId, faultId)),
    cutoffSets: await db.select({ id: cutoffSets.id }).from(cutoffSets).where(eq(cutoffSets.faultId, faultId)),
  };
}

describe("cut-off line upload: a second kind of file beside pick CSVs", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  it("a file in two-way time without a velocity model: the preview asks for one (422, the file's horizons listed), nothing saved", async () => {
    signInAs(fixture.people.interpreter);
    const preview = await upload(fixture.fault.id, "preview", form(timeCutoffCsv()));
    expect(preview.status).toBe(422);
    expect(preview.json.error).toMatch(/is in two-way time \(twt, ms\)\. Give a velocity model to convert its cut-offs to depth/);
    expect(preview.json.details).toMatchObject({ needsVelocityModel: true, kind: "cutoffs", horizons: ["H1", "H2", "H3"] });
    const bad = await upload(
      fixture.fault.id,
      "preview",
      form(timeCutoffCsv(), { velocityModel: JSON.stringify({ kind: "linear", v0MPerS: 20, kPerS: 0.6 }) }),
    );
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.json.details.fieldErrors.velocityModel)).toMatch(/v0 must be at least 100 m\/s/);
    expect((await rowsOf(fixture.fault.id)).pickSets).toHaveLength(0);
  });

  it("with the model the preview shows the derived picks, each horizon's stations and throws, and the stations with one wall", async () => {
    signInAs(fixture.people.interpreter);
    const preview = await upload(fixture.fault.id, "preview", form(timeCutoffCsv(), { velocityModel: LINEAR }));
    expect(preview.status).toBe(200);
    expect(uploadPreviewSchema.safeParse(preview.json).error).toBeUndefined();
    expect(preview.json).toMatchObject({ kind: "cutoffs", domain: "time", accepted: 55, velocityModel: { kind: "linear", v0MPerS: 1800, kPerS: 0.6 } });
    expect(preview.json.cutoffs.horizons.map((h: { name: string; stations: number }) => [h.name, h.stations])).toEqual([
      ["H1", 20],
      ["H2", 20],
      ["H3", 15],
    ]);
    expect(preview.json.cutoffs.horizons[2].maxThrowM).toBeCloseTo(80, 2);
    expect(preview.json.cutoffs.missingStations).toBe(5);
    expect(preview.json.cutoffs.missing[0]).toMatchObject({ horizon: "H3", present: "fw" });
    expect(preview.json.sample[0].throwM).toBeCloseTo(60, 2);
  });

  it("confirm saves the derived pick set with its provenance and model, and its cut-off set, in one go; the analysis runs as for any pick set", async () => {
    signInAs(fixture.people.interpreter);
    const saved = await upload(fixture.fault.id, "confirm", form(timeCutoffCsv(), { velocityModel: LINEAR, stationSpacingM: "100" }));
    expect(saved.status).toBe(201);
    const db = await getDb();
    const [pickSet] = await db.select().from(pickSets).where(eq(pickSets.id, saved.json.pickSetId));
    expect(pickSet).toMatchObject({ fileName: "qg-cutoffs.csv", rowCount: 55, velocityModel: { kind: "linear", v0MPerS: 1800, kPerS: 0.6 } });
    expect(pickSet.derivedFrom).toMatchObject({ kind: "cutoffs", fileName: "qg-cutoffs.csv", stationSpacingM: 100, stationSpacingSource: "set", rakeDeg: 90 });
    expect(pickSet.derivedFrom!.checksum).toMatch(/^[0-9a-f]{64}$/);
    expect(pickSet.horizonNames).toEqual(["H1", "H2", "H3"]);
    const picks = decodePicks(pickSet.picks);
    expect(picks.throwM[0]).toBeCloseTo(60, 2);
    const [cutoffSet] = await db.select().from(cutoffSets).where(eq(cutoffSets.pickSetId, pickSet.id));
    expect(cutoffSet).toMatchObject({ domain: "time", vertexCount: 121, stationSpacingM: 100, checksum: pickSet.derivedFrom!.checksum });
    await runner.runAnalysis(saved.json.analysisId);

    signInAs(fixture.people.viewer);
    const analysis = await callRoute(analysisRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(analysis.json.analysis.status).toBe("done");
    expect(analysis.json.analysis.velocityModel).toEqual({ kind: "linear", v0MPerS: 1800, kPerS: 0.6 });
    expect(analysis.json.analysis.derivedFrom.kind).toBe("cutoffs");
    const [segment] = analysis.json.analysis.result.segments;
    expect(segment.pickCount).toBe(55);
    expect(segment.plane.dipDeg).toBeCloseTo(60, 2);
    expect(segment.max.throwM).toBeCloseTo(80, 2);

    const cutoffs = await callRoute(cutoffsRoute.GET, { path: `/x?pickSet=${pickSet.id}`, params: { faultId: fixture.fault.id } });
    expect(cutoffs.status).toBe(200);
    expect(cutoffs.json.cutoffSet).toMatchObject({ pickSetVersion: 1, ofShownPickSet: true, domain: "time", fileName: "qg-cutoffs.csv" });
    const h1 = cutoffs.json.cutoffSet.summary.segments[0].horizons[0];
    // the original times are kept beside the converted depths
    expect(h1.fwTwtMs[0]).toBeCloseTo(1351.5504, 3);
    expect(h1.fwZ[0]).toBeCloseTo(-1500, 2);
  });

  it("nothing is half-saved: a failure inside the transaction leaves neither the pick set nor its cut-off set", async () => {
    signInAs(fixture.people.interpreter);
    const before = await rowsOf(fixture.fault.id);
    const spy = vi.spyOn(runner, "queueAnalysisJob").mockRejectedValueOnce(new Error("the queue is gone"));
    const failed = await upload(fixture.fault.id, "confirm", form(timeCutoffCsv(), { velocityModel: LINEAR }));
    spy.mockRestore();
    expect(failed.status).toBe(500);
    expect(failed.json.error).not.toMatch(/queue is gone/);
    const after = await rowsOf(fixture.fault.id);
    expect(after.pickSets).toHaveLength(before.pickSets.length);
    expect(after.cutoffSets).toHaveLength(before.cutoffSets.length);
  });

  it("a cut-off file with a line that crosses itself is refused with its row, and nothing is saved", async () => {
    signInAs(fixture.people.interpreter);
    // the footwall cut-off of H1 (rows 2–22) replaced by five vertices: north to y = 400 m, back to y = 300 m 30 ms
    // deeper, then up through the first piece to y = 200 m 30 ms shallower (rows 2–6)
    const lines = timeCutoffCsv().trimEnd().split("\n");
    const [x, , t] = lines[1].split(",").map(Number);
    const crossing = [
      [0, t],
      [400, t],
      [300, t + 30],
      [200, t - 30],
      [2000, t],
    ].map(([y, ms]) => `${x},${y},${ms},H1,fw`);
    lines.splice(1, 21, ...crossing);
    const before = await rowsOf(fixture.fault.id);
    const refused = await upload(fixture.fault.id, "confirm", form(lines.join("\n"), { velocityModel: LINEAR }));
    expect(refused.status).toBe(422);
    expect(refused.json.details.rejected[0]).toMatchObject({ row: 4, column: "x,y" });
    expect(refused.json.details.rejected[0].reason).toMatch(
      /the footwall cut-off of "H1" crosses itself: the piece from row 2 to row 3 crosses the piece from row 4 to row 5/,
    );
    expect((await rowsOf(fixture.fault.id)).pickSets).toHaveLength(before.pickSets.length);
  });

  it("throw picks in two-way time are converted on upload with the model, which is stored with the pick set", async () => {
    signInAs(fixture.people.owner);
    const rows = ["x,y,twt,throw"];
    for (let k = 0; k < 30; k++) rows.push(`${100 * (k % 6)},${120 * Math.floor(k / 6)},${1300 + 20 * (k % 6)},${10 + (k % 5)}`);
    const needsModel = await upload(fixture.otherFault.id, "preview", form(rows.join("\n"), {}, "time-picks.csv"));
    expect(needsModel.status).toBe(404); // another study's fault: no sign of it
    const fault = fixture.fault.id;
    const refused = await upload(fault, "preview", form(rows.join("\n"), {}, "time-picks.csv"));
    expect(refused.json.details).toMatchObject({ needsVelocityModel: true, kind: "picks" });
    const saved = await upload(fault, "confirm", form(rows.join("\n"), { velocityModel: LINEAR }, "time-picks.csv"));
    expect(saved.status).toBe(201);
    const db = await getDb();
    const [pickSet] = await db.select().from(pickSets).where(eq(pickSets.id, saved.json.pickSetId));
    expect(pickSet.velocityModel).toEqual({ kind: "linear", v0MPerS: 1800, kPerS: 0.6 });
    expect(pickSet.derivedFrom).toBeNull();
    const picks = decodePicks(pickSet.picks);
    expect(picks.throwM[0]).toBeCloseTo(depthFromTwtLinear(1305, 1800, 0.6) - depthFromTwtLinear(1295, 1800, 0.6), 9);
    expect(picks.twtMs![0]).toBe(1300);
  });
});

describe("stratigraphy table and cut-off routes: session, role and input checks", () => {
  let fixture: Fixture;
  const table = {
    units: [
      { name: "Quillon Claystone", topHorizon: "H1", kind: "seal", clayFraction: 0.75 },
      { name: "Quillon Sandstone", topHorizon: "H2", kind: "reservoir", clayFraction: 0.12 },
    ],
  };
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  for (const role of ROLES) {
    const canEdit = ROLE_PERMISSIONS.edit.includes(role);
    it(`as ${role}: reads the table and the cut-offs; ${canEdit ? "saves" : "may not save (403)"} the table`, async () => {
      signInAs(fixture.people[role]);
      expect((await callRoute(stratigraphyRoute.GET, { params: { studyId: fixture.study.id } })).status).toBe(200);
      expect((await callRoute(cutoffsRoute.GET, { params: { faultId: fixture.fault.id } })).json).toEqual({ cutoffSet: null });
      const put = await callRoute(stratigraphyRoute.PUT, { method: "PUT", params: { studyId: fixture.study.id }, body: table });
      expect(put.status).toBe(canEdit ? 200 : 403);
      if (!canEdit) expect(put.json.error).toMatch(/role/);
    });
  }

  it("signed out: 401; an outsider or another study: 404", async () => {
    signInAs(null);
    expect((await callRoute(stratigraphyRoute.GET, { params: { studyId: fixture.study.id } })).status).toBe(401);
    expect((await callRoute(cutoffsRoute.GET, { params: { faultId: fixture.fault.id } })).status).toBe(401);
    signInAs(fixture.people.outsider);
    expect((await callRoute(stratigraphyRoute.PUT, { method: "PUT", params: { studyId: fixture.study.id }, body: table })).status).toBe(404);
    expect((await callRoute(cutoffsRoute.GET, { params: { faultId: fixture.fault.id } })).status).toBe(404);
    signInAs(fixture.people.owner);
    expect((await callRoute(cutoffsRoute.GET, { params: { faultId: fixture.otherFault.id } })).status).toBe(404);
  });

  it("refuses a bad table with messages that name the field, and versions each save", async () => {
    signInAs(fixture.people.interpreter);
    const bad = await callRoute(stratigraphyRoute.PUT, {
      method: "PUT",
      params: { studyId: fixture.study.id },
      body: {
        units: [
          { name: "A", topHorizon: "H1", kind: "reservoir", clayFraction: 12 },
          { name: "a", topHorizon: "H2", kind: "sand", clayFraction: null },
        ],
      },
    });
    expect(bad.status).toBe(400);
    const messages = JSON.stringify(bad.json.details);
    expect(messages).toMatch(/The clay fraction must be at most 1 \(a fraction, not a percentage\)/);
    expect(messages).toMatch(/A unit is a reservoir, a seal or other/);
    const first = await callRoute(stratigraphyRoute.GET, { params: { studyId: fixture.study.id } });
    const saved = await callRoute(stratigraphyRoute.PUT, { method: "PUT", params: { studyId: fixture.study.id }, body: table });
    expect(saved.json.version).toBe(first.json.version + 1);
    expect(saved.json.units).toEqual(table.units);
    expect(saved.json.updatedBy.name).toBe(fixture.people.interpreter.name);
  });
});
