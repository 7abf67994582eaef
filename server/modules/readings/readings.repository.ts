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
import { investigations, investigationItems } from "../investigations/investigations.table";

/** A tool of a reading as the sheet shows it: the status and due date stored when the reading was recorded. */
export interface ReadingToolOfSheet {
  assetTag: string;
  description: string;
  kind: string;
  unit: "in" | "mm";
  statusAtReading: string;
  dueAtReading: string | null;
}

export type ReadingRow = typeof readings.$inferSelect;
export type ReadingJudgementInsert = typeof readingJudgements.$inferInsert;
export type ReadingInsert = typeof readings.$inferInsert;

const taker = alias(users, "taker");
const overrider = alias(users, "overrider");
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

  /**
   * Serialises writers of one place of one sheet until the transaction ends (a transaction-level advisory lock keyed
   * by the place): two readings or two corrections of the same place cannot both see it free; other places go on.
   */
  async lockPlace(db: DbOrTx, jobId: string, itemKey: string, index: number) {
    await db.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`reading-place:${jobId}:${itemKey}:${index}`}, 0))`);
  },

  findById: async (db: DbOrTx, id: string) => (await db.select().from(readings).where(eq(readings.id, id)))[0],
  successorOf: async (db: DbOrTx, id: string) => (await db.select({ id: readings.id }).from(readings).where(eq(readings.supersedesId, id)))[0],

  async insert(db: DbOrTx, values: ReadingInsert, toolRows: Omit<typeof readingTools.$inferInsert, "readingId">[]) {
    const [row] = await db.insert(readings).values(values).returning();
    if (toolRows.length) await db.insert(readingTools).values(toolRows.map((t) => ({ ...t, readingId: row.id })));
    return row;
  },

  /**
   * Every reading of a job (superseded ones too) in one query, as the check sheet shows them: the people named, the
   * reading that superseded it, its tools with the status and due date stored at the reading (never derived again),
   * whether an open investigation holds it, and its stored judgement under `rulesVersion` (null until judged).
   */
  ofJob(db: DbOrTx, jobId: string, rulesVersion: number) {
    // The tools of the job's readings, one row per reading (a join, not a subquery run per reading).
    const toolsOf = db.$with("tools_of").as(
      db
        .select({
          readingId: readingTools.readingId,
          tools: sql<ReadingToolOfSheet[]>`json_agg(json_build_object(
            'assetTag', ${tools.assetTag}, 'description', ${tools.description}, 'kind', ${families.kind}, 'unit', ${tools.unit},
            'statusAtReading', ${readingTools.statusAtReading}, 'dueAtReading', ${readingTools.dueAtReading}) order by ${readingTools.position})`.as("tools"),
        })
        .from(readingTools)
        .innerJoin(readings, eq(readings.id, readingTools.readingId))
        .innerJoin(tools, eq(tools.id, readingTools.toolId))
        .innerJoin(families, eq(families.id, tools.familyId))
        .where(eq(readings.jobId, jobId))
        .groupBy(readingTools.readingId),
    );
    return db
      .with(toolsOf)
      .select({
        r: readings,
        takerName: taker.name,
        overriderName: overrider.name,
        supersededById: successor.id,
        tools: sql<ReadingToolOfSheet[]>`coalesce(${toolsOf.tools}, '[]'::json)`,
        suspect: sql<boolean>`exists (
          select 1 from ${investigationItems} ii join ${investigations} i on i.id = ii.investigation_id
          where ii.reading_id = ${readings.id} and i.status = 'open')`,
        judgedAt: readingJudgements.judgedAt,
        judgedView: readingJudgements.detail,
      })
      .from(readings)
      .leftJoin(taker, eq(taker.id, readings.takenBy))
      .leftJoin(overrider, eq(overrider.id, readings.overrideBy))
      .leftJoin(successor, eq(successor.supersedesId, readings.id))
      .leftJoin(toolsOf, eq(toolsOf.readingId, readings.id))
      .leftJoin(readingJudgements, and(eq(readingJudgements.readingId, readings.id), eq(readingJudgements.rulesVersion, rulesVersion)))
      .where(eq(readings.jobId, jobId))
      .orderBy(asc(readings.takenAt));
  },

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
