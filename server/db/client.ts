import { AsyncLocalStorage } from "node:async_hooks";
import pg from "pg";
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import * as schema from "./schema";

// numeric (OID 1700) stays a string: lengths are exact decimals and are only
// turned into numbers at the edge of the API.
export type Db = NodePgDatabase<typeof schema>;
/**
 * A transaction handle. Code that must run inside a transaction (holds, lifecycle changes, investigations,
 * settings) takes `Tx`, not `DbOrTx`: the pool handle `Db` has no `rollback`, so passing it is a type error.
 */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
/** Repositories accept either: a read on the pool, or a statement inside the caller's transaction. */
export type DbOrTx = Db | Tx;

/** Limits every connection of the pool carries; see docs/decisions/011-database-roles-and-evidence-triggers.md. */
export interface DbOptions {
  max?: number;
  /** A statement running longer is cancelled (57014) and its request answers 503. */
  statementTimeoutMs?: number;
  /** A transaction left idle this long is ended by PostgreSQL, which frees its connection and row locks. */
  idleInTransactionMs?: number;
  /** Waiting this long for a row lock gives up (55P03) rather than queueing forever. */
  lockTimeoutMs?: number;
  /** Waiting this long for a free pooled connection (or to connect) gives up with a 503. */
  connectTimeoutMs?: number;
  /**
   * A connection idle this long is closed (node-postgres closes them after 10 s unless told). The app keeps its own
   * for minutes: a new connection signs in again, prepares its statements again, and its server process maps every
   * shared buffer it reads for the first time. On this machine a tool's status took 40–47 ms on a connection opened
   * after a 12-second lull, against 8–12 ms on one kept, and a home page 82–85 ms against 24 ms.
   */
  idleTimeoutMs?: number;
  applicationName?: string;
  /** Told about errors of idle connections (a restarted or stopped database); they never stop the process. */
  onConnectionError?: (err: Error) => void;
}

export const DB_DEFAULTS = {
  statementTimeoutMs: 30_000,
  idleInTransactionMs: 15_000,
  lockTimeoutMs: 10_000,
  connectTimeoutMs: 5_000,
  /** node-postgres's own: a script's pool lets its process end soon after its last query. The app sets its own. */
  idleTimeoutMs: 10_000,
} as const;

/**
 * Opens a pool and a typed Drizzle handle on it. The pool survives a database restart: errors of idle
 * connections are reported, not thrown (pg emits them as 'error' events, which would otherwise end the
 * process), broken connections are dropped, and new ones are opened on the next query.
 */
export function createDb(url: string, maxOrOptions: number | DbOptions = {}) {
  const opts: DbOptions = typeof maxOrOptions === "number" ? { max: maxOrOptions } : maxOrOptions;
  const pool = new pg.Pool({
    connectionString: url,
    max: opts.max ?? 10,
    statement_timeout: opts.statementTimeoutMs ?? DB_DEFAULTS.statementTimeoutMs,
    idle_in_transaction_session_timeout: opts.idleInTransactionMs ?? DB_DEFAULTS.idleInTransactionMs,
    lock_timeout: opts.lockTimeoutMs ?? DB_DEFAULTS.lockTimeoutMs,
    connectionTimeoutMillis: opts.connectTimeoutMs ?? DB_DEFAULTS.connectTimeoutMs,
    idleTimeoutMillis: opts.idleTimeoutMs ?? DB_DEFAULTS.idleTimeoutMs,
    application_name: opts.applicationName ?? "tenthwise",
    keepAlive: true,
    // A connection is replaced after an hour (when next idle). Statements whose text names the shop's date (statusNow)
    // are a new prepared statement each day on every connection that runs them; a connection kept busy for months
    // would keep every day's.
    maxLifetimeSeconds: 60 * 60,
  });
  const report = opts.onConnectionError ?? (() => undefined);
  pool.on("error", report);
  // A checked-out connection can also emit 'error' (the server went away between two queries);
  // without a listener Node treats that as an uncaught exception.
  pool.on("connect", (client) => client.on("error", report));
  guardPool(pool);
  const db = drizzle(pool, { schema });
  guardTransactions(db);
  return { pool, db };
}

// --- One connection per transaction ---------------------------------------------------------------
//
// Inside a transaction every statement must use the transaction's handle. Taking a second pooled
// connection there (a read on `db` instead of `tx`, a nested db.transaction) can freeze the whole pool
// under a burst: every connection is held by a transaction waiting for another connection. The pool
// therefore refuses to be used from inside an open transaction in the same async context.

interface TxScope {
  open: boolean;
}
const txScope = new AsyncLocalStorage<TxScope>();

/** Thrown when the pool is used inside an open transaction; always a programming error. */
export class SecondConnectionInTransactionError extends Error {
  constructor(what: string) {
    super(`${what} was called on the pool inside an open transaction: use the transaction's handle (tx), not db, until it commits.`);
    this.name = "SecondConnectionInTransactionError";
  }
}

/** True while the calling code runs inside a transaction callback of db.transaction. */
export const insideTransaction = () => txScope.getStore()?.open === true;

function refuseInsideTransaction(what: string) {
  if (!insideTransaction()) return;
  const err = new SecondConnectionInTransactionError(what);
  // Loud in tests: an unexpected console.error fails the test that caused it.
  console.error(err.message, err.stack);
  throw err;
}

function guardPool(pool: pg.Pool) {
  const query = pool.query.bind(pool) as (...args: unknown[]) => unknown;
  const connect = pool.connect.bind(pool) as (...args: unknown[]) => unknown;
  (pool as { query: unknown }).query = (...args: unknown[]) => {
    refuseInsideTransaction("pool.query");
    return query(...args);
  };
  (pool as { connect: unknown }).connect = (...args: unknown[]) => {
    refuseInsideTransaction("pool.connect");
    return connect(...args);
  };
}

function guardTransactions(db: Db) {
  const transaction = db.transaction.bind(db);
  db.transaction = ((fn: (tx: Tx) => Promise<unknown>, config?: Parameters<Db["transaction"]>[1]) => {
    refuseInsideTransaction("db.transaction");
    return transaction((tx) => {
      const scope: TxScope = { open: true };
      return txScope.run(scope, () => fn(tx)).finally(() => {
        scope.open = false;
      });
    }, config);
  }) as Db["transaction"];
}
