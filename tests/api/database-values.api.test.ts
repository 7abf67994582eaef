import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { isoInstant, pgArray } from "../../server/db/values";
import { columnsOf, insertRows } from "../../server/db/columns";
import { auditEvents } from "../../server/modules/audit/audit.table";

// Values read and written as PostgreSQL's own text. The reference for each check is PostgreSQL itself
// (its epoch of an instant and its parsing of array literals, PostgreSQL 15 manual §8.5 and §8.15.6) and
// ECMA-262's time value, which holds whole milliseconds (§21.4.1.1).

let database: TestDatabase;
beforeAll(async () => {
  database = await createTestDatabase({ max: 2 });
});
afterAll(async () => {
  await database?.drop();
});

describe("values as the database writes them", () => {
  it("a recorded instant reads back as the same instant to the millisecond, with or without fractions of a second", async () => {
    const res = await database.db.execute(sql`
      select t::text as raw, t as value, floor(extract(epoch from t) * 1000)::bigint::text as ms
      from unnest(array['2026-01-16 20:24:04.317721+00', '2026-12-03 05:24:15.2+00', '2026-03-08 08:00:00+00',
                        '1999-12-31 23:59:59.999999+00', '2026-11-01 06:59:59.000999+00']::timestamptz[]) as t`);
    const rows = res.rows as { raw: string; value: unknown; ms: string }[];
    expect(rows).toHaveLength(5);
    for (const r of rows) {
      expect(isoInstant(r.value)).toBe(new Date(Number(r.ms)).toISOString());
      expect(isoInstant(r.raw)).toBe(new Date(Number(r.ms)).toISOString());
    }
    // Another zone's offset, and a Date, go the long way and agree.
    expect(isoInstant("2026-07-01 07:05:00-05")).toBe("2026-07-01T12:05:00.000Z");
    expect(isoInstant(new Date("2026-07-01T12:05:00Z"))).toBe("2026-07-01T12:05:00.000Z");
    expect(isoInstant(null)).toBeNull();
  });

  it("a list sent as one array arrives element for element, quotes, commas, braces and the word NULL included", async () => {
    const values = ["J001", 'a "quoted" item', "back\\slash", "comma, and {braces}", "NULL", "", " spaced "];
    const res = await database.db.execute(sql`select x, x is null as missing from unnest(${pgArray(values)}::text[]) with ordinality as u(x, n) order by n`);
    const rows = res.rows as { x: string | null; missing: boolean }[];
    expect(rows.map((r) => r.x)).toEqual(values);
    expect(rows.some((r) => r.missing)).toBe(false);
  });

  it("a row written and read back as SQL is the row the query builder writes and reads: instants, JSON, nulls and text alike", async () => {
    const db = database.db;
    const at = new Date("2026-03-08T08:00:00.123Z");
    const after = { values: ["2.5001", "2.5002"], note: 'a "quoted" word, a comma', nested: { n: 1.25, none: null } };
    const [id1, id2] = ["b1a2c3d4-0000-4000-8000-000000000001", "b1a2c3d4-0000-4000-8000-000000000002"];
    // The same line twice: once as the SQL helper writes it, once through the query builder.
    await db.execute(insertRows(auditEvents, [{ actorId: null, action: "check.sql", entityType: "reading", entityId: id1, before: null, after, at }]));
    await db.insert(auditEvents).values({ actorId: null, action: "check.builder", entityType: "reading", entityId: id2, before: null, after, at });
    const cols = columnsOf(auditEvents, "e", "line.");
    const viaSql = await db.execute(sql`select ${cols.list} from audit_events e where e.entity_id in (${id1}, ${id2}) order by e.action`);
    const viaBuilder = await db.select().from(auditEvents).orderBy(auditEvents.action);
    const read = (viaSql.rows as Record<string, unknown>[]).map(cols.read);
    expect(read).toHaveLength(2);
    for (const [i, r] of read.entries()) {
      const b = viaBuilder.find((x) => x.entityId === r.entityId)!;
      expect(r).toEqual(b);
      expect(r.at).toEqual(at);
      expect(r.after).toEqual(after);
      expect(r.before).toBeNull();
      expect(r.action).toBe(i === 0 ? "check.builder" : "check.sql");
    }
  });
});
