import { and, asc, count, desc, eq, ilike, inArray, isNotNull, isNull, lt, not, or, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { checkoutRefusals, checkouts } from "./checkouts.table";
import { tools } from "../tools/tools.table";
import { families } from "../families/families.table";
import { users } from "../users/users.table";
import { standards } from "../standards/standards.table";
import { intermediateChecks } from "../checks/checks.table";
import { listPage, pageOffset } from "../../db/paging";

export type CheckoutRow = typeof checkouts.$inferSelect;
export type ToolRow = typeof tools.$inferSelect;

const person = alias(users, "person");
const issuer = alias(users, "issuer");
const returner = alias(users, "returner");

const viewColumns = {
  checkout: checkouts,
  tool: { id: tools.id, assetTag: tools.assetTag, description: tools.description, unit: tools.unit, rangeMin: tools.rangeMin, rangeMax: tools.rangeMax },
  person: { id: person.id, name: person.name, email: person.email },
  issuedByName: issuer.name,
  returnedByName: returner.name,
};
export type CheckoutViewRow = {
  checkout: CheckoutRow;
  tool: { id: string; assetTag: string; description: string; unit: "in" | "mm"; rangeMin: string; rangeMax: string };
  person: { id: string; name: string; email: string };
  issuedByName: string | null;
  returnedByName: string | null;
};

function viewQuery(db: DbOrTx) {
  return db
    .select(viewColumns)
    .from(checkouts)
    .innerJoin(tools, eq(tools.id, checkouts.toolId))
    .innerJoin(person, eq(person.id, checkouts.userId))
    .leftJoin(issuer, eq(issuer.id, checkouts.issuedBy))
    .leftJoin(returner, eq(returner.id, checkouts.returnedBy));
}

export interface CheckoutFilter {
  open?: boolean;
  userId?: string;
  /** true: not back by the time it was due back at `at`; false: back, or not yet due back. */
  overdue?: boolean;
  at: Date;
  assetTag?: string;
  q?: string;
  sort?: string;
  page: number;
  pageSize: number;
}

const SORTS: Record<string, SQL | ReturnType<typeof asc>> = {
  dueBackAt: asc(checkouts.dueBackAt),
  "-dueBackAt": desc(checkouts.dueBackAt),
  issuedAt: asc(checkouts.issuedAt),
  "-issuedAt": desc(checkouts.issuedAt),
  assetTag: asc(tools.assetTag),
  "-assetTag": desc(tools.assetTag),
  person: asc(person.name),
  "-person": desc(person.name),
};

/**
 * A tool not returned: still out on check-out after the time it was due back. The one definition behind the
 * custody list's ?overdue=true, each checkout's notBackInTime and the overview's "not returned" count.
 * (Served by the partial index checkouts_open_due_idx.)
 */
export const notReturnedBy = (at: Date): SQL => and(isNull(checkouts.returnedAt), lt(checkouts.dueBackAt, at))!;
export const isNotReturned = (c: Pick<CheckoutRow, "returnedAt" | "dueBackAt">, at: Date) => c.returnedAt == null && c.dueBackAt.getTime() < at.getTime();

/** How many tools are not returned at `at`. */
export async function notReturnedCount(db: DbOrTx, at: Date): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(checkouts).where(notReturnedBy(at));
  return n;
}

