// Property test of the indexed status (docs/decisions/013-indexed-status.md) and its kept counts (027).
// Oracle: deriveToolStatus (shared/tools/tool-status.ts), fed by gatherStatusesAt, which reads the
// records as they stood at the instant asked about — the definition of a tool's status. Generated
// histories are written with set-based statements (as imports and the bench filler write), in a
// shuffled order, then partly changed by set-based updates; the triggers must keep tool_states right.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import seedrandom from "seedrandom";
import { sql } from "drizzle-orm";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { makeFamily, makeLab, makeTool } from "../support/factories";
import { calibrations, calibrationReviews, checkouts, holds, intermediateChecks, labShipments, toolLifecycleEvents, tools, users } from "../../server/db/schema";
import { gatherStatusesAt, statusesFor, type StatusContext, type ToolStatusView } from "../../server/modules/tools/tool-status.service";
import { countByStatus, foldToolStateCounts, foldWanted, statusCase, statusCountSql, statusIn, statusNow } from "../../server/modules/tools/tool-states.sql";
import { TOOL_STATUSES, type ToolStatus } from "../../shared/tools/tool-status";
import { addDays, calendarDate } from "../../shared/common/dates";
import type { DbOrTx } from "../../server/db/client";
import { reminderPlanInputs } from "../../server/modules/reminders/reminders.service";
import type { ToolForReminders } from "../../shared/reminders/reminder-plan";

const SEED = "tool-states-2026";
const TOOL_COUNT = 300;
/** Every generated event happens before this instant; the instants asked about come after it. */
const HISTORY_END = Date.parse("2026-01-31T00:00:00Z");
const HISTORY_START = Date.parse("2024-01-01T00:00:00Z");
/** Daylight-saving changes of 2026 (tz database): United States, United Kingdom, New Zealand; India keeps one offset. */
const ZONES: { zone: string; dstDates: string[] }[] = [
  { zone: "America/Chicago", dstDates: ["2026-03-08", "2026-11-01"] },
  { zone: "Europe/London", dstDates: ["2026-03-29", "2026-10-25"] },
  { zone: "Pacific/Auckland", dstDates: ["2026-04-05", "2026-09-27"] },
  { zone: "Asia/Kolkata", dstDates: [] },
];

let tdb: TestDatabase;
let ids: string[] = [];
let dueDates: string[] = [];

/** The first millisecond of a calendar date in a zone (binary search on the shop-date function). */
function localMidnight(date: string, zone: string): number {
  let lo = Date.parse(`${date}T00:00:00Z`) - 16 * 3600_000;
  let hi = Date.parse(`${date}T00:00:00Z`) + 16 * 3600_000;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (calendarDate(new Date(mid), zone) >= date) hi = mid;
    else lo = mid;
  }
  return hi;
}

