// Every environment variable Slipfield reads, in one place: what it means, its default, and its check (zod over
// process.env). The app reads its settings through `config()`; .env.example lists the same variables (a test keeps the
// two and the source tree in step). zod/mini: this module is also bundled into the command line and the worker threads,
// where loading zod's full API would cost every start about 50 ms.
import * as z from "zod/mini";

const onOff = (fallback: "on" | "off") => z._default(z.enum(["on", "off"], { error: "must be on or off" }), fallback);
const count = (min: number, max: number, fallback: number) => {
  const error = `must be a whole number from ${min} to ${max}`;
  return z._default(z.coerce.number({ error }).check(z.int({ error }), z.gte(min, { error }), z.lte(max, { error })), fallback);
};
const seconds = (min: number, max: number, fallback: number) => {
  const error = `must be a number of seconds from ${min} to ${max}`;
  return z._default(z.coerce.number({ error }).check(z.gte(min, { error }), z.lte(max, { error })), fallback);
};
const text = () => z.optional(z.string().check(z.minLength(1)));

/**
 * The app's variables (web server, job workers, command line). Each entry: the check and default, and the meaning in
 * a sentence (README "Configuration" and .env.example say the same).
 */
export const APP_VARIABLES = {
  PORT: { schema: count(1, 65_535, 3000), meaning: "HTTP port of the web server" },
  SLIPFIELD_URL: {
    schema: z.optional(z.url({ error: "must be an absolute http(s) address" })),
    meaning: "public address used in e-mail links (default http://localhost:$PORT)",
  },
  SLIPFIELD_DATA_DIR: { schema: text(), meaning: "PGlite data folder and the generated auth secret (default ./data)" },
  DATABASE_URL: { schema: text(), meaning: "use this PostgreSQL server instead of the embedded PGlite (same schema and migrations)" },
  SLIPFIELD_DB_POOL: { schema: count(1, 1000, 10), meaning: "PostgreSQL connections per process (plus one that listens for other processes' notifications)" },
  SLIPFIELD_DB_THREAD: { schema: onOff("on"), meaning: "PGlite runs on its own thread (dist/database-worker.mjs); off runs it in the server's thread" },
  AUTH_SECRET: { schema: text(), meaning: "session signing secret (default: generated on first run into <data>/auth-secret)" },
  SMTP_URL: { schema: text(), meaning: "send e-mail through this SMTP server; without it mail stays in the outbox table on this machine" },
  MAIL_FROM: { schema: z._default(z.string().check(z.minLength(3)), "Slipfield <no-reply@slipfield.local>"), meaning: "sender of Slipfield's e-mail" },
  SLIPFIELD_OUTBOX: {
    schema: z.optional(z.enum(["on", "off"], { error: "must be on or off" })),
    meaning: "the outbox page: shown without SMTP_URL and in development; on keeps it with SMTP_URL in production, off hides it",
  },
  SLIPFIELD_DIGEST_SECRET: { schema: text(), meaning: "lets a scheduler call POST /api/digest with the header x-slipfield-digest-secret" },
  SLIPFIELD_SEED: { schema: onOff("on"), meaning: "off skips the demo seed on an empty database" },
  SLIPFIELD_ANALYSIS_WORKERS: {
    schema: count(0, 64, 1),
    meaning: "analyses this process runs at once, each in a warm worker thread; 0 leaves them to job workers (npm run worker)",
  },
  SLIPFIELD_ANALYSIS_TIMEOUT_MS: { schema: count(1, 24 * 3600_000, 600_000), meaning: "an analysis running longer is stopped and marked failed" },
  SLIPFIELD_INLINE_ANALYSIS: {
    schema: z._default(z.enum(["0", "1"], { error: "must be 0 or 1" }), "0"),
    meaning: "1 runs analyses and upload parsing in this thread instead of a worker thread (the unit tests)",
  },
  SLIPFIELD_JOB_LEASE_SECONDS: {
    schema: seconds(2, 3600, 30),
    meaning: "a worker holds a job by a lease it renews every third of this; a silent worker's job is taken back after it",
  },
  SLIPFIELD_JOB_RETRY_SECONDS: {
    schema: seconds(0, 3600, 5),
    meaning: "back-off before an interrupted job is tried again, doubled at each attempt (at most 5 minutes)",
  },
  SLIPFIELD_JOB_ATTEMPTS: { schema: count(1, 100, 3), meaning: "claims of a job before it is given up" },
  SLIPFIELD_DRAIN_SECONDS: {
    schema: seconds(0, 3600, 8),
    meaning: "on SIGTERM or SIGINT, how long running jobs get to finish before they go back to the queue",
  },
  SLIPFIELD_TIPLINE_THREAD: { schema: onOff("off"), meaning: "command line: fit the tip lines on a helper thread while the main thread grids and contours" },
  SLIPFIELD_DIST_DIR: { schema: text(), meaning: "Next's build folder instead of .next (the real-process tests build apart)" },
  NODE_ENV: {
    schema: z._default(z.enum(["development", "production", "test"], { error: "must be development, production or test" }), "development"),
    meaning: "set by Next.js and the test runner: production turns on the production headers and hides development pages",
  },
} as const;

