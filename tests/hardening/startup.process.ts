import { spawn, spawnSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { ensureBuild, freePort, ROOT, startServer, tempDataDir } from "../../scripts/hardening/server";

/**
 * Start-up on a data folder that cannot be written: a clear message naming the folder, and a non-zero exit — through
 * `npm start` (scripts/start.mjs) and through `next start` directly (lib/startup.ts via instrumentation.ts).
 * Root ignores file modes, so read-only and full disks are real mounts in a private mount namespace (`unshare -m`):
 * a read-only tmpfs, and a 256 KB tmpfs that fills up while the database is created.
 */
const isRoot = process.getuid?.() === 0;

function run(command: string[], env: Record<string, string>, timeoutMs = 180_000): Promise<{ code: number | null; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(command[0], command.slice(1), {
      cwd: ROOT,
      env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", SLIPFIELD_SKIP_BUILD: "1", ...env },
    });
    let output = "";
    child.stdout.on("data", (chunk) => (output += chunk));
    child.stderr.on("data", (chunk) => (output += chunk));
    const timer = setTimeout(() => child.kill("SIGKILL"), timeoutMs);
    child.on("exit", (code) => {
      clearTimeout(timer);
      resolve({ code, output });
    });
  });
}

/** Runs `inner` (argv) with a tmpfs mounted over `folder` with the given mount options, in a private mount namespace. */
function withMount(folder: string, options: string, inner: string[]) {
  const quoted = inner.map((arg) => `'${arg.replace(/'/g, "'\\''")}'`).join(" ");
  return ["unshare", "-m", "sh", "-c", `mount -t tmpfs -o ${options} tmpfs '${folder}' && exec ${quoted}`];
}

const nextStart = (port: number) => [process.execPath, path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"];
const npmStart = [process.execPath, path.join(ROOT, "scripts/start.mjs")];

describe("start-up on a data folder that cannot be written", () => {
  let canMount = false;
  beforeAll(() => {
    ensureBuild();
    if (isRoot) {
      const probe = tempDataDir("probe");
      canMount = spawnSync("unshare", ["-m", "sh", "-c", `mount -t tmpfs -o ro tmpfs '${probe}'`]).status === 0;
    } else canMount = false;
  });

  it("the data folder path runs through a file (ENOTDIR): both start paths stop with a message and exit 1", async () => {
    const parent = tempDataDir("notdir");
    const file = path.join(parent, "a-file");
    writeFileSync(file, "not a folder");
    const dataDir = path.join(file, "data");

    const viaNpm = await run(npmStart, { SLIPFIELD_DATA_DIR: dataDir, PORT: String(await freePort()) });
    expect(viaNpm.code).toBe(1);
    expect(viaNpm.output).toContain(dataDir);
    expect(viaNpm.output).toMatch(/cannot create the data folder .*ENOTDIR.*writable folder/);

    const viaNext = await run(nextStart(await freePort()), { SLIPFIELD_DATA_DIR: dataDir, AUTH_SECRET: "hardening-startup-secret-000000000000" });
    expect(viaNext.code).toBe(1);
    expect(viaNext.output).toMatch(/cannot open the database in .*a-file\/data.*ENOTDIR/);
    expect(viaNext.output).toMatch(/Check that the folder exists, is writable and the disk is not full/);
    expect(viaNext.output).not.toMatch(/\n\s+at .*\(.*:\d+:\d+\)/); // no stack trace
  });

  it("a read-only data folder (read-only mount, or mode 555 when not root): message and exit 1", async () => {
    const dataDir = tempDataDir("readonly");
    const env = { SLIPFIELD_DATA_DIR: dataDir, PORT: String(await freePort()) };
    const secretEnv = { ...env, AUTH_SECRET: "hardening-startup-secret-000000000000" };
    let viaNpm, viaNext;
    if (isRoot) {
      expect(canMount, "root without permission to mount a tmpfs in a private namespace cannot simulate a read-only disk").toBe(true);
      viaNpm = await run(withMount(dataDir, "ro", npmStart), env);
      viaNext = await run(withMount(dataDir, "ro", nextStart(await freePort())), secretEnv);
    } else {
      spawnSync("chmod", ["555", dataDir]);
      viaNpm = await run(npmStart, env);
      viaNext = await run(nextStart(await freePort()), secretEnv);
    }
    expect(viaNpm.code).toBe(1);
    expect(viaNpm.output).toMatch(/cannot write .*auth-secret \((EROFS|EACCES)\): the data folder must be writable/);
    expect(viaNext.code).toBe(1);
    expect(viaNext.output).toContain(`cannot open the database in ${dataDir}`);
    expect(viaNext.output).toMatch(/EROFS|EACCES|read-only/i);
    expect(viaNext.output).toMatch(/is writable and the disk is not full/);
  });

  it("a full disk while the database is first created: message and exit 1", async () => {
    // Only root can mount the small file system that fills up; every developer machine and CI here run as root.
    expect(isRoot && canMount, "this check needs root and `unshare -m` (as on the project's machines and CI)").toBe(true);
    const dataDir = tempDataDir("full");
    mkdirSync(dataDir, { recursive: true });
    const result = await run(withMount(dataDir, "size=256k", nextStart(await freePort())), {
      SLIPFIELD_DATA_DIR: dataDir,
      AUTH_SECRET: "hardening-startup-secret-000000000000",
    });
    expect(result.code).toBe(1);
    expect(result.output).toContain(`cannot open the database in ${dataDir}`);
    expect(result.output).toMatch(/is writable and the disk is not full/);
  });

  it("a second server on a data folder that a running server holds stops with a message (PGlite allows one process)", async () => {
    const dataDir = tempDataDir("twice");
    const first = await startServer({ dataDir });
    try {
      const second = await run(nextStart(await freePort()), { SLIPFIELD_DATA_DIR: dataDir, AUTH_SECRET: "hardening-startup-secret-000000000000" });
      expect(second.code).toBe(1);
      expect(second.output).toMatch(/another server \(pid \d+\) is already using this data folder/);
      expect((await fetch(`${first.url}/api/health`)).status).toBe(200);
    } finally {
      await first.stop();
    }
  });
});
