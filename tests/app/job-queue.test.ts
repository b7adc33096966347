import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/analysis/runner", async (importOriginal) => ({ ...(await importOriginal<object>()), scheduleAnalysis: vi.fn() }));

import { eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, jobs } from "@/db/schema";
import { analysisJobHandler } from "@/lib/analysis/runner";
import { confirmUpload } from "@/lib/analysis/uploads";
import { demoCsv } from "@/lib/demo";
import { holdWhileRunning, JobProcessor } from "@/lib/jobs/processor";
import { claimNextJob, enqueueJob, finishJob, queueDepth, releaseJob, renewLease, sweepExpiredLeases } from "@/lib/jobs/queue";
import { useFreshDatabase } from "../support/database";
import { studyWithEveryRole } from "../support/fixtures";

// basis for every check here: common practice, no source (a job queue's contract: one holder per job, leases renewed
// by a heartbeat, fenced results, bounded retries with back-off)

type Access = Parameters<typeof confirmUpload>[0];

async function jobOf(analysisId: string) {
  const db = await getDb();
  const [job] = await db.select().from(jobs).where(eq(jobs.subjectId, analysisId));
  return job;
}

/** A dead worker: its lease ran out (set in the past instead of waiting for it). */
async function expireLease(jobId: string) {
  await (
    await getDb()
  )
    .update(jobs)
    .set({ leaseUntil: sql`now() - interval '1 second'` })
    .where(eq(jobs.id, jobId));
}

/** Skip the back-off instead of waiting it out. */
async function dueNow(jobId: string) {
  await (
    await getDb()
  )
    .update(jobs)
    .set({ runAfter: sql`now()` })
    .where(eq(jobs.id, jobId));
}

const sweep = () => sweepExpiredLeases((tx, interrupted) => analysisJobHandler.interrupted!(tx, interrupted));

