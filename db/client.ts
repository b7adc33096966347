import "server-only";
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { PgDatabase, PgQueryResultHKT } from "drizzle-orm/pg-core";
import * as schema from "./schema";
import { config } from "@/lib/config";

export type Database = PgDatabase<PgQueryResultHKT, typeof schema>;

export interface DatabaseHandle {
  db: Database;
  kind: "pglite" | "postgres";
  /** PGlite only: the database engine runs on its own thread (db/pglite-thread.ts) */
  threaded: boolean;
  /** PostgreSQL only: the server's address (db/notifications.ts opens its listening connection to it) */
  url?: string;
  /** Runs `task` while no other process runs one under the same `lock` (a PostgreSQL advisory lock; in-process on PGlite). */
  exclusively<T>(lock: number, task: () => Promise<T>): Promise<T>;
  close: () => Promise<void>;
}

const migrationsFolder = path.join(process.cwd(), "drizzle");

export function dataDirectory(): string {
  return path.resolve(/*turbopackIgnore: true*/ config().SLIPFIELD_DATA_DIR ?? path.join(process.cwd(), "data"));
}

/**
 * Opens and migrates a database: PostgreSQL when `url` is given, else PGlite (on disk, or in memory for `memory`).
 * PGlite runs on its own thread unless `thread` is false or SLIPFIELD_DB_THREAD=off.
 */
export async function openDatabase(options: { url?: string; memory?: boolean; dataDir?: string; thread?: boolean } = {}): Promise<DatabaseHandle> {
  if (options.url) {
    const { Pool } = await import("pg");
    const { drizzle } = await import("drizzle-orm/node-postgres");
    const { migrate } = await import("drizzle-orm/node-postgres/migrator");
    const pool = new Pool({ connectionString: options.url, max: config().SLIPFIELD_DB_POOL });
    const db = drizzle(pool, { schema });
    const exclusively = <T>(lock: number, task: () => Promise<T>) => withAdvisoryLock(pool, lock, task);
    await exclusively(MIGRATION_LOCK, () => migrate(db, { migrationsFolder }));
    return { db: db as unknown as Database, kind: "postgres", threaded: false, url: options.url, exclusively, close: () => pool.end() };
  }
  const { drizzle } = await import("drizzle-orm/pglite");
  const { migrate } = await import("drizzle-orm/pglite/migrator");
  let folder: string | undefined;
  if (!options.memory) {
    folder = options.dataDir ?? path.join(dataDirectory(), "pglite");
    mkdirSync(path.dirname(folder), { recursive: true });
  }
  const threaded = (options.thread ?? true) && config().SLIPFIELD_DB_THREAD !== "off";
  let client: { close: () => Promise<void> };
  if (threaded) {
    const { ThreadedPGlite } = await import("./pglite-thread");
    client = await ThreadedPGlite.open(folder);
  } else {
    const { PGlite } = await import("@electric-sql/pglite");
    const { pgliteOptions } = await import("./pglite-options");
    const inProcess = new PGlite(folder, pgliteOptions);
    await inProcess.waitReady;
    client = inProcess;
  }
  // drizzle's PGlite driver uses only query/exec/transaction, which the threaded client provides
  const db = drizzle({ client: client as unknown as import("@electric-sql/pglite").PGlite, schema });
  await migrate(db, { migrationsFolder });
  return { db: db as unknown as Database, kind: "pglite", threaded, exclusively: (_lock, task) => task(), close: () => client.close() };
}

/**
 * Advisory locks (arbitrary constants). Several web processes and workers may start at once against one PostgreSQL
 * server: they apply the migrations, and seed an empty database, one after the other (the others then find nothing
 * left to do), instead of racing to create the same tables and demo accounts.
 */
const MIGRATION_LOCK = 0x511f1e1d;
export const SEED_LOCK = 0x511f1e1e;

async function withAdvisoryLock<T>(pool: import("pg").Pool, lock: number, task: () => Promise<T>): Promise<T> {
  const client = await pool.connect();
  try {
    await client.query("select pg_advisory_lock($1)", [lock]);
    return await task();
  } finally {
    await client.query("select pg_advisory_unlock($1)", [lock]).catch(() => undefined);
    client.release();
  }
}

const globalForDb = globalThis as unknown as { slipfieldDb?: Promise<DatabaseHandle> };

/** The app's one database, opened lazily (never at import time, so `next build` does not touch the data folder). */
export function getDatabaseHandle(): Promise<DatabaseHandle> {
  if (!globalForDb.slipfieldDb) {
    globalForDb.slipfieldDb = openDatabase({ url: config().DATABASE_URL });
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
