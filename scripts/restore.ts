// npm run restore FILE [--force] — loads a backup written by `npm run backup` into the data folder
// (SLIPFIELD_DATA_DIR, default ./data). Refuses to overwrite a database that is already there unless --force is given;
// with --force the existing database is kept beside it as pglite.before-restore-<UTC time>, never deleted.
import { existsSync, mkdirSync, readFileSync, readdirSync, renameSync, rmSync } from "node:fs";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { livingServerPid } from "./hardening/data-lock";
import { config } from "../lib/config";

function fail(message: string): never {
  console.error(`restore: ${message}`);
  process.exit(1);
}

async function main() {
  const args = process.argv.slice(2);
  const force = args.includes("--force");
  const file = args.find((arg) => !arg.startsWith("--"));
  if (!file) fail("name the backup file: npm run restore backups/slipfield-….tar.gz [--force]");
  if (!existsSync(file)) fail(`${file} does not exist.`);
  const dataDir = path.resolve(config().SLIPFIELD_DATA_DIR ?? "data");
  const folder = path.join(dataDir, "pglite");
  const pid = livingServerPid(dataDir);
  if (pid) fail(`the server (pid ${pid}) is using ${dataDir}; stop it first.`);
  if (existsSync(folder) && readdirSync(folder).length > 0) {
    if (!force) fail(`${folder} already holds a database. Restore into an empty data folder, or add --force (the current database is kept beside it).`);
    const aside = `${folder}.before-restore-${new Date().toISOString().replace(/[:.]/g, "-")}`;
    renameSync(folder, aside);
    console.log(`restore: moved the existing database to ${aside}`);
  }
  mkdirSync(dataDir, { recursive: true });
  const started = Date.now();
  const blob = new Blob([readFileSync(file)], { type: "application/x-gzip" });
  let client: PGlite;
  try {
    client = new PGlite(folder, { loadDataDir: blob });
    await client.waitReady;
  } catch (error) {
    rmSync(folder, { recursive: true, force: true }); // only what this run created: nothing half-restored stays behind
    fail(`${file} is not a readable backup (${error instanceof Error ? error.message : String(error)}).`);
  }
  const tables = await client.query<{ count: number }>(`select count(*)::int as count from pg_tables where schemaname = 'public'`);
  await client.close();
  console.log(`restore: restored ${file} into ${folder} (${tables.rows[0].count} tables) in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

main().catch((error) => fail(error instanceof Error ? error.message : String(error)));
