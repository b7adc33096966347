import "server-only";
import { sql } from "drizzle-orm";
import { getDatabaseHandle } from "@/db/client";
import { leaseSeconds, queueDepth, workerHeartbeats } from "@/lib/jobs/queue";
import { isDraining } from "@/lib/shutdown";
import type { HealthStatus } from "@/lib/contracts/health";

/** A worker is counted live while its heartbeat is younger than a lease (it beats every third of one). */
const liveWithinSeconds = () => leaseSeconds();

/** The database, the job queue's depth and the workers' heartbeats (public: no ids of studies, users or jobs). */
export async function healthStatus(): Promise<HealthStatus> {
  let database = "unavailable";
  try {
    const handle = await getDatabaseHandle();
    database = handle.kind;
    await handle.db.execute(sql`select 1`);
    const [queue, list] = await Promise.all([queueDepth(), workerHeartbeats()]);
    const live = list.filter((worker) => worker.secondsAgo <= liveWithinSeconds()).length;
    return { ok: !isDraining(), database, draining: isDraining(), queue, workers: { live, list } };
  } catch {
    return { ok: false, database, error: "The database is not ready." };
  }
}
