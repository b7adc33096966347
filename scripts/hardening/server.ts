// Starts the real production server (next start) on a free loopback port with its own data folder, and talks to it
// over HTTP the way a browser does (sign-in through the auth routes, cookies, same-origin headers).
// Shared by `npm run loadtest` and the real-process tests in tests/hardening/.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync } from "node:fs";
import http from "node:http";
import { createServer } from "node:net";
import os from "node:os";
import { gunzipSync } from "node:zlib";
import path from "node:path";

export const ROOT = path.resolve(__dirname, "../..");
export const DEMO_PASSWORD = "quillon-demo-1";
export const DEMO_ACCOUNTS = ["owner", "interpreter", "reviewer", "viewer"].map((role) => `${role}@quillon.test`);

/** The build folder: .next, or SLIPFIELD_DIST_DIR (next.config.ts) to keep a private build on a shared checkout. */
export const DIST_DIR = process.env.SLIPFIELD_DIST_DIR || ".next";

export function hasBuild() {
  return (
    existsSync(path.join(ROOT, DIST_DIR, "BUILD_ID")) &&
    ["analysis-worker.mjs", "database-worker.mjs", "job-worker.mjs"].every((file) => existsSync(path.join(ROOT, "dist", file)))
  );
}

/** Builds the app (worker + next build) when no build exists, like scripts/start.mjs does on first start. */
export function ensureBuild(log: (line: string) => void = console.log) {
  if (hasBuild()) return;
  log("no production build found: building (scripts/build-worker.mjs + next build)…");
  for (const args of [["scripts/build-worker.mjs"], ["node_modules/next/dist/bin/next", "build"]]) {
    const result = spawnSync(process.execPath, args, { cwd: ROOT, stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } });
    if (result.status !== 0) throw new Error(`the build failed: node ${args.join(" ")}`);
  }
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolve(port));
    });
  });
}

export function tempDataDir(tag = "data") {
  return mkdtempSync(path.join(os.tmpdir(), `slipfield-${tag}-`));
}

export interface RunningServer {
  url: string;
  port: number;
  dataDir: string;
  process: ChildProcess;
  output: () => string;
  /** resolves with the exit code (or signal) once the process has ended */
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  stop: () => Promise<void>;
  kill9: () => Promise<void>;
}

/** `next start` exactly as scripts/start.mjs runs it (NODE_ENV=production, AUTH_SECRET, data folder). */
export function launchServer(options: { dataDir: string; port: number; env?: Record<string, string> }) {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    NEXT_TELEMETRY_DISABLED: "1",
    AUTH_SECRET: "hardening-tests-secret-0123456789abcdef",
    SLIPFIELD_DATA_DIR: options.dataDir,
    PORT: String(options.port),
    ...options.env,
  };
  delete env.SLIPFIELD_INLINE_ANALYSIS; // the server runs analyses in its worker thread, as in production
  delete env.VITEST;
  // as scripts/start.mjs runs it; SLIPFIELD_KEEPALIVE_MS sets next's --keepAliveTimeout to try other values
  // SLIPFIELD_SERVER_NODE_ARGS: extra node flags for the server process (e.g. "--cpu-prof --cpu-prof-dir=/tmp/p")
  const nodeArgs = (process.env.SLIPFIELD_SERVER_NODE_ARGS ?? "").split(" ").filter(Boolean);
  const args = [...nodeArgs, path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(options.port), "-H", "127.0.0.1"];
  if (process.env.SLIPFIELD_KEEPALIVE_MS) args.push("--keepAliveTimeout", process.env.SLIPFIELD_KEEPALIVE_MS);
  const child = spawn(process.execPath, args, {
    cwd: ROOT,
    env,
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout!.on("data", (chunk) => (output += chunk));
  child.stderr!.on("data", (chunk) => (output += chunk));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.on("exit", (code, signal) => resolve({ code, signal })),
  );
  return { child, exited, output: () => output };
}

