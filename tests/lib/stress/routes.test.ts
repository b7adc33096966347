import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { check } from "@placemarkio/check-geojson";
import type { StudyRole } from "@/lib/contracts/roles";
import { ROLE_PERMISSIONS, type StudyAction } from "@/lib/contracts/roles";
import { runAnalysis } from "@/lib/analysis/runner";
import { demoCsv } from "@/lib/demo";
import { DEFAULT_STRESS_PARAMETERS, applyPreset } from "@/lib/stress/parameters";
import { EXPORT_COLUMNS } from "@/lib/stress/service";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import * as stressRoute from "@/app/api/faults/[faultId]/stress/route";
import * as resultRoute from "@/app/api/faults/[faultId]/stress/result/route";
import * as exportRoute from "@/app/api/faults/[faultId]/stress/export/route";
import { useFreshDatabase } from "../../support/database";
import { studyWithEveryRole } from "../../support/fixtures";
import { callRoute } from "../../support/requests";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;
const ROLES: StudyRole[] = ["owner", "interpreter", "reviewer", "viewer"];
const normalState = { parameters: { ...applyPreset(DEFAULT_STRESS_PARAMETERS, "normal"), maxHorizontalAzimuthDeg: 150 }, source: "illustrative preset" };

async function withAnalysedFault(fixture: Fixture, name: "QG-1" | "QG-4" = "QG-1") {
  signInAs(fixture.people.owner);
  const form = new FormData();
  form.set("file", new File([demoCsv(name)], `${name}.csv`, { type: "text/csv" }));
  form.set("units", "m");
  const saved = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId: fixture.fault.id }, formData: form });
  expect(saved.status).toBe(201);
  await runAnalysis(saved.json.analysisId);
}

const CASES: { name: string; action: StudyAction; call: (faultId: string) => ReturnType<typeof callRoute> }[] = [
  { name: "GET stress state", action: "view", call: (faultId) => callRoute(stressRoute.GET, { params: { faultId } }) },
  { name: "POST stress state", action: "edit", call: (faultId) => callRoute(stressRoute.POST, { method: "POST", params: { faultId }, body: normalState }) },
  { name: "GET stress result", action: "view", call: (faultId) => callRoute(resultRoute.GET, { params: { faultId } }) },
  { name: "GET stress export csv", action: "view", call: (faultId) => callRoute(exportRoute.GET, { path: "/x?format=csv", params: { faultId } }) },
  { name: "GET stress export geojson", action: "view", call: (faultId) => callRoute(exportRoute.GET, { path: "/x?format=geojson", params: { faultId } }) },
];

describe("stress routes: session and role on every route (docs/design.md, Roles)", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    await withAnalysedFault(fixture, "QG-4");
    signInAs(fixture.people.owner);
    expect((await callRoute(stressRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: normalState })).status).toBe(201);
  });

  for (const testCase of CASES) {
    for (const role of ROLES) {
      const allowed = ROLE_PERMISSIONS[testCase.action].includes(role);
      it(`${testCase.name} as ${role} → ${allowed ? "allowed" : "403"}`, async () => {
        signInAs(fixture.people[role]);
        const { status, json } = await testCase.call(fixture.fault.id);
        if (allowed) expect(status, JSON.stringify(json).slice(0, 300)).toBeLessThan(300);
        else {
          expect(status).toBe(403);
          expect(json.error).toMatch(/role/i);
        }
      });
    }
    it(`${testCase.name} signed out → 401`, async () => {
      signInAs(null);
      expect((await testCase.call(fixture.fault.id)).status).toBe(401);
    });
    it(`${testCase.name} on another study's fault → 404 (no IDOR)`, async () => {
      signInAs(fixture.people.owner);
      const { status, json } = await testCase.call(fixture.otherFault.id);
      expect(status).toBe(404);
      expect(json.error).toBe("Fault not found.");
    });
    it(`${testCase.name} by an outsider on this study's fault → 404`, async () => {
      signInAs(fixture.people.outsider);
      expect((await testCase.call(fixture.fault.id)).status).toBe(404);
    });
  }
});

