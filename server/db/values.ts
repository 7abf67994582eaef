import { sql, type SQL, type SQLWrapper } from "drizzle-orm";

/**
 * Raw SQL answers (db.execute) carry timestamptz as PostgreSQL's text, e.g. "2026-01-16 20:24:04.317721+00" on our
 * UTC sessions. Turning that into the ISO instant the shared rules read is, through `new Date`, the largest part of
 * deriving a page of statuses; the UTC form is rewritten by its parts instead (to the millisecond, as `Date` keeps
 * it), anything else goes through `Date`.
 */
const PG_UTC = /^(\d{4}-\d{2}-\d{2}) (\d{2}:\d{2}:\d{2})(?:\.(\d{1,6}))?\+00$/;

export function isoInstant(v: unknown): string | null {
  if (v == null) return null;
  if (v instanceof Date) return v.toISOString();
  const s = String(v);
  const m = PG_UTC.exec(s);
  return m ? `${m[1]}T${m[2]}.${(m[3] ?? "").padEnd(3, "0").slice(0, 3)}Z` : new Date(s).toISOString();
}

/**
 * A PostgreSQL array literal for one parameter (`${pgArray(ids)}::uuid[]`): Drizzle's `sql` would spread a JS array
 * into one parameter per element, and thousands of parameters cost more to bind than the query to run.
 */
export function pgArray(values: readonly string[]): string {
  return `{${values.map((v) => `"${v.replace(/[\\"]/g, "\\$&")}"`).join(",")}}`;
}

/**
 * `column = any($1::uuid[])`: a list of ids as one array parameter, where the query builder's `inArray` sends one
 * parameter per id (opening an investigation over 5,000 readings named thousands of them per statement).
 */
export const anyId = (column: SQLWrapper, ids: readonly string[]): SQL => sql`${column} = any(${pgArray(ids)}::uuid[])`;
