import { count, desc, eq, inArray } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { intermediateChecks } from "./checks.table";
import { standards } from "../standards/standards.table";
import { users } from "../users/users.table";
import { listPage, pageOffset } from "../../db/paging";

export type CheckRow = typeof intermediateChecks.$inferSelect;

export const checksRepository = {
  findById: (db: DbOrTx, id: string) => db.query.intermediateChecks.findFirst({ where: eq(intermediateChecks.id, id) }),
  insert: async (db: DbOrTx, values: typeof intermediateChecks.$inferInsert) => (await db.insert(intermediateChecks).values(values).returning())[0],
  async listForTool(db: DbOrTx, toolId: string, page: number, pageSize: number) {
    const where = eq(intermediateChecks.toolId, toolId);
    return listPage(
      db.select().from(intermediateChecks).where(where).orderBy(desc(intermediateChecks.performedAt)).limit(pageSize).offset(pageOffset(page, pageSize)),
      db.select({ total: count() }).from(intermediateChecks).where(where),
    );
  },
  async names(db: DbOrTx, rows: CheckRow[]) {
    const userIds = [...new Set(rows.map((r) => r.performedBy).filter((x): x is string => !!x))];
    const stdIds = [...new Set(rows.map((r) => r.standardId).filter((x): x is string => !!x))];
    const [u, s] = await Promise.all([
      userIds.length ? db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, userIds)) : [],
      stdIds.length ? db.select({ id: standards.id, assetTag: standards.assetTag, name: standards.name }).from(standards).where(inArray(standards.id, stdIds)) : [],
    ]);
    return { users: new Map(u.map((x) => [x.id, x.name])), standards: new Map(s.map((x) => [x.id, x])) };
  },
};
