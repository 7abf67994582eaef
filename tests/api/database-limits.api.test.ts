import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Request, Response } from "express";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { createDb } from "../../server/db/client";
import { errorHandler } from "../../server/http/error-handler";

// Every pooled connection carries limits, so no statement, lock wait or forgotten transaction can hold
// a connection (and the rows it locked) for ever; what hits a limit is answered 503, never 500.

let database: TestDatabase;
let limited: ReturnType<typeof createDb>;
let idleLimited: ReturnType<typeof createDb>;
const reported: string[] = [];

beforeAll(async () => {
  database = await createTestDatabase();
  limited = createDb(database.url, { max: 2, statementTimeoutMs: 1000, idleInTransactionMs: 0, lockTimeoutMs: 200 });
  idleLimited = createDb(database.url, { max: 2, idleInTransactionMs: 400, onConnectionError: (e) => reported.push((e as { code?: string }).code ?? e.message) });
});
afterAll(async () => {
  await limited?.pool.end();
  await idleLimited?.pool.end();
  await database?.drop();
});

/** What the API answers for an error: status and body, through the one error handler. */
function answerFor(err: unknown) {
  let status = 0;
  let body: unknown;
  const res = { headersSent: false, setHeader: () => res, status: (s: number) => ((status = s), res), json: (b: unknown) => ((body = b), res), end: () => res } as unknown as Response;
  errorHandler(err, { log: { warn: () => undefined, error: () => undefined } } as unknown as Request, res, () => undefined);
  return { status, body: body as { error: { code: string; message: string } } };
}

async function failure(p: Promise<unknown>) {
  try {
    await p;
  } catch (e) {
    return e;
  }
  throw new Error("expected a failure");
}

describe("limits on every database connection", () => {
  it("each connection carries the statement, lock and idle-in-transaction limits", async () => {
    const { rows } = await limited.pool.query("select current_setting('statement_timeout') as s, current_setting('lock_timeout') as l, current_setting('idle_in_transaction_session_timeout') as i");
    expect(rows[0]).toEqual({ s: "1s", l: "200ms", i: "0" });
    expect((await idleLimited.pool.query("select current_setting('idle_in_transaction_session_timeout') as i")).rows[0]).toEqual({ i: "400ms" });
  });

  it("a statement running past its limit is cancelled and answered 503 database_busy", async () => {
    const err = await failure(limited.pool.query("select pg_sleep(4)"));
    expect((err as { code: string }).code).toBe("57014");
    expect(answerFor(err)).toMatchObject({ status: 503, body: { error: { code: "database_busy" } } });
    expect((await limited.pool.query("select 1 as one")).rows).toEqual([{ one: 1 }]);
  });

  it("a wait for a row another transaction holds gives up and is answered 503, and the holder is unaffected", async () => {
    const holder = await limited.pool.connect();
    await holder.query("begin");
    await holder.query("select pg_advisory_xact_lock(4242)");
    const err = await failure(limited.pool.query("select pg_advisory_xact_lock(4242)").then(async () => undefined));
    // Advisory locks wait on lock_timeout too.
    expect((err as { code: string }).code).toBe("55P03");
    expect(answerFor(err).status).toBe(503);
    await holder.query("commit");
    holder.release();
  });

  it("a transaction left idle is ended by PostgreSQL; the pool drops that connection and keeps serving, and nothing stops the process", async () => {
    const forgotten = await idleLimited.pool.connect();
    await forgotten.query("begin");
    await new Promise((r) => setTimeout(r, 900));
    const err = await failure(forgotten.query("select 1"));
    forgotten.release(err as Error);
    expect(answerFor(err).status).toBe(503);
    expect((await idleLimited.pool.query("select 2 as two")).rows).toEqual([{ two: 2 }]);
    expect(reported.length).toBeGreaterThan(0);
  });
});