describe("stress state: validation, versions, study default", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
  });

  it("refuses a bad body with field errors that carry units, and writes nothing", async () => {
    signInAs(fixture.people.interpreter);
    const bad = { parameters: { ...DEFAULT_STRESS_PARAMETERS, verticalGradient: -1, frictionLow: 0.9, frictionHigh: 0.6 }, source: "x" };
    const { status, json } = await callRoute(stressRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: bad });
    expect(status).toBe(400);
    const fields = json.details.fieldErrors as Record<string, string[]>;
    expect(fields.parameters.join(" ")).toMatch(/Vertical stress gradient must be between .* MPa\/km/);
    expect(fields.parameters.join(" ")).toMatch(/Upper friction coefficient/);
    expect((await callRoute(stressRoute.GET, { params: { faultId: fixture.fault.id } })).json.current).toBeNull();
  });

  it("falls back to the study default, then saves fault versions with who, when and source", async () => {
    signInAs(fixture.people.owner);
    const studyWide = await callRoute(stressRoute.POST, {
      method: "POST",
      params: { faultId: fixture.fault.id },
      body: { ...normalState, studyWide: true, source: "regional compilation" },
    });
    expect(studyWide.json).toMatchObject({ version: 1, scope: "study" });
    let view = await callRoute(stressRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(view.json.current).toMatchObject({ scope: "study", version: 1, source: "regional compilation" });
    signInAs(fixture.people.interpreter);
    await callRoute(stressRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: { ...normalState, source: "leak-off tests, well QG-A" } });
    const reverse = { parameters: applyPreset(DEFAULT_STRESS_PARAMETERS, "reverse"), source: "what-if" };
    const second = await callRoute(stressRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: reverse });
    expect(second.json).toMatchObject({ version: 2, scope: "fault" });
    view = await callRoute(stressRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(view.json.current).toMatchObject({ scope: "fault", version: 2, source: "what-if" });
    expect(view.json.current.parameters.regime).toBe("reverse");
    expect(view.json.current.setBy.email).toBe(fixture.people.interpreter.email);
    expect(view.json.faultVersions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
    expect(view.json.studyVersions).toHaveLength(1);
    expect(Date.parse(view.json.current.createdAt)).not.toBeNaN();
  });

  it("explains why there is no result before an analysis exists", async () => {
    signInAs(fixture.people.viewer);
    const { status, json } = await callRoute(resultRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(status).toBe(404);
    expect(json.error).toMatch(/no analysis yet/);
  });
});

