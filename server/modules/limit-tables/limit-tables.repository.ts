import { and, asc, count, desc, eq, ilike, inArray, isNull, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { limitTables, limitItems } from "./limit-tables.table";
import { users } from "../users/users.table";
import { listPage, pageOffset } from "../../db/paging";

export type LimitTableRow = typeof limitTables.$inferSelect;
export type LimitItemRow = typeof limitItems.$inferSelect;

const newer = alias(limitTables, "newer");

const summaryColumns = {
  table: limitTables,
  supersededById: newer.id,
  creatorName: users.name,
  itemCount: sql<number>`(select count(*)::int from ${limitItems} where ${limitItems.limitTableId} = ${limitTables.id})`,
};

function summaryQuery(db: DbOrTx) {
  return db
    .select(summaryColumns)
    .from(limitTables)
    .leftJoin(newer, eq(newer.supersedesId, limitTables.id))
    .leftJoin(users, eq(users.id, limitTables.createdBy));
}
export type LimitTableSummaryRow = Awaited<ReturnType<ReturnType<typeof summaryQuery>["execute"]>>[number];

const SORTS: Record<string, SQL[]> = {
  name: [asc(limitTables.name), desc(limitTables.version)],
  "-name": [desc(limitTables.name), desc(limitTables.version)],
  engineModel: [asc(limitTables.engineModel), asc(limitTables.name), desc(limitTables.version)],
  "-engineModel": [desc(limitTables.engineModel), asc(limitTables.name), desc(limitTables.version)],
  createdAt: [asc(limitTables.createdAt)],
  "-createdAt": [desc(limitTables.createdAt)],
};

export const limitTablesRepository = {
  async list(db: DbOrTx, q: { q?: string; engineModel?: string; current?: boolean; sort: string; page: number; pageSize: number }) {
    const where = and(
      q.q ? or(ilike(limitTables.name, `%${q.q}%`), ilike(limitTables.engineModel, `%${q.q}%`), ilike(limitTables.sourceDocument, `%${q.q}%`)) : undefined,
      q.engineModel ? eq(limitTables.engineModel, q.engineModel) : undefined,
      q.current === true ? isNull(newer.id) : q.current === false ? sql`${newer.id} is not null` : undefined,
    );
    return listPage(
      summaryQuery(db).where(where).orderBy(...SORTS[q.sort]).limit(q.pageSize).offset(pageOffset(q.page, q.pageSize)),
      db.select({ total: count() }).from(limitTables).leftJoin(newer, eq(newer.supersedesId, limitTables.id)).where(where),
    );
  },
  async summary(db: DbOrTx, id: string) {
    const [row] = await summaryQuery(db).where(eq(limitTables.id, id));
    return row;
  },
  items: (db: DbOrTx, tableId: string) => db.select().from(limitItems).where(eq(limitItems.limitTableId, tableId)).orderBy(asc(limitItems.seq)),
  itemsOf: (db: DbOrTx, tableIds: string[]) =>
    tableIds.length ? db.select().from(limitItems).where(inArray(limitItems.limitTableId, tableIds)).orderBy(asc(limitItems.seq)) : Promise.resolve([]),
  async insert(db: DbOrTx, table: typeof limitTables.$inferInsert, items: Omit<typeof limitItems.$inferInsert, "limitTableId">[]) {
    const [row] = await db.insert(limitTables).values(table).returning();
    await db.insert(limitItems).values(items.map((it) => ({ ...it, limitTableId: row.id })));
    return row;
  },
  /** Locks the table row while a revision is made, so two revisions of one table cannot both succeed. */
  async lockForRevision(db: DbOrTx, id: string) {
    const res = await db.execute(sql`select id, version from limit_tables where id = ${id} for update`);
    return res.rows[0] as { id: string; version: number } | undefined;
  },
  /** Holds off a revision of the table until the caller's transaction ends (a job opening on it). */
  async lockAgainstRevision(db: DbOrTx, id: string) {
    await db.execute(sql`select id from limit_tables where id = ${id} for share`);
  },
  async revisionOf(db: DbOrTx, id: string) {
    const [row] = await db.select({ id: limitTables.id }).from(limitTables).where(eq(limitTables.supersedesId, id));
    return row;
  },
};
