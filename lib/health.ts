import "server-only";
import { sql } from "drizzle-orm";
import { getDatabaseHandle } from "@/db/client";

export async function databaseStatus(): Promise<{ ok: boolean; database: string; error?: string }> {
  try {
    const handle = await getDatabaseHandle();
    await handle.db.execute(sql`select 1`);
    return { ok: true, database: handle.kind };
  } catch {
    return { ok: false, database: "unavailable", error: "The database is not ready." };
  }
}
