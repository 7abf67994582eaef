import { and, asc, count, eq, ilike, or, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { users } from "./users.table";
import { listPage, pageOffset } from "../../db/paging";

export type UserRow = typeof users.$inferSelect;

export const usersRepository = {
  findByEmail: (db: DbOrTx, email: string) => db.query.users.findFirst({ where: eq(users.email, email.toLowerCase()) }),
  findById: (db: DbOrTx, id: string) => db.query.users.findFirst({ where: eq(users.id, id) }),
  async list(db: DbOrTx, opts: { q?: string; role?: string; active?: boolean; page: number; pageSize: number }) {
    const where = and(
      opts.q ? or(ilike(users.name, `%${opts.q}%`), ilike(users.email, `%${opts.q}%`), eq(users.badgeCode, opts.q)) : undefined,
      opts.role ? eq(users.role, opts.role as UserRow["role"]) : undefined,
      opts.active === undefined ? undefined : eq(users.active, opts.active),
    );
    return listPage(
      db.select().from(users).where(where).orderBy(asc(users.name)).limit(opts.pageSize).offset(pageOffset(opts.page, opts.pageSize)),
      db.select({ total: count() }).from(users).where(where),
    );
  },
  insert: async (db: DbOrTx, values: typeof users.$inferInsert) => (await db.insert(users).values(values).returning())[0],
  update: async (db: DbOrTx, id: string, values: Partial<typeof users.$inferInsert>) =>
    (await db.update(users).set(values).where(eq(users.id, id)).returning())[0],
  /** Ends every stored session of a person (connect-pg-simple's table). */
  async deleteSessions(db: DbOrTx, userId: string) {
    await db.execute(sql`delete from "session" where sess -> 'passport' ->> 'user' = ${userId}`);
  },
};
