import { asc, count, eq, ilike, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { labs } from "./labs.table";
import { listPage, pageOffset } from "../../db/paging";

export type LabRow = typeof labs.$inferSelect;

export const labsRepository = {
  findById: (db: DbOrTx, id: string) => db.query.labs.findFirst({ where: eq(labs.id, id) }),
  findByName: (db: DbOrTx, name: string) => db.query.labs.findFirst({ where: sql`lower(${labs.name}) = lower(${name})` }),
  async list(db: DbOrTx, opts: { q?: string; page: number; pageSize: number }) {
    const where = opts.q ? ilike(labs.name, `%${opts.q}%`) : undefined;
    return listPage(
      db.select().from(labs).where(where).orderBy(asc(labs.name)).limit(opts.pageSize).offset(pageOffset(opts.page, opts.pageSize)),
      db.select({ total: count() }).from(labs).where(where),
    );
  },
  insert: async (db: DbOrTx, values: typeof labs.$inferInsert) => (await db.insert(labs).values(values).returning())[0],
};
