import { spawn, type ChildProcess } from "node:child_process";
import { connect } from "node:net";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { ensureBuild, freePort, ROOT, tempDataDir } from "../../scripts/hardening/server";

/**
 * Stopping the server the ways people do: `npm start` stopped through npm (npm ends the shell it ran the launcher in,
 * so the launcher must notice on its own), and the launcher stopped with Ctrl-C (SIGINT). Afterwards nothing may still
 * serve the port and no process of the run may be left.
 */
const env = (dataDir: string, port: number): NodeJS.ProcessEnv => ({
  ...process.env,
  NODE_ENV: "production",
  NEXT_TELEMETRY_DISABLED: "1",
  SLIPFIELD_SKIP_BUILD: "1",
  SLIPFIELD_DATA_DIR: dataDir,
  PORT: String(port),
});

function exited(child: ChildProcess): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  return new Promise((resolve) => child.once("exit", (code, signal) => resolve({ code, signal })));
}

function portAnswers(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = connect(port, "127.0.0.1");
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("error", () => resolve(false));
  });
}

async function until(what: string, check: () => Promise<boolean> | boolean, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await check()) return;
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`timed out waiting until ${what}`);
}

async function healthy(port: number) {
  try {
    return (await fetch(`http://127.0.0.1:${port}/api/health`)).ok;
  } catch {
    return false;
  }
}

/** True while any process of the group is alive. */
function groupAlive(pgid: number) {
  try {
    process.kill(-pgid, 0);
    return true;
  } catch {
    return false;
  }
}

describe("stopping the server", () => {
  let dataDir = "";
  beforeAll(() => {
    ensureBuild();
    dataDir = tempDataDir("stop");
  });

  it("stopping `npm start` (SIGTERM to npm) stops the launcher and the server, and frees the port", async () => {
    const port = await freePort();
    // its own process group, so the test can see whether any process of the run is left
    const npm = spawn("npm", ["start"], { cwd: ROOT, env: env(dataDir, port), detached: true, stdio: "ignore" });
    const pgid = npm.pid!;
    try {
      await until("the server answers /api/health", () => healthy(port), 180_000);
      const npmGone = exited(npm);
      process.kill(npm.pid!, "SIGTERM");
      await npmGone;
      await until("the port is free", async () => !(await portAnswers(port)), 25_000);
      await until("no process of the run is left", () => !groupAlive(pgid), 25_000);
    } finally {
      if (groupAlive(pgid)) process.kill(-pgid, "SIGKILL");
    }
  });

  it("Ctrl-C (SIGINT) to the launcher ends the server and then the launcher, with the server's way of ending", async () => {
    const port = await freePort();
    const launcher = spawn(process.execPath, [path.join(ROOT, "scripts/start.mjs")], { cwd: ROOT, env: env(dataDir, port), detached: true, stdio: "ignore" });
    const pgid = launcher.pid!;
    try {
      await until("the server answers /api/health", () => healthy(port), 180_000);
      const ended = exited(launcher);
      process.kill(launcher.pid!, "SIGINT");
      const { code, signal } = await ended;
      // next start ends on SIGINT with 130 (128 + SIGINT, the shell's convention); the launcher passes that on
      expect(code === 130 || signal === "SIGINT", `code ${code}, signal ${signal}`).toBe(true);
      expect(await portAnswers(port)).toBe(false);
      await until("no process of the run is left", () => !groupAlive(pgid), 10_000);
    } finally {
      if (groupAlive(pgid)) process.kill(-pgid, "SIGKILL");
    }
  });
});
