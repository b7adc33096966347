import { rmSync } from "node:fs";
import { Client as PgClient } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  Client,
  DEMO_PASSWORD,
  ensureBuild,
  startServer,
  startWorker,
  syntheticPickCsv,
  tempDataDir,
  type RunningServer,
  type RunningWorker,
} from "../../scripts/hardening/server";

/**
 * Several processes on one PostgreSQL server, as the README's "Running on several machines" runs them: two web
 * processes that run no jobs (SLIPFIELD_ANALYSIS_WORKERS=0) and two job workers (the bundled `npm run worker`).
 * Checks: 20 uploads spread over both web processes are each analysed exactly once; a worker killed (SIGKILL) in the
 * middle of an analysis leaves nothing half-written and another worker completes it once the lease has run out; a
 * web process restarted while the other serves resets no job; a worker stopped with SIGTERM gives its job back;
 * the sign-in limit, a role change and a sign-out hold across processes; /api/health shows the queue and the workers.
 */

const databaseUrl = process.env.TEST_DATABASE_URL!;
const LEASE_SECONDS = 4;
const jobEnv = { SLIPFIELD_JOB_LEASE_SECONDS: String(LEASE_SECONDS), SLIPFIELD_JOB_RETRY_SECONDS: "1" };
const webEnv = { DATABASE_URL: databaseUrl, SLIPFIELD_ANALYSIS_WORKERS: "0", ...jobEnv };
const workerEnv = { DATABASE_URL: databaseUrl, SLIPFIELD_ANALYSIS_WORKERS: "1", SLIPFIELD_DRAIN_SECONDS: "0.5", ...jobEnv };

const webs: RunningServer[] = [];
const workers: RunningWorker[] = [];
const dataDirs: string[] = [];
let db: PgClient;
let faultId = "";
let studyId = "";

interface JobRow {
  subject_id: string;
  state: string;
  attempts: number;
  lease_owner: string | null;
  lease_until: Date | null;
  started_at: Date | null;
}

async function jobOf(analysisId: string): Promise<JobRow> {
  const { rows } = await db.query<JobRow>(
    "select subject_id, state, attempts, lease_owner, lease_until, started_at from jobs where kind = 'analysis' and subject_id = $1",
    [analysisId],
  );
  return rows[0];
}

async function analysisRow(analysisId: string) {
  const { rows } = await db.query<{ status: string; has_result: boolean; has_display: boolean }>(
    "select status, result is not null as has_result, display is not null as has_display from analyses where id = $1",
    [analysisId],
  );
  return rows[0];
}

async function web(index: number, env: Record<string, string> = {}) {
  const dataDir = tempDataDir(`scale-web${index}`);
  dataDirs.push(dataDir);
  return startServer({ dataDir, env: { ...webEnv, ...env } });
}

async function signedIn(server: RunningServer, who = "interpreter@quillon.test") {
  const client = new Client(server.url);
  await client.signIn(who, DEMO_PASSWORD);
  return client;
}

async function waitUntil<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 180_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