describe("the durable job queue", () => {
  let access: Access;
  const upload = () =>
    confirmUpload(access, { name: "qg-4.csv", bytes: new TextEncoder().encode(demoCsv("QG-4")) }, { units: "m", dropBadRows: false, problemPage: 0 });

  beforeAll(async () => {
    process.env.SLIPFIELD_JOB_LEASE_SECONDS = "2";
    process.env.SLIPFIELD_JOB_RETRY_SECONDS = "30";
    await useFreshDatabase();
    const fixture = await studyWithEveryRole();
    access = { user: fixture.people.interpreter, studyId: fixture.study.id, role: "interpreter", faultId: fixture.fault.id };
  });
  afterAll(() => {
    delete process.env.SLIPFIELD_JOB_LEASE_SECONDS;
    delete process.env.SLIPFIELD_JOB_RETRY_SECONDS;
  });

  it("an upload adds the analysis and its job in one transaction; each job is claimed by exactly one of many claimers", async () => {
    const uploads = [await upload(), await upload(), await upload(), await upload()];
    for (const { analysisId } of uploads) expect((await jobOf(analysisId)).state).toBe("queued");
    expect((await queueDepth()).analysis.queued).toBe(4);
    const claims = await Promise.all(Array.from({ length: 12 }, (_, index) => claimNextJob(`claimer-${index}`, ["analysis"])));
    const won = claims.filter((claim) => claim !== null);
    expect(won).toHaveLength(4);
    expect(new Set(won.map((claim) => claim!.subjectId))).toEqual(new Set(uploads.map((entry) => entry.analysisId)));
    for (const claim of won) expect(claim!.attempts).toBe(1);
    const depth = await queueDepth();
    expect(depth.analysis).toEqual({ queued: 0, delayed: 0, running: 4 });
    // clean up: the holders end their jobs
    const db = await getDb();
    for (const [index, claim] of claims.entries()) if (claim) await db.transaction((tx) => finishJob(tx, claim.id, `claimer-${index}`, { state: "done" }));
  });

  it("a second request for the same subject joins the live job instead of adding another", async () => {
    const db = await getDb();
    const first = await enqueueJob(db, { kind: "export", subjectId: "same-export" });
    const second = await enqueueJob(db, { kind: "export", subjectId: "same-export" });
    expect(second).toBe(first);
    const claim = await claimNextJob("exporter", ["export"]);
    expect(claim?.id).toBe(first);
    await db.transaction((tx) => finishJob(tx, first, "exporter", { state: "done" }));
    // once it has ended, a new request makes a new job
    expect(await enqueueJob(db, { kind: "export", subjectId: "same-export" })).not.toBe(first);
  });

  it("only the holder renews the lease or ends the job; a worker whose lease ran out cannot write its result", async () => {
    const { analysisId } = await upload();
    const first = await claimNextJob("worker-a", ["analysis"]);
    expect(first?.subjectId).toBe(analysisId);
    expect(await renewLease(first!.id, "worker-b")).toBe(false);
    expect(await renewLease(first!.id, "worker-a")).toBe(true);

    // worker-a dies: its lease runs out, the sweep queues the job again after the back-off, worker-b takes it
    await expireLease(first!.id);
    const swept = await sweep();
    expect(swept).toEqual([expect.objectContaining({ id: first!.id, state: "queued", attempts: 1 })]);
    const waiting = await jobOf(analysisId);
    expect(waiting.runAfter.getTime()).toBeGreaterThan(Date.now() + 20_000); // SLIPFIELD_JOB_RETRY_SECONDS=30 for the first retry
    expect(await claimNextJob("worker-b", ["analysis"])).toBeNull(); // not before the back-off ends
    await dueNow(first!.id);
    const second = await claimNextJob("worker-b", ["analysis"]);
    expect(second).toMatchObject({ id: first!.id, attempts: 2 });

    // worker-a comes back to life with a result: refused, nothing written
    const db = await getDb();
    expect(await db.transaction((tx) => finishJob(tx, first!.id, "worker-a", { state: "done" }))).toBe(false);
    expect(await renewLease(first!.id, "worker-a")).toBe(false);
    expect(await db.transaction((tx) => finishJob(tx, first!.id, "worker-b", { state: "done" }))).toBe(true);
    expect((await jobOf(analysisId)).state).toBe("done");
  });

  it("retries are bounded: after three interrupted attempts the job and its analysis are failed with a readable message", async () => {
    const { analysisId } = await upload();
    const db = await getDb();
    for (let attempt = 1; attempt <= 3; attempt++) {
      const claim = await claimNextJob(`worker-${attempt}`, ["analysis"]);
      expect(claim).toMatchObject({ subjectId: analysisId, attempts: attempt });
      await db.update(analyses).set({ status: "running" }).where(eq(analyses.id, analysisId));
      await expireLease(claim!.id);
      const [swept] = await sweep();
      expect(swept.state).toBe(attempt < 3 ? "queued" : "failed");
      const analysis = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
      expect(analysis?.status).toBe(attempt < 3 ? "queued" : "failed");
      if (attempt < 3) {
        // the back-off doubles with each attempt: 30 s, then 60 s
        const { runAfter } = await jobOf(analysisId);
        expect(runAfter.getTime()).toBeGreaterThan(Date.now() + 30_000 * 2 ** (attempt - 1) - 5_000);
        await dueNow(claim!.id);
      }
    }
    const analysis = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
    expect(analysis?.errorMessage).toMatch(/interrupted 3 times/);
    expect(analysis?.result).toBeNull();
    expect(await claimNextJob("worker-4", ["analysis"])).toBeNull();
  });

  it("a job given back while draining is queued at once and the attempt does not count", async () => {
    const { analysisId } = await upload();
    const claim = await claimNextJob("draining", ["analysis"]);
    const db = await getDb();
    expect(await db.transaction((tx) => releaseJob(tx, claim!.id, "draining"))).toBe(true);
    const job = await jobOf(analysisId);
    expect(job).toMatchObject({ state: "queued", attempts: 0, leaseOwner: null });
    expect((await claimNextJob("next", ["analysis"]))?.id).toBe(claim!.id);
    await db.transaction((tx) => finishJob(tx, claim!.id, "next", { state: "done" }));
  });

  it("the heartbeat stops the work as soon as another worker holds the job", async () => {
    const { analysisId } = await upload();
    const claim = await claimNextJob("slow-worker", ["analysis"]);
    expect(claim?.subjectId).toBe(analysisId);
    const stopped = holdWhileRunning(
      claim!,
      "slow-worker",
      (signal) => new Promise<string>((resolve) => signal.addEventListener("abort", () => resolve(String(signal.reason)))),
    );
    // someone else took it (as after a lease that ran out)
    await (await getDb()).update(jobs).set({ leaseOwner: "other-worker" }).where(eq(jobs.id, claim!.id));
    expect(await stopped).toBe("lease-lost");
  });

  it("a processor runs queued analyses to done, each claimed once, and drains by giving back what it could not finish", async () => {
    const db = await getDb();
    await db.update(jobs).set({ state: "done" }).where(eq(jobs.state, "queued")); // leftovers of the cases above
    const uploads = [await upload(), await upload()];
    const processor = new JobProcessor({ role: "worker", handlers: { analysis: analysisJobHandler }, slots: { analysis: 1 } });
    await processor.start();
    for (const { analysisId } of uploads) {
      for (let polls = 0; polls < 600 && (await jobOf(analysisId)).state !== "done"; polls++) await new Promise((resolve) => setTimeout(resolve, 100));
      expect(await jobOf(analysisId)).toMatchObject({ state: "done", attempts: 1 });
      const analysis = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
      expect(analysis?.status).toBe("done");
      expect(analysis?.result).not.toBeNull();
    }
    await processor.drain(1000);

    // a handler that never finishes by itself: draining gives its job back, and its analysis shows as queued again
    const { analysisId } = await upload();
    const stuck = new JobProcessor({
      role: "worker",
      handlers: {
        analysis: {
          ...analysisJobHandler,
          run: ({ signal }) => new Promise((_, reject) => signal.addEventListener("abort", () => reject(new Error("stopped")))),
        },
      },
      slots: { analysis: 1 },
    });
    await stuck.start();
    for (let polls = 0; polls < 100 && (await jobOf(analysisId)).state !== "running"; polls++) await new Promise((resolve) => setTimeout(resolve, 50));
    await db.update(analyses).set({ status: "running" }).where(eq(analyses.id, analysisId));
    await stuck.drain(200);
    expect(await jobOf(analysisId)).toMatchObject({ state: "queued", attempts: 0, leaseOwner: null });
    expect((await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) }))?.status).toBe("queued");
  });
});