beforeAll(async () => {
  tdb = await createTestDatabase();
  const db = tdb.db;
  const rng = seedrandom(SEED);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rng() * xs.length)];
  const between = (a: number, b: number) => Math.floor(a + rng() * (b - a));
  const family = await makeFamily(db);
  const labsMade = [await makeLab(db), await makeLab(db)];
  const [person] = await db.insert(users).values({ email: "prop@example.test", name: "Demo Mechanic", role: "mechanic", passwordHash: "x" }).returning();

  // Due dates cluster on the daylight-saving dates and the days around them, and spread over the year.
  const special = ZONES.flatMap((z) => z.dstDates).flatMap((d) => [addDays(d, -1), d, addDays(d, 1)]);
  dueDates = [...special, "2026-02-01", "2026-02-02", "2026-12-31"];
  const dueDate = () => (rng() < 0.4 ? pick(dueDates) : addDays("2025-11-01", between(0, 460)));

  const rows = { cal: [] as (typeof calibrations.$inferInsert)[], rev: [] as { calIndex: number; reviewedAt: Date; accepted: boolean }[], chk: [] as (typeof intermediateChecks.$inferInsert)[], hold: [] as (typeof holds.$inferInsert)[], ship: [] as (typeof labShipments.$inferInsert)[], life: [] as (typeof toolLifecycleEvents.$inferInsert)[], out: [] as (typeof checkouts.$inferInsert)[] };
  const corrections: { calIndex: number; at: Date; nextDueAt: string; result: "pass" | "fail" }[] = [];
  for (let i = 0; i < TOOL_COUNT; i++) {
    const tool = await makeTool(db, {
      familyId: family.id,
      assetTag: `P-${String(i).padStart(4, "0")}`,
      calibrationRequired: rng() < 0.92,
      usageLimit: rng() < 0.25 ? between(1, 12) : null,
    });
    ids.push(tool.id);
    // Distinct instants for this tool's events, in order.
    const n = between(0, 14);
    const times = Array.from({ length: n }, () => between(HISTORY_START, HISTORY_END - 86_400_000)).sort((a, b) => a - b);
    let openHold = false;
    let openTrip = false;
    let openOut = false;
    for (const t of times) {
      const at = new Date(t);
      const kind = pick(["cal", "cal", "cal", "check", "hold", "ship", "life", "out", "out", "out", "fix"] as const);
      if (kind === "cal") {
        const outside = rng() < 0.3;
        const result = pick(["pass", "pass", "pass", "adjusted", "fail", "limited"] as const);
        rows.cal.push({
          toolId: tool.id, performedAt: at, decisionRule: "simple", result, asFoundInTolerance: result !== "fail", intervalDays: 365, nextDueAt: dueDate(),
          source: outside ? "outside_lab" : "in_house", labId: outside ? pick(labsMade).id : null,
          limitedMin: result === "limited" && rng() < 0.7 ? "0.1" : null, limitedMax: result === "limited" && rng() < 0.7 ? "0.6" : null, limitedNote: result === "limited" && rng() < 0.5 ? "Spindle lock worn." : null,
        });
        if (outside && rng() < 0.65) rows.rev.push({ calIndex: rows.cal.length - 1, reviewedAt: new Date(between(t + 1, HISTORY_END)), accepted: rng() < 0.8 });
      } else if (kind === "fix" && rows.cal.length && rows.cal[rows.cal.length - 1].toolId === tool.id && !corrections.some((c) => c.calIndex === rows.cal.length - 1)) {
        corrections.push({ calIndex: rows.cal.length - 1, at, nextDueAt: dueDate(), result: rng() < 0.8 ? "pass" : "fail" });
      } else if (kind === "check") {
        const passed = rng() < 0.6;
        rows.chk.push({ toolId: tool.id, performedAt: at, nominal: "0.5", reading: passed ? "0.5" : "0.5004", deviation: passed ? "0" : pick(["0.0004", "-0.0003"]), tolerance: "0.0001", passed });
      } else if (kind === "hold") {
        if (openHold) rows.hold[rows.hold.length - 1].releasedAt = at;
        else rows.hold.push({ toolId: tool.id, placedAt: at, reason: "Dropped on the bench" });
        openHold = !openHold;
      } else if (kind === "ship") {
        if (openTrip) rows.ship[rows.ship.length - 1].receivedAt = at;
        else rows.ship.push({ toolId: tool.id, labId: pick(labsMade).id, shippedAt: at, expectedBackAt: rng() < 0.5 ? addDays(calendarDate(at, "UTC"), 14) : null });
        openTrip = !openTrip;
      } else if (kind === "life") {
        rows.life.push({ toolId: tool.id, at, lifecycle: pick(["active", "inactive", "lost", "retired"] as const), reason: "Demo change" });
      } else if (kind === "out") {
        if (openOut) rows.out[rows.out.length - 1].returnedAt = at;
        else rows.out.push({ toolId: tool.id, userId: person.id, issuedAt: at, dueBackAt: new Date(t + 8 * 3600_000) });
        openOut = !openOut;
      }
    }
  }
  // Set-based writes, in a shuffled order of tables and rows.
  const shuffle = <T>(xs: T[]) => xs.map((x) => [rng(), x] as const).sort((a, b) => a[0] - b[0]).map(([, x]) => x);
  const insertMany = async <T>(rowsOf: T[], write: (part: T[]) => Promise<unknown>) => {
    const all = shuffle(rowsOf);
    for (let i = 0; i < all.length; i += 400) await write(all.slice(i, i + 400));
  };
  const calIds: string[] = [];
  // Calibrations first (reviews and corrections name them), keeping their order to map indexes to ids.
  for (let i = 0; i < rows.cal.length; i += 400) calIds.push(...(await db.insert(calibrations).values(rows.cal.slice(i, i + 400)).returning({ id: calibrations.id })).map((r) => r.id));
  const writes = shuffle([
    () => insertMany(rows.chk, (p) => db.insert(intermediateChecks).values(p)),
    () => insertMany(rows.hold, (p) => db.insert(holds).values(p)),
    () => insertMany(rows.ship, (p) => db.insert(labShipments).values(p)),
    () => insertMany(rows.life, (p) => db.insert(toolLifecycleEvents).values(p)),
    () => insertMany(rows.out, (p) => db.insert(checkouts).values(p)),
    () => insertMany(rows.rev, (p) => db.insert(calibrationReviews).values(p.map((r) => ({ calibrationId: calIds[r.calIndex], reviewedAt: r.reviewedAt, accepted: r.accepted, findings: r.accepted ? "Certificate checked against the record." : "Points missing on the certificate." })))),
    () =>
      insertMany(corrections, (p) =>
        db.insert(calibrations).values(
          p.map((c) => ({ ...rows.cal[c.calIndex], performedAt: c.at, nextDueAt: c.nextDueAt, result: c.result, asFoundInTolerance: c.result !== "fail", source: "in_house" as const, labId: null, supersedesId: calIds[c.calIndex], supersedeReason: "Wrong due date" })),
        ),
      ),
  ]);
  for (const w of writes) await w();
  // Set-based changes: return every open check-out of a third of the tools, release some holds, change usage limits, rename a lab.
  const third = ids.filter((_, i) => i % 3 === 0);
  await db.execute(sql`update checkouts set returned_at = issued_at + interval '3 hours' where returned_at is null and tool_id = any(${`{${third.join(",")}}`}::uuid[]) and issued_at < ${new Date(HISTORY_END - 86_400_000).toISOString()}::timestamptz`);
  await db.execute(sql`update holds set released_at = placed_at + interval '1 hour', release_reason = 'Checked and fine' where released_at is null and tool_id = any(${`{${ids.filter((_, i) => i % 4 === 1).join(",")}}`}::uuid[])`);
  await db.execute(sql`update tools set usage_limit = case when usage_limit is null then 5 else null end where id = any(${`{${ids.filter((_, i) => i % 5 === 2).join(",")}}`}::uuid[])`);
  await db.execute(sql`update labs set name = 'Demo Metrology Lab (renamed)' where id = ${labsMade[0].id}::uuid`);
}, 240_000);
afterAll(() => tdb?.drop());