describe("stress result and exports on the demo fault QG-1 (two segments)", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    await withAnalysedFault(fixture, "QG-1");
    signInAs(fixture.people.owner);
    await callRoute(stressRoute.POST, { method: "POST", params: { faultId: fixture.fault.id }, body: normalState });
  });

  it("returns a summary, per-node fields sized to each display grid, and Mohr points", async () => {
    signInAs(fixture.people.viewer);
    const { status, json } = await callRoute(resultRoute.GET, { path: "/x?thresholds=1,2,5", params: { faultId: fixture.fault.id } });
    expect(status).toBe(200);
    expect(json.segments.map((s: { segmentId: string }) => s.segmentId).sort()).toEqual(["north", "south"]);
    for (const segment of json.segments) {
      const bytes = Buffer.from(segment.dp, "base64");
      expect(bytes.length).toBe(segment.columns * segment.rows * 4);
      const values = new Float32Array(bytes.buffer, bytes.byteOffset, bytes.length / 4);
      expect(values.some((v) => Number.isFinite(v))).toBe(true);
    }
    const { summary } = json;
    expect(summary.triangleCount).toBeGreaterThan(1000);
    expect(summary.thresholds.map((t: { thresholdMPa: number }) => t.thresholdMPa)).toEqual([1, 2, 5]);
    // fractions below a larger threshold can only grow, and the more critical end counts at least the area of both ends
    expect(summary.thresholds[0].fractionCritical).toBeLessThanOrEqual(summary.thresholds[2].fractionCritical);
    for (const t of summary.thresholds) expect(t.fractionBothEnds).toBeLessThanOrEqual(t.fractionCritical);
    // without cohesion the lower friction coefficient is the more critical end everywhere
    expect(summary.minPressureToFailureMPa.critical).toBe(summary.minPressureToFailureMPa.low);
    expect(summary.minPressureToFailureMPa.low).toBeLessThanOrEqual(summary.minPressureToFailureMPa.high);
    expect(summary.minPressureToFailureMPa.criticalRange[0]).toBeLessThanOrEqual(summary.minPressureToFailureMPa.critical);
    expect(summary.minPressureToFailureMPa.criticalRange[1]).toBeGreaterThanOrEqual(summary.minPressureToFailureMPa.critical);
    // the demo picks scatter 2 m off their planes (lib/demo.ts): at the smoothing length that reads as a few degrees of
    // orientation scatter, never the tens of degrees of a bent surface (common practice, no source)
    expect(summary.orientation.medianSlopeScatterDeg).toBeGreaterThan(0.1);
    expect(summary.orientation.medianSlopeScatterDeg).toBeLessThan(5);
    // the default length: 200 m or 4 median pick spacings; QG-1's picks are about 60 m apart
    expect(json.orientation.lengthScaleM).toBe(json.orientation.defaultLengthScaleM);
    expect(json.orientation.defaultLengthScaleM).toBe(Math.max(200, Math.ceil((4 * json.orientation.medianPickSpacingM) / 10) * 10));
    expect(json.orientation.medianPickSpacingM).toBeGreaterThan(30);
    expect(json.orientation.medianPickSpacingM).toBeLessThan(100);
    // QG-1 lies at about 2–3.5 km depth (lib/demo.ts)
    expect(summary.depthRangeM[0]).toBeGreaterThan(1000);
    expect(summary.depthRangeM[1]).toBeLessThan(5000);
    expect(summary.sentence).toMatch(/MPa at μ = 0\.6/);
    expect(json.mohr.effectiveNormalMPa.length).toBe(Math.min(20_000, summary.triangleCount));
    const bad = await callRoute(resultRoute.GET, { path: "/x?thresholds=1,abc", params: { faultId: fixture.fault.id } });
    expect(bad.status).toBe(400);
    expect(bad.json.error).toMatch(/MPa/);
  });

  it("takes the smoothing length from the request, states it, and refuses one that is not a length", async () => {
    signInAs(fixture.people.viewer);
    const longer = await callRoute(resultRoute.GET, { path: "/x?lengthScaleM=600", params: { faultId: fixture.fault.id } });
    expect(longer.status).toBe(200);
    expect(longer.json.orientation.lengthScaleM).toBe(600);
    expect(longer.json.summary.sentence).toMatch(/MPa/);
    for (const bad of ["abc", "2", "99999"]) {
      const refused = await callRoute(resultRoute.GET, { path: `/x?lengthScaleM=${bad}`, params: { faultId: fixture.fault.id } });
      expect(refused.status).toBe(400);
      expect(refused.json.error).toBe("lengthScaleM must be a length in metres between 10 and 5000, e.g. 200.");
    }
    const exported = await callRoute(exportRoute.GET, { path: "/x?format=csv&lengthScaleM=abc", params: { faultId: fixture.fault.id } });
    expect(exported.status).toBe(400);
  });

  it("exports one CSV row per screened triangle with the documented header", async () => {
    signInAs(fixture.people.reviewer);
    const result = await callRoute(resultRoute.GET, { params: { faultId: fixture.fault.id } });
    const response = await exportRoute.GET(new Request("http://localhost:3000/x?format=csv", { headers: { host: "localhost:3000" } }), {
      params: Promise.resolve({ faultId: fixture.fault.id }),
    });
    expect(response.headers.get("content-disposition")).toMatch(/attachment; filename="reactivation-screen-v1\.csv"/);
    const lines = (await response.text()).trim().split("\n");
    expect(lines[0]).toMatch(/^# Screening only/);
    expect(lines[1]).toBe(EXPORT_COLUMNS.join(","));
    expect(lines.length - 2).toBe(result.json.summary.triangleCount);
    const first = lines[2].split(",");
    expect(first).toHaveLength(EXPORT_COLUMNS.length);
    const ts = Number(first[EXPORT_COLUMNS.indexOf("slip_tendency")]);
    const tau = Number(first[EXPORT_COLUMNS.indexOf("tau_mpa")]);
    const eff = Number(first[EXPORT_COLUMNS.indexOf("sigma_n_eff_mpa")]);
    expect(Math.abs(ts - tau / eff)).toBeLessThan(1e-3);
    const low = Number(first[EXPORT_COLUMNS.indexOf("dp_failure_mu_low_mpa")]);
    const high = Number(first[EXPORT_COLUMNS.indexOf("dp_failure_mu_high_mpa")]);
    expect(Number(first[EXPORT_COLUMNS.indexOf("dp_failure_critical_mpa")])).toBe(Math.min(low, high));
    expect(lines[0]).toMatch(/orientation from the surface smoothed at \d+ m/);
  });

  it("exports valid RFC 7946 GeoJSON triangles with [x, y, z] and the values as properties (checked with @placemarkio/check-geojson)", async () => {
    signInAs(fixture.people.viewer);
    const response = await exportRoute.GET(new Request("http://localhost:3000/x?format=geojson", { headers: { host: "localhost:3000" } }), {
      params: Promise.resolve({ faultId: fixture.fault.id }),
    });
    const text = await response.text();
    const parsed = check(text);
    expect(parsed.type).toBe("FeatureCollection");
    const collection = JSON.parse(text);
    const feature = collection.features[0];
    expect(feature.geometry.coordinates[0]).toHaveLength(4);
    expect(feature.geometry.coordinates[0][0]).toHaveLength(3);
    expect(feature.properties).toHaveProperty("dp_failure_mu_low_mpa");
    expect(collection.screening.caution).toMatch(/Screening only/);
    const bad = await callRoute(exportRoute.GET, { path: "/x?format=shp", params: { faultId: fixture.fault.id } });
    expect(bad.status).toBe(400);
  });
});
