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

const shapes = new Map<string, { sql: string; params: unknown[]; name: string }>();
const MAX_SHAPES = 500;

/**
 * A statement of a fixed shape run with values that change from call to call, for the writes every mechanic makes:
 * `build` gives the statement with drizzle's placeholders (sql.placeholder) where the values go and is called once
 * per `shape` (the caller's name for everything that decides the text); each call fills in `values`, given as the
 * driver takes them. Turning a large SQL tree into text at every call cost more of the process's only thread than
 * PostgreSQL spent on the statement. Run as a named prepared statement, as executePrepared.
 */
export async function executeShaped(db: DbOrTx, shape: string, build: () => SQL, values: Record<string, unknown>): Promise<QueryResult<Record<string, unknown>>> {
  const { dialect, session } = db as unknown as { dialect: PgDialect; session: PgSession };
  let built = shapes.get(shape);
  if (built === undefined) {
    const q = dialect.sqlToQuery(build());
    built = { sql: q.sql, params: q.params, name: nameOf(q.sql) };
    // The shapes are a handful per write (the kinds of reading, one to a few tools); the memo stays small regardless.
    if (shapes.size < MAX_SHAPES) shapes.set(shape, built);
  }
  const prepared = session.prepareQuery({ sql: built.sql, params: built.params }, undefined, built.name, false);
  return (await prepared.execute(values)) as QueryResult<Record<string, unknown>>;
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