export const checkoutsRepository = {
  /** A tool by its asset tag as scanned or typed (labels print upper case; a typed lower-case tag still finds it). */
  async findToolByTag(db: DbOrTx, tag: string): Promise<ToolRow | undefined> {
    const t = tag.trim();
    const rows = await db.select().from(tools).where(inArray(tools.assetTag, [...new Set([t, t.toUpperCase()])])).limit(1);
    return rows[0];
  },

  findToolById: async (db: DbOrTx, id: string): Promise<ToolRow | undefined> => (await db.select().from(tools).where(eq(tools.id, id)))[0],

  async findToolsByTags(db: DbOrTx, tags: string[]): Promise<ToolRow[]> {
    const wanted = [...new Set(tags.flatMap((t) => [t.trim(), t.trim().toUpperCase()]))];
    return db.select().from(tools).where(inArray(tools.assetTag, wanted));
  },

  /** The check tolerance of the tool's family (the permissible deviation of a zero or pre-use check), else its MPE. */
  async checkToleranceOf(db: DbOrTx, familyId: string): Promise<string | null> {
    const [f] = await db.select({ tol: families.checkTolerance, mpe: families.mpe }).from(families).where(eq(families.id, familyId));
    return f?.tol ?? f?.mpe ?? null;
  },

  async standardExists(db: DbOrTx, id: string) {
    const [s] = await db.select({ id: standards.id }).from(standards).where(eq(standards.id, id));
    return !!s;
  },

  /** The person a tool is issued to, by id, e-mail or badge code. */
  async findPerson(db: DbOrTx, by: { userId?: string; userEmail?: string; badgeCode?: string }) {
    const where = by.userId ? eq(users.id, by.userId) : by.userEmail ? eq(users.email, by.userEmail.toLowerCase()) : eq(users.badgeCode, by.badgeCode!);
    const [u] = await db.select({ id: users.id, name: users.name, email: users.email, active: users.active }).from(users).where(where);
    return u;
  },

  async nameOf(db: DbOrTx, userId: string) {
    const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId));
    return u?.name ?? null;
  },

  insert: async (tx: DbOrTx, values: typeof checkouts.$inferInsert) => (await tx.insert(checkouts).values(values).returning())[0],

  /** Closes an open checkout; null when it was already closed (by someone else a moment ago). */
  async close(tx: DbOrTx, id: string, values: Pick<CheckoutRow, "returnedAt" | "returnedBy" | "returnCondition" | "returnNote" | "returnPhotoKey">) {
    const [row] = await tx.update(checkouts).set(values).where(and(eq(checkouts.id, id), isNull(checkouts.returnedAt))).returning();
    return row ?? null;
  },

  findById: async (db: DbOrTx, id: string) => (await db.select().from(checkouts).where(eq(checkouts.id, id)))[0],

  openOfTool: async (db: DbOrTx, toolId: string) => (await db.select().from(checkouts).where(and(eq(checkouts.toolId, toolId), isNull(checkouts.returnedAt))))[0],

  async view(db: DbOrTx, id: string): Promise<CheckoutViewRow | undefined> {
    return (await viewQuery(db).where(eq(checkouts.id, id)))[0];
  },

  async list(db: DbOrTx, f: CheckoutFilter): Promise<{ items: CheckoutViewRow[]; total: number }> {
    const like = f.q ? `%${f.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%` : null;
    const where = and(
      f.open === true ? isNull(checkouts.returnedAt) : f.open === false ? isNotNull(checkouts.returnedAt) : undefined,
      f.userId ? eq(checkouts.userId, f.userId) : undefined,
      f.overdue === true ? notReturnedBy(f.at) : f.overdue === false ? not(notReturnedBy(f.at)) : undefined,
      f.assetTag ? inArray(tools.assetTag, [...new Set([f.assetTag, f.assetTag.toUpperCase()])]) : undefined,
      like
        ? or(ilike(tools.assetTag, like), ilike(tools.description, like), ilike(person.name, like), ilike(person.email, like), ilike(checkouts.workOrder, like), ilike(checkouts.engineSerial, like))
        : undefined,
    );
    const order = SORTS[f.sort ?? (f.open ? "dueBackAt" : "-issuedAt")];
    return listPage(
      viewQuery(db).where(where).orderBy(order, asc(checkouts.id)).limit(f.pageSize).offset(pageOffset(f.page, f.pageSize)),
      db
        .select({ total: count() })
        .from(checkouts)
        .innerJoin(tools, eq(tools.id, checkouts.toolId))
        .innerJoin(person, eq(person.id, checkouts.userId))
        .where(where),
    );
  },

  /** Open checkouts held by a person. */
  openOfPerson: (db: DbOrTx, userId: string) => viewQuery(db).where(and(eq(checkouts.userId, userId), isNull(checkouts.returnedAt))).orderBy(asc(checkouts.dueBackAt)),

  /** A person's own tools (ownerType personal). */
  personalToolsOf: (db: DbOrTx, userId: string) =>
    db.select().from(tools).where(and(eq(tools.ownerUserId, userId), eq(tools.ownerType, "personal"))).orderBy(asc(tools.assetTag)),

  async recordRefusal(db: DbOrTx, values: typeof checkoutRefusals.$inferInsert) {
    await db.insert(checkoutRefusals).values(values);
  },

  insertCheck: async (tx: DbOrTx, values: typeof intermediateChecks.$inferInsert) => (await tx.insert(intermediateChecks).values(values).returning())[0],
};
