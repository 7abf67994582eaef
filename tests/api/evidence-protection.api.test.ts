import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import pg from "pg";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { loadConfig } from "../../server/config";
import { fixedClock } from "../../server/platform/clock";
import { seedDemoOnce } from "../../server/seed";
import { memoryMailer, memoryStorage } from "../support/test-app";
import { makeJob, makeLimitTable, signJob } from "../support/factories-investigations";
import { makeTool, makeLab } from "../support/factories";
import { holds, labShipments, setElements, storedFiles, checkouts, checkoutRefusals, investigations, investigationItems, intervalDecisions } from "../../server/db/schema";
import { OWNER_ROLE, RUNTIME_GROUP, TRIGGER_KEPT_TABLES, prepareDatabase } from "../../server/db/roles";

// Evidence is held by the database, not by the app's good manners: the app runs as a role that owns
// nothing, may not TRUNCATE, disable a trigger or switch triggers off for its session; every evidence
// table refuses UPDATE and DELETE; every closed or signed record refuses any change. The protected tables
// are found in the catalog (every table with a tenthwise_* trigger), so a table another branch protects
// with tenthwise_protect_append_only / tenthwise_protect_closed is tried here too.

let database: TestDatabase;
let owner: pg.Client;

/** Rows that are closed, per table protected by a "closed" rule (a table protected later names its own here). */
const CLOSED_ROWS: Record<string, string> = {
  investigations: "status = 'closed'",
  investigation_items: "investigation_id in (select id from investigations where status = 'closed')",
  jobs: "id in (select job_id from job_signoffs)",
  limit_tables: "id in (select limit_table_id from jobs)",
  limit_items: "limit_table_id in (select limit_table_id from jobs)",
  standard_certificates: "true",
  holds: "released_at is not null",
  checkouts: "returned_at is not null",
  lab_shipments: "received_at is not null",
  set_elements: "rejected_at is not null",
  stored_files: "claimed_by is not null",
};

beforeAll(async () => {
  database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: database.url, SESSION_SECRET: "evidence-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
  await seedDemoOnce({ db: database.db, clock: fixedClock("2026-06-15T15:00:00Z"), config, mailer: memoryMailer(), storage: memoryStorage() }, "tenthwise-demo");
  // Closed records the demo does not hold, made the way the app makes them.
  const db = database.db;
  const [crib] = (await db.execute(sql`select id from users where role = 'crib' limit 1`)).rows as { id: string }[];
  const [inspector] = (await db.execute(sql`select id from users where role = 'inspector' limit 1`)).rows as { id: string }[];
  const tool = await makeTool(db, { assetTag: "EVID-01" });
  const [hold] = await db.insert(holds).values({ toolId: tool.id, placedAt: new Date("2026-06-01T15:00:00Z"), reason: "Dropped" }).returning();
  await db.update(holds).set({ releasedAt: new Date("2026-06-02T15:00:00Z"), releaseReason: "Checked" }).where(sql`id = ${hold.id}`);
  const [co] = await db.insert(checkouts).values({ toolId: tool.id, userId: crib.id, issuedAt: new Date("2026-06-03T15:00:00Z"), dueBackAt: new Date("2026-06-03T23:00:00Z") }).returning();
  await db.update(checkouts).set({ returnedAt: new Date("2026-06-03T20:00:00Z"), returnCondition: "ok" }).where(sql`id = ${co.id}`);
  await db.insert(checkoutRefusals).values({ toolId: tool.id, userId: crib.id, refusedBy: crib.id, at: new Date("2026-06-03T14:00:00Z"), code: "tool_not_usable", reason: "Quarantined" });
  const [inv] = await db.insert(investigations).values({ toolId: tool.id, trigger: "lost", openedAt: new Date("2026-06-07T15:00:00Z"), windowEnd: new Date("2026-06-07T15:00:00Z") }).returning();
  await db.insert(investigationItems).values({ investigationId: inv.id, toolId: tool.id, verdictCouldChange: false, basis: "No reading in the window" });
  await db.update(investigations).set({ status: "closed", closedAt: new Date("2026-06-08T15:00:00Z"), closingSummary: "Nothing affected" }).where(sql`id = ${inv.id}`);
  await db.insert(intervalDecisions).values({ familyId: tool.familyId, decidedBy: crib.id, decidedAt: new Date("2026-06-08T15:00:00Z"), previousIntervalDays: 365, newIntervalDays: 180, method: "engineering_judgement", rationale: "Two failures in a row", data: {} });
  const lab = await makeLab(db);
  const [ship] = await db.insert(labShipments).values({ toolId: tool.id, labId: lab.id, shippedAt: new Date("2026-06-04T15:00:00Z") }).returning();
  await db.update(labShipments).set({ receivedAt: new Date("2026-06-05T15:00:00Z") }).where(sql`id = ${ship.id}`);
  const [el] = await db.insert(setElements).values({ toolId: tool.id, label: "0.010", nominal: "0.010" }).returning();
  await db.update(setElements).set({ rejectedAt: new Date("2026-06-06T15:00:00Z"), rejectedReason: "Kinked" }).where(sql`id = ${el.id}`);
  await db.insert(storedFiles).values({ key: "calibration-certificates/evid-01.pdf", purpose: "calibration_certificate", contentType: "application/pdf", size: 10, fileName: "c.pdf", uploadedAt: new Date(), claimedBy: "calibration:x", claimedAt: new Date() });
  const { table } = await makeLimitTable(db);
  const job = await makeJob(db, table.id);
  await signJob(db, job.id, inspector.id, "2026-06-10T15:00:00Z");
  owner = new pg.Client({ connectionString: database.ownerUrl });
  await owner.connect();
}, 120_000);
afterAll(async () => {
  await owner?.end();
  await database?.drop();
});

