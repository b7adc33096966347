import "server-only";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { count } from "drizzle-orm";
import { dataDirectory, getDatabaseHandle, SEED_LOCK } from "@/db/client";
import { users } from "@/db/schema";
import { config, ConfigError } from "@/lib/config";

/** Open + migrate the database and seed the demo on first start. A database that cannot open stops the server with a clear message. */
export async function prepareServer() {
  const started = Date.now();
  try {
    // an unusable setting stops the start here, with the variable named (lib/config.ts)
    const settings = config();
    if (!settings.DATABASE_URL) claimDataFolder(dataDirectory());
    const { db, kind, threaded, exclusively } = await getDatabaseHandle();
    await exclusively(SEED_LOCK, async () => {
      const [{ userCount }] = await db.select({ userCount: count() }).from(users);
      if (Number(userCount) === 0 && settings.SLIPFIELD_SEED !== "off") {
        const { seedDemo } = await import("./seed");
        await seedDemo();
        console.log(`slipfield: seeded the Quillon Graben demo study`);
      }
    });
    const { queueAnalysesWithoutJobs } = await import("./analysis/runner");
    const adopted = await queueAnalysesWithoutJobs();
    if (adopted > 0) console.log(`slipfield: queued ${adopted} unfinished analyses from before the job queue`);
    const { startListening } = await import("@/db/notifications");
    if (kind === "postgres" && !(await startListening()))
      console.warn("slipfield: not listening for changes from other processes yet (roles and sessions are read afresh until then)");
    const { startLocalJobs } = await import("./jobs/local");
    const processor = await startLocalJobs((line) => console.log(`slipfield jobs: ${line}`));
    const { drainOnSignals } = await import("./shutdown");
    drainOnSignals(processor);
    console.log(`slipfield: database ready (${kind}${threaded ? ", on its own thread" : ""}) in ${Date.now() - started} ms`);
    console.log(
      processor
        ? `slipfield: this process runs analyses and exports (${processor.id})`
        : "slipfield: this process runs no analyses or exports (SLIPFIELD_ANALYSIS_WORKERS=0): `npm run worker` processes do",
    );
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(`slipfield: ${error.message}`);
      process.exit(1);
    }
    const reason = error instanceof Error ? error.message : String(error);
    console.error(
      `slipfield: cannot open the database${config().DATABASE_URL ? " at DATABASE_URL" : ` in ${dataDirectory()}`}: ${reason}\n` +
        `Check that the folder exists, is writable and the disk is not full (or that the PostgreSQL server is reachable).`,
    );
    process.exit(1);
  }
}

/**
 * A PGlite data folder may be open in one process only: refuse a second server on the same folder, and record our pid
 * in <data>/server.pid so `npm run backup` / `npm run restore` can refuse while we run. Writing it also proves the
 * folder is writable before the database opens.
 */
function claimDataFolder(dataDir: string) {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, "server.pid");
  if (existsSync(file)) {
    const pid = Number(readFileSync(file, "utf8").trim());
    if (Number.isInteger(pid) && pid > 0 && pid !== process.pid && isAlive(pid)) {
      throw new Error(`another server (pid ${pid}) is already using this data folder (if no server is running, delete ${file})`);
    }
  }
  writeFileSync(file, String(process.pid));
}

function isAlive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}
