import { createHash } from "node:crypto";
import type { QueryResult } from "pg";
import type { SQL } from "drizzle-orm";
import type { PgDialect, PgSession } from "drizzle-orm/pg-core";
import type { DbOrTx } from "./client";

/**
 * Runs a statement as a named prepared statement: PostgreSQL parses and plans it once per connection and reuses the
 * plan, where an unnamed statement is planned on every call (0.3 ms for a tool's status, five times the lookup
 * itself). For statements whose text is the same on every call and whose best plan does not depend on the values
 * (a lookup by a unique key, a list of ids): after five calls PostgreSQL may keep one generic plan for all values.
 * The name is derived from the text, so two texts never share a name (node-postgres refuses that). Only for
 * statements of fixed text: each distinct text stays prepared on every connection that ran it.
 */
export async function executePrepared(db: DbOrTx, query: SQL): Promise<QueryResult<Record<string, unknown>>> {
  const { dialect, session } = db as unknown as { dialect: PgDialect; session: PgSession };
  const built = dialect.sqlToQuery(query);
  const prepared = session.prepareQuery(built, undefined, nameOf(built.sql), false);
  return (await prepared.execute()) as QueryResult<Record<string, unknown>>;
}

const names = new Map<string, string>();

/** A stable name for a statement's text (a hash of it): the same text always gets the same name. */
function nameOf(text: string): string {
  let name = names.get(text);
  if (name === undefined) {
    name = `tw_${createHash("sha1").update(text).digest("hex").slice(0, 24)}`;
    // The callers' texts are a handful of fixed statements; the memo stays small whatever happens.
    if (names.size < 200) names.set(text, name);
  }
  return name;
}

/** What a query builder's prepare() gives in drizzle-orm's node-postgres driver (fields it keeps internally). */
interface BuiltQuery<T> {
  queryString: string;
  queryConfig: { name?: string };
  rawQueryConfig: { name?: string };
  execute(): Promise<T>;
}

/**
 * A query built with the query builder, run as a named prepared statement (see executePrepared): the statement is
 * built once, then named after its text. For the register's pages, whose text is one of a bounded set (one per
 * combination of filters and sort) and whose plans are index scans whatever the values.
 */
export function runPrepared<T>(qb: { prepare(name: string): unknown }): Promise<T> {
  const built = qb.prepare(undefined as unknown as string) as BuiltQuery<T>;
  const name = nameOf(built.queryString);
  built.queryConfig.name = name;
  built.rawQueryConfig.name = name;
  return built.execute();
}
