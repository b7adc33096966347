import "server-only";
import { count } from "drizzle-orm";
import { dataDirectory, getDatabaseHandle } from "@/db/client";
import { users } from "@/db/schema";

/** Open + migrate the database and seed the demo on first start. A database that cannot open stops the server with a clear message. */
export async function prepareServer() {
  const started = Date.now();
  try {
    const { db, kind } = await getDatabaseHandle();
    const [{ userCount }] = await db.select({ userCount: count() }).from(users);
    if (Number(userCount) === 0 && process.env.SLIPFIELD_SEED !== "off") {
      const { seedDemo } = await import("./seed");
      await seedDemo();
      console.log(`slipfield: seeded the Quillon Graben demo study`);
    }
    const { resumeUnfinishedAnalyses } = await import("./analysis/runner");
    const resumed = await resumeUnfinishedAnalyses();
    if (resumed > 0) console.log(`slipfield: resumed ${resumed} unfinished analyses`);
    console.log(`slipfield: database ready (${kind}) in ${Date.now() - started} ms`);
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    console.error(
      `slipfield: cannot open the database${process.env.DATABASE_URL ? " at DATABASE_URL" : ` in ${dataDirectory()}`}: ${reason}\n` +
        `Check that the folder exists, is writable and the disk is not full (or that the PostgreSQL server is reachable).`,
    );
    process.exit(1);
  }
}
