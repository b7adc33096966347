import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  Client,
  DEMO_PASSWORD,
  ensureBuild,
  pinBody,
  ROOT,
  startServer,
  tempDataDir,
  viewpointBody,
  waitForAnalysis,
  type RunningServer,
} from "../../scripts/hardening/server";
import { openStopped, tableFingerprints } from "./inspect-db";

/** `npm run backup` / `npm run restore` round trip of a populated database, compared table by table (row count + md5). */
const tsx = path.join(ROOT, "node_modules/.bin/tsx");
const runScript = (script: string, args: string[], dataDir: string) =>
  spawnSync(tsx, [path.join(ROOT, "scripts", script), ...args], { cwd: ROOT, encoding: "utf8", env: { ...process.env, SLIPFIELD_DATA_DIR: dataDir } });

let server: RunningServer | null = null;
const source = tempDataDir("backup-source");
const restored = tempDataDir("backup-restored");
const file = path.join(tempDataDir("backup-file"), "slipfield.tar.gz");
let pinId = "";

beforeAll(async () => {
  ensureBuild();
  server = await startServer({ dataDir: source });
  const client = new Client(server.url);
  await client.signIn("interpreter@quillon.test", DEMO_PASSWORD);
  const { studies } = (await (await client.request("/api/studies")).json()) as { studies: { id: string }[] };
  const { faults } = (await (await client.request(`/api/studies/${studies[0].id}/faults`)).json()) as { faults: { id: string }[] };
  type Analysis = { result: { segments: { id: string }[] } };
  await waitForAnalysis(client, faults[0].id);
  await waitForAnalysis(client, faults[1].id);
  const full = (await (await client.request(`/api/faults/${faults[0].id}/analysis`)).json()) as { analysis: Analysis };
  const pin = await client.json(`/api/faults/${faults[0].id}/pins`, "POST", pinBody(full.analysis.result.segments[0].id, 1));
  expect(pin.status).toBe(201);
  pinId = ((await pin.json()) as { pin: { id: string } }).pin.id;
  expect((await client.json(`/api/faults/${faults[0].id}/viewpoints`, "POST", viewpointBody(1))).status).toBe(201);
}, 300_000);

afterAll(async () => {
  await server?.stop();
  for (const folder of [source, restored, path.dirname(file)]) rmSync(folder, { recursive: true, force: true });
});

describe("backup and restore", () => {
  it("refuses to back up while the server is using the data folder", () => {
    const result = runScript("backup.ts", [file], source);
    expect(result.status).toBe(1);
    expect(result.stderr).toMatch(/is using .*stop it first/);
    expect(existsSync(file)).toBe(false);
  });

  it("round-trips users, study, faults, pick sets, analyses, pins and viewpoints exactly", async () => {
    await server!.stop();
    server = null;
    const backup = runScript("backup.ts", [file], source);
    expect(backup.status, backup.stderr).toBe(0);
    expect(statSync(file).size).toBeGreaterThan(1000);

    const restore = runScript("restore.ts", [file], restored);
    expect(restore.status, restore.stderr).toBe(0);

    const before = await openStopped(source);
    const beforePrints = await tableFingerprints(before);
    await before.close();
    const after = await openStopped(restored);
    const afterPrints = await tableFingerprints(after);
    await after.close();
    for (const table of ["users", "studies", "memberships", "faults", "pick_sets", "analyses", "pins", "viewpoints"]) {
      expect(beforePrints[table]?.rows, `${table} has rows`).toBeGreaterThan(0);
    }
    expect(afterPrints).toEqual(beforePrints);
    const total = Object.values(afterPrints).reduce((sum, table) => sum + table.rows, 0);
    console.log(
      `backup: ${(statSync(file).size / 1048576).toFixed(1)} MB file, ${Object.keys(afterPrints).length} tables, ${total} rows, every table's count and md5 equal after restore`,
    );

    // the restored folder serves: sign in and find the pin
    server = await startServer({ dataDir: restored });
    const client = new Client(server.url);
    await client.signIn("interpreter@quillon.test", DEMO_PASSWORD);
    const { studies } = (await (await client.request("/api/studies")).json()) as { studies: { id: string }[] };
    const { faults } = (await (await client.request(`/api/studies/${studies[0].id}/faults`)).json()) as { faults: { id: string }[] };
    const pins = (await (await client.request(`/api/faults/${faults[0].id}/pins`)).json()) as { pins: { id: string }[] };
    expect(pins.pins.map((pin) => pin.id)).toContain(pinId);
    await server.stop();
    server = null;
  });

  it("restore refuses a data folder that already holds a database unless --force, and then keeps the old one aside", () => {
    const refused = runScript("restore.ts", [file], restored);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/already holds a database.*--force/);
    const forced = runScript("restore.ts", [file, "--force"], restored);
    expect(forced.status, forced.stderr).toBe(0);
    expect(readdirSync(restored).some((name) => name.startsWith("pglite.before-restore-"))).toBe(true);
  });

  it("restore of a file that is not a backup fails with a message", () => {
    const result = runScript("restore.ts", [path.join(ROOT, "package.json")], tempDataDir("backup-bad"));
    expect(result.status).toBe(1);
    expect(result.stderr).toMatch(/restore: .*package\.json is not a readable backup/);
  });
});
