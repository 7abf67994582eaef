import { and, asc, count, eq, ilike, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { families } from "./families.table";
import { tools } from "../tools/tools.table";
import { listPage, pageOffset } from "../../db/paging";

export type FamilyRow = typeof families.$inferSelect;

// Written with table names: in a one-table select Drizzle renders columns bare, and a bare "id" inside the
// subquery would be the tool's own id (so every family counted 0 tools).
const toolCount = sql<number>`(select count(*)::int from tools t where t.family_id = families.id)`;

export const familiesRepository = {
  findById: (db: DbOrTx, id: string) => db.query.families.findFirst({ where: eq(families.id, id) }),
  findByName: (db: DbOrTx, name: string) => db.query.families.findFirst({ where: sql`lower(${families.name}) = lower(${name})` }),
  async countTools(db: DbOrTx, id: string) {
    const [{ n }] = await db.select({ n: count() }).from(tools).where(eq(tools.familyId, id));
    return n;
  },
  async list(db: DbOrTx, opts: { q?: string; kind?: FamilyRow["kind"]; page: number; pageSize: number }) {
    const where = and(opts.q ? ilike(families.name, `%${opts.q}%`) : undefined, opts.kind ? eq(families.kind, opts.kind) : undefined);
    return listPage(
      db
        .select({ family: families, toolCount })
        .from(families)
        .where(where)
        .orderBy(asc(families.name))
        .limit(opts.pageSize)
        .offset(pageOffset(opts.page, opts.pageSize)),
      db.select({ total: count() }).from(families).where(where),
    );
  },
  insert: async (db: DbOrTx, values: typeof families.$inferInsert) => (await db.insert(families).values(values).returning())[0],
  update: async (db: DbOrTx, id: string, values: Partial<typeof families.$inferInsert>) =>
    (await db.update(families).set(values).where(eq(families.id, id)).returning())[0],
};
