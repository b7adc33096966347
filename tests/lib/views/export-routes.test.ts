import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import * as exportRoute from "@/app/api/faults/[faultId]/export/[kind]/route";
import * as studyRoute from "@/app/api/studies/[studyId]/route";
import { createRequire } from "node:module";
import { runAnalysis } from "@/lib/analysis/runner";
import { demoCsv } from "@/lib/demo";
import { readCsv } from "@/lib/views/csv";
import { parsePickCsv } from "@/lib/engine/csv";
import { useFreshDatabase } from "../../support/database";
import { studyWithEveryRole } from "../../support/fixtures";
import { callRoute } from "../../support/requests";

type Fixture = Awaited<ReturnType<typeof studyWithEveryRole>>;
const KINDS = ["grid.csv", "picks.csv", "profiles.csv", "contours.geojson", "surface.glb", "scaling.json"];

// the Khronos glTF-Validator, compiled from the reference validator (npm package gltf-validator)
const validator = createRequire(import.meta.url)("gltf-validator") as { validateBytes(data: Uint8Array): Promise<{ issues: { numErrors: number } }> };

describe("export routes: session, view role, content", () => {
  let fixture: Fixture;
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    signInAs(fixture.people.interpreter);
    const form = new FormData();
    form.set("file", new File([demoCsv("QG-4")], "qg-4-throw-picks.csv", { type: "text/csv" }));
    form.set("units", "m");
    const saved = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId: fixture.fault.id }, formData: form });
    expect(saved.status).toBe(201);
    await runAnalysis(saved.json.analysisId);
  });

  it("401 when signed out", async () => {
    signInAs(null);
    for (const kind of KINDS) {
      const response = await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind } });
      expect(response.status, kind).toBe(401);
    }
  });

  it("404 for someone outside the study and for an unknown fault (ids of other studies reveal nothing)", async () => {
    signInAs(fixture.people.outsider);
    for (const kind of KINDS) {
      expect((await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind } })).status, kind).toBe(404);
    }
    signInAs(fixture.people.viewer);
    expect((await callRoute(exportRoute.GET, { params: { faultId: "no-such-fault", kind: "grid.csv" } })).status).toBe(404);
  });

  it("404 when the fault has no finished analysis, 400 for an unknown export kind", async () => {
    signInAs(fixture.people.owner);
    expect((await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "secrets.txt" } })).status).toBe(400);
    signInAs(fixture.people.outsider);
    const empty = await callRoute(exportRoute.GET, { params: { faultId: fixture.otherFault.id, kind: "grid.csv" } });
    expect(empty.status).toBe(404);
    expect(empty.json.error).toMatch(/no finished analysis/);
  });

  it("every role in the study (all hold view) downloads each export", async () => {
    for (const role of ["owner", "interpreter", "reviewer", "viewer"] as const) {
      signInAs(fixture.people[role]);
      const geo = await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "contours.geojson" } });
      expect(geo.status, role).toBe(200);
      expect(geo.json.type).toBe("FeatureCollection");
      // the contour rings come back from the display payload (the stored report keeps only the levels)
      const kinds = new Set((geo.json.features as { properties: { kind: string } }[]).map((feature) => feature.properties.kind));
      expect([...kinds].sort(), role).toEqual(["contour", "mapped-limit", "tip-line"]);
    }
    signInAs(fixture.people.viewer);
    const grid = await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "grid.csv" } });
    expect(grid.status).toBe(200);
    expect(readCsv(grid.json as unknown as string).header).toEqual([
      "segment",
      "s",
      "t",
      "x",
      "y",
      "z",
      "displacement",
      "throw",
      "offset",
      "local_dip",
      "local_strike",
    ]);
    const picks = await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "picks.csv" } });
    expect(readCsv(picks.json as unknown as string).rows.length).toBe(parsePickCsv(demoCsv("QG-4")).accepted);
    const scaling = await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "scaling.json" } });
    expect(scaling.json.faults).toHaveLength(1);
    expect(scaling.json.faults[0].lengthM).toBeGreaterThan(2000);
  });

  it("the owner records the study's coordinate reference (checked codes; a bad one named); the exports then carry it", async () => {
    signInAs(fixture.people.owner);
    const wrong = await callRoute(studyRoute.PATCH, { method: "PATCH", params: { studyId: fixture.study.id }, body: { coordinateReference: { epsg: 4326 } } });
    expect(wrong.status).toBe(400);
    expect(wrong.json.error).toContain("EPSG:4326 (WGS 84) is a geographic (longitude/latitude) system");
    expect(wrong.json.details.fieldErrors["coordinateReference.epsg"]).toHaveLength(1);
    const depth = await callRoute(studyRoute.PATCH, {
      method: "PATCH",
      params: { studyId: fixture.study.id },
      body: { coordinateReference: { epsg: 32631, verticalEpsg: 5715 } },
    });
    expect(depth.status).toBe(400);
    expect(depth.json.error).toContain("measures depth (positive down)");
    signInAs(fixture.people.interpreter);
    expect(
      (await callRoute(studyRoute.PATCH, { method: "PATCH", params: { studyId: fixture.study.id }, body: { coordinateReference: { epsg: 32631 } } })).status,
    ).toBe(403);
    signInAs(fixture.people.owner);
    const set = await callRoute(studyRoute.PATCH, {
      method: "PATCH",
      params: { studyId: fixture.study.id },
      body: { coordinateReference: { epsg: 32631, verticalEpsg: 5714 } },
    });
    expect(set.status).toBe(200);
    expect(set.json.study.coordinateReference.horizontal).toMatchObject({ epsg: 32631, name: "WGS 84 / UTM zone 31N" });

    signInAs(fixture.people.viewer);
    const geo = await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "contours.geojson" } });
    expect(geo.json.crs).toEqual({ type: "name", properties: { name: "urn:ogc:def:crs:EPSG::32631" } });
    const grid = (await callRoute(exportRoute.GET, { params: { faultId: fixture.fault.id, kind: "grid.csv" } })).json as unknown as string;
    expect(grid.split("\n")[0]).toBe(
      "# coordinate reference: EPSG:32631 (WGS 84 / UTM zone 31N), metres; z elevation above EPSG:5714 (MSL height), metres, positive up",
    );
    // the 3D model as bytes: a valid glTF 2.0 binary whose extras state the reference
    const response = await exportRoute.GET(
      new Request(`http://localhost:3000/api/faults/${fixture.fault.id}/export/surface.glb`, { headers: { host: "localhost:3000" } }),
      {
        params: Promise.resolve({ faultId: fixture.fault.id, kind: "surface.glb" }),
      },
    );
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("model/gltf-binary");
    const bytes = new Uint8Array(await response.arrayBuffer());
    expect((await validator.validateBytes(bytes)).issues.numErrors).toBe(0);
    const jsonLength = new DataView(bytes.buffer, bytes.byteOffset).getUint32(12, true);
    const gltf = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLength)));
    expect(gltf.asset.extras.coordinateReference).toMatchObject({ horizontal: "EPSG:32631", vertical: "EPSG:5714" });
  });
});