/** Lines "analysis <id>: started (attempt n of m)" in a worker's log. */
function startedIn(worker: RunningWorker) {
  return [...worker.output().matchAll(/analysis ([0-9a-f-]{36}): started \(attempt (\d+)/g)].map((match) => ({ id: match[1], attempt: Number(match[2]) }));
}

beforeAll(async () => {
  ensureBuild();
  db = new PgClient({ connectionString: databaseUrl });
  await db.connect();
  await db.query("drop schema if exists public cascade; drop schema if exists drizzle cascade; create schema public;");
  // the first web process migrates and seeds; the rest start together (they find both done)
  webs.push(await web(1));
  const [second, ...started] = await Promise.all([web(2), startWorker(workerEnv), startWorker(workerEnv)]);
  webs.push(second);
  workers.push(...(started as RunningWorker[]));
  const client = await signedIn(webs[0]);
  const { studies } = (await (await client.request("/api/studies")).json()) as { studies: { id: string }[] };
  studyId = studies[0].id;
  const { fault } = (await (await client.json(`/api/studies/${studyId}/faults`, "POST", { name: "Scale-out F-1" })).json()) as { fault: { id: string } };
  faultId = fault.id;
}, 300_000);

afterAll(async () => {
  await Promise.all([...webs.map((server) => server.stop()), ...workers.map((worker) => worker.stop())]);
  await db?.end();
  for (const dir of dataDirs) rmSync(dir, { recursive: true, force: true });
});

describe("two web processes and two job workers on one PostgreSQL server", () => {
  it("20 uploads spread over both web processes: every analysis is computed exactly once, by one of the two workers", async () => {
    const clients = [await signedIn(webs[0]), await signedIn(webs[1])];
    const analysisIds: string[] = [];
    await Promise.all(
      Array.from({ length: 20 }, async (_, index) => {
        const { csv } = await syntheticPickCsv(3000 + 100 * index, 500 + index);
        const response = await clients[index % 2].upload(faultId, `spread-${index}.csv`, csv);
        expect(response.status).toBe(201);
        analysisIds.push(((await response.json()) as { analysisId: string }).analysisId);
      }),
    );
    for (const [index, analysisId] of analysisIds.entries()) {
      const done = await waitUntil(`analysis ${analysisId}`, async () => {
        const { analysis } = (await (await clients[index % 2].request(`/api/faults/${faultId}/analysis?pickSet=${await pickSetOf(analysisId)}`)).json()) as {
          analysis: { status: string };
        };
        return analysis.status === "done" || analysis.status === "failed" ? analysis : null;
      });
      expect(done.status).toBe("done");
      expect(await jobOf(analysisId)).toMatchObject({ state: "done", attempts: 1, lease_owner: null });
    }
    const started = workers.flatMap(startedIn).filter((entry) => analysisIds.includes(entry.id));
    expect(started.map((entry) => entry.id).sort()).toEqual([...analysisIds].sort()); // each once, none twice
    const perWorker = workers.map((worker) => startedIn(worker).filter((entry) => analysisIds.includes(entry.id)).length);
    expect(perWorker.every((count) => count > 0)).toBe(true);
    console.log(`scale-out: 20 uploads over 2 web processes, analysed once each by 2 workers (${perWorker.join(" + ")})`);
  });

  it("a worker killed (SIGKILL) mid-analysis: nothing half-written is visible, and the other worker completes it after the lease ran out", async () => {
    const client = await signedIn(webs[0]);
    const big = await syntheticPickCsv(400_000, 77);
    const response = await client.upload(faultId, "big-kill.csv", big.csv);
    expect(response.status).toBe(201);
    const { analysisId } = (await response.json()) as { analysisId: string };
    const held = await waitUntil("the analysis to run on a worker", async () => {
      const job = await jobOf(analysisId);
      return job.state === "running" && (await analysisRow(analysisId)).status === "running" ? job : null;
    });
    const victim = workers.find((worker) => held.lease_owner!.includes(`-${worker.process.pid}-`))!;
    const survivor = workers.find((worker) => worker !== victim)!;
    expect(victim).toBeDefined();
    await victim.kill9();
    const { rows: leaseRows } = await db.query<{ lease_until: Date }>("select lease_until from jobs where subject_id = $1", [analysisId]);
    const leaseRanOutAt = leaseRows[0].lease_until;

    // until another worker has written the whole result, readers see it unfinished, never in part
    const seen = new Set<string>();
    const finished = await waitUntil("the analysis to be completed by the other worker", async () => {
      const row = await analysisRow(analysisId);
      seen.add(row.status);
      if (row.status !== "done") {
        expect(row.has_result || row.has_display).toBe(false);
        const { analysis } = (await (await client.request(`/api/faults/${faultId}/analysis?pickSet=${await pickSetOf(analysisId)}`)).json()) as {
          analysis: { status: string; result: unknown };
        };
        if (analysis.status !== "done") expect(analysis.result).toBeNull();
        return null;
      }
      return row;
    });
    expect(finished).toMatchObject({ status: "done", has_result: true, has_display: true });
    const job = await jobOf(analysisId);
    expect(job).toMatchObject({ state: "done", attempts: 2, lease_owner: null });
    // the second claim came after the first lease ran out (database clock): never two workers at once
    expect(job.started_at!.getTime()).toBeGreaterThanOrEqual(leaseRanOutAt.getTime());
    expect(startedIn(survivor).filter((entry) => entry.id === analysisId)).toEqual([{ id: analysisId, attempt: 2 }]);
    expect(seen.has("queued")).toBe(true); // the sweep put it back in the queue before the survivor took it
    console.log(
      `scale-out: worker killed during a ${big.rows}-pick analysis; seen meanwhile: ${[...seen].join(", ")}; completed by the other worker on attempt 2`,
    );
    workers.splice(workers.indexOf(victim), 1, await startWorker(workerEnv));
  });

  it("a web process restarted while the other serves resets no job", async () => {
    const client = await signedIn(webs[1]);
    const big = await syntheticPickCsv(400_000, 78);
    const response = await client.upload(faultId, "big-restart.csv", big.csv);
    expect(response.status).toBe(201);
    const { analysisId } = (await response.json()) as { analysisId: string };
    const held = await waitUntil("the analysis to run on a worker", async () => {
      const job = await jobOf(analysisId);
      return job.state === "running" ? job : null;
    });
    // restart web 1 while web 2 keeps answering
    let served = 0;
    let stopPolling = false;
    const polling = (async () => {
      while (!stopPolling) {
        const answer = await client.request(`/api/faults/${faultId}`);
        expect(answer.status).toBe(200);
        await answer.arrayBuffer();
        served++;
      }
    })();
    await webs[0].stop();
    webs[0] = await web(1);
    const during = await jobOf(analysisId);
    expect(during.attempts).toBe(1);
    if (during.state === "running") expect(during.lease_owner).toBe(held.lease_owner);
    stopPolling = true;
    await polling;
    expect(served).toBeGreaterThan(0);
    await waitUntil("the analysis", async () => (await jobOf(analysisId)).state === "done");
    expect(await jobOf(analysisId)).toMatchObject({ state: "done", attempts: 1 });
    console.log(
      `scale-out: web 1 restarted during an analysis held by ${held.lease_owner}; web 2 answered ${served} requests meanwhile; the job kept its worker and its single attempt`,
    );
  });

  it("a worker stopped with SIGTERM mid-analysis gives its job back; the other worker takes it at once and the attempt does not count", async () => {
    const client = await signedIn(webs[1]);
    const big = await syntheticPickCsv(400_000, 79);
    const response = await client.upload(faultId, "big-drain.csv", big.csv);
    const { analysisId } = (await response.json()) as { analysisId: string };
    const held = await waitUntil("the analysis to run on a worker", async () => {
      const job = await jobOf(analysisId);
      return job.state === "running" ? job : null;
    });
    const stopping = workers.find((worker) => held.lease_owner!.includes(`-${worker.process.pid}-`))!;
    const exit = await stopping.stop();
    expect(exit.code).toBe(0);
    expect(stopping.output()).toMatch(new RegExp(`analysis ${analysisId}: (given back to the queue|finished)`));
    await waitUntil("the analysis", async () => (await jobOf(analysisId)).state === "done");
    expect(await jobOf(analysisId)).toMatchObject({ state: "done", attempts: 1 });
    expect((await analysisRow(analysisId)).status).toBe("done");
    workers.splice(workers.indexOf(stopping), 1, await startWorker(workerEnv));
  });

  it("the sign-in limit reached through one web process holds in the other", async () => {
    const email = "viewer@quillon.test";
    for (let attempt = 0; attempt < 8; attempt++) {
      const result = await new Client(webs[0].url).signInAttempt(email, "not-the-password-1");
      expect(result.signedIn).toBe(false);
      expect(result.location).not.toContain("too_many_attempts");
    }
    const next = await new Client(webs[1].url).signInAttempt(email, DEMO_PASSWORD);
    expect(next.signedIn).toBe(false);
    expect(next.location).toContain("too_many_attempts");
  });

  it("a role change made through one web process applies on the other at the member's next request; a sign-out ends the session on both", async () => {
    const owner = await signedIn(webs[0], "owner@quillon.test");
    const reviewerOn1 = await signedIn(webs[0], "reviewer@quillon.test");
    const reviewerOn2 = reviewerOn1.sameBrowserOn(webs[1].url);
    expect((await reviewerOn2.request(`/api/faults/${faultId}`)).status).toBe(200); // remembered on web 2 now
    const { members } = (await (await owner.request(`/api/studies/${studyId}/members`)).json()) as { members: { userId: string; email: string }[] };
    const reviewer = members.find((member) => member.email === "reviewer@quillon.test")!;
    expect((await owner.request(`/api/studies/${studyId}/members/${reviewer.userId}`, { method: "DELETE" })).status).toBe(204);
    const roleDelayMs = await refusedWithin(() => reviewerOn2.request(`/api/faults/${faultId}`), 404);

    const interpreterOn1 = await signedIn(webs[0]);
    const interpreterOn2 = interpreterOn1.sameBrowserOn(webs[1].url);
    expect((await interpreterOn2.request("/api/studies")).status).toBe(200); // remembered on web 2 now
    await interpreterOn1.signOut();
    const sessionDelayMs = await refusedWithin(() => interpreterOn2.request("/api/studies"), 401);
    console.log(
      `scale-out: after the change answered on web 1, web 2 refused the removed member after ${roleDelayMs} ms and the signed-out session after ${sessionDelayMs} ms (PostgreSQL's notification on its way)`,
    );
    expect((await (await signedIn(webs[1])).request("/api/studies")).status).toBe(200); // a fresh sign-in still works
  });

  it("/api/health reports the database, the queue's depth and both workers' heartbeats", async () => {
    const health = (await (await fetch(`${webs[1].url}/api/health`)).json()) as {
      ok: boolean;
      database: string;
      queue: { analysis: { queued: number; running: number } };
      workers: { live: number; list: { role: string; secondsAgo: number }[] };
    };
    expect(health).toMatchObject({ ok: true, database: "postgres" });
    expect(health.queue.analysis).toMatchObject({ queued: 0, running: 0 });
    expect(health.workers.live).toBe(2);
    expect(health.workers.list.filter((worker) => worker.role === "worker" && worker.secondsAgo <= LEASE_SECONDS)).toHaveLength(2);
  });
});

/**
 * The other process learns of a change through a notification PostgreSQL delivers to each listening process on its
 * own: it may arrive a few milliseconds after the change answered. Tries every 10 ms, 100 times at most; returns how
 * long the old answer was still given.
 */
async function refusedWithin(send: () => Promise<Response>, status: number) {
  const started = Date.now();
  for (let attempt = 0; attempt < 100; attempt++) {
    const response = await send();
    await response.arrayBuffer();
    if (response.status === status) return Date.now() - started;
    expect(response.status).toBe(200);
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
  throw new Error(`still answered 200 after 100 tries (${Date.now() - started} ms)`);
}

async function pickSetOf(analysisId: string) {
  const { rows } = await db.query<{ pick_set_id: string }>("select pick_set_id from analyses where id = $1", [analysisId]);
  return rows[0].pick_set_id;
}
