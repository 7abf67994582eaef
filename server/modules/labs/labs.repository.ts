import { asc, count, eq, ilike, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { labs } from "./labs.table";

export type LabRow = typeof labs.$inferSelect;

export const labsRepository = {
  findById: (db: DbOrTx, id: string) => db.query.labs.findFirst({ where: eq(labs.id, id) }),
  findByName: (db: DbOrTx, name: string) => db.query.labs.findFirst({ where: sql`lower(${labs.name}) = lower(${name})` }),
  async list(db: DbOrTx, opts: { q?: string; page: number; pageSize: number }) {
    const where = opts.q ? ilike(labs.name, `%${opts.q}%`) : undefined;
    const [items, [{ total }]] = await Promise.all([
      db.select().from(labs).where(where).orderBy(asc(labs.name)).limit(opts.pageSize).offset((opts.page - 1) * opts.pageSize),
      db.select({ total: count() }).from(labs).where(where),
    ]);
    return { items, total };
  },
  insert: async (db: DbOrTx, values: typeof labs.$inferInsert) => (await db.insert(labs).values(values).returning())[0],
};
