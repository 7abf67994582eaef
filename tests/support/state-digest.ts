import { sql } from "drizzle-orm";
import type { Db } from "../../server/db/client";

// Bookkeeping that changes on any request and is no record of the shop's.
const NOT_STATE = new Set(["session", "login_throttle"]);

/**
 * A fingerprint of every table of the shop's data (each table's rows, hashed in a stable order): equal
 * before and after means nothing was written. Tables other branches add are included as they appear.
 */
export async function stateDigest(db: Db): Promise<Record<string, string>> {
  const tables = (await db.execute(sql`select tablename from pg_tables where schemaname = 'public' order by tablename`)).rows
    .map((r) => String((r as { tablename: string }).tablename))
    .filter((t) => !NOT_STATE.has(t));
  const out: Record<string, string> = {};
  const parts = tables.map((t) => `select '${t}' as t, count(*)::text || ':' || coalesce(md5(string_agg(x::text, '|' order by x::text)), '') as d from "${t}" x`);
  const res = await db.execute(sql.raw(parts.join(" union all ")));
  for (const r of res.rows as { t: string; d: string }[]) out[r.t] = r.d;
  return out;
}
