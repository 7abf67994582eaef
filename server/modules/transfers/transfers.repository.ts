import { asc, gt, inArray, sql, and, eq, or } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { tools } from "../tools/tools.table";
import { families } from "../families/families.table";
import { calibrations } from "../calibrations/calibrations.table";
import { users } from "../users/users.table";

const BATCH = 1000;

export const transfersRepository = {
  /** Which of these asset tags the register already holds. */
  async existingTags(db: DbOrTx, tags: string[]): Promise<Set<string>> {
    const out = new Set<string>();
    for (let i = 0; i < tags.length; i += 5000) {
      const chunk = tags.slice(i, i + 5000);
      if (!chunk.length) continue;
      const rows = await db.select({ t: tools.assetTag }).from(tools).where(inArray(tools.assetTag, chunk));
      rows.forEach((r) => out.add(r.t));
    }
    return out;
  },

  allFamilies: (db: DbOrTx) => db.select({ id: families.id, name: families.name, defaultIntervalDays: families.defaultIntervalDays }).from(families),

  insertFamilies: (db: DbOrTx, values: (typeof families.$inferInsert)[]) =>
    values.length ? db.insert(families).values(values).returning({ id: families.id, name: families.name }) : Promise.resolve([]),

  /** Inserts in batches, calling back after each so a long import can report progress. */
  async insertTools(db: DbOrTx, values: (typeof tools.$inferInsert)[], onBatch: (n: number) => void) {
    const out: { id: string; assetTag: string }[] = [];
    for (let i = 0; i < values.length; i += BATCH) {
      out.push(...(await db.insert(tools).values(values.slice(i, i + BATCH)).returning({ id: tools.id, assetTag: tools.assetTag })));
      onBatch(Math.min(i + BATCH, values.length));
    }
    return out;
  },

  async insertCalibrations(db: DbOrTx, values: (typeof calibrations.$inferInsert)[], onBatch: (n: number) => void) {
    const out: { id: string; toolId: string }[] = [];
    for (let i = 0; i < values.length; i += BATCH) {
      out.push(...(await db.insert(calibrations).values(values.slice(i, i + BATCH)).returning({ id: calibrations.id, toolId: calibrations.toolId })));
      onBatch(Math.min(i + BATCH, values.length));
    }
    return out;
  },

  /** A page of tools in asset-tag order after `afterTag` (keyset paging, so a full export never loads the register at once). */
  toolsAfter: (db: DbOrTx, afterTag: string | null, limit: number) =>
    db
      .select({
        id: tools.id,
        assetTag: tools.assetTag,
        description: tools.description,
        family: families.name,
        serialNumber: tools.serialNumber,
        maker: tools.maker,
        model: tools.model,
        unit: tools.unit,
        rangeMin: tools.rangeMin,
        rangeMax: tools.rangeMax,
        resolution: tools.resolution,
        intervalDays: tools.intervalDays,
        location: tools.location,
        ownerType: tools.ownerType,
        ownerName: sql<string | null>`coalesce(${tools.ownerName}, ${users.name})`,
      })
      .from(tools)
      .innerJoin(families, eq(families.id, tools.familyId))
      .leftJoin(users, eq(users.id, tools.ownerUserId))
      .where(afterTag === null ? undefined : gt(tools.assetTag, afterTag))
      .orderBy(asc(tools.assetTag))
      .limit(limit),

  /** A page of calibration records (oldest first) after the given one, with their tool, lab and who performed them. */
  async calibrationsAfter(db: DbOrTx, after: { at: Date; id: string } | null, limit: number) {
    return db
      .select({
        id: calibrations.id,
        performedAt: calibrations.performedAt,
        assetTag: tools.assetTag,
        source: calibrations.source,
        lab: sql<string | null>`(select l.name from labs l where l.id = ${calibrations.labId})`,
        certificateNumber: calibrations.certificateNumber,
        performedBy: sql<string | null>`coalesce((select u.name from users u where u.id = ${calibrations.performedBy}), ${calibrations.performedByName})`,
        temperatureC: calibrations.temperatureC,
        decisionRule: calibrations.decisionRule,
        result: calibrations.result,
        asFoundInTolerance: calibrations.asFoundInTolerance,
        intervalDays: calibrations.intervalDays,
        nextDueAt: calibrations.nextDueAt,
        supersedesId: calibrations.supersedesId,
        supersedeReason: calibrations.supersedeReason,
        notes: calibrations.notes,
      })
      .from(calibrations)
      .innerJoin(tools, eq(tools.id, calibrations.toolId))
      .where(after ? or(gt(calibrations.performedAt, after.at), and(eq(calibrations.performedAt, after.at), gt(calibrations.id, after.id))) : undefined)
      .orderBy(asc(calibrations.performedAt), asc(calibrations.id))
      .limit(limit);
  },

  async pointsOf(db: DbOrTx, calibrationIds: string[]) {
    if (!calibrationIds.length) return [];
    const r = await db.execute(sql`
      select p.calibration_id, p.seq, e.label as element, p.nominal, p.reference, p.as_found, p.as_left, p.error_as_found, p.error_as_left, p.mpe, p.uncertainty, p.tur, p.verdict
      from calibration_points p left join set_elements e on e.id = p.element_id
      where p.calibration_id in (${sql.join(calibrationIds.map((id) => sql`${id}::uuid`), sql`, `)})
      order by p.calibration_id, p.seq`);
    return r.rows as Record<string, string | number | null>[];
  },
};
