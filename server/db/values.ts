import { sql, type Placeholder, type SQL, type SQLWrapper } from "drizzle-orm";

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
 * into one parameter per element, and thousands of parameters cost more to bind than the query to run. `null` is an
 * element that is NULL.
 */
export function pgArray(values: readonly (string | null)[]): string {
  return `{${values.map((v) => (v == null ? "NULL" : `"${v.replace(/[\\"]/g, "\\$&")}"`)).join(",")}}`;
}

/**
 * `column = any($1::uuid[])`: a list of ids as one array parameter, where the query builder's `inArray` sends one
 * parameter per id (opening an investigation over 5,000 readings named thousands of them per statement).
 */
export const anyId = (column: SQLWrapper, ids: readonly string[]): SQL => sql`${column} = any(${pgArray(ids)}::uuid[])`;

/** Up to this many values, `inList` writes one parameter each (see there). */
const FIXED_LIST_MAX = 8;

/**
 * `column in ($1, $2)`: a short list of values (the tools a reading names, their families), one parameter each, for
 * the named prepared statements of the write path. PostgreSQL knows how many values such a list holds when it plans
 * it, so after its first five runs it keeps one generic plan for every call; with the list as one array parameter
 * it cannot know the array's length, judges a generic plan dearer, and plans the statement afresh at every call
 * (about 0.8 ms of the database's time for a reading's lock statement, against 0.15 ms planned once). Longer lists
 * stay one array parameter (`= any($1::type[])`), whose text does not grow with the list.
 */
export function inList(column: SQL, values: readonly (string | Placeholder)[], type: "text" | "uuid"): SQL {
  if (values.length === 0) return sql`false`;
  // Placeholders (a statement built once per shape, executeShaped) stay one each: the shape counts them.
  if (values.length > FIXED_LIST_MAX && values.every((v) => typeof v === "string")) return sql`${column} = any(${pgArray(values as string[])}::${sql.raw(type)}[])`;
  return sql`${column} in (${sql.join(
    values.map((v) => sql`${v}::${sql.raw(type)}`),
    sql`, `,
  )})`;
}
