import { sql } from "drizzle-orm";

/**
 * Sliding-window limits (attempts per key in the last `windowMs`). On the embedded database one process serves
 * everyone, so the window lives in its memory; on a PostgreSQL server several processes serve the same people, so the
 * window is a row in the database that every process updates in one statement (a limit reached through one process
 * holds in all of them).
 */
export interface RateLimiter {
  /** Records one attempt; resolves false when the key is over its limit (the refused attempt is not recorded). */
  attempt(key: string): Promise<boolean>;
  /** Forgets the key's attempts (e.g. after a successful sign-in). */
  reset(key: string): Promise<void>;
}

/** The in-memory window of one process. */
export function memoryWindow({ limit, windowMs }: { limit: number; windowMs: number }) {
  const hits = new Map<string, number[]>();
  return {
    attempt(key: string, now = Date.now()): boolean {
      const recent = (hits.get(key) ?? []).filter((time) => now - time < windowMs);
      if (recent.length >= limit) {
        hits.set(key, recent);
        return false;
      }
      recent.push(now);
      hits.set(key, recent);
      if (hits.size > 10_000) {
        for (const [storedKey, times] of hits) if (times.every((time) => now - time >= windowMs)) hits.delete(storedKey);
      }
      return true;
    },
    reset(key: string) {
      hits.delete(key);
    },
  };
}

/**
 * The window in the database (table rate_limit_windows): one INSERT … ON CONFLICT DO UPDATE keeps the attempts still
 * inside the window and appends this one only if they are fewer than `limit`; the row lock it takes makes concurrent
 * attempts from several processes count one after the other. The attempt was allowed when it is the row's newest hit.
 */
export function databaseWindow({ scope, limit, windowMs }: { scope: string; limit: number; windowMs: number }) {
  const recent = sql`coalesce((select array_agg(hit order by hit) from unnest(rate_limit_windows.hits) as hit where hit > now() - ${windowMs}::float8 * interval '1 millisecond'), '{}')`;
  let attemptsSinceCleanUp = 0;
  return {
    async attempt(key: string): Promise<boolean> {
      const { getDb } = await import("@/db/client");
      const db = await getDb();
      const result = (await db.execute(sql`
        insert into rate_limit_windows (scope, key, hits, updated_at) values (${scope}, ${key}, array[now()], now())
        on conflict (scope, key) do update set
          hits = case when cardinality(${recent}) >= ${limit}::int then ${recent} else ${recent} || now() end,
          updated_at = now()
        returning hits[cardinality(hits)] = now() as allowed`)) as unknown as { rows: { allowed: boolean }[] };
      if (++attemptsSinceCleanUp >= 500) {
        attemptsSinceCleanUp = 0;
        await db.execute(sql`delete from rate_limit_windows where scope = ${scope} and updated_at < now() - ${windowMs}::float8 * interval '1 millisecond'`);
      }
      return Boolean(result.rows[0]?.allowed);
    },
    async reset(key: string) {
      const { getDb } = await import("@/db/client");
      await (await getDb()).execute(sql`delete from rate_limit_windows where scope = ${scope} and key = ${key}`);
    },
  };
}

/** A limit shared by every process on a PostgreSQL server, kept in memory on the embedded database. */
export function createRateLimiter(options: { scope: string; limit: number; windowMs: number }): RateLimiter {
  const memory = memoryWindow(options);
  const shared = databaseWindow(options);
  const sharedThroughDatabase = async () => {
    const { getDatabaseHandle } = await import("@/db/client");
    return (await getDatabaseHandle()).kind === "postgres";
  };
  return {
    async attempt(key) {
      return (await sharedThroughDatabase()) ? shared.attempt(key) : memory.attempt(key);
    },
    async reset(key) {
      if (await sharedThroughDatabase()) await shared.reset(key);
      else memory.reset(key);
    },
  };
}

export const signInLimiter = createRateLimiter({ scope: "sign-in", limit: 8, windowMs: 5 * 60_000 });
