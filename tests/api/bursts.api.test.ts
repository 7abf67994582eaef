import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestApp, type TestAgent, type TestApp } from "../support/test-app";
import { makeLab, makeCalibration } from "../support/factories";
import { makeQuarantinedTool, makeUsableTool } from "../support/factories-crib";
import { calibrationBody, micrometerBench } from "../support/factories-register";
import { SecondConnectionInTransactionError } from "../../server/db/client";

// Bursts on one record: twenty people (or one impatient double-click, twenty times) at once. Exactly
// one succeeds — held by a unique index or a row lock in the database, never by read-then-write — and
// the others get a 4xx refusal naming the rule. The pool stays healthy throughout.

let t: TestApp;
beforeAll(async () => {
  // A pool as small as production's share per process makes a freeze show at once.
  t = await createTestApp();
});
afterAll(async () => t?.close());

const count = async (query: ReturnType<typeof sql>) => Number(((await t.db.execute(query)).rows[0] as { n: number }).n);

/** Sends the same request n times at once (each on its own connection) and tallies the statuses. */
async function burst(n: number, send: (i: number) => Promise<{ status: number; body: { error?: { code: string } } }>) {
  const results = await Promise.all(Array.from({ length: n }, (_, i) => send(i)));
  const ok = results.filter((r) => r.status < 300);
  const refused = results.filter((r) => r.status >= 400 && r.status < 500);
  const broken = results.filter((r) => r.status >= 500);
  return { ok, refused, broken, codes: [...new Set(refused.map((r) => r.body.error?.code))] };
}

/** Four signed-in people of a role, taking turns in a burst (each request is its own connection anyway). */
async function agents(role: Parameters<TestApp["agent"]>[0], n: number) {
  const four: TestAgent[] = [];
  for (let i = 0; i < 4; i++) four.push(await t.agent(role));
  return Array.from({ length: n }, (_, i) => four[i % 4]);
}

/** The error under Drizzle's "Failed query" wrapper. */
async function rootError(p: Promise<unknown>) {
  try {
    await p;
  } catch (e) {
    let err = e as { cause?: unknown };
    while (err.cause) err = err.cause as { cause?: unknown };
    return err;
  }
  return null;
}