/**
 * Variables read only by scripts, tests and benchmarks (not by the app). Listed so that every variable in the source tree
 * is documented in one place; the scripts read them directly.
 */
export const TOOLING_VARIABLES: Record<string, string> = {
  SLIPFIELD_SKIP_BUILD: "scripts/start.mjs: 1 starts the server without checking whether the build is current",
  SLIPFIELD_PYTHON: "the Python (with numpy and scipy) that the test oracles and the benchmark run (scripts/python.ts)",
  SLIPFIELD_KEEPALIVE_MS: "scripts/hardening/server.ts: HTTP keep-alive of the real-process tests' server",
  SLIPFIELD_SERVER_NODE_ARGS: "scripts/hardening/server.ts: extra Node options for the real-process tests' server",
  SLIPFIELD_FUZZ_RUNS: "tests/hardening/fuzz.test.ts: cases per fuzzing property",
  TEST_DATABASE_URL: "scripts/test.sh and the tests: also run the database suite against this PostgreSQL server",
  E2E_PORT: "playwright.config.ts: the port of the browser tests' server",
  E2E_DATA_DIR: "playwright.config.ts: the browser tests' data folder (a fresh temporary one by default)",
  BENCH_URL: "bench/scene-frames.ts: the running server whose 3D view is measured",
  LOADTEST_SECONDS: "scripts/loadtest.ts: length of the measured window",
  LOADTEST_WARMUP_SECONDS: "scripts/loadtest.ts: unmeasured load before the window",
  LOADTEST_CONNECTIONS: "scripts/loadtest.ts: concurrent connections",
  LOADTEST_SIGNUPS: "scripts/loadtest.ts: users created through the sign-up form",
  LOADTEST_RATE: "scripts/loadtest.ts: offered requests per second (paced) instead of a closed loop",
  LOADTEST_BIG_UPLOADS: "scripts/loadtest.ts: 10^5-pick uploads during the window",
  LOADTEST_SERVER_OUTPUT: "scripts/loadtest.ts: show the server's output",
  LOADTEST_DATABASE_URL: "scripts/loadtest.ts: run the server on this PostgreSQL server",
  LOADTEST_KEEP_DATA: "scripts/loadtest.ts: keep the data folder afterwards",
  LOADTEST_TARGETS: "scripts/loadtest.ts: several running servers to load instead of starting one",
  LOADTEST_WEB_PROCESSES: "scripts/loadtest.ts: web processes to start (PostgreSQL)",
  LOADTEST_WORKERS: "scripts/loadtest.ts: job workers to start (PostgreSQL)",
  NEXT_RUNTIME: "set by Next.js: nodejs or edge (instrumentation.ts starts the database only on nodejs)",
  NEXT_MANUAL_SIG_HANDLE: "set by scripts/start.mjs for Next.js: the app handles SIGTERM itself (lib/shutdown.ts)",
  __NEXT_PRIVATE_ORIGIN: "set by Next.js: the server's own origin (proxy.ts)",
};

const appSchema = z.object(
  Object.fromEntries(Object.entries(APP_VARIABLES).map(([name, { schema }]) => [name, schema])) as {
    [K in keyof typeof APP_VARIABLES]: (typeof APP_VARIABLES)[K]["schema"];
  },
);

export type Config = z.infer<typeof appSchema>;

/** A variable that is set to something unusable: named, with what it must be. */
export class ConfigError extends Error {
  name = "ConfigError";
}

/** The app's settings from `env`; an unusable value throws a ConfigError naming the variable. Empty values count as unset. */
export function readConfig(env: Record<string, string | undefined> = process.env): Config {
  const values: Record<string, string | undefined> = {};
  for (const name of Object.keys(APP_VARIABLES)) values[name] = env[name] === "" ? undefined : env[name];
  const parsed = z.safeParse(appSchema, values);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${String(issue.path[0])}=${JSON.stringify(values[String(issue.path[0])])}: ${issue.message}`);
    throw new ConfigError(`Environment variable${problems.length > 1 ? "s" : ""} not usable: ${problems.join("; ")}. See .env.example.`);
  }
  return parsed.data;
}

let cached: { key: string; config: Config } | null = null;

/**
 * The current settings. Read again whenever a variable changed (tests set them while running), otherwise parsed once:
 * the key is the variables' values joined, cheaper than the parse.
 */
export function config(): Config {
  let key = "";
  for (const name in APP_VARIABLES) key += `${process.env[name] ?? ""}\u0000`;
  if (cached?.key !== key) cached = { key, config: readConfig() };
  return cached.config;
}
