import { and, desc, eq, gte, lt, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { auditEvents } from "./audit.table";
import { users } from "../users/users.table";
import { listPage, pageOffset } from "../../db/paging";
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
}

export const auditRepository = {
  /** A page of the trail, newest first; each filter matches an index (actor, entity, at). */
  async list(db: DbOrTx, f: AuditFilter) {
    const where = and(
      f.actorId ? eq(auditEvents.actorId, f.actorId) : undefined,
      f.entityType ? eq(auditEvents.entityType, f.entityType) : undefined,
      f.entityId ? eq(auditEvents.entityId, f.entityId) : undefined,
      f.action ? eq(auditEvents.action, f.action) : undefined,
      f.fromInstant ? gte(auditEvents.at, f.fromInstant) : undefined,
      f.toInstantExclusive ? lt(auditEvents.at, f.toInstantExclusive) : undefined,
    );
    return listPage(
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
        })
        .from(auditEvents)
        .leftJoin(users, eq(users.id, auditEvents.actorId))
        .where(where)
        .orderBy(desc(auditEvents.at), desc(auditEvents.id))
        .limit(f.pageSize)
        .offset(pageOffset(f.page, f.pageSize)),
      db.select({ total: sql<number>`count(*)::int` }).from(auditEvents).where(where),
    );
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
