import { sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { auditRecordPath, type AuditRecordRef } from "../../../shared/audit/labels";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

interface Found {
  id: string;
  title: string;
  tool_tag?: string | null;
  job_id?: string | null;
  standard_id?: string | null;
}

/**
 * Per record type, the query naming its records by what people know them by (a tool's tag, an engine serial,
 * a person's name). Each selects id, title and the keys of its page; `ids` is the uuid list of that type on the page.
 */
const LOOKUPS: Record<string, (ids: SQL) => SQL> = {
  user: (ids) => sql`select u.id::text as id, u.name as title from users u where u.id in (${ids})`,
  family: (ids) => sql`select f.id::text as id, f.name as title from families f where f.id in (${ids})`,
  investigation: (ids) => sql`
    select i.id::text as id, 'Investigation of ' || coalesce(t.asset_tag, s.asset_tag, 'a tool') as title
    from investigations i left join tools t on t.id = i.tool_id left join standards s on s.id = i.standard_id where i.id in (${ids})`,
  job: (ids) => sql`select j.id::text as id, 'Engine ' || j.engine_serial as title from jobs j where j.id in (${ids})`,
  calibration: (ids) => sql`
    select c.id::text as id, 'Calibration of ' || t.asset_tag || ', ' || to_char(c.performed_at at time zone 'UTC', 'YYYY-MM-DD') as title, t.asset_tag as tool_tag
    from calibrations c join tools t on t.id = c.tool_id where c.id in (${ids})`,
  checkout: (ids) => sql`
    select c.id::text as id, t.asset_tag || ' issued to ' || u.name as title, t.asset_tag as tool_tag
    from checkouts c join tools t on t.id = c.tool_id join users u on u.id = c.user_id where c.id in (${ids})`,
  intermediate_check: (ids) => sql`
    select c.id::text as id, 'Check of ' || t.asset_tag as title, t.asset_tag as tool_tag from intermediate_checks c join tools t on t.id = c.tool_id where c.id in (${ids})`,
  tool_hold: (ids) => sql`select h.id::text as id, 'Hold on ' || t.asset_tag as title, t.asset_tag as tool_tag from holds h join tools t on t.id = h.tool_id where h.id in (${ids})`,
  set_element: (ids) => sql`
    select e.id::text as id, t.asset_tag || ' element ' || e.label as title, t.asset_tag as tool_tag from set_elements e join tools t on t.id = e.tool_id where e.id in (${ids})`,
  standard: (ids) => sql`select s.id::text as id, s.asset_tag || ' — ' || s.name as title from standards s where s.id in (${ids})`,
  standard_certificate: (ids) => sql`
    select c.id::text as id, 'Certificate ' || c.number || ' of ' || s.asset_tag as title, s.id::text as standard_id
    from standard_certificates c join standards s on s.id = c.standard_id where c.id in (${ids})`,
  reading: (ids) => sql`
    select r.id::text as id, 'Reading on engine ' || j.engine_serial as title, j.id::text as job_id from readings r join jobs j on j.id = r.job_id where r.id in (${ids})`,
  limit_table: (ids) => sql`select l.id::text as id, l.name || ' (v' || l.version || ')' as title from limit_tables l where l.id in (${ids})`,
  lab_shipment: (ids) => sql`
    select s.id::text as id, t.asset_tag || ' to ' || l.name as title, t.asset_tag as tool_tag
    from lab_shipments s join tools t on t.id = s.tool_id join labs l on l.id = s.lab_id where s.id in (${ids})`,
  lab: (ids) => sql`select l.id::text as id, l.name as title from labs l where l.id in (${ids})`,
  study: (ids) => sql`select g.id::text as id, 'GRR-' || lpad(g.number::text, 4, '0') as title from gauge_studies g where g.id in (${ids})`,
  reminder_run: (ids) => sql`select r.id::text as id, 'Reminder run' as title from reminder_runs r where r.id in (${ids})`,
};

/** The map key of a line's record. */
export const auditRecordKey = (type: string, id: string) => `${type}\u0000${id.toLowerCase()}`;

/**
 * Names the records of a page of the audit trail: one query per record type present (at most a page of ids each),
 * so the trail shows "Engine HF-1042" or "MIC-0106" linked to its page instead of an id.
 */
export async function describeAuditRecords(db: DbOrTx, lines: { entityType: string; entityId: string }[]): Promise<Map<string, AuditRecordRef>> {
  const out = new Map<string, AuditRecordRef>();
  const key = auditRecordKey;
  const byType = new Map<string, Set<string>>();
  for (const l of lines) {
    if (l.entityType === "tool") out.set(key("tool", l.entityId), { title: l.entityId, path: auditRecordPath("tool", { id: l.entityId }) });
    else if (l.entityType === "settings") out.set(key("settings", l.entityId), { title: "Shop settings", path: auditRecordPath("settings", { id: l.entityId }) });
    else if (l.entityType === "file") out.set(key("file", l.entityId), { title: l.entityId.split("/").pop() ?? "File", path: null });
    else if (LOOKUPS[l.entityType] && UUID.test(l.entityId)) {
      const set = byType.get(l.entityType) ?? new Set<string>();
      set.add(l.entityId.toLowerCase());
      byType.set(l.entityType, set);
    }
  }
  for (const [type, ids] of byType) {
    const list = sql.join([...ids].map((id) => sql`${id}::uuid`), sql`, `);
    const rows = (await db.execute(LOOKUPS[type](list))).rows as unknown as Found[];
    for (const r of rows) {
      out.set(key(type, r.id), { title: r.title, path: auditRecordPath(type, { id: r.id, toolTag: r.tool_tag, jobId: r.job_id, standardId: r.standard_id }) });
    }
  }
  return out;
}

