// npm run loadtest — the production build on loopback under a mixed load, with two 10⁵-pick analyses during the window.
//   LOADTEST_SECONDS (60)      length of the measured window
//   LOADTEST_WARMUP_SECONDS (10) the same load first, not measured: a server that has just started is still compiling
//                              its code and filling its memories (its read p95 there is printed apart)
//   LOADTEST_CONNECTIONS (50)  concurrent connections (each a loop: send, wait for the answer, send the next)
//   LOADTEST_SIGNUPS (8)       users created through the sign-up form, beside the four demo accounts
//   LOADTEST_BIG_UPLOADS (2)   10⁵-pick files uploaded and analysed during the window (0: the same load without analyses)
//   LOADTEST_RATE (0)          0: each connection sends its next request as soon as the answer is in (closed loop, the
//                              default); N > 0: the connections together offer N requests/s on a fixed schedule, and a
//                              latency counts from the scheduled send time (a late answer delays nothing unmeasured)
//   LOADTEST_SERVER_OUTPUT=1   print the server's whole output afterwards
// Targets (several web processes on one PostgreSQL server):
//   npm run loadtest -- URL [URL…]   (or LOADTEST_TARGETS=URL,URL) load web processes that already run, spreading the
//                              users (and so the connections) over them in turn; their CPU is not measured
//   LOADTEST_DATABASE_URL=postgres://…  start the web processes and job workers here on that PostgreSQL database
//                              (emptied first!) and load them: LOADTEST_WEB_PROCESSES (1) web processes that run no
//                              jobs, LOADTEST_WORKERS (1) job workers (the bundled `npm run worker`) for the analyses
//   LOADTEST_KEEP_DATA=1       keep the temporary data folder afterwards (removed by default)
//   SLIPFIELD_DIST_DIR         build folder (default .next; built first when missing, like `npm start`)
// Prints throughput, p50/p95/p99 for reads and writes, errors (must be 0) and the check that every acknowledged
// write is stored. Exits 1 when there were errors or a write is missing.
import { readdirSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import {
  Client,
  DEMO_ACCOUNTS,
  DEMO_PASSWORD,
  ensureBuild,
  type LeanResponse,
  leanText,
  pinBody,
  ROOT,
  startServer,
  startWorker,
  syntheticPickCsv,
  tempDataDir,
  type RunningServer,
  type RunningWorker,
  viewpointBody,
  waitForAnalysis,
} from "./hardening/server";

const SECONDS = Number(process.env.LOADTEST_SECONDS ?? 60);
const WARMUP_SECONDS = Number(process.env.LOADTEST_WARMUP_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.LOADTEST_CONNECTIONS ?? 50);
const SIGNUPS = Number(process.env.LOADTEST_SIGNUPS ?? 8);
const RATE = Number(process.env.LOADTEST_RATE ?? 0);
const BIG_UPLOADS = Number(process.env.LOADTEST_BIG_UPLOADS ?? 2);
const PIN_BUDGET = 38; // the product allows 40 pins + replies per person per 10 minutes (lib/pins/service.ts)

// Node's fetch keeps connections alive and opens one per request in flight: CONNECTIONS loops = CONNECTIONS connections.

type Kind = "read" | "write";
interface Sample {
  kind: Kind;
  name: string;
  ms: number;
  status: number;
  /** when the request was (scheduled to be) sent, ms after the window opened */
  sentAt: number;
}

interface Actor {
  client: Client;
  email: string;
  canComment: boolean;
  canShare: boolean;
  canEdit: boolean;
  studyId: string;
  faults: { id: string; analysisId: string; segmentId: string }[];
  pinBudget: number;
  ownPins: string[];
}

const log = (line: string) => console.log(`loadtest: ${line}`);

function percentile(sorted: number[], p: number) {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

/**
 * One /proc stat file (a process's or a thread's): its name, parent pid and CPU seconds used (user + system; Linux
 * counts them in clock ticks of 1/100 s). Null when the process or thread ended while we looked.
 */
function procStat(file: string) {
  try {
    const text = readFileSync(file, "utf8");
    const fields = text.slice(text.lastIndexOf(")") + 2).split(" "); // the fields after the name, from the state on
    return {
      name: text.slice(text.indexOf("(") + 1, text.lastIndexOf(")")),
      parent: Number(fields[1]),
      seconds: (Number(fields[11]) + Number(fields[12])) / 100,
    };
  } catch {
    return null;
  }
}

/** CPU seconds (all threads) of a process and its descendants. */
function cpuSecondsOfTree(rootPid: number) {
  const stats = new Map<number, { parent: number; seconds: number }>();
  for (const entry of readdirSync("/proc")) {
    const stat = /^\d+$/.test(entry) ? procStat(`/proc/${entry}/stat`) : null;
    if (stat) stats.set(Number(entry), stat);
  }
  let total = 0;
  const pending = [rootPid];
  while (pending.length) {
    const pid = pending.pop()!;
    total += stats.get(pid)?.seconds ?? 0;
    for (const [child, stat] of stats) if (stat.parent === pid) pending.push(child);
  }
  return total;
}

/** CPU seconds per thread of one process, keyed by "tid name". */
function cpuSecondsByThread(pid: number) {
  const threads = new Map<string, number>();
  for (const tid of readdirSync(`/proc/${pid}/task`)) {
    const stat = procStat(`/proc/${pid}/task/${tid}/stat`);
    if (stat) threads.set(`${tid} ${stat.name}`, stat.seconds);
  }
  return threads;
}

/** The machine's CPU time so far by kind (Linux /proc/stat, all cores, in clock ticks). */
function machineCpuTicks() {
  const [, ...values] = readFileSync("/proc/stat", "utf8").split("\n")[0].trim().split(/\s+/);
  const [user, nice, system, idle, iowait, irq, softirq, steal] = values.map(Number);
  return { busy: user + nice + system + irq + softirq, idle: idle + iowait, steal: steal ?? 0 };
}

async function jsonOf<T>(response: Response): Promise<T> {
  if (!response.ok) throw new Error(`${response.url} → ${response.status} ${await response.text()}`);
  return (await response.json()) as T;
}

async function faultsOf(client: Client, studyId: string) {
  const { faults } = await jsonOf<{ faults: { id: string; name: string }[] }>(await client.request(`/api/studies/${studyId}/faults`));
  const out: Actor["faults"] = [];
  for (const fault of faults) {
    const analysis = await waitForAnalysis(client, fault.id);
    if (analysis.status !== "done") continue;
    const full = await jsonOf<{ analysis: { id: string; result: { segments: { id: string }[] } } }>(await client.request(`/api/faults/${fault.id}/analysis`));
    out.push({ id: fault.id, analysisId: full.analysis.id, segmentId: full.analysis.result.segments[0].id });
  }
  return out;
}

/** What is loaded: web processes started here (embedded, or on a PostgreSQL database with job workers), or given URLs. */
async function startTargets(): Promise<{ targets: string[]; servers: RunningServer[]; workers: RunningWorker[]; description: string }> {
  const given = [...process.argv.slice(2), ...(process.env.LOADTEST_TARGETS ?? "").split(",")].map((url) => url.trim().replace(/\/$/, "")).filter(Boolean);
  if (given.length > 0)
    return { targets: given, servers: [], workers: [], description: `${given.length} web process(es) already running (${given.join(", ")})` };
  ensureBuild(log);
  const databaseUrl = process.env.LOADTEST_DATABASE_URL;
  if (!databaseUrl) {
    // analyses run as in production: one worker thread (SLIPFIELD_ANALYSIS_WORKERS, default 1), further ones queued
    const server = await startServer();
    return {
      targets: [server.url],
      servers: [server],
      workers: [],
      description: "one web process on the embedded database (PGlite), running the analyses itself",
    };
  }
  const webCount = Number(process.env.LOADTEST_WEB_PROCESSES ?? 1);
  const workerCount = Number(process.env.LOADTEST_WORKERS ?? 1);
  const { Client: PgClient } = await import("pg");
  const pg = new PgClient({ connectionString: databaseUrl });
  await pg.connect();
  await pg.query("drop schema if exists public cascade; drop schema if exists drizzle cascade; create schema public;");
  await pg.end();
  const env = { DATABASE_URL: databaseUrl, SLIPFIELD_ANALYSIS_WORKERS: "0" };
  // the first one migrates and seeds; the others start together
  const servers = [await startServer({ dataDir: tempDataDir("load-web1"), env })];
  servers.push(...(await Promise.all(Array.from({ length: webCount - 1 }, (_, index) => startServer({ dataDir: tempDataDir(`load-web${index + 2}`), env })))));
  const workers = await Promise.all(Array.from({ length: workerCount }, () => startWorker({ DATABASE_URL: databaseUrl, SLIPFIELD_ANALYSIS_WORKERS: "1" })));
  return {
    targets: servers.map((server) => server.url),
    servers,
    workers,
    description: `${webCount} web process(es) running no jobs and ${workerCount} job worker(s) on PostgreSQL (${new URL(databaseUrl).host})`,
  };
}

async function main() {
  const started = Date.now();
  const { targets, servers, workers, description } = await startTargets();
  log(`${description}: ${targets.join(", ")} ready in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  const serverPids = [...servers, ...workers].map((running) => running.process.pid!);
  const output = () => [...servers, ...workers].map((running) => running.output()).join("\n");
  const shutdown = async () => {
    await Promise.all([...servers.map((server) => server.stop()), ...workers.map((worker) => worker.stop())]);
    if (process.env.LOADTEST_KEEP_DATA !== "1") for (const server of servers) rmSync(server.dataDir, { recursive: true, force: true });
  };
  process.on("SIGINT", () => void shutdown().then(() => process.exit(130)));

  try {
    // ---- users -------------------------------------------------------------------------------------------------
    const actors: Actor[] = [];
    let demoStudyId = "";
    // each user talks to one target, in turn (behind a proxy a browser would also stay on one process or another)
    const targetFor = (index: number) => targets[index % targets.length];
    for (const [index, email] of DEMO_ACCOUNTS.entries()) {
      const client = new Client(targetFor(index));
      await client.signIn(email, DEMO_PASSWORD);
      const { studies } = await jsonOf<{ studies: { id: string }[] }>(await client.request("/api/studies"));
      demoStudyId = studies[0].id;
      const role = email.split("@")[0];
      actors.push({
        client,
        email,
        canComment: role !== "viewer",
        canShare: role !== "viewer",
        canEdit: role === "owner" || role === "interpreter",
        studyId: demoStudyId,
        faults: [],
        pinBudget: role === "viewer" ? 0 : PIN_BUDGET,
        ownPins: [],
      });
    }
    const demoFaults = await faultsOf(actors[0].client, demoStudyId);
    for (const actor of actors) actor.faults = demoFaults;
    const smallCsv = readFileSync(path.join(ROOT, "public/demo/qg-4-throw-picks.csv"), "utf8");
    const runId = Date.now().toString(36);
    for (let index = 0; index < SIGNUPS; index++) {
      const client = new Client(targetFor(DEMO_ACCOUNTS.length + index));
      const email = `load-${runId}-${index}@example.test`;
      await client.signUp(`Load user ${index}`, email, `load-test-pass-${index}A`);
      const { study } = await jsonOf<{ study: { id: string } }>(await client.json("/api/studies", "POST", { name: `Load study ${index}` }));
      const { fault } = await jsonOf<{ fault: { id: string } }>(await client.json(`/api/studies/${study.id}/faults`, "POST", { name: `LF-${index}` }));
      const upload = await client.upload(fault.id, "qg-4-throw-picks.csv", smallCsv);
      if (upload.status !== 201) throw new Error(`setup upload failed: ${upload.status} ${await upload.text()}`);
      actors.push({ client, email, canComment: true, canShare: true, canEdit: true, studyId: study.id, faults: [], pinBudget: PIN_BUDGET, ownPins: [] });
    }
    for (const actor of actors.slice(DEMO_ACCOUNTS.length)) actor.faults = await faultsOf(actor.client, actor.studyId);
    log(`${actors.length} users signed in (${DEMO_ACCOUNTS.length} demo accounts, ${SIGNUPS} created through the sign-up form)`);

    // two 10⁵-pick files, uploaded through the real upload API during the window
    const bigFiles = await Promise.all(Array.from({ length: BIG_UPLOADS }, (_, index) => syntheticPickCsv(100_000, 101 * (index + 1))));

    // ---- the measured window ----------------------------------------------------------------------------------
    const samples: Sample[] = [];
    const warmupSamples: Sample[] = [];
    const errors: string[] = [];
    const acknowledged = {
      pins: [] as { faultId: string; id: string; reader: Client }[],
      replies: [] as { faultId: string; pinId: string; id: string; reader: Client }[],
      viewpoints: [] as { faultId: string; id: string; reader: Client }[],
      faults: [] as { studyId: string; id: string; reader: Client }[],
    };
    let writeCounter = 0;
    const windowStart = Date.now() + WARMUP_SECONDS * 1000;
    const windowStartPerf = performance.now() + WARMUP_SECONDS * 1000;
    const windowEnd = windowStart + SECONDS * 1000;

    // scheduledAt (paced runs): the send time the request was scheduled for; the clock starts there, not when the loop got to it
    const timed = async (scheduledAt: number | null, kind: Kind, name: string, send: () => Promise<LeanResponse>) => {
      const t0 = Math.min(performance.now(), scheduledAt ?? Infinity);
      let response: LeanResponse;
      try {
        response = await send();
      } catch (error) {
        const { code } = error as { code?: string };
        errors.push(`${name} at ${((Date.now() - windowStart) / 1000).toFixed(1)} s: ${(error as Error).message}${code ? ` (${code})` : ""}`);
        await new Promise((resolve) => setTimeout(resolve, 200)); // a refused connection must not turn the loop into a spin
        return null;
      }
      const ms = performance.now() - t0;
      (t0 < windowStartPerf ? warmupSamples : samples).push({ kind, name, ms, status: response.status, sentAt: t0 - windowStartPerf });
      if (response.status >= 400) errors.push(`${name}: HTTP ${response.status} ${leanText(response).slice(0, 200)}`);
      return response;
    };
    const idOf = (response: LeanResponse, key: string) => (JSON.parse(leanText(response)) as Record<string, { id: string }>)[key].id;

    const oneRequest = async (actor: Actor, random: number, scheduledAt: number | null = null) => {
      const fault = actor.faults[Math.floor(Math.random() * actor.faults.length)];
      if (random < 0.8 || !actor.canComment) {
        const which = Math.floor(Math.random() * 4);
        if (which === 0) await timed(scheduledAt, "read", "GET fault", () => actor.client.send("GET", `/api/faults/${fault.id}`));
        else if (which === 1)
          await timed(scheduledAt, "read", "GET analysis", () => actor.client.send("GET", `/api/faults/${fault.id}/analysis?contours=0`)); // as the fault page asks
        else if (which === 2)
          await timed(scheduledAt, "read", "GET display grid", () =>
            actor.client.send("GET", `/api/faults/${fault.id}/analysis/display?analysis=${fault.analysisId}`),
          );
        else await timed(scheduledAt, "read", "GET pins", () => actor.client.send("GET", `/api/faults/${fault.id}/pins`));
        return;
      }
      const index = writeCounter++;
      const choice = Math.random();
      if (actor.pinBudget > 0 && (choice < 0.3 || (choice < 0.45 && actor.ownPins.length === 0))) {
        actor.pinBudget--;
        const result = await timed(scheduledAt, "write", "POST pin", () =>
          actor.client.send("POST", `/api/faults/${fault.id}/pins`, pinBody(fault.segmentId, index)),
        );
        if (result?.status === 201) {
          const id = idOf(result, "pin");
          actor.ownPins.push(id);
          acknowledged.pins.push({ faultId: fault.id, id, reader: actor.client });
        }
      } else if (actor.pinBudget > 0 && choice < 0.45) {
        actor.pinBudget--;
        const pinId = actor.ownPins[Math.floor(Math.random() * actor.ownPins.length)];
        const pinFault = acknowledged.pins.find((pin) => pin.id === pinId)!.faultId;
        const result = await timed(scheduledAt, "write", "POST reply", () =>
          actor.client.send("POST", `/api/pins/${pinId}/replies`, { body: `Reply ${index}: agreed, check the next line.` }),
        );
        if (result?.status === 201) acknowledged.replies.push({ faultId: pinFault, pinId, id: idOf(result, "reply"), reader: actor.client });
      } else if (actor.canShare && choice < 0.8) {
        const result = await timed(scheduledAt, "write", "POST viewpoint", () =>
          actor.client.send("POST", `/api/faults/${fault.id}/viewpoints`, viewpointBody(index)),
        );
        if (result?.status === 201) acknowledged.viewpoints.push({ faultId: fault.id, id: idOf(result, "viewpoint"), reader: actor.client });
      } else if (actor.canEdit) {
        const result = await timed(scheduledAt, "write", "POST fault", () =>
          actor.client.send("POST", `/api/studies/${actor.studyId}/faults`, { name: `Load ${runId} ${index}` }),
        );
        if (result?.status === 201) acknowledged.faults.push({ studyId: actor.studyId, id: idOf(result, "fault"), reader: actor.client });
      } else {
        await timed(scheduledAt, "read", "GET pins", () => actor.client.send("GET", `/api/faults/${fault.id}/pins`));
      }
    };

    const connection = async (slot: number) => {
      const actor = actors[slot % actors.length];
      if (RATE <= 0) {
        while (Date.now() < windowEnd) await oneRequest(actor, Math.random());
        return;
      }
      const intervalMs = (1000 * CONNECTIONS) / RATE;
      let next = performance.now() + Math.random() * intervalMs;
      while (Date.now() < windowEnd) {
        const wait = next - performance.now();
        if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
        await oneRequest(actor, Math.random(), next);
        next += intervalMs;
      }
    };

    // the analyses (two by default): uploaded by the interpreter to the two demo faults a few seconds into the window
    const interpreter = actors[1];
    const analysisRuns = (async () => {
      await new Promise((resolve) => setTimeout(resolve, WARMUP_SECONDS * 1000 + Math.min(5000, (SECONDS * 1000) / 10)));
      return Promise.all(
        bigFiles.map(async (file, index) => {
          // a fault of its own, so the pins written meanwhile on the demo faults keep their segments
          const { fault } = await jsonOf<{ fault: { id: string } }>(
            await interpreter.client.json(`/api/studies/${demoStudyId}/faults`, "POST", { name: `Big ${runId} ${index + 1}` }),
          );
          const faultId = fault.id;
          const t0 = performance.now();
          const response = await interpreter.client.upload(faultId, `load-${index + 1}.csv`, file.csv);
          const uploadMs = performance.now() - t0;
          if (response.status !== 201) throw new Error(`big upload failed: ${response.status} ${await response.text()}`);
          const { analysisId, pickSetId } = (await response.json()) as { analysisId: string; pickSetId: string };
          for (;;) {
            const { analysis } = await jsonOf<{ analysis: { id: string; status: string; finishedAt: string | null; errorMessage: string | null } }>(
              await interpreter.client.request(`/api/faults/${faultId}/analysis?pickSet=${pickSetId}`),
            );
            if (analysis.status === "done" || analysis.status === "failed") {
              return { rows: file.rows, uploadMs, analysisId, status: analysis.status, error: analysis.errorMessage, doneAt: Date.now() - windowStart };
            }
            await new Promise((resolve) => setTimeout(resolve, 500));
          }
        }),
      );
    })();

    const loadBefore = (await import("node:os")).loadavg()[0];
    log(
      `${WARMUP_SECONDS} s of warm-up, then measuring for ${SECONDS} s at ${CONNECTIONS} connections, ${RATE > 0 ? `offering ${RATE} requests/s` : "closed loop (next request as soon as the answer is in)"}…`,
    );
    const loops = Promise.all(Array.from({ length: CONNECTIONS }, (_, slot) => connection(slot)));
    await new Promise((resolve) => setTimeout(resolve, Math.max(0, windowStart - Date.now())));
    const clientCpuBefore = process.cpuUsage();
    const serverCpuBefore = serverPids.map(cpuSecondsOfTree);
    const threadCpuBefore = servers.length === 1 && workers.length === 0 ? cpuSecondsByThread(serverPids[0]) : new Map<string, number>();
    const machineBefore = machineCpuTicks();
    await loops;
    const windowMs = Date.now() - windowStart;
    const clientCpu = process.cpuUsage(clientCpuBefore);
    const clientCpuSeconds = (clientCpu.user + clientCpu.system) / 1e6;
    const serverCpuEach = serverPids.map((pid, index) => cpuSecondsOfTree(pid) - serverCpuBefore[index]);
    const serverCpuSeconds = serverCpuEach.reduce((sum, seconds) => sum + seconds, 0);
    const machineAfter = machineCpuTicks();
    const machineTotal = machineAfter.busy + machineAfter.idle + machineAfter.steal - (machineBefore.busy + machineBefore.idle + machineBefore.steal);
    const machineShare = (kind: "busy" | "idle" | "steal") => ((100 * (machineAfter[kind] - machineBefore[kind])) / machineTotal).toFixed(0);
    const threadCpu =
      threadCpuBefore.size > 0
        ? [...cpuSecondsByThread(serverPids[0])].map(([thread, seconds]) => [thread, seconds - (threadCpuBefore.get(thread) ?? 0)] as const)
        : [];
    const runs = await analysisRuns;

    // ---- every acknowledged write is stored ------------------------------------------------------------------
    const missing: string[] = [];
    const pinsByFault = new Map<string, { pins: { id: string; replies: { id: string }[] }[] }>();
    const viewpointsByFault = new Map<string, Set<string>>();
    const faultsByStudy = new Map<string, Set<string>>();
    for (const pin of acknowledged.pins) {
      if (!pinsByFault.has(pin.faultId)) pinsByFault.set(pin.faultId, await jsonOf(await pin.reader.request(`/api/faults/${pin.faultId}/pins`)));
      if (!pinsByFault.get(pin.faultId)!.pins.some((stored) => stored.id === pin.id)) missing.push(`pin ${pin.id}`);
    }
    for (const reply of acknowledged.replies) {
      if (!pinsByFault.has(reply.faultId)) pinsByFault.set(reply.faultId, await jsonOf(await reply.reader.request(`/api/faults/${reply.faultId}/pins`)));
      const pin = pinsByFault.get(reply.faultId)!.pins.find((stored) => stored.id === reply.pinId);
      if (!pin?.replies.some((stored) => stored.id === reply.id)) missing.push(`reply ${reply.id}`);
    }
    for (const viewpoint of acknowledged.viewpoints) {
      if (!viewpointsByFault.has(viewpoint.faultId)) {
        const { viewpoints } = await jsonOf<{ viewpoints: { id: string }[] }>(await viewpoint.reader.request(`/api/faults/${viewpoint.faultId}/viewpoints`));
        viewpointsByFault.set(viewpoint.faultId, new Set(viewpoints.map((stored) => stored.id)));
      }
      if (!viewpointsByFault.get(viewpoint.faultId)!.has(viewpoint.id)) missing.push(`viewpoint ${viewpoint.id}`);
    }
    for (const fault of acknowledged.faults) {
      if (!faultsByStudy.has(fault.studyId)) {
        const { faults } = await jsonOf<{ faults: { id: string }[] }>(await fault.reader.request(`/api/studies/${fault.studyId}/faults`));
        faultsByStudy.set(fault.studyId, new Set(faults.map((stored) => stored.id)));
      }
      if (!faultsByStudy.get(fault.studyId)!.has(fault.id)) missing.push(`fault ${fault.id}`);
    }

    // ---- report ------------------------------------------------------------------------------------------------
    const table: string[] = [];
    const row = (cells: (string | number)[]) => table.push(`| ${cells.join(" | ")} |`);
    row(["requests", "count", "per s", "p50 ms", "p95 ms", "p99 ms", "max ms", "errors"]);
    row(["---", "---:", "---:", "---:", "---:", "---:", "---:", "---:"]);
    const describe = (label: string, list: Sample[]) => {
      const sorted = list.map((sample) => sample.ms).sort((a, b) => a - b);
      const failed = list.filter((sample) => sample.status >= 400).length;
      row([
        label,
        list.length,
        (list.length / (windowMs / 1000)).toFixed(1),
        percentile(sorted, 50).toFixed(1),
        percentile(sorted, 95).toFixed(1),
        percentile(sorted, 99).toFixed(1),
        (sorted.at(-1) ?? NaN).toFixed(1),
        failed,
      ]);
    };
    describe("all", samples);
    describe(
      "reads",
      samples.filter((sample) => sample.kind === "read"),
    );
    describe(
      "writes",
      samples.filter((sample) => sample.kind === "write"),
    );
    for (const name of [...new Set(samples.map((sample) => sample.name))].sort())
      describe(
        `· ${name}`,
        samples.filter((sample) => sample.name === name),
      );

    console.log("");
    console.log(
      `Load test: ${(windowMs / 1000).toFixed(1)} s, ${CONNECTIONS} connections, ${RATE > 0 ? `paced at ${RATE} requests/s offered` : "closed loop"}, ${actors.length} users, ${BIG_UPLOADS} uploads of 10⁵ picks analysed during the window, Node ${process.version}, ${(await import("node:os")).cpus().length} cores`,
    );
    console.log(`target: ${description}`);
    const warmupReads = warmupSamples
      .filter((sample) => sample.kind === "read")
      .map((sample) => sample.ms)
      .sort((a, b) => a - b);
    if (WARMUP_SECONDS > 0)
      console.log(
        `warm-up: the same load for ${WARMUP_SECONDS} s after start-up before the window, not in the figures below (${warmupSamples.length} requests, reads p95 ${percentile(warmupReads, 95).toFixed(0)} ms)`,
      );
    console.log(
      `machine load average (1 min) before the ${WARMUP_SECONDS > 0 ? "warm-up" : "window"} ${loadBefore.toFixed(1)}, after the window ${(await import("node:os")).loadavg()[0].toFixed(1)} — other processes on these cores count too`,
    );
    const percentOfCore = (seconds: number) => `${((100 * seconds) / (windowMs / 1000)).toFixed(0)} %`;
    if (serverPids.length > 0) {
      const each = serverCpuEach
        .map((seconds, index) => `${index < servers.length ? `web ${index + 1}` : `worker ${index - servers.length + 1}`} ${percentOfCore(seconds)}`)
        .join(", ");
      console.log(
        `CPU during the window: servers ${serverCpuSeconds.toFixed(1)} s (${percentOfCore(serverCpuSeconds)} of one core, every thread: ${each}), load generator ${clientCpuSeconds.toFixed(1)} s (${percentOfCore(clientCpuSeconds)})`,
      );
    } else
      console.log(
        `CPU during the window: load generator ${clientCpuSeconds.toFixed(1)} s (${percentOfCore(clientCpuSeconds)}); the targets' CPU is not measured (they were not started here)`,
      );
    const busiest = threadCpu.filter(([, seconds]) => seconds >= 0.5).sort((a, b) => b[1] - a[1]);
    console.log(
      `machine CPU during the window (both cores): ${machineShare("busy")} % busy, ${machineShare("idle")} % idle, ${machineShare("steal")} % taken by the host (steal)`,
    );
    if (busiest.length > 0)
      console.log(
        `server threads: ${busiest.map(([thread, seconds]) => `${thread === `${serverPids[0]} ${thread.split(" ").slice(1).join(" ")}` ? "main" : thread} ${percentOfCore(seconds)}`).join(", ")}`,
      );
    console.log(table.join("\n"));
    console.log("");
    // where in the window the slow answers were: reads by the 5-second slice they were sent in
    const slices: string[] = [];
    for (let from = 0; from < windowMs; from += 5000) {
      const sorted = samples
        .filter((sample) => sample.kind === "read" && sample.sentAt >= from && sample.sentAt < from + 5000)
        .map((sample) => sample.ms)
        .sort((a, b) => a - b);
      if (sorted.length) slices.push(`${from / 1000}–${(from + 5000) / 1000} s: ${sorted.length} reads, p95 ${percentile(sorted, 95).toFixed(0)} ms`);
    }
    console.log(`reads by send time: ${slices.join("; ")}`);
    console.log("");
    for (const [index, run] of runs.entries()) {
      console.log(
        `analysis ${index + 1}: ${run.rows} picks, upload answered in ${(run.uploadMs / 1000).toFixed(1)} s, ${run.status}${run.error ? ` (${run.error})` : ""} at ${(run.doneAt / 1000).toFixed(1)} s into the window`,
      );
    }
    const writes = acknowledged.pins.length + acknowledged.replies.length + acknowledged.viewpoints.length + acknowledged.faults.length;
    console.log(
      `acknowledged writes (warm-up included): ${writes} (${acknowledged.pins.length} pins, ${acknowledged.replies.length} replies, ${acknowledged.viewpoints.length} viewpoints, ${acknowledged.faults.length} faults); missing afterwards: ${missing.length}`,
    );
    console.log(`errors: ${errors.length}`);
    for (const error of [...errors.slice(0, 10), ...(errors.length > 20 ? ["…"] : []), ...errors.slice(Math.max(10, errors.length - 10))])
      console.log(`  ${error}`);
    if (process.env.LOADTEST_SERVER_OUTPUT === "1") console.log(`server output:\n${output()}`);
    else if (errors.length > 0) console.log(`server output (last lines):\n${output().split("\n").slice(-40).join("\n")}`);
    const failedAnalyses = runs.filter((run) => run.status !== "done").length;
    await shutdown();
    process.exit(errors.length === 0 && missing.length === 0 && failedAnalyses === 0 ? 0 : 1);
  } catch (error) {
    console.error(`loadtest: ${(error as Error).message}`);
    console.error(output().slice(-3000));
    await shutdown();
    process.exit(1);
  }
}

void main();
