import "server-only";
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { PgDatabase, PgQueryResultHKT } from "drizzle-orm/pg-core";
import * as schema from "./schema";

export type Database = PgDatabase<PgQueryResultHKT, typeof schema>;

export interface DatabaseHandle {
  db: Database;
  kind: "pglite" | "postgres";
  close: () => Promise<void>;
  /** PGlite only: dump the data folder as a tarball */
  dump?: () => Promise<Blob>;
}

const migrationsFolder = path.join(process.cwd(), "drizzle");

export function dataDirectory(): string {
  return path.resolve(/*turbopackIgnore: true*/ process.env.SLIPFIELD_DATA_DIR ?? path.join(process.cwd(), "data"));
}

/** Opens and migrates a database: PostgreSQL when `url` is given, else PGlite (on disk, or in memory for `memory`). */
export async function openDatabase(options: { url?: string; memory?: boolean; dataDir?: string; loadDataDir?: Blob } = {}): Promise<DatabaseHandle> {
  if (options.url) {
    const { Pool } = await import("pg");
    const { drizzle } = await import("drizzle-orm/node-postgres");
    const { migrate } = await import("drizzle-orm/node-postgres/migrator");
    const pool = new Pool({ connectionString: options.url, max: 10 });
    const db = drizzle(pool, { schema });
    await migrate(db, { migrationsFolder });
    return { db: db as unknown as Database, kind: "postgres", close: () => pool.end() };
  }
  const { PGlite } = await import("@electric-sql/pglite");
  const { drizzle } = await import("drizzle-orm/pglite");
  const { migrate } = await import("drizzle-orm/pglite/migrator");
  let client;
  if (options.memory) {
    client = new PGlite({ loadDataDir: options.loadDataDir });
  } else {
    const folder = options.dataDir ?? path.join(dataDirectory(), "pglite");
    mkdirSync(path.dirname(folder), { recursive: true });
    client = new PGlite(folder, { loadDataDir: options.loadDataDir });
  }
  await client.waitReady;
  const db = drizzle(client, { schema });
  await migrate(db, { migrationsFolder });
  return {
    db: db as unknown as Database,
    kind: "pglite",
    close: () => client.close(),
    dump: () => client.dumpDataDir("gzip") as Promise<Blob>,
  };
}

const globalForDb = globalThis as unknown as { slipfieldDb?: Promise<DatabaseHandle> };

/** The app's one database, opened lazily (never at import time, so `next build` does not touch the data folder). */
export function getDatabaseHandle(): Promise<DatabaseHandle> {
  if (!globalForDb.slipfieldDb) {
    globalForDb.slipfieldDb = openDatabase({ url: process.env.DATABASE_URL || undefined });
    globalForDb.slipfieldDb.catch(() => {
      globalForDb.slipfieldDb = undefined;
    });
  }
  return globalForDb.slipfieldDb;
}

export async function getDb(): Promise<Database> {
  return (await getDatabaseHandle()).db;
}

/** Tests: install a specific database (e.g. in-memory PGlite) as the app's database. */
export function setDatabaseForTests(handle: DatabaseHandle) {
  globalForDb.slipfieldDb = Promise.resolve(handle);
}
