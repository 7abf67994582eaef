import pg from "pg";
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import * as schema from "./schema";

// numeric (OID 1700) stays a string: lengths are exact decimals and are only
// turned into numbers at the edge of the API.
export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle; repositories accept either. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type DbOrTx = Db | Tx;

/** Opens a pool and a typed Drizzle handle on it. */
export function createDb(url: string, max = 10) {
  const pool = new pg.Pool({ connectionString: url, max });
  const db = drizzle(pool, { schema });
  return { pool, db };
}
