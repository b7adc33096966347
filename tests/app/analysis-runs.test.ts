import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import * as analysisRoute from "@/app/api/faults/[faultId]/analysis/route";
import * as rerunRoute from "@/app/api/faults/[faultId]/analysis/rerun/route";
import * as runsRoute from "@/app/api/faults/[faultId]/analysis/runs/route";
import { runAnalysis } from "@/lib/analysis/runner";
import { demoCsv } from "@/lib/demo";
import type { AnalysisReport } from "@/lib/engine/types";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

// The interpreter's control over a run (common practice, no source): the settings reach the engine, every run is kept
// beside the earlier ones, and settings the engine cannot use are refused with a message naming them.
describe("runs of an analysis with the interpreter's settings", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  let pickSetId: string;
  let firstId: string;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    signInAs(fixture.people.interpreter);
    const data = new FormData();
    data.set("file", new File([demoCsv("QG-4")], "qg-4.csv", { type: "text/csv" }));
    data.set("units", "m");
    const saved = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId: fixture.fault.id }, formData: data });
    pickSetId = saved.json.pickSetId;
    firstId = saved.json.analysisId;
    await runAnalysis(firstId);
  }, 120_000);

  it("runs again with a set cut-off, one profile, an open end, a contour interval and smoothing, and keeps both runs", async () => {
    const settings = { throwCutoffM: 20, profiles: ["linear"], ends: { "strike-end": "open" }, intervalM: 4, smoothingM: 60 };
    const started = await callRoute(rerunRoute.POST, { method: "POST", path: "/x", params: { faultId: fixture.fault.id }, body: { pickSetId, settings } });
    expect(started.status).toBe(202);
    await runAnalysis(started.json.analysisId);

    const second = await callRoute(analysisRoute.GET, { method: "GET", path: `/x?analysis=${started.json.analysisId}`, params: { faultId: fixture.fault.id } });
    const report = second.json.analysis.result as AnalysisReport;
    expect(report.settings).toEqual(settings);
    const tip = report.segments[0].tipLine;
    expect(tip.cutoff.source).toBe("set");
    // the throw cut-off as displacement through the picks' median local dip (Groshong 2006: D = T / sin δ); QG-4 is gently
    // listric (lib/demo.ts: 60° at the top to 44° at the base), so it lies between 20/sin 60° and 20/sin 44°, within
    // 1 % of 20/sin(the plane's 52°)
    expect(tip.cutoff.displacementM).toBeGreaterThan(20 / Math.sin((60 * Math.PI) / 180));
    expect(tip.cutoff.displacementM).toBeLessThan(20 / Math.sin((44 * Math.PI) / 180));
    expect(Math.abs(tip.cutoff.displacementM / (20 / Math.sin((report.segments[0].plane.dipDeg * Math.PI) / 180)) - 1)).toBeLessThan(0.01);
    expect(tip.candidates.map((c) => c.model)).toEqual(["linear"]);
    expect(tip.ends.find((end) => end.side === "strike-end")).toEqual({ side: "strike-end", status: "open", source: "set" });
    expect(tip.lengthRangeM[1]).toBeNull();
    expect(report.segments[0].contourIntervalM).toBe(4);

    const first = await callRoute(analysisRoute.GET, { method: "GET", path: `/x?analysis=${firstId}`, params: { faultId: fixture.fault.id } });
    const firstReport = first.json.analysis.result as AnalysisReport;
    expect(firstReport.settings).toEqual({});
    expect(firstReport.segments[0].tipLine.cutoff.source).toBe("estimated");

    const runs = await callRoute(runsRoute.GET, { method: "GET", path: "/x", params: { faultId: fixture.fault.id } });
    expect(runs.status).toBe(200);
    expect(runs.json.runs.map((run: { id: string }) => run.id)).toEqual([started.json.analysisId, firstId]);
    expect(runs.json.runs[0].settings).toEqual(settings);
    expect(runs.json.runs[0].segments[0].lengthRangeM[1]).toBeNull();
    expect(runs.json.runs[1].segments[0].lengthM).toBeCloseTo(firstReport.segments[0].tipLine.lengthM, 6);
  }, 120_000);

  it("refuses settings it cannot use, naming each", async () => {
    const refused = await callRoute(rerunRoute.POST, {
      method: "POST",
      path: "/x",
      params: { faultId: fixture.fault.id },
      body: { pickSetId, settings: { throwCutoffM: -3, profiles: ["quadratic"], ends: { sideways: "open" } } },
    });
    expect(refused.status).toBe(400);
    const text = JSON.stringify(refused.json);
    expect(text).toMatch(/cut-off must be more than 0 m/);
    expect(text).toMatch(/profile must be one of/);
    expect(text).not.toMatch(/at [A-Za-z]+ \(/);
  });

  it("lets a reviewer see the runs but not start one", async () => {
    signInAs(fixture.people.reviewer);
    const runs = await callRoute(runsRoute.GET, { method: "GET", path: "/x", params: { faultId: fixture.fault.id } });
    expect(runs.status).toBe(200);
    const refused = await callRoute(rerunRoute.POST, { method: "POST", path: "/x", params: { faultId: fixture.fault.id }, body: { pickSetId } });
    expect(refused.status).toBe(403);
    signInAs(fixture.people.interpreter);
  });
});