/** The PostgreSQL error code and message a statement run as the app's role ends with, or null if it ran. */
async function refusal(statement: string, client?: pg.Client): Promise<{ code: string; message: string } | null> {
  try {
    if (client) await client.query(statement);
    else await database.db.execute(sql.raw(statement));
    return null;
  } catch (e) {
    let err = e as { code?: string; message: string; cause?: unknown };
    while (!err.code && err.cause) err = err.cause as typeof err;
    return { code: String(err.code), message: err.message };
  }
}

async function protectedTables() {
  const rows = (
    await database.db.execute(sql`
      select c.relname as table, string_agg(distinct tg.tgname, ',') as triggers
      from pg_trigger tg join pg_class c on c.oid = tg.tgrelid join pg_proc p on p.oid = tg.tgfoid join pg_namespace n on n.oid = c.relnamespace
      where n.nspname = 'public' and not tg.tgisinternal and p.proname like 'tenthwise\\_%'
      group by c.relname order by c.relname`)
  ).rows as { table: string; triggers: string }[];
  return rows.map((r) => {
    const triggers = r.triggers.split(",");
    return { table: r.table, triggers, appendOnly: triggers.includes(`${r.table}_append_only`), closed: triggers.includes(`${r.table}_closed`) };
  });
}

describe("the app's database role", () => {
  it("is no superuser, creates no roles or databases, owns no table, and may not truncate, reference or trigger any table", async () => {
    const [me] = (await database.db.execute(sql`select current_user as name, rolsuper, rolcreaterole, rolcreatedb, rolbypassrls, rolreplication from pg_roles where rolname = current_user`)).rows as Record<string, unknown>[];
    expect(me).toMatchObject({ rolsuper: false, rolcreaterole: false, rolcreatedb: false, rolbypassrls: false, rolreplication: false });
    const owned = (await database.db.execute(sql`select relname from pg_class c join pg_namespace n on n.oid = c.relnamespace where n.nspname = 'public' and pg_get_userbyid(c.relowner) <> ${OWNER_ROLE} and c.relkind in ('r','p','v','m','S')`)).rows;
    expect(owned).toEqual([]);
    const extra = (
      await database.db.execute(sql`
        select tablename from pg_tables where schemaname = 'public'
          and (has_table_privilege(current_user, format('%I.%I', schemaname, tablename), 'TRUNCATE') or has_table_privilege(current_user, format('%I.%I', schemaname, tablename), 'TRIGGER')
               or has_table_privilege(current_user, format('%I.%I', schemaname, tablename), 'REFERENCES'))`)
    ).rows;
    expect(extra).toEqual([]);
  });

  it("may not switch triggers off for its session, create a table, or act as the owner", async () => {
    expect(await refusal("set session_replication_role = replica")).toMatchObject({ code: "42501" });
    expect(await refusal("create table sneaky (x int)")).toMatchObject({ code: "42501" });
    expect(await refusal(`set role ${OWNER_ROLE}`)).toMatchObject({ code: "42501" });
  });

  it("is granted every table a later migration adds, as the owner creates it (default privileges)", async () => {
    await owner.query("create table later_branch_table (id int primary key, note text)");
    try {
      await database.db.execute(sql`insert into later_branch_table values (1, 'granted')`);
      expect((await database.db.execute(sql`select note from later_branch_table`)).rows).toEqual([{ note: "granted" }]);
      expect(await refusal("truncate later_branch_table")).toMatchObject({ code: "42501" });
    } finally {
      await owner.query("drop table later_branch_table");
    }
    const members = (await owner.query(`select pg_has_role('tenthwise_app', '${RUNTIME_GROUP}', 'member') as m`)).rows[0];
    expect(members).toEqual({ m: true });
  });

  it("only reads the tables the database keeps by its own triggers (each tool's status inputs, each sheet's activity and people), also after the app is started again", async () => {
    const writable = async () =>
      (
        await database.db.execute(sql`
          select t from unnest(${`{${TRIGGER_KEPT_TABLES.join(",")}}`}::text[]) t
          where has_table_privilege(current_user, t, 'INSERT') or has_table_privilege(current_user, t, 'UPDATE') or has_table_privilege(current_user, t, 'DELETE')
             or not has_table_privilege(current_user, t, 'SELECT')`)
      ).rows;
    expect(await writable()).toEqual([]);
    // Every start grants the app the tables (and those later migrations add); the trigger-kept ones stay read-only.
    await prepareDatabase({ adminUrl: database.adminUrl, database: database.name, migrate: false });
    expect(await writable()).toEqual([]);
    expect(await refusal("update job_activity set readings = 0")).toMatchObject({ code: "42501" });
    expect(await refusal("delete from tool_states")).toMatchObject({ code: "42501" });
    expect(await refusal("insert into job_people (job_id, user_id) select id, opened_by from jobs limit 1")).toMatchObject({ code: "42501" });
  });
});

