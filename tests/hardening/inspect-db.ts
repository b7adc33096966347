// Opens a stopped server's PGlite data folder directly, to check what is stored (never while the server runs).
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { decodePicks } from "../../lib/picks/codec";

export async function openStopped(dataDir: string) {
  const client = new PGlite(path.join(dataDir, "pglite"));
  await client.waitReady;
  return client;
}

/** Row count and an order-independent checksum of every table in the public schema. */
export async function tableFingerprints(client: PGlite) {
  const tables = await client.query<{ name: string }>(`select tablename as name from pg_tables where schemaname = 'public' order by tablename`);
  const result: Record<string, { rows: number; md5: string }> = {};
  for (const { name } of tables.rows) {
    const { rows } = await client.query<{ rows: number; md5: string }>(
      `select count(*)::int as rows, md5(coalesce(string_agg(t::text, '|' order by t::text), '')) as md5 from "${name}" t`,
    );
    result[name] = rows[0];
  }
  return result;
}

/** Every pick set with its analyses, and whether its stored picks decode to exactly row_count picks. */
export async function pickSetIntegrity(client: PGlite) {
  const { rows } = await client.query<{ id: string; row_count: number; picks: Uint8Array; analyses: number; statuses: string | null }>(
    `select p.id, p.row_count, p.picks, count(a.id)::int as analyses, string_agg(a.status::text, ',') as statuses
       from pick_sets p left join analyses a on a.pick_set_id = p.id group by p.id`,
  );
  return rows.map((row) => {
    let decoded = -1;
    try {
      decoded = decodePicks(row.picks).x.length;
    } catch {
      decoded = -1;
    }
    return { id: row.id, rowCount: row.row_count, decodedPicks: decoded, analyses: row.analyses, statuses: row.statuses ?? "" };
  });
}
