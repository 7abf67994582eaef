import { sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { isoInstant } from "../../db/values";
import { awaitingSignatureOfActivity, openOfActivity } from "../jobs/job-state";
import { notReturnedCount } from "../checkouts/checkouts.repository";
import { undisposedItemsOf } from "../investigations/investigations.repository";
import { statusColumns } from "../tools/tool-states.sql";

type Row = Record<string, unknown>;
const iso = isoInstant;

/** A job summary row: counts of readings and the last one; a sheet is open until an inspector signs it. */
const jobSummary = (r: Row) => ({
  id: String(r.id),
  engineSerial: String(r.engine_serial),
  engineModel: String(r.engine_model),
  workOrder: (r.work_order as string | null) ?? null,
  openedAt: iso(r.opened_at)!,
  readings: Number(r.readings ?? 0),
  lastReadingAt: iso(r.last_reading_at),
});

export const statsRepository = {
  async allToolIds(db: DbOrTx): Promise<string[]> {
    const r = await db.execute(sql`select id from tools`);
    return (r.rows as Row[]).map((x) => String(x.id));
  },

  async openInvestigations(db: DbOrTx): Promise<number> {
    const r = await db.execute(sql`select count(*)::int as n from investigations where status = 'open'`);
    return Number((r.rows[0] as Row).n);
  },

  /** Tools still out on check-out past the time they were due back (the custody list's ?overdue=true). */
  notReturned: (db: DbOrTx, at: Date): Promise<number> => notReturnedCount(db, at),

  /** Tools the person holds on check-out, or owns, each with the columns its status is derived from (statusColumns). */
  async myTools(db: DbOrTx, userId: string) {
    const r = await db.execute(sql`
      select m.relation, ${statusColumns("t", "u")}
      from (
        select t.id, 'personal' as relation from tools t where t.owner_user_id = ${userId}::uuid and t.lifecycle <> 'retired'
        union
        select c.tool_id, 'issued' as relation from checkouts c where c.user_id = ${userId}::uuid and c.returned_at is null
      ) m
      join tools t on t.id = m.id
      left join tool_states s on s.tool_id = t.id
      left join users u on u.id = s.custody_user_id`);
    return r.rows as (Row & { id: string; description: string; relation: "issued" | "personal" })[];
  },

  /**
   * Unsigned check sheets the person opened or took readings on, newest activity first. The person's sheets (from
   * job_people, kept by a trigger, not from their readings) are ranked on their job_activity row alone, one probe each;
   * the sheets themselves are read for the page only.
   */
  async myOpenJobs(db: DbOrTx, userId: string, limit = 50) {
    const r = await db.execute(sql`
      with mine as (
        select p.job_id from job_people p where p.user_id = ${userId}::uuid
        union
        select o.id from jobs o where o.opened_by = ${userId}::uuid
      ), ranked as (
        select m.job_id, a.readings, a.last_reading_at,
          coalesce(a.last_reading_at, (select o.opened_at from jobs o where o.id = m.job_id)) as last_at
        from mine m left join job_activity a on a.job_id = m.job_id
        where ${openOfActivity}
        order by last_at desc, m.job_id
        limit ${limit}
      )
      select j.id, j.engine_serial, j.engine_model, j.work_order, j.opened_at, coalesce(r.readings, 0) as readings, r.last_reading_at
      from ranked r join jobs j on j.id = r.job_id
      order by r.last_at desc, r.job_id`);
    return (r.rows as Row[]).map(jobSummary);
  },

  /** Check sheets with readings and no sign-off covering them (the jobs list's ?status=awaiting_signature). */
  async sheetsAwaitingSignature(db: DbOrTx, limit = 50) {
    const [rows, count] = await Promise.all([
      db.execute(sql`
        select j.id, j.engine_serial, j.engine_model, j.work_order, j.opened_at, a.readings, a.last_reading_at
        from job_activity a join jobs j on j.id = a.job_id where ${awaitingSignatureOfActivity} order by j.opened_at limit ${limit}`),
      db.execute(sql`select count(*)::int as n from job_activity a where ${awaitingSignatureOfActivity}`),
    ]);
    return { items: (rows.rows as Row[]).map(jobSummary), total: Number((count.rows[0] as Row).n) };
  },

  /** Open investigations with affected items that have no disposition yet. */
  async investigationsNeedingDisposition(db: DbOrTx, limit = 50) {
    const pending = undisposedItemsOf(sql`v.id`);
    const [rows, count] = await Promise.all([
      db.execute(sql`
        select v.id, t.asset_tag as tool_tag, s.asset_tag as standard_tag, v.trigger, v.opened_at, ${pending}::int as pending
        from investigations v left join tools t on t.id = v.tool_id left join standards s on s.id = v.standard_id
        where v.status = 'open' and ${pending} > 0
        order by v.opened_at limit ${limit}`),
      db.execute(sql`select count(*)::int as n from investigations v where v.status = 'open' and ${pending} > 0`),
    ]);
    return {
      items: (rows.rows as Row[]).map((r) => ({
        id: String(r.id),
        toolAssetTag: (r.tool_tag as string | null) ?? null,
        standardAssetTag: (r.standard_tag as string | null) ?? null,
        trigger: String(r.trigger),
        openedAt: iso(r.opened_at)!,
        itemsAwaitingDisposition: Number(r.pending),
      })),
      total: Number((count.rows[0] as Row).n),
    };
  },
};