describe("evidence and closed records refuse change at the database", () => {
  it("the protected tables include every evidence table and every closed or signed record", async () => {
    const tables = (await protectedTables()).map((t) => t.table);
    for (const t of ["audit_events", "calibrations", "calibration_points", "calibration_reviews", "intermediate_checks", "readings", "reading_tools", "job_signoffs", "dispositions", "tool_lifecycle_events", "investigations", "investigation_items", "jobs", "limit_items", "standard_certificates", "holds", "checkouts", "lab_shipments"]) {
      expect(tables, t).toContain(t);
    }
  });

  it("every protected table refuses TRUNCATE, ALTER TABLE … DISABLE TRIGGER and dropping its trigger from the app's role, and TRUNCATE even from the owner", async () => {
    const tables = await protectedTables();
    for (const { table, triggers } of tables) {
      expect(triggers, `${table} guards TRUNCATE`).toContain(`${table}_never_emptied`);
      expect(await refusal(`truncate "${table}" cascade`), `truncate ${table}`).toMatchObject({ code: "42501" });
      expect(await refusal(`alter table "${table}" disable trigger all`), `disable trigger on ${table}`).toMatchObject({ code: "42501" });
      expect(await refusal(`alter table "${table}" disable trigger "${triggers[0]}"`), `disable ${triggers[0]}`).toMatchObject({ code: "42501" });
      expect(await refusal(`drop trigger "${triggers[0]}" on "${table}"`), `drop trigger on ${table}`).toMatchObject({ code: "42501" });
      expect(await refusal(`truncate "${table}" cascade`, owner), `owner truncates ${table}`).toMatchObject({ code: "P0001" });
    }
  });

  it("every append-only table refuses UPDATE and DELETE of its rows", async () => {
    const tables = (await protectedTables()).filter((t) => t.appendOnly);
    expect(tables.length).toBeGreaterThanOrEqual(13);
    for (const { table } of tables) {
      const [{ n }] = (await database.db.execute(sql.raw(`select count(*)::int as n from "${table}"`))).rows as { n: number }[];
      if (n === 0) await expect.soft(n, `${table} holds a row to try (the demo shop or this file must make one)`).toBeGreaterThan(0);
      const row = `ctid = (select ctid from "${table}" limit 1)`;
      const col = ((await database.db.execute(sql`select column_name from information_schema.columns where table_name = ${table} order by ordinal_position limit 1`)).rows[0] as { column_name: string }).column_name;
      expect(await refusal(`update "${table}" set "${col}" = "${col}" where ${row}`), `update ${table}`).toMatchObject({ code: "P0001", message: expect.stringMatching(/^record_signed/) });
      expect(await refusal(`delete from "${table}" where ${row}`), `delete ${table}`).toMatchObject({ code: "P0001" });
    }
  });

  it("every closed or signed record refuses UPDATE and DELETE", async () => {
    const tables = (await protectedTables()).filter((t) => t.closed);
    expect(tables.length).toBeGreaterThanOrEqual(11);
    for (const { table } of tables) {
      const closed = CLOSED_ROWS[table];
      expect(closed, `tests/api/evidence-protection.api.test.ts names which rows of ${table} are closed`).toBeDefined();
      const row = `ctid = (select ctid from "${table}" where ${closed} limit 1)`;
      const [{ n }] = (await database.db.execute(sql.raw(`select count(*)::int as n from "${table}" where ${closed}`))).rows as { n: number }[];
      expect(n, `${table} holds a closed row to try`).toBeGreaterThan(0);
      const cols = ((await database.db.execute(sql`select column_name from information_schema.columns where table_name = ${table} and column_name <> 'id' order by ordinal_position`)).rows as { column_name: string }[]).map((c) => c.column_name);
      // Each column in turn: no part of a closed record may change (a no-op assignment still fires the rule where it must).
      const changeable = cols.filter((c) => !(table === "investigations" && c === "finding"));
      for (const col of changeable.slice(0, 4)) {
        const r = await refusal(`update "${table}" set "${col}" = "${col}" where ${row}`);
        if (r === null) {
          // Rules that compare old and new let a no-op through; a real change must still be refused.
          const type = ((await database.db.execute(sql`select data_type from information_schema.columns where table_name = ${table} and column_name = ${col}`)).rows[0] as { data_type: string }).data_type;
          const changed = type.includes("timestamp") ? `"${col}" + interval '1 day'` : type === "text" ? `coalesce("${col}", '') || 'x'` : type === "boolean" ? `not coalesce("${col}", false)` : type === "integer" || type === "numeric" ? `coalesce("${col}", 0) + 1` : null;
          if (changed) expect(await refusal(`update "${table}" set "${col}" = ${changed} where ${row}`), `change ${table}.${col}`).toMatchObject({ code: "P0001" });
        } else expect(r, `update ${table}.${col}`).toMatchObject({ code: "P0001" });
      }
      expect(await refusal(`delete from "${table}" where ${row}`), `delete ${table}`).toMatchObject({ code: "P0001" });
    }
  });

  it("an open hold may still be released and an open checkout returned: closing is the one change an open record takes", async () => {
    const tool = await makeTool(database.db, { assetTag: "EVID-02" });
    const [hold] = await database.db.insert(holds).values({ toolId: tool.id, placedAt: new Date("2026-06-01T15:00:00Z"), reason: "Dropped" }).returning();
    expect(await refusal(`update holds set released_at = now(), release_reason = 'Checked' where id = '${hold.id}'`)).toBeNull();
    expect(await refusal(`update holds set release_reason = 'Changed my mind' where id = '${hold.id}'`)).toMatchObject({ code: "P0001", message: expect.stringMatching(/^record_closed/) });
  });
});
