import { and, asc, count, desc, eq, ilike, inArray, isNull, or, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { standards, standardCertificates } from "./standards.table";
import { listPage, pageOffset } from "../../db/paging";

export type StandardRow = typeof standards.$inferSelect;
export type CertificateRow = typeof standardCertificates.$inferSelect;

/** A certificate covers a calendar date from its issue date through its due date. */
const covers = (date: string) => and(sql`${standardCertificates.issuedAt} <= ${date}`, sql`${standardCertificates.dueAt} >= ${date}`);

export const standardsRepository = {
  findById: (db: DbOrTx, id: string) => db.query.standards.findFirst({ where: eq(standards.id, id) }),
  findByTag: (db: DbOrTx, tag: string) => db.query.standards.findFirst({ where: sql`lower(${standards.assetTag}) = lower(${tag})` }),
  findByIds: (db: DbOrTx, ids: string[]) => (ids.length ? db.select().from(standards).where(inArray(standards.id, ids)) : Promise.resolve([])),
  findCertificate: (db: DbOrTx, standardId: string, certificateId: string) =>
    db.query.standardCertificates.findFirst({ where: and(eq(standardCertificates.standardId, standardId), eq(standardCertificates.id, certificateId)) }),
  /** Every certificate of the given standards, latest due date first. */
  certificatesOf: (db: DbOrTx, standardIds: string[]) =>
    standardIds.length
      ? db.select().from(standardCertificates).where(inArray(standardCertificates.standardId, standardIds)).orderBy(desc(standardCertificates.dueAt), desc(standardCertificates.createdAt))
      : Promise.resolve([] as CertificateRow[]),
  /** For each standard, the certificate covering the date (the one due last when several do). */
  async coveringCertificates(db: DbOrTx, standardIds: string[], date: string): Promise<Map<string, CertificateRow>> {
    if (standardIds.length === 0) return new Map();
    const rows = await db
      .select()
      .from(standardCertificates)
      .where(and(inArray(standardCertificates.standardId, standardIds), covers(date)))
      .orderBy(desc(standardCertificates.dueAt));
    const out = new Map<string, CertificateRow>();
    for (const r of rows) if (!out.has(r.standardId)) out.set(r.standardId, r);
    return out;
  },
  async list(db: DbOrTx, opts: { q?: string; kind?: string; unit?: "in" | "mm"; inCalibration?: boolean; today: string; page: number; pageSize: number }) {
    const inCal = sql`exists (select 1 from ${standardCertificates} where ${standardCertificates.standardId} = ${standards.id} and ${covers(opts.today)})`;
    const where = and(
      opts.q ? or(ilike(standards.assetTag, `%${opts.q}%`), ilike(standards.name, `%${opts.q}%`)) : undefined,
      opts.kind ? eq(standards.kind, opts.kind) : undefined,
      opts.unit ? eq(standards.unit, opts.unit) : undefined,
      opts.inCalibration === undefined ? undefined : opts.inCalibration ? inCal : sql`not ${inCal}`,
    );
    return listPage(
      db.select().from(standards).where(where).orderBy(asc(standards.assetTag)).limit(opts.pageSize).offset(pageOffset(opts.page, opts.pageSize)),
      db.select({ total: count() }).from(standards).where(where),
    );
  },
  insert: async (db: DbOrTx, values: typeof standards.$inferInsert) => (await db.insert(standards).values(values).returning())[0],
  insertCertificate: async (db: DbOrTx, values: typeof standardCertificates.$inferInsert) => (await db.insert(standardCertificates).values(values).returning())[0],
  setCertificateFile: async (db: DbOrTx, certificateId: string, fileKey: string) =>
    (await db.update(standardCertificates).set({ fileKey }).where(and(eq(standardCertificates.id, certificateId), isNull(standardCertificates.fileKey))).returning())[0],
};
