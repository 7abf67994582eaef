import { and, asc, eq, inArray, isNull, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { readings, readingTools } from "./readings.table";
import { tools, setElements } from "../tools/tools.table";
import { families } from "../families/families.table";
import { calibrationPoints } from "../calibrations/calibrations.table";
import { users } from "../users/users.table";

export type ReadingRow = typeof readings.$inferSelect;
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
};
