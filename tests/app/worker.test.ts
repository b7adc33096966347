import { readdirSync, readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, pickSets } from "@/db/schema";
import { confirmUpload } from "@/lib/analysis/uploads";
import { runAnalysis } from "@/lib/analysis/runner";
import { analysisWorkerCounts, computeGridsOffThread, parseUploadOffThread, readMultipartOffThread } from "@/lib/analysis/worker-pool";
import { computeFullResolution } from "@/lib/analysis/compute";
import { parseUploadedFile, UploadProblem } from "@/lib/analysis/upload-parse";
import { demoCsv } from "@/lib/demo";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";

describe("analyses in the worker thread", () => {
  let access: Parameters<typeof confirmUpload>[0];
  beforeAll(async () => {
    process.env.SLIPFIELD_INLINE_ANALYSIS = "0";
    await useFreshDatabase();
    const fixture = await studyWithEveryRole();
    access = { user: fixture.people.interpreter, studyId: fixture.study.id, role: "interpreter", faultId: fixture.fault.id };
  });
  afterAll(() => {
    process.env.SLIPFIELD_INLINE_ANALYSIS = "1";
    delete process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS;
  });

  const upload = () =>
    confirmUpload(access, { name: "qg-4.csv", bytes: new TextEncoder().encode(demoCsv("QG-4")) }, { units: "m", dropBadRows: false, problemPage: 0 });

  it("computes the same report off the main thread", async () => {
    const { analysisId } = await upload();
    await runAnalysis(analysisId);
    const stored = await (await getDb()).query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
    expect(stored?.status).toBe("done");
    expect((stored?.result as { segments: unknown[] }).segments).toHaveLength(1);
    expect(stored?.display?.byteLength).toBeGreaterThan(1000);
  });

  // basis: common practice, no source (the same pure compute, run in another thread, gives the same numbers)
  it("computes the full-resolution export grids off the main thread, identical to the in-process result", async () => {
    const { analysisId } = await upload();
    const analysis = await (await getDb()).query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
    const pickSet = await (await getDb()).query.pickSets.findFirst({ where: eq(pickSets.id, analysis!.pickSetId) });
    const job = { picks: pickSet!.picks, units: "m" as const };
    const offThread = await computeGridsOffThread(job);
    const inProcess = computeFullResolution(job);
    expect(offThread.report).toEqual(inProcess.report);
    const segment = inProcess.report.segments[0].id;
    expect(Array.from(offThread.grids[segment].displacementM)).toEqual(Array.from(inProcess.grids[segment].displacementM));
  });

  // basis: common practice, no source (the same pure parse, run in another thread, gives the same columns and errors)
  it("reads an uploaded file off the main thread: the same picks and encoding, and row-level problems as a 422", async () => {
    const bytes = new TextEncoder().encode(demoCsv("QG-4"));
    const job = { output: "parse" as const, name: "qg-4.csv", bytes, units: "m" as const, dropBadRows: false, encode: true };
    const offThread = await parseUploadOffThread(job);
    const inProcess = parseUploadedFile(job);
    expect(offThread.parsed.accepted).toBe(inProcess.parsed.accepted);
    expect(Array.from(offThread.parsed.picks.throwM)).toEqual(Array.from(inProcess.parsed.picks.throwM));
    expect(Buffer.from(offThread.encoded!).equals(Buffer.from(inProcess.encoded!))).toBe(true);
    const bad = new TextEncoder().encode("x,y,z,throw\n1,2,3,4\n5,six,7,8\n9,10,11,-2\n");
    const refused = await parseUploadOffThread({ ...job, bytes: bad }).catch((error: unknown) => error);
    expect(refused).toBeInstanceOf(UploadProblem);
    expect((refused as UploadProblem).status).toBe(422);
    expect((refused as UploadProblem).details?.rejected.map((row) => row.row)).toEqual([3, 4]);
  });

  it("takes a multipart upload apart off the main thread: the file's exact bytes and the text fields", async () => {
    const csv = new TextEncoder().encode(demoCsv("QG-4"));
    const form = new FormData();
    form.set("file", new Blob([csv], { type: "text/csv" }), "qg-4.csv");
    form.set("units", "ft");
    form.set("dropBadRows", "true");
    const request = new Request("http://localhost/", { method: "POST", body: form });
    const contentType = request.headers.get("content-type")!;
    const body = new Uint8Array(await request.arrayBuffer());
    const { file, fields } = await readMultipartOffThread({ output: "multipart", body, contentType });
    expect(body.byteLength).toBe(0); // the body moved to the worker instead of being copied
    expect(file?.name).toBe("qg-4.csv");
    expect(file?.size).toBe(csv.byteLength);
    expect(Buffer.from(file!.bytes).equals(Buffer.from(csv))).toBe(true);
    expect(fields).toEqual({ units: "ft", dropBadRows: "true" });

    const withoutFile = new Request("http://localhost/", {
      method: "POST",
      body: (() => {
        const f = new FormData();
        f.set("units", "m");
        return f;
      })(),
    });
    const none = await readMultipartOffThread({
      output: "multipart",
      body: new Uint8Array(await withoutFile.arrayBuffer()),
      contentType: withoutFile.headers.get("content-type")!,
    });
    expect(none.file).toBeNull();
    const broken = await readMultipartOffThread({
      output: "multipart",
      body: new TextEncoder().encode("not a form"),
      contentType: "multipart/form-data; boundary=xyz",
    }).catch((error: unknown) => error);
    expect(broken).toBeInstanceOf(UploadProblem);
    expect((broken as UploadProblem).status).toBe(400);
  });

  it("keeps one warm worker thread for the next job instead of starting a thread per analysis", async () => {
    const before = analysisWorkerCounts();
    for (let run = 0; run < 2; run++) {
      const { analysisId } = await upload();
      await runAnalysis(analysisId);
    }
    expect(analysisWorkerCounts().started).toBe(before.started + (before.idle > 0 ? 0 : 1));
    expect(analysisWorkerCounts().idle).toBe(1);
  });

  // basis: common practice, no source (setpriority(2) on a Linux thread id changes that thread only)
  it("runs the worker thread at a lower priority than the web server's thread (Linux)", () => {
    const niceOf = (stat: string) => Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[16]);
    const tasks = readdirSync("/proc/self/task").map((task) => niceOf(readFileSync(`/proc/self/task/${task}/stat`, "utf8")));
    expect(niceOf(readFileSync("/proc/thread-self/stat", "utf8"))).toBe(0);
    expect(tasks).toContain(10);
  });

  it("stops an analysis that runs past the time limit, marks it failed with a message and never reuses that thread", async () => {
    process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS = "1";
    const before = analysisWorkerCounts();
    const { analysisId } = await upload();
    await runAnalysis(analysisId);
    const stored = await (await getDb()).query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
    expect(stored?.status).toBe("failed");
    expect(stored?.errorMessage).toMatch(/time limit/);
    expect(analysisWorkerCounts().idle).toBe(before.idle - 1);
    delete process.env.SLIPFIELD_ANALYSIS_TIMEOUT_MS;
    const retry = await upload();
    await runAnalysis(retry.analysisId);
    const again = await (await getDb()).query.analyses.findFirst({ where: eq(analyses.id, retry.analysisId) });
    expect(again?.status).toBe("done");
    expect(analysisWorkerCounts().started).toBe(before.started + 1);
  });
});
