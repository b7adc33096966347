// npm run backup [FILE] — writes the PGlite data folder (SLIPFIELD_DATA_DIR, default ./data) as a gzipped tarball
// (PGlite's dumpDataDir) to FILE, or to ./backups/slipfield-<UTC time>.tar.gz. Stop the server first: the folder can be
// open in one process only, so the script refuses while the server that owns it is running (its pid is in server.pid).
import { existsSync, mkdirSync, readdirSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { livingServerPid } from "./hardening/data-lock";
import { config } from "../lib/config";

function fail(message: string): never {
  console.error(`backup: ${message}`);
  process.exit(1);
}

async function main() {
  const dataDir = path.resolve(config().SLIPFIELD_DATA_DIR ?? "data");
  const folder = path.join(dataDir, "pglite");
  if (!existsSync(folder) || readdirSync(folder).length === 0) fail(`no database in ${folder} (set SLIPFIELD_DATA_DIR to the data folder).`);
  const pid = livingServerPid(dataDir);
  if (pid) fail(`the server (pid ${pid}) is using ${dataDir}; stop it first, then run the backup again.`);
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const target = path.resolve(process.argv[2] ?? path.join("backups", `slipfield-${stamp}.tar.gz`));
  if (existsSync(target) && statSync(target).isDirectory()) fail(`${target} is a folder; give a file name.`);
  mkdirSync(path.dirname(target), { recursive: true });

  const started = Date.now();
  const client = new PGlite(folder);
  await client.waitReady;
  // a checkpoint first, so every committed row is in the data files that the dump copies
  await client.exec("checkpoint");
  const counts = await client.query<{ table: string; rows: number }>(
    `select relname as table, n_live_tup::int as rows from pg_stat_user_tables order by relname`,
  );
  const dump = await client.dumpDataDir("gzip");
  await client.close();
  const bytes = new Uint8Array(await (dump as Blob).arrayBuffer());
  writeFileSync(target, bytes);
  console.log(
    `backup: wrote ${target} (${(bytes.byteLength / 1048576).toFixed(1)} MB, ${counts.rows.length} tables) in ${((Date.now() - started) / 1000).toFixed(1)} s`,
  );
  console.log(`backup: restore with  npm run restore ${path.relative(process.cwd(), target)}`);
}

main().catch((error) => fail(error instanceof Error ? error.message : String(error)));
