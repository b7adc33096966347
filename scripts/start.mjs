// One command from a fresh clone: build if the sources changed, then serve. The database is opened,
// migrated and seeded by instrumentation.ts when the server starts.
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const dataDir = path.resolve(process.env.SLIPFIELD_DATA_DIR ?? path.join(root, "data"));
const port = process.env.PORT ?? "3000";

function fail(message) {
  console.error(`slipfield: ${message}`);
  process.exit(1);
}

try {
  mkdirSync(dataDir, { recursive: true });
} catch (error) {
  fail(`cannot create the data folder ${dataDir} (${error.code ?? error.message}). Set SLIPFIELD_DATA_DIR to a writable folder.`);
}

function authSecret() {
  if (process.env.AUTH_SECRET) return process.env.AUTH_SECRET;
  if (process.env.DATABASE_URL) {
    console.warn(
      "slipfield: AUTH_SECRET is not set: this process signs sessions with a secret of its own data folder, so a session made here is refused by every other web process on the same database. Give all of them the same AUTH_SECRET.",
    );
  }
  const file = path.join(dataDir, "auth-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  const secret = randomBytes(32).toString("base64url");
  try {
    writeFileSync(file, secret, { mode: 0o600 });
  } catch (error) {
    fail(`cannot write ${file} (${error.code ?? error.message}): the data folder must be writable.`);
  }
  console.log(`slipfield: generated a new auth secret in ${file}`);
  return secret;
}

function newestSourceTime() {
  let newest = 0;
  const visit = (entry) => {
    const stats = statSync(entry);
    if (stats.isDirectory()) {
      for (const child of readdirSync(entry)) visit(path.join(entry, child));
    } else newest = Math.max(newest, stats.mtimeMs);
  };
  for (const entry of [
    "app",
    "components",
    "scene",
    "lib",
    "db",
    "public",
    "package-lock.json",
    "next.config.ts",
    "tailwind.config.ts",
    "instrumentation.ts",
  ]) {
    const full = path.join(root, entry);
    if (existsSync(full)) visit(full);
  }
  return newest;
}

const buildId = path.join(root, ".next", "BUILD_ID");
const workerFiles = ["analysis-worker.mjs", "database-worker.mjs", "job-worker.mjs"].map((file) => path.join(root, "dist", file));
const needsBuild =
  process.env.SLIPFIELD_SKIP_BUILD !== "1" && (!existsSync(buildId) || !workerFiles.every(existsSync) || statSync(buildId).mtimeMs < newestSourceTime());
if (needsBuild) {
  console.log("slipfield: building the app (first start or sources changed; about a minute on two cores)…");
  const worker = spawnSync(process.execPath, [path.join(root, "scripts/build-worker.mjs")], { cwd: root, stdio: "inherit" });
  if (worker.status !== 0) fail("building the analysis worker failed (see above).");
  const cli = spawnSync(process.execPath, [path.join(root, "scripts/build-cli.mjs")], { cwd: root, stdio: "inherit" });
  if (cli.status !== 0) fail("building the command line failed (see above).");
  const build = spawnSync(process.execPath, [path.join(root, "node_modules/next/dist/bin/next"), "build"], {
    cwd: root,
    stdio: "inherit",
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  if (build.status !== 0) fail("the build failed (see above).");
}

const env = { ...process.env, AUTH_SECRET: authSecret(), SLIPFIELD_DATA_DIR: dataDir, PORT: port, NEXT_TELEMETRY_DISABLED: "1", NODE_ENV: "production" };
console.log(`slipfield: serving on http://localhost:${port} (data in ${dataDir}); Ctrl-C stops it`);
const server = spawn(process.execPath, [path.join(root, "node_modules/next/dist/bin/next"), "start", "-p", port], { cwd: root, stdio: "inherit", env });

// Stopping: a signal to this launcher goes on to the server, and the launcher exits when the server has (with its exit
// code). The server gets 15 s to close the database cleanly before it is killed.
let stopping = false;
function stop(signal) {
  if (stopping) return;
  stopping = true;
  server.kill(signal);
  setTimeout(() => server.kill("SIGKILL"), 15_000).unref();
}
for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"]) process.on(signal, () => stop(signal));
// `npm start` runs this launcher through a shell; stopping npm ends the shell but does not signal this process. When the
// process that started the launcher is gone, the launcher is an orphan: stop the server rather than keep serving.
const parentAtStart = process.ppid;
setInterval(() => {
  if (process.ppid !== parentAtStart) stop("SIGTERM");
}, 500).unref();
server.on("exit", (code, signal) => {
  if (signal) {
    // end the way the server ended, so whoever started the launcher sees the same
    for (const name of ["SIGINT", "SIGTERM", "SIGHUP"]) process.removeAllListeners(name);
    process.kill(process.pid, signal);
  } else process.exit(code ?? 0);
});
