import { and, desc, eq, gte, lt, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { auditEvents } from "./audit.table";
import { users } from "../users/users.table";
import { pageOffset } from "../../db/paging";
import { insertRows } from "../../db/columns";

export interface AuditEntry {
  actorId: string | null;
  action: string;
  entityType: string;
  entityId: string;
  before?: unknown;
  after?: unknown;
  at?: Date;
}

/** An entry as the row it appends. */
export const auditRow = (e: AuditEntry) => ({
  actorId: e.actorId,
  action: e.action,
  entityType: e.entityType,
  entityId: e.entityId,
  before: (e.before ?? null) as object | null,
  after: (e.after ?? null) as object | null,
  ...(e.at ? { at: e.at } : {}),
});

/** The statement that appends one line to the trail, not yet run: for a write that sends its rows in one statement. */
export const auditInsert = (e: AuditEntry): SQL => insertRows(auditEvents, [auditRow(e)]);

/** Appends one line to the audit trail, inside the caller's transaction. */
export async function recordAudit(tx: DbOrTx, e: AuditEntry): Promise<void> {
  await tx.insert(auditEvents).values(auditRow(e));
}

/** Appends many lines at once (an import of thousands of tools), inside the caller's transaction. */
export async function recordAuditMany(tx: DbOrTx, entries: AuditEntry[]): Promise<void> {
  for (let i = 0; i < entries.length; i += 1000) {
    const chunk = entries.slice(i, i + 1000);
    // Every line needs the same columns in one multi-row insert.
    await tx.insert(auditEvents).values(chunk.map((e) => ({ at: e.at ?? sql`now()`, ...auditRow(e) })));
  }
}

export interface AuditFilter {
  actorId?: string;
  entityType?: string;
  entityId?: string;
  action?: string;
  fromInstant?: SQL;
  toInstantExclusive?: SQL;
  page: number;
  pageSize: number;
  /** A nextCursor: the page starts after that line (the page number is then only shown, not counted). */
  after?: string;
  /** Count at most this many lines for the total. */
  totalCap: number;
}

/** A line's place in the trail's order, as a cursor: its instant in microseconds since 1970 (exact) and its id. */
const cursorOf = sql<string>`(extract(epoch from ${auditEvents.at}) * 1000000)::bigint::text || '_' || ${auditEvents.id}::text`;

/** Lines older than the cursor's, in the trail's order (at, id), newest first: a range of audit_events_at_id_idx. */
function olderThan(cursor: string): SQL {
  const [micros, id] = cursor.split("_");
  return sql`(${auditEvents.at}, ${auditEvents.id}) < (timestamptz 'epoch' + ${micros}::bigint * interval '1 microsecond', ${id}::bigint)`;
}

export const auditRepository = {
  /**
   * A page of the trail, newest first; each filter matches an index (actor, entity, at). By ?after= the page is read
   * on from the line before by keyset, at the same cost however deep; the total counts at most `totalCap` lines (a
   * trail of millions is never counted whole), with `totalCapped` when there are more.
   */
  async list(db: DbOrTx, f: AuditFilter) {
    const where = and(
      f.actorId ? eq(auditEvents.actorId, f.actorId) : undefined,
      f.entityType ? eq(auditEvents.entityType, f.entityType) : undefined,
      f.entityId ? eq(auditEvents.entityId, f.entityId) : undefined,
      f.action ? eq(auditEvents.action, f.action) : undefined,
      f.fromInstant ? gte(auditEvents.at, f.fromInstant) : undefined,
      f.toInstantExclusive ? lt(auditEvents.at, f.toInstantExclusive) : undefined,
    );
    const [rows, counted] = await Promise.all([
      db
        .select({
          id: auditEvents.id,
          at: auditEvents.at,
          actorId: auditEvents.actorId,
          actorName: users.name,
          action: auditEvents.action,
          entityType: auditEvents.entityType,
          entityId: auditEvents.entityId,
          before: auditEvents.before,
          after: auditEvents.after,
          cursor: cursorOf,
        })
        .from(auditEvents)
        .leftJoin(users, eq(users.id, auditEvents.actorId))
        .where(f.after ? and(where, olderThan(f.after)) : where)
        .orderBy(desc(auditEvents.at), desc(auditEvents.id))
        // One line more than the page: whether another page follows.
        .limit(f.pageSize + 1)
        .offset(f.after ? 0 : pageOffset(f.page, f.pageSize)),
      db.execute(sql`select count(*)::int as n from (select 1 from ${auditEvents} where ${where ?? sql`true`} limit ${f.totalCap + 1}) x`),
    ]);
    const n = Number((counted.rows[0] as { n: number }).n);
    const page = rows.slice(0, f.pageSize);
    return {
      items: page.map(({ cursor: _cursor, ...e }) => e),
      total: Math.min(n, f.totalCap),
      totalCapped: n > f.totalCap,
      nextCursor: rows.length > f.pageSize ? page[page.length - 1].cursor : null,
    };
  },

  /** Distinct record types on the trail, by a skip scan over the entity index (fast on millions of lines). */
  async entityTypes(db: DbOrTx): Promise<string[]> {
    const r = await db.execute(sql`
      with recursive t(v) as (
        select min(entity_type) from audit_events
        union all
        select (select min(entity_type) from audit_events where entity_type > t.v) from t where t.v is not null
      ) select v from t where v is not null`);
    return (r.rows as { v: string }[]).map((x) => x.v);
  },
};
