import { and, asc, eq, inArray, isNull, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { readings, readingTools, readingJudgements } from "./readings.table";
import { tools, setElements } from "../tools/tools.table";
import { families } from "../families/families.table";
import { calibrationPoints } from "../calibrations/calibrations.table";
import { users } from "../users/users.table";
import { jobs } from "../jobs/jobs.table";
import { limitTables } from "../limit-tables/limit-tables.table";

export type ReadingRow = typeof readings.$inferSelect;
export type ReadingJudgementInsert = typeof readingJudgements.$inferInsert;
export type ReadingInsert = typeof readings.$inferInsert;

const taker = alias(users, "taker");
const overrider = alias(users, "overrider");
const goLeaf = alias(setElements, "go_leaf");
const noGoLeaf = alias(setElements, "no_go_leaf");
const successor = alias(readings, "successor");

export const readingsRepository = {
  /** Tools by asset tag, with their family's kind. */
  toolsByTags: (db: DbOrTx, tags: string[]) =>
    tags.length
      ? db
          .select({ tool: tools, kind: families.kind })
          .from(tools)
          .innerJoin(families, eq(families.id, tools.familyId))
          .where(inArray(tools.assetTag, tags))
      : Promise.resolve([]),

  /** A set's leaves, with their results in the calibration that counts (rejected leaves and calibrated thickness). */
  async leavesOf(db: DbOrTx, toolId: string, calibrationId: string | null, at: Date) {
    const elements = await db.select().from(setElements).where(eq(setElements.toolId, toolId)).orderBy(asc(setElements.nominal));
    const points = calibrationId
      ? await db
          .select({ elementId: calibrationPoints.elementId, asFound: calibrationPoints.asFound, asLeft: calibrationPoints.asLeft, verdict: calibrationPoints.verdict })
          .from(calibrationPoints)
          .where(and(eq(calibrationPoints.calibrationId, calibrationId), sql`${calibrationPoints.elementId} is not null`))
      : [];
    const byElement = new Map(points.map((p) => [p.elementId!, p]));
    return elements.map((e) => {
      const p = byElement.get(e.id);
      return {
        id: e.id,
        label: e.label,
        nominal: e.nominal,
        calibrated: p ? (p.asLeft ?? p.asFound) : null,
        rejected: (e.rejectedAt != null && e.rejectedAt <= at) || p?.verdict === "fail",
      };
    });
  },

  /** The reading that currently holds a place on a sheet (not superseded). */
  async currentAt(db: DbOrTx, jobId: string, itemKey: string, index: number) {
    const [row] = await db
      .select({ r: readings })
      .from(readings)
      .leftJoin(successor, eq(successor.supersedesId, readings.id))
      .where(and(eq(readings.jobId, jobId), eq(readings.itemKey, itemKey), eq(readings.index, index), isNull(successor.id)))
      .orderBy(sql`${readings.takenAt} desc`)
      .limit(1);
    return row?.r;
  },

  findById: async (db: DbOrTx, id: string) => (await db.select().from(readings).where(eq(readings.id, id)))[0],
  successorOf: async (db: DbOrTx, id: string) => (await db.select({ id: readings.id }).from(readings).where(eq(readings.supersedesId, id)))[0],

  async insert(db: DbOrTx, values: ReadingInsert, toolRows: Omit<typeof readingTools.$inferInsert, "readingId">[]) {
    const [row] = await db.insert(readings).values(values).returning();
    if (toolRows.length) await db.insert(readingTools).values(toolRows.map((t) => ({ ...t, readingId: row.id })));
    return row;
  },

  /** Every reading of a job (superseded ones too), with the people and leaves named. */
  ofJob: (db: DbOrTx, jobId: string) =>
    db
      .select({
        r: readings,
        takerName: taker.name,
        overriderName: overrider.name,
        goLeaf: { id: goLeaf.id, label: goLeaf.label, nominal: goLeaf.nominal },
        noGoLeaf: { id: noGoLeaf.id, label: noGoLeaf.label, nominal: noGoLeaf.nominal },
        supersededById: successor.id,
      })
      .from(readings)
      .leftJoin(taker, eq(taker.id, readings.takenBy))
      .leftJoin(overrider, eq(overrider.id, readings.overrideBy))
      .leftJoin(goLeaf, eq(goLeaf.id, readings.goLeafId))
      .leftJoin(noGoLeaf, eq(noGoLeaf.id, readings.noGoLeafId))
      .leftJoin(successor, eq(successor.supersedesId, readings.id))
      .where(eq(readings.jobId, jobId))
      .orderBy(asc(readings.takenAt)),

  /** The tools of many readings, with their status and due date at the reading. */
  toolsOfReadings: (db: DbOrTx, readingIds: string[]) =>
    readingIds.length
      ? db
          .select({ readingId: readingTools.readingId, position: readingTools.position, statusAtReading: readingTools.statusAtReading, dueAtReading: readingTools.dueAtReading, assetTag: tools.assetTag, description: tools.description, unit: tools.unit, kind: families.kind })
          .from(readingTools)
          .innerJoin(tools, eq(tools.id, readingTools.toolId))
          .innerJoin(families, eq(families.id, tools.familyId))
          .where(inArray(readingTools.readingId, readingIds))
          .orderBy(asc(readingTools.position))
      : Promise.resolve([]),

  /** Records a reading's judgement under a rules version; a second one for the same version is ignored (idempotent). */
  async insertJudgements(db: DbOrTx, rows: ReadingJudgementInsert[]) {
    for (let i = 0; i < rows.length; i += 500) await db.insert(readingJudgements).values(rows.slice(i, i + 500)).onConflictDoNothing({ target: [readingJudgements.readingId, readingJudgements.rulesVersion] });
  },

  /** Judgements of some readings under one rules version. */
  judgementsOf: (db: DbOrTx, readingIds: string[], rulesVersion: number) =>
    readingIds.length
      ? db.select().from(readingJudgements).where(and(inArray(readingJudgements.readingId, readingIds), eq(readingJudgements.rulesVersion, rulesVersion)))
      : Promise.resolve([]),

  /**
   * Readings not yet judged under a rules version, a batch at a time (the unique index answers the anti-join). The outer
   * column is spelled out: drizzle leaves it unqualified in one-table queries, and inside the subquery it would bind there.
   */
  unjudged: (db: DbOrTx, rulesVersion: number, limit: number) =>
    db
      .select()
      .from(readings)
      .where(sql`not exists (select 1 from reading_judgements j where j.reading_id = "readings"."id" and j.rules_version = ${rulesVersion})`)
      .orderBy(asc(readings.id))
      .limit(limit),

  /** Current (not superseded) readings of some jobs, for the places a reading feeds. */
  currentOfJobs: (db: DbOrTx, jobIds: string[]) =>
    jobIds.length
      ? db
          .select({ r: readings })
          .from(readings)
          .leftJoin(successor, eq(successor.supersedesId, readings.id))
          .where(and(inArray(readings.jobId, jobIds), isNull(successor.id)))
          .orderBy(asc(readings.takenAt))
          .then((rows) => rows.map((x) => x.r))
      : Promise.resolve([]),

  /** The limits table (unit, expansion coefficient) of each of some jobs. */
  tablesOfJobs: (db: DbOrTx, jobIds: string[]) =>
    jobIds.length
      ? db
          .select({ jobId: jobs.id, tableId: limitTables.id, unit: limitTables.unit, expansionPerK: limitTables.expansionPerK })
          .from(jobs)
          .innerJoin(limitTables, eq(limitTables.id, jobs.limitTableId))
          .where(inArray(jobs.id, jobIds))
      : Promise.resolve([]),
};