/** The instants asked about: midnight in the shop's zone (its first millisecond and the one before), noon, on each daylight-saving date, each clustered due date and days around them. */
function instantsFor(zone: string, dstDates: string[]): Date[] {
  const dates = [...new Set([...dstDates.flatMap((d) => [addDays(d, -1), d, addDays(d, 1)]), ...dueDates.slice(-3), "2026-06-15"])].filter((d) => d >= "2026-02-01").sort();
  return dates.flatMap((d) => {
    const m = localMidnight(d, zone);
    return [m - 1, m, m + 12 * 3600_000].map((x) => new Date(x));
  });
}

describe("the indexed status (tool_states) against the definition (deriveToolStatus on the records as they stood)", () => {
  it("gives every generated tool the same status in SQL, in the status filters and in the counts, at midnight and across daylight-saving changes", async () => {
    const db = tdb.db;
    let compared = 0;
    const mismatches: string[] = [];
    const seen = new Set<string>();
    for (const [z, { zone, dstDates }] of ZONES.entries()) {
      for (const [k, at] of instantsFor(zone, dstDates).entries()) {
        const ctx: StatusContext = { timeZone: zone, dueSoonDays: [0, 7, 30, 45][(z + k) % 4] };
        const oracle = await gatherStatusesAt(db, ids, at, ctx);
        const now = statusNow(at, ctx);
        const res = await db.execute(sql`
          select s.tool_id, ${statusCase(now)} as status,
            ${sql.join(TOOL_STATUSES.map((st) => sql`${statusIn([st], now)} as ${sql.raw(`"is_${st}"`)}`), sql`, `)}
          from tool_states s where s.tool_id = any(${`{${ids.join(",")}}`}::uuid[])`);
        expect(res.rows.length).toBe(ids.length);
        for (const r of res.rows as Record<string, unknown>[]) {
          const want = oracle.get(String(r.tool_id))!.status;
          compared++;
          seen.add(want);
          if (r.status !== want) mismatches.push(`${String(r.tool_id)} at ${at.toISOString()} in ${zone}: SQL ${String(r.status)}, definition ${want}`);
          for (const st of TOOL_STATUSES) if (Boolean(r[`is_${st}`]) !== (st === want)) mismatches.push(`${String(r.tool_id)} at ${at.toISOString()} in ${zone}: filter ${st} is ${String(r[`is_${st}`])}, definition ${want}`);
        }
        // Counts as the home pages show them: by status, and still in calibration due within 7 and 30 days.
        const counts = await countByStatus(db, now, [7, 30]);
        const views = [...oracle.values()];
        const want = Object.fromEntries(TOOL_STATUSES.map((st) => [st, views.filter((v) => v.status === st).length])) as Record<ToolStatus, number>;
        const inCal = (v: ToolStatusView, d: number) => ["in_calibration", "due_soon", "limited"].includes(v.status) && v.daysToDue != null && v.daysToDue >= 0 && v.daysToDue <= d;
        expect(counts.byStatus).toEqual(want);
        expect(counts.dueWithin).toEqual([views.filter((v) => inCal(v, 7)).length, views.filter((v) => inCal(v, 30)).length]);
        // The register's total when filtered by status alone: each status, and several at once.
        const mix: ToolStatus[] = ["overdue", "due_soon", "quarantined"];
        const totals = await db.execute(sql`select ${sql.join(
          TOOL_STATUSES.map((st) => sql`${statusCountSql([st], now)} as ${sql.raw(`"n_${st}"`)}`),
          sql`, `,
        )}, ${statusCountSql(mix, now)} as n_mix`);
        const t = totals.rows[0] as Record<string, unknown>;
        expect(Object.fromEntries(TOOL_STATUSES.map((st) => [st, Number(t[`n_${st}`])]))).toEqual(want);
        expect(Number(t.n_mix)).toBe(mix.reduce((a, st) => a + want[st], 0));
      }
    }
    expect(mismatches.slice(0, 10)).toEqual([]);
    // Thousands of comparisons, and every status reached by some generated history.
    expect(compared).toBeGreaterThan(10_000);
    expect([...seen].sort()).toEqual([...TOOL_STATUSES].sort());
  }, 240_000);

  it("answers each tool's whole status (reasons, due date, uses left, custodian) from its tool_states row exactly as the definition does, now and at past instants", async () => {
    const db = tdb.db;
    for (const { zone, dstDates } of ZONES) {
      const instants = [...instantsFor(zone, dstDates).slice(0, 6), new Date("2025-03-01T10:00:00Z"), new Date("2025-09-15T23:30:00Z")];
      for (const at of instants) {
        const ctx: StatusContext = { timeZone: zone, dueSoonDays: 30 };
        const [fast, oracle] = await Promise.all([statusesFor(db, ids, at, ctx), gatherStatusesAt(db, ids, at, ctx)]);
        expect(fast.size).toBe(ids.length);
        for (const id of ids) expect(fast.get(id), `${id} at ${at.toISOString()}`).toEqual(oracle.get(id));
      }
    }
  }, 240_000);

  it("gives the reminder run what the definition gives (status, due date, days to it, uses left, owner, custodian), from SQL for the present and from the records for a past instant", async () => {
    const db = tdb.db;
    // Some tools owned by a person, as a mechanic's own micrometer is: the plan sends their reminders to the owner.
    const owner = (await db.execute(sql`select id from users where email = 'prop@example.test'`)).rows[0] as { id: string };
    await db.execute(sql`update tools set owner_type = 'personal', owner_user_id = ${owner.id}::uuid where id = any(${`{${ids.filter((_, i) => i % 7 === 3).join(",")}}`}::uuid[])`);
    const facts = new Map(((await db.execute(sql`select id, usage_limit, owner_type, owner_user_id from tools where id = any(${`{${ids.join(",")}}`}::uuid[])`)).rows as Record<string, unknown>[]).map((r) => [String(r.id), r]));
    const every = sql`select unnest(${`{${ids.join(",")}}`}::uuid[])`;
    let settledOnes = 0;
    for (const { zone, dstDates } of ZONES) {
      const instants = [...instantsFor(zone, dstDates).slice(0, 6), new Date("2025-03-01T10:00:00Z"), new Date("2025-09-15T23:30:00Z")];
      for (const at of instants) {
        const ctx: StatusContext = { timeZone: zone, dueSoonDays: 30 };
        const [{ tools: got }, oracle] = await Promise.all([reminderPlanInputs(db, every, at, ctx), gatherStatusesAt(db, ids, at, ctx)]);
        if (at.getTime() > HISTORY_END) settledOnes += got.length;
        expect(got.length).toBe(ids.length);
        const want = (id: string): ToolForReminders => {
          const v = oracle.get(id)!;
          const f = facts.get(id)!;
          return {
            toolId: id,
            status: v.status,
            dueAt: v.dueAt,
            daysToDue: v.daysToDue,
            usageLimit: f.usage_limit == null ? null : Number(f.usage_limit),
            usesRemaining: v.usesRemaining,
            ownerUserId: f.owner_type === "personal" ? String(f.owner_user_id) : null,
            custodian: v.custodian ? { userId: v.custodian.userId, dueBackAt: v.custodian.dueBackAt } : null,
          };
        };
        for (const g of got) expect(g, `${g.toolId} at ${at.toISOString()} in ${zone}`).toEqual(want(g.toolId));
      }
    }
    expect(settledOnes).toBeGreaterThan(1000);
  }, 240_000);

  it("keeps the counts by status equal to the tools counted one by one, through concurrent events, rolled-back ones and folds run meanwhile", async () => {
    const db = tdb.db;
    // The kept counts summed per combination, against tool_states grouped the same way (one row per tool).
    const key = sql.raw("base_status || '|' || coalesce(cal_next_due::text, '-') || '|' || coalesce(cal_result, '-') || '|' || usage_exhausted || '|' || usage_warn");
    const kept = async () =>
      Object.fromEntries(((await db.execute(sql`select ${key} as k, sum(n)::int as n from tool_state_counts group by 1 having sum(n) <> 0 order by 1`)).rows as { k: string; n: number }[]).map((r) => [r.k, Number(r.n)]));
    const counted = async () =>
      Object.fromEntries(((await db.execute(sql`select ${key} as k, count(*)::int as n from tool_states group by 1 order by 1`)).rows as { k: string; n: number }[]).map((r) => [r.k, Number(r.n)]));
    expect(await kept()).toEqual(await counted());

    // Forty transactions at once, each about its own tool: a calibration with a new due date, a quarantine, a lab
    // trip or a retirement; every fifth rolls back. Folds run among them.
    const at = new Date("2026-01-30T09:00:00Z");
    // Tools with no open hold or lab trip (a tool has at most one of each open).
    const chosen = ((await db.execute(sql`select tool_id from tool_states where hold_since is null and lab_since is null order by tool_id limit 40`)).rows as { tool_id: string }[]).map((r) => r.tool_id);
    expect(chosen).toHaveLength(40);
    const lab = await makeLab(db);
    const writes = chosen.map((toolId, i) =>
      db
        .transaction(async (tx) => {
          if (i % 4 === 0) await tx.insert(calibrations).values({ toolId, performedAt: at, decisionRule: "simple", result: "pass", asFoundInTolerance: true, intervalDays: 180, nextDueAt: addDays("2026-07-01", i) });
          else if (i % 4 === 1) await tx.insert(holds).values({ toolId, placedAt: at, reason: "Dropped on the bench" });
          else if (i % 4 === 2) await tx.insert(labShipments).values({ toolId, labId: lab.id, shippedAt: at });
          else await tx.insert(toolLifecycleEvents).values({ toolId, at, lifecycle: "retired", reason: "Demo change" });
          if (i % 5 === 4) throw new Error("roll back");
        })
        .catch((e: Error) => {
          if (e.message !== "roll back") throw e;
        }),
    );
    await Promise.all([...writes, foldToolStateCounts(db), foldToolStateCounts(db), foldToolStateCounts(db)]);
    expect(await kept()).toEqual(await counted());

    // A fold leaves one piece per combination, and the counts are unchanged by it.
    const before = await kept();
    await foldToolStateCounts(db);
    expect(await kept()).toEqual(before);
    const afterFold = await countByStatus(db, statusNow(at, { timeZone: "UTC", dueSoonDays: 30 }));
    expect(afterFold.pieces).toBe(afterFold.combinations);
    expect(foldWanted(afterFold)).toBe(false);
    expect(foldWanted({ pieces: 3 * afterFold.combinations + 300, combinations: afterFold.combinations })).toBe(true);
  });

  it("changes in the same transaction as the event: a quarantine shows inside it, and is gone when the transaction rolls back", async () => {
    const db = tdb.db;
    const tool = await makeTool(db, { assetTag: "P-TX" });
    await db.insert(calibrations).values({ toolId: tool.id, performedAt: new Date("2026-01-10T10:00:00Z"), decisionRule: "simple", result: "pass", asFoundInTolerance: true, intervalDays: 365, nextDueAt: "2027-01-10" });
    const at = new Date("2026-02-01T12:00:00Z");
    const ctx: StatusContext = { timeZone: "America/Chicago", dueSoonDays: 30 };
    const now = statusNow(at, ctx);
    const statusIn_ = async (h: DbOrTx) =>
      ((await h.execute(sql`select ${statusCase(now)} as status from tool_states s where s.tool_id = ${tool.id}::uuid`)).rows[0] as { status: string }).status;
    expect(await statusIn_(db)).toBe("in_calibration");
    const quarantinedBefore = (await countByStatus(db, now)).byStatus.quarantined;
    await expect(
      db.transaction(async (tx) => {
        await tx.insert(holds).values({ toolId: tool.id, placedAt: new Date("2026-01-20T10:00:00Z"), reason: "Dropped" });
        expect(await statusIn_(tx)).toBe("quarantined");
        // The count by status moves inside the transaction too, and back when it rolls back.
        expect((await countByStatus(tx, now)).byStatus.quarantined).toBe(quarantinedBefore + 1);
        throw new Error("roll back");
      }),
    ).rejects.toThrow("roll back");
    expect(await statusIn_(db)).toBe("in_calibration");
    expect((await countByStatus(db, now)).byStatus.quarantined).toBe(quarantinedBefore);
    await db.update(tools).set({ calibrationRequired: false }).where(sql`${tools.id} = ${tool.id}::uuid`);
    expect(await statusIn_(db)).toBe("reference_only");
  });
});
