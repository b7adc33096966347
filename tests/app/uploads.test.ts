import { beforeAll, describe, expect, it, vi } from "vitest";
import { signInAs } from "../support/session";

vi.mock("@/lib/auth/session", async () => ({ getSessionUser: (await import("../support/session")).getSessionUserMock }));
vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, pickSets } from "@/db/schema";
import * as pickSetsRoute from "@/app/api/faults/[faultId]/pick-sets/route";
import * as analysisRoute from "@/app/api/faults/[faultId]/analysis/route";
import { runAnalysis } from "@/lib/analysis/runner";
import { decodeFaultDisplay } from "@/lib/display/payload";
import { analysisResponseSchema, pickSetsResponseSchema, uploadPreviewSchema } from "@/lib/contracts/analysis";
import { demoCsv } from "@/lib/demo";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";
import { callRoute } from "../support/requests";

function form(csv: string, fields: Record<string, string> = {}) {
  const data = new FormData();
  data.set("file", new File([csv], "qg-4.csv", { type: "text/csv" }));
  for (const [key, value] of Object.entries({ units: "m", ...fields })) data.set(key, value);
  return data;
}

describe("pick-set upload: preview, confirm, analyse", () => {
  let fixture: Awaited<ReturnType<typeof studyWithEveryRole>>;
  const csv = demoCsv("QG-4");
  beforeAll(async () => {
    await useFreshDatabase();
    fixture = await studyWithEveryRole();
    signInAs(fixture.people.interpreter);
  });

  it("previews without saving and names each bad row and column", async () => {
    const lines = csv.trimEnd().split("\n");
    lines[3] = lines[3].replace(/,[^,]*,main$/, ",-4,main");
    lines[7] = "oops,1,2,3,main";
    const preview = await callRoute(pickSetsRoute.POST, {
      method: "POST",
      path: "/x?step=preview",
      params: { faultId: fixture.fault.id },
      formData: form(lines.join("\n")),
    });
    expect(preview.status).toBe(200);
    // the answer is what the contract says the workspace gets (lib/contracts/analysis.ts)
    expect(uploadPreviewSchema.safeParse(preview.json).error).toBeUndefined();
    expect(preview.json.problemCount).toBe(2);
    expect(preview.json.problems.map((problem: { row: number; column: string }) => [problem.row, problem.column])).toEqual([
      [4, "throw"],
      [8, "x"],
    ]);
    const db = await getDb();
    expect(await db.select().from(pickSets).where(eq(pickSets.faultId, fixture.fault.id))).toHaveLength(0);

    const refused = await callRoute(pickSetsRoute.POST, {
      method: "POST",
      path: "/x?step=confirm",
      params: { faultId: fixture.fault.id },
      formData: form(lines.join("\n")),
    });
    expect(refused.status).toBe(422);
    expect(refused.json.error).toMatch(/2 problems/);
    expect(refused.json.details.rejected).toHaveLength(2);
    expect(await db.select().from(pickSets).where(eq(pickSets.faultId, fixture.fault.id))).toHaveLength(0);
  });

  it("saves a pick set in one go, runs the analysis and serves its report and display grid", async () => {
    const saved = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId: fixture.fault.id }, formData: form(csv) });
    expect(saved.status).toBe(201);
    expect(saved.json.version).toBe(1);
    await runAnalysis(saved.json.analysisId);
    const db = await getDb();
    const analysis = await db.query.analyses.findFirst({ where: eq(analyses.id, saved.json.analysisId) });
    expect(analysis?.status).toBe("done");
    const latest = await callRoute(analysisRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(analysisResponseSchema.safeParse(latest.json).error).toBeUndefined();
    const report = latest.json.analysis.result;
    expect(report.segments).toHaveLength(1);
    // QG-4 is drawn with a 1250 m half-length (lib/demo.ts): the inferred tip line should recover ~2500 m.
    expect(report.segments[0].tipLine.lengthM).toBeGreaterThan(2500 * 0.95);
    expect(report.segments[0].tipLine.lengthM).toBeLessThan(2500 * 1.05);
    const display = decodeFaultDisplay(analysis!.display!);
    expect(display.segments).toHaveLength(1);
    // the workspace's form: the same report with the contour rings left out (it draws them from the display)
    const sheet = await callRoute(analysisRoute.GET, { path: "/x?contours=0", params: { faultId: fixture.fault.id } });
    expect(analysisResponseSchema.safeParse(sheet.json).error).toBeUndefined();
    const lean = sheet.json.analysis.result;
    expect(report.segments[0].contours.some((level: { rings: unknown[] }) => level.rings.length > 0)).toBe(true);
    expect(lean.segments[0].contours.map((level: { levelM: number }) => level.levelM)).toEqual(
      report.segments[0].contours.map((level: { levelM: number }) => level.levelM),
    );
    expect(lean.segments[0].contours.every((level: { rings: unknown[] }) => level.rings.length === 0)).toBe(true);
    expect({ ...lean.segments[0], contours: null }).toEqual({ ...report.segments[0], contours: null });
    expect(sheet.json.analysis.id).toBe(latest.json.analysis.id);
  });

  it("detects a re-upload of the same file by checksum and versions the pick sets", async () => {
    const preview = await callRoute(pickSetsRoute.POST, {
      method: "POST",
      path: "/x?step=preview",
      params: { faultId: fixture.fault.id },
      formData: form(csv),
    });
    expect(preview.json.duplicateOfVersion).toBe(1);
    const second = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=confirm", params: { faultId: fixture.fault.id }, formData: form(csv) });
    expect(second.json.version).toBe(2);
    const list = await callRoute(pickSetsRoute.GET, { params: { faultId: fixture.fault.id } });
    expect(pickSetsResponseSchema.safeParse(list.json).error).toBeUndefined();
    expect(list.json.pickSets.map((set: { version: number }) => set.version)).toEqual([2, 1]);
  });

  it("converts feet to metres on upload", async () => {
    const feet =
      "x,y,z,throw\n" +
      csv
        .trimEnd()
        .split("\n")
        .slice(1, 40)
        .map((line) =>
          line
            .split(",")
            .slice(0, 4)
            .map((value) => String(Number(value) / 0.3048))
            .join(","),
        )
        .join("\n");
    const preview = await callRoute(pickSetsRoute.POST, {
      method: "POST",
      path: "/x?step=preview",
      params: { faultId: fixture.fault.id },
      formData: form(feet, { units: "ft" }),
    });
    expect(preview.status).toBe(200);
    const firstMetres = csv.split("\n")[1].split(",").map(Number);
    expect(preview.json.sample[0].throwM).toBeCloseTo(firstMetres[3], 6);
  });

  it("refuses an empty file and a file that is not text", async () => {
    const empty = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=preview", params: { faultId: fixture.fault.id }, formData: form("") });
    expect(empty.status).toBe(400);
    expect(empty.json.error).toMatch(/empty/);
    const binary = new FormData();
    binary.set("file", new File([new Uint8Array([0xff, 0xfe, 0xfd, 0x00])], "picks.bin"));
    const notText = await callRoute(pickSetsRoute.POST, { method: "POST", path: "/x?step=preview", params: { faultId: fixture.fault.id }, formData: binary });
    expect(notText.status).toBe(400);
    expect(notText.json.error).toMatch(/not a UTF-8 text file/);
  });
});