export async function startServer(
  options: { dataDir?: string; port?: number; env?: Record<string, string>; readyTimeoutMs?: number } = {},
): Promise<RunningServer> {
  const dataDir = options.dataDir ?? tempDataDir();
  const port = options.port ?? (await freePort());
  const { child, exited, output } = launchServer({ dataDir, port, env: options.env });
  const url = `http://127.0.0.1:${port}`;
  let ended: { code: number | null; signal: NodeJS.Signals | null } | null = null;
  void exited.then((result) => (ended = result));
  const deadline = Date.now() + (options.readyTimeoutMs ?? 120_000);
  for (;;) {
    if (ended) throw new Error(`the server exited during start-up (${JSON.stringify(ended)}):\n${output()}`);
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill("SIGKILL");
      throw new Error(`the server did not become healthy in time:\n${output()}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return {
    url,
    port,
    dataDir,
    process: child,
    output,
    exited,
    stop: async () => {
      if (!ended) child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 10_000);
      await exited;
      clearTimeout(timer);
    },
    kill9: async () => {
      child.kill("SIGKILL");
      await exited;
    },
  };
}

// ---- job workers (npm run worker, bundled) ---------------------------------------------------------------------

export interface RunningWorker {
  process: ChildProcess;
  output: () => string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  stop: () => Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  kill9: () => Promise<void>;
}

/** `node dist/job-worker.mjs` (the bundled `npm run worker`) against `env.DATABASE_URL`; resolves once it works the queue. */
export async function startWorker(env: Record<string, string>): Promise<RunningWorker> {
  const child = spawn(process.execPath, [path.join(ROOT, "dist", "job-worker.mjs")], {
    cwd: ROOT,
    env: { ...process.env, NODE_ENV: "production", ...env, SLIPFIELD_INLINE_ANALYSIS: "0" },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout!.on("data", (chunk) => (output += chunk));
  child.stderr!.on("data", (chunk) => (output += chunk));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.on("exit", (code, signal) => resolve({ code, signal })),
  );
  let ended = false;
  void exited.then(() => (ended = true));
  const deadline = Date.now() + 60_000;
  while (!/running up to/.test(output)) {
    if (ended) throw new Error(`the worker exited during start-up:\n${output}`);
    if (Date.now() > deadline) {
      child.kill("SIGKILL");
      throw new Error(`the worker did not start in time:\n${output}`);
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  return {
    process: child,
    output: () => output,
    exited,
    stop: async () => {
      if (!ended) child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 30_000);
      const result = await exited;
      clearTimeout(timer);
      return result;
    },
    kill9: async () => {
      child.kill("SIGKILL");
      await exited;
    },
  };
}

// ---- a browser-like HTTP client ----------------------------------------------------------------------------------

function setCookies(response: Response): string[] {
  const headers = response.headers as Headers & { getSetCookie?: () => string[] };
  return headers.getSetCookie?.() ?? [];
}

/** What `Client.send` answers: the status, the body as it came over the wire (maybe gzip) and the headers. */
export interface LeanResponse {
  status: number;
  body: Buffer;
  headers: http.IncomingHttpHeaders;
}

/** The body of a `Client.send` answer as text, decompressed when the server gzipped it. */
export function leanText(response: LeanResponse) {
  return (response.headers["content-encoding"] === "gzip" ? gunzipSync(response.body) : response.body).toString("utf8");
}

/** One keep-alive pool for every `Client.send`: a connection per request in flight, reused afterwards. */
const leanAgent = new http.Agent({ keepAlive: true, maxSockets: Infinity });

export class Client {
  private cookies = new Map<string, string>();
  constructor(readonly base: string) {}

  get cookieHeader() {
    return [...this.cookies].map(([name, value]) => `${name}=${value}`).join("; ");
  }

  private remember(response: Response) {
    this.rememberLines(setCookies(response));
  }

  private rememberLines(lines: string[]) {
    for (const line of lines) {
      const [pair] = line.split(";");
      const index = pair.indexOf("=");
      const name = pair.slice(0, index).trim();
      const value = pair.slice(index + 1).trim();
      if (value === "" || /max-age=0|expires=thu, 01 jan 1970/i.test(line)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  async request(pathname: string, init: RequestInit = {}) {
    const headers = new Headers(init.headers);
    if (this.cookies.size) headers.set("cookie", this.cookieHeader);
    if (init.method && init.method !== "GET" && !headers.has("origin")) headers.set("origin", this.base);
    const response = await fetch(this.base + pathname, { ...init, headers, redirect: "manual" });
    this.remember(response);
    return response;
  }

  /**
   * The same request over Node's http module, for the load test's measured loop: a fraction of fetch's CPU per request,
   * which on a 2-core machine is CPU taken from the server under test. No redirects followed; the body is decoded only
   * when read (`leanText`).
   */
  send(method: "GET" | "POST", pathname: string, json?: unknown): Promise<LeanResponse> {
    const payload = json === undefined ? undefined : Buffer.from(JSON.stringify(json));
    const headers: http.OutgoingHttpHeaders = { "accept-encoding": "gzip" }; // as a browser asks, so the server compresses as it would for one
    if (this.cookies.size) headers.cookie = this.cookieHeader;
    if (payload) {
      headers["content-type"] = "application/json";
      headers["content-length"] = payload.byteLength;
    }
    if (method !== "GET") headers.origin = this.base;
    return new Promise((resolve, reject) => {
      const request = http.request(this.base + pathname, { method, headers, agent: leanAgent }, (response) => {
        const chunks: Buffer[] = [];
        response.on("data", (chunk: Buffer) => chunks.push(chunk));
        response.on("error", reject);
        response.on("end", () => {
          this.rememberLines(response.headers["set-cookie"] ?? []);
          resolve({ status: response.statusCode ?? 0, body: Buffer.concat(chunks), headers: response.headers });
        });
      });
      request.on("error", reject);
      request.end(payload);
    });
  }

  json(pathname: string, method: string, body: unknown) {
    return this.request(pathname, { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  }

  /**
   * One sign-in attempt through next-auth's credentials flow; answers where next-auth sent the browser: the page
   * asked for on success, or the sign-in page with `code=too_many_attempts` when the address is over its limit.
   */
  async signInAttempt(email: string, password: string): Promise<{ signedIn: boolean; location: string }> {
    const csrf = await this.request("/api/auth/csrf");
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const response = await this.request("/api/auth/callback/credentials", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ csrfToken, email, password, callbackUrl: this.base + "/studies" }).toString(),
    });
    await response.arrayBuffer();
    return { signedIn: [...this.cookies.keys()].some((name) => name.endsWith("authjs.session-token")), location: response.headers.get("location") ?? "" };
  }

  /** The session cookie(s) as sent, to replay them from another client (e.g. against another web process). */
  sessionCookies(): Map<string, string> {
    return new Map([...this.cookies].filter(([name]) => name.includes("authjs.session-token")));
  }

  /** A client that sends the same cookies to another address (the same browser, behind a proxy, on another process). */
  sameBrowserOn(base: string) {
    const other = new Client(base);
    for (const [name, value] of this.cookies) other.cookies.set(name, value);
    return other;
  }

  /** The header's "Sign out" form as a browser without JavaScript submits it (the server action's hidden fields from the page). */
  async signOut() {
    const page = await (await this.request("/studies")).text();
    const signOutForm = [...page.matchAll(/<form[^>]*>([\s\S]*?)<\/form>/g)].find((match) => match[1].includes("Sign out"));
    if (!signOutForm) throw new Error("no sign-out form on /studies (not signed in?)");
    const form = new FormData();
    for (const match of signOutForm[1].matchAll(/<input[^>]*type="hidden"[^>]*>/g)) {
      const fieldName = /name="([^"]*)"/.exec(match[0])?.[1];
      const value = /value="([^"]*)"/.exec(match[0])?.[1] ?? "";
      if (fieldName) form.set(fieldName.replace(/&amp;/g, "&"), value.replace(/&amp;/g, "&").replace(/&quot;/g, '"'));
    }
    const response = await this.request("/studies", { method: "POST", body: form });
    await response.arrayBuffer();
    if ([...this.cookies.keys()].some((name) => name.endsWith("authjs.session-token")))
      throw new Error(`sign-out did not clear the session (status ${response.status})`);
  }

  /** next-auth's credentials flow: CSRF token, then the callback; success sets the session cookie. */
  async signIn(email: string, password: string) {
    const { signedIn, location } = await this.signInAttempt(email, password);
    if (!signedIn) throw new Error(`sign-in as ${email} failed (location ${location})`);
  }

  /** The sign-up form as a browser without JavaScript submits it (the server action's hidden fields come from the page). */
  async signUp(name: string, email: string, password: string) {
    const page = await (await this.request("/sign-up")).text();
    const form = new FormData();
    for (const match of page.matchAll(/<input[^>]*type="hidden"[^>]*>/g)) {
      const fieldName = /name="([^"]*)"/.exec(match[0])?.[1];
      const value = /value="([^"]*)"/.exec(match[0])?.[1] ?? "";
      if (fieldName) form.set(fieldName.replace(/&amp;/g, "&"), value.replace(/&amp;/g, "&").replace(/&quot;/g, '"'));
    }
    form.set("name", name);
    form.set("email", email);
    form.set("password", password);
    const response = await this.request("/sign-up", { method: "POST", body: form });
    await response.arrayBuffer();
    if (![...this.cookies.keys()].some((cookie) => cookie.endsWith("authjs.session-token"))) {
      throw new Error(`sign-up as ${email} did not sign in (status ${response.status})`);
    }
  }

  async upload(faultId: string, fileName: string, csv: string, step: "preview" | "confirm" = "confirm") {
    const form = new FormData();
    form.set("file", new File([csv], fileName, { type: "text/csv" }));
    form.set("units", "m");
    return this.request(`/api/faults/${faultId}/pick-sets?step=${step}`, { method: "POST", body: form });
  }
}

/** Polls the analysis the fault page polls until it is no longer queued/running. */
export async function waitForAnalysis(client: Client, faultId: string, deadlineMs = 600_000) {
  const until = Date.now() + deadlineMs;
  for (;;) {
    const response = await client.request(`/api/faults/${faultId}/analysis`);
    const { analysis } = (await response.json()) as { analysis: { id: string; status: string; errorMessage: string | null } | null };
    if (analysis && analysis.status !== "queued" && analysis.status !== "running") return analysis;
    if (Date.now() > until) throw new Error(`analysis of fault ${faultId} did not finish in time (${analysis?.status})`);
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
}

// ---- workload pieces shared by the load test and the kill test ---------------------------------------------------

/** A pick file of about `count` synthetic picks (one segment, throw noise, no cut-off), as an interpreter would upload. */
export async function syntheticPickCsv(count: number, seed: number) {
  const { generateSyntheticPicks, toCsv } = await import("../../lib/engine/synthetic");
  const { picks } = generateSyntheticPicks({ seed, pickCount: count, throwCutoffM: 0, noiseM: 1, segment: "main" });
  return { csv: toCsv(picks), rows: picks.x.length };
}

export function pinBody(segmentId: string, index: number) {
  return {
    x: 1000 + index,
    y: 2000 + index,
    z: -1500,
    s: index % 500,
    t: 100 + (index % 300),
    segmentId,
    body: `Load check note ${index}: throw looks high here.`,
  };
}

export function viewpointBody(index: number) {
  return {
    title: `Check view ${index}`,
    note: "saved during the hardening run",
    camera: { position: [100 + index, 200, 300], target: [0, 0, 0], up: [0, 0, 1], fov: 45 },
    settings: { layers: { surface: true, contours: true, picks: false }, colourMode: "throw", exaggeration: 1 },
  };
}