describe("exactly one success in a burst on one record", () => {
  it("twenty simultaneous corrections of one calibration: one supersedes it, nineteen are told it was already corrected", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const first = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id]));
    expect(first.status).toBe(201);
    const people = await agents("quality", 20);
    const r = await burst(20, (i) =>
      people[i].post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { supersedesId: first.body.id, supersedeReason: `Wrong figure copied from the sheet, correction ${i}` })),
    );
    expect(r.broken).toHaveLength(0);
    expect(r.ok).toHaveLength(1);
    expect(r.codes).toEqual(["already_superseded"]);
    expect(await count(sql`select count(*)::int as n from calibrations where supersedes_id = ${first.body.id}`)).toBe(1);
  });

  it("twenty simultaneous 'lost' reports of one tool: one is recorded, with one investigation and one set of notices", async () => {
    const tool = await makeUsableTool(t.db);
    const people = await agents("crib", 20);
    const r = await burst(20, (i) => people[i].post(`/api/tools/${tool.assetTag}/lost`, { reason: `Not in the drawer at shift change (${i})` }));
    expect(r.broken).toHaveLength(0);
    expect(r.ok).toHaveLength(1);
    expect(r.codes).toEqual(["lifecycle_unchanged"]);
    expect(await count(sql`select count(*)::int as n from tool_lifecycle_events where tool_id = ${tool.id} and lifecycle = 'lost'`)).toBe(1);
    expect(await count(sql`select count(*)::int as n from investigations where tool_id = ${tool.id}`)).toBe(1);
  });

  it("twenty simultaneous releases of one quarantined tool: one releases it, and the register keeps answering throughout", async () => {
    const tool = await makeQuarantinedTool(t.db);
    const people = await agents("crib", 20);
    const health = await t.agent();
    const [r, healthDuring] = await Promise.all([
      burst(20, (i) => people[i].post(`/api/tools/${tool.assetTag}/release`, { reason: `Inspected, no damage found (${i})` })),
      Promise.all(Array.from({ length: 5 }, () => health.get("/api/health"))),
    ]);
    expect(r.broken).toHaveLength(0);
    expect(r.ok).toHaveLength(1);
    expect(r.codes).toEqual(["not_quarantined"]);
    expect(healthDuring.map((h) => h.status)).toEqual([200, 200, 200, 200, 200]);
    expect(await count(sql`select count(*)::int as n from holds where tool_id = ${tool.id} and released_at is not null`)).toBe(1);
    expect((await health.get("/api/health")).status).toBe(200);
  });

  it("twenty simultaneous quarantines of one tool: one hold is placed", async () => {
    const tool = await makeUsableTool(t.db);
    const people = await agents("crib", 20);
    const r = await burst(20, (i) => people[i].post(`/api/tools/${tool.assetTag}/quarantine`, { reason: `Dropped on the floor (${i})` }));
    expect(r.broken).toHaveLength(0);
    expect(r.ok).toHaveLength(1);
    expect(r.codes).toEqual(["already_quarantined"]);
    expect(await count(sql`select count(*)::int as n from holds where tool_id = ${tool.id} and released_at is null`)).toBe(1);
  });

  it("twenty simultaneous reviews of one outside-lab certificate: one review is recorded", async () => {
    const tool = await makeUsableTool(t.db);
    const lab = await makeLab(t.db);
    const cal = await makeCalibration(t.db, tool.id, { source: "outside_lab", labId: lab.id, performedAt: new Date("2026-06-01T15:00:00Z"), nextDueAt: "2027-06-01" });
    const people = await agents("quality", 20);
    const r = await burst(20, (i) => people[i].post(`/api/calibrations/${cal.id}/review`, { accepted: true, findings: `Certificate complete, traceable, in scope (${i})` }));
    expect(r.broken).toHaveLength(0);
    expect(r.ok).toHaveLength(1);
    expect(r.codes).toEqual(["already_reviewed"]);
    expect(await count(sql`select count(*)::int as n from calibration_reviews where calibration_id = ${cal.id}`)).toBe(1);
  });

  it("twenty simultaneous issues of one tool to different people: one checkout, nineteen told it is already out", async () => {
    const tool = await makeUsableTool(t.db);
    const people = await agents("crib", 20);
    const r = await burst(20, (i) => people[i].post(`/api/checkouts`, { assetTag: tool.assetTag, userEmail: i % 2 ? "mechanic@test.example" : "inspector@test.example" }));
    expect(r.broken).toHaveLength(0);
    expect(r.ok).toHaveLength(1);
    expect(r.codes).toEqual(["already_checked_out"]);
  });
});

describe("one connection per transaction", () => {
  it("reading through the pool inside an open transaction is refused at once, instead of waiting for a connection that may never come", async () => {
    const errors: unknown[] = [];
    const original = console.error;
    console.error = (...args: unknown[]) => void errors.push(args);
    try {
      expect(await rootError(t.db.transaction(async () => t.db.execute(sql`select 1`)))).toBeInstanceOf(SecondConnectionInTransactionError);
      expect(await rootError(t.db.transaction(async () => t.db.transaction(async (tx) => tx.execute(sql`select 1`))))).toBeInstanceOf(SecondConnectionInTransactionError);
      expect(await rootError(t.db.transaction(async () => t.pool.query("select 1")))).toBeInstanceOf(SecondConnectionInTransactionError);
    } finally {
      console.error = original;
    }
    expect(errors).toHaveLength(3);
    // The transaction's own handle, and the pool once the transaction has ended, both work.
    expect(await t.db.transaction(async (tx) => (await tx.execute(sql`select 1 as one`)).rows[0])).toEqual({ one: 1 });
    expect((await t.db.execute(sql`select 2 as two`)).rows[0]).toEqual({ two: 2 });
  });

  it("work started inside a transaction that carries on after it committed may use the pool", async () => {
    let later: Promise<unknown> = Promise.resolve();
    await t.db.transaction(async (tx) => {
      await tx.execute(sql`select 1`);
      later = new Promise((resolve) => setTimeout(resolve, 20)).then(() => t.db.execute(sql`select 3 as three`));
    });
    expect(((await later) as { rows: unknown[] }).rows[0]).toEqual({ three: 3 });
  });
});
