import { sql } from "drizzle-orm";
import { openDatabase, setDatabaseForTests, type DatabaseHandle } from "@/db/client";

/**
 * A fresh database for one test file: in-memory PGlite, or the PostgreSQL server named by
 * TEST_DATABASE_URL (its public and drizzle schemas are dropped first so each file starts clean).
 */
export async function useFreshDatabase(): Promise<DatabaseHandle> {
  // a job processor started by an earlier part of the file (it starts when a job is added) stops first: its queries
  // would otherwise hold locks on the tables about to be dropped
  const { forgetLocalProcessor, localProcessor } = await import("@/lib/jobs/processor");
  const processor = await localProcessor();
  if (processor) await processor.drain(0);
  forgetLocalProcessor();
  const url = process.env.TEST_DATABASE_URL;
  if (url) {
    const { Client } = await import("pg");
    const client = new Client({ connectionString: url });
    await client.connect();
    await client.query("drop schema if exists public cascade; drop schema if exists drizzle cascade; create schema public;");
    await client.end();
  }
  const handle = await openDatabase(url ? { url } : { memory: true });
  await handle.db.execute(sql`select 1`);
  setDatabaseForTests(handle);
  return handle;
}
