import { and, asc, count, desc, eq, inArray, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { calibrations, calibrationPoints, calibrationReviews, calibrationStandards } from "./calibrations.table";
import { standards } from "../standards/standards.table";
import { setElements } from "../tools/tools.table";
import { users } from "../users/users.table";
import { labs } from "../labs/labs.table";
import { listPage, pageOffset } from "../../db/paging";

export type CalibrationRow = typeof calibrations.$inferSelect;
export type CalibrationPointRow = typeof calibrationPoints.$inferSelect;

/** Newest first by when performed; on the same instant the later-signed record (a correction) leads. */
const NEWEST_FIRST = [desc(calibrations.performedAt), desc(calibrations.createdAt)] as const;

const notSuperseded = sql`not exists (select 1 from ${calibrations} s where s.supersedes_id = ${calibrations.id})`;

export const calibrationsRepository = {
  findById: (db: DbOrTx, id: string) => db.query.calibrations.findFirst({ where: eq(calibrations.id, id) }),
  supersededBy: async (db: DbOrTx, id: string) => (await db.query.calibrations.findFirst({ where: eq(calibrations.supersedesId, id), columns: { id: true } }))?.id ?? null,

  /** A tool's calibrations, newest first. */
  async listForTool(db: DbOrTx, toolId: string, opts: { includeSuperseded: boolean; page: number; pageSize: number }) {
    const where = and(eq(calibrations.toolId, toolId), opts.includeSuperseded ? undefined : notSuperseded);
    return listPage(
      db
        .select()
        .from(calibrations)
        .where(where)
        .orderBy(...NEWEST_FIRST)
        .limit(opts.pageSize)
        .offset(pageOffset(opts.page, opts.pageSize)),
      db.select({ total: count() }).from(calibrations).where(where),
    );
  },

  /** Everything shown beside a set of calibrations: points (with element labels), standards, reviews, corrections, labs, people. */
  async related(db: DbOrTx, rows: CalibrationRow[]) {
    const ids = rows.map((r) => r.id);
    if (ids.length === 0) return null;
    const labIds = [...new Set(rows.map((r) => r.labId).filter((x): x is string => !!x))];
    const [points, stds, reviews, successors, labRows] = await Promise.all([
      db
        .select({ point: calibrationPoints, elementLabel: setElements.label })
        .from(calibrationPoints)
        .leftJoin(setElements, eq(setElements.id, calibrationPoints.elementId))
        .where(inArray(calibrationPoints.calibrationId, ids))
        .orderBy(asc(calibrationPoints.calibrationId), asc(calibrationPoints.seq)),
      db
        .select({ calibrationId: calibrationStandards.calibrationId, id: standards.id, assetTag: standards.assetTag, name: standards.name })
        .from(calibrationStandards)
        .innerJoin(standards, eq(standards.id, calibrationStandards.standardId))
        .where(inArray(calibrationStandards.calibrationId, ids))
        .orderBy(asc(standards.assetTag)),
      db
        .select({ review: calibrationReviews, reviewerName: users.name })
        .from(calibrationReviews)
        .leftJoin(users, eq(users.id, calibrationReviews.reviewedBy))
        .where(inArray(calibrationReviews.calibrationId, ids))
        .orderBy(desc(calibrationReviews.reviewedAt)),
      db.select({ id: calibrations.id, supersedesId: calibrations.supersedesId }).from(calibrations).where(inArray(calibrations.supersedesId, ids)),
      labIds.length ? db.select({ id: labs.id, name: labs.name }).from(labs).where(inArray(labs.id, labIds)) : Promise.resolve([]),
    ]);
    const performerIds = [...new Set(rows.map((r) => r.performedBy).filter((x): x is string => !!x))];
    const people = performerIds.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, performerIds)) : [];
    return { points, standards: stds, reviews, successors, labs: labRows, people };
  },

  /** Standard ids linked to a calibration, in the order they were named. */
  standardIdsOf: async (db: DbOrTx, calibrationId: string) =>
    (await db.select({ id: calibrationStandards.standardId }).from(calibrationStandards).where(eq(calibrationStandards.calibrationId, calibrationId))).map((r) => r.id),

  reviewOf: (db: DbOrTx, calibrationId: string) => db.query.calibrationReviews.findFirst({ where: eq(calibrationReviews.calibrationId, calibrationId) }),

  async insert(
    db: DbOrTx,
    cal: typeof calibrations.$inferInsert,
    points: Omit<typeof calibrationPoints.$inferInsert, "calibrationId">[],
    standardIds: string[],
  ) {
    const [row] = await db.insert(calibrations).values(cal).returning();
    await db.insert(calibrationPoints).values(points.map((p) => ({ ...p, calibrationId: row.id })));
    if (standardIds.length) await db.insert(calibrationStandards).values(standardIds.map((standardId) => ({ calibrationId: row.id, standardId })));
    return row;
  },
  insertReview: async (db: DbOrTx, values: typeof calibrationReviews.$inferInsert) => (await db.insert(calibrationReviews).values(values).returning())[0],

  /**
   * As-found points stated conditional (ILAC-G8 non-binary statement), newest first, from records that still count;
   * `current` keeps only each tool's latest such record. The partial index on conditional statements carries it.
   */
  async conditionalResults(db: DbOrTx, q: { statement?: "conditional_pass" | "conditional_fail"; toolAssetTag?: string; current: boolean; page: number; pageSize: number }) {
    const where = sql`p.as_found_statement in ('conditional_pass', 'conditional_fail')
      ${q.statement ? sql`and p.as_found_statement = ${q.statement}` : sql``}
      ${q.toolAssetTag ? sql`and lower(t.asset_tag) = lower(${q.toolAssetTag})` : sql``}
      and not exists (select 1 from calibrations s where s.supersedes_id = c.id)
      ${
        q.current
          ? sql`and not exists (select 1 from calibrations later where later.tool_id = c.tool_id
              and (later.performed_at, later.created_at) > (c.performed_at, c.created_at)
              and not exists (select 1 from calibrations s2 where s2.supersedes_id = later.id))`
          : sql``
      }`;
    const from = sql`from calibration_points p join calibrations c on c.id = p.calibration_id join tools t on t.id = c.tool_id left join set_elements e on e.id = p.element_id`;
    const [rows, counted] = await Promise.all([
      db.execute(sql`select p.id as point_id, p.calibration_id, p.seq, p.nominal, p.error_as_found, p.mpe, p.uncertainty, p.as_found_statement,
          e.label as element, c.performed_at, c.result, t.asset_tag, t.description, t.unit
        ${from} where ${where}
        order by c.performed_at desc, t.asset_tag, p.seq
        limit ${q.pageSize} offset ${pageOffset(q.page, q.pageSize)}`),
      db.execute(sql`select count(*)::int as total ${from} where ${where}`),
    ]);
    return {
      items: rows.rows as {
        point_id: string;
        calibration_id: string;
        seq: number;
        nominal: string;
        error_as_found: string;
        mpe: string;
        uncertainty: string | null;
        as_found_statement: "conditional_pass" | "conditional_fail";
        element: string | null;
        performed_at: string | Date;
        result: "pass" | "adjusted" | "fail" | "limited";
        asset_tag: string;
        description: string;
        unit: "in" | "mm";
      }[],
      total: Number((counted.rows[0] as { total: number }).total),
    };
  },

  /** The latest record of a tool that is not superseded (for the chain when none counts yet). */
  latestForTool: async (db: DbOrTx, toolId: string) =>
    (await db.select().from(calibrations).where(and(eq(calibrations.toolId, toolId), notSuperseded)).orderBy(...NEWEST_FIRST).limit(1))[0],
};
