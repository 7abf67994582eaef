import { and, asc, desc, eq, gte, inArray, isNotNull, lte, lt, ne, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import {
  calibrationPoints,
  calibrationStandards,
  calibrations,
  intermediateChecks,
  jobSignoffs,
  jobs,
  limitItems,
  limitTables,
  readingTools,
  readings,
  setElements,
  standardCertificates,
  standards,
  tools,
  users,
} from "../../db/schema";
import { dispositions, investigationItems, investigations } from "./investigations.table";
import { pageOffset } from "../../db/paging";
import { anyId, pgArray } from "../../db/values";
import { columnsOf, columnsPicked } from "../../db/columns";
import { executePrepared } from "../../db/prepared";

export type InvestigationRow = typeof investigations.$inferSelect;
export type InvestigationItemRow = typeof investigationItems.$inferSelect;
export type ReadingRow = typeof readings.$inferSelect;

/** A reading counts until a later reading supersedes it (corrections are new records). */
// Spelled out in full: drizzle leaves column names unqualified in some one-table queries, and an unqualified
// name inside the subquery would bind to the subquery's own table.
const readingNotSuperseded = sql.raw("not exists (select 1 from readings superseding where superseding.supersedes_id = readings.id)");
const calibrationNotSuperseded = sql.raw("not exists (select 1 from calibrations superseding_cal where superseding_cal.supersedes_id = calibrations.id)");
const itemWithoutDisposition = sql.raw("not exists (select 1 from dispositions d where d.investigation_item_id = investigation_items.id)");

/**
 * The instant the tool was last known good before `before`: the latest calibration that left it in tolerance
 * (as-found in tolerance, or adjusted so that its as-left is), or — when the shop's setting says so — the latest
 * passing intermediate check. Null when it never was.
 */
export async function lastKnownGood(
  tx: DbOrTx,
  args: { toolId: string; before: Date; excludeCalibrationId?: string | null; excludeCheckId?: string | null; countPassingChecks: boolean },
): Promise<{ at: Date; source: "calibration" | "check"; id: string } | null> {
  const [cal] = await tx
    .select({ id: calibrations.id, at: calibrations.performedAt })
    .from(calibrations)
    .where(
      and(
        eq(calibrations.toolId, args.toolId),
        lt(calibrations.performedAt, args.before),
        args.excludeCalibrationId ? ne(calibrations.id, args.excludeCalibrationId) : undefined,
        or(eq(calibrations.asFoundInTolerance, true), eq(calibrations.result, "adjusted")),
        calibrationNotSuperseded,
      ),
    )
    .orderBy(desc(calibrations.performedAt))
    .limit(1);
  let best: { at: Date; source: "calibration" | "check"; id: string } | null = cal ? { at: cal.at, source: "calibration", id: cal.id } : null;
  if (args.countPassingChecks) {
    const [check] = await tx
      .select({ id: intermediateChecks.id, at: intermediateChecks.performedAt })
      .from(intermediateChecks)
      .where(
        and(
          eq(intermediateChecks.toolId, args.toolId),
          eq(intermediateChecks.passed, true),
          lt(intermediateChecks.performedAt, args.before),
          args.excludeCheckId ? ne(intermediateChecks.id, args.excludeCheckId) : undefined,
        ),
      )
      .orderBy(desc(intermediateChecks.performedAt))
      .limit(1);
    if (check && (!best || check.at > best.at)) best = { at: check.at, source: "check", id: check.id };
  }
  return best;
}

/** Readings naming the tool taken in [start, end] (start null: since ever), superseded ones left out; overrides included. */
export async function readingsWithTool(tx: DbOrTx, toolId: string, start: Date | null, end: Date) {
  return tx
    .select({ reading: readings })
    .from(readingTools)
    .innerJoin(readings, eq(readings.id, readingTools.readingId))
    .where(and(eq(readingTools.toolId, toolId), start ? gte(readingTools.takenAt, start) : undefined, lte(readingTools.takenAt, end), readingNotSuperseded))
    .orderBy(asc(readingTools.takenAt))
    .then((rows) => rows.map((r) => r.reading));
}

/**
 * At most how many readings readingsWithTool would give — the tool's readings in the window, corrected ones included —
 * counting no further than `cap` (the answer is then `cap`). Read off the tool's index of its readings by time alone.
 */
export async function countReadingsWithTool(tx: DbOrTx, toolId: string, start: Date | null, end: Date, cap: number): Promise<number> {
  const res = await executePrepared(
    tx,
    sql`select count(*)::int as n from (
      select 1 from reading_tools
      where reading_tools.tool_id = ${toolId} and reading_tools.taken_at <= ${end.toISOString()}
        and reading_tools.taken_at >= ${(start ?? new Date(0)).toISOString()}
      limit ${cap}) x`,
  );
  return Number((res.rows[0] as { n: number }).n);
}

/** An investigation still gathering its readings, held for this transaction; null when done or another holds it. */
export async function claimGathering(tx: DbOrTx, id: string): Promise<InvestigationRow | null> {
  const [row] = await tx.select().from(investigations).where(and(eq(investigations.id, id), eq(investigations.gathering, true))).for("update", { skipLocked: true });
  return row ?? null;
}

/** The investigations still gathering their readings, oldest first. */
export async function gatheringIds(db: DbOrTx): Promise<string[]> {
  const rows = await db.select({ id: investigations.id }).from(investigations).where(eq(investigations.gathering, true)).orderBy(asc(investigations.openedAt));
  return rows.map((r) => r.id);
}

/** The jobs of some readings with their limits tables and every item of those tables (in sheet order). */
export async function jobsWithTables(tx: DbOrTx, jobIds: string[]) {
  const jobRows = jobIds.length ? await tx.select().from(jobs).where(anyId(jobs.id, jobIds)) : [];
  const tableIds = [...new Set(jobRows.map((j) => j.limitTableId))];
  const tables = tableIds.length ? await tx.select().from(limitTables).where(inArray(limitTables.id, tableIds)) : [];
  const items = tableIds.length ? await tx.select().from(limitItems).where(inArray(limitItems.limitTableId, tableIds)).orderBy(asc(limitItems.seq)) : [];
  return { jobs: jobRows, tables, items };
}

/**
 * The current readings at some places of some check sheets (the other sides of clearances and stations of tapers
 * an affected reading is judged with). Only the places asked for are read, never a whole sheet.
 */
export async function currentReadingsAtPlaces(tx: DbOrTx, places: { jobId: string; index: number; itemKey: string }[]) {
  if (places.length === 0) return [] as ReadingRow[];
  const wanted = JSON.stringify(places.map((p) => ({ job_id: p.jobId, idx: p.index, item_key: p.itemKey })));
  return tx
    .select()
    .from(readings)
    .where(
      and(
        inArray(
          readings.id,
          sql`(select r.id from jsonb_to_recordset(${wanted}::jsonb) as p(job_id uuid, idx int, item_key text) join readings r on r.job_id = p.job_id and r.item_key = p.item_key and r.index = p.idx)`,
        ),
        readingNotSuperseded,
      ),
    )
    .orderBy(asc(readings.takenAt));
}

/** The tools each of some readings named, in the order named. */
export async function toolsOfReadings(tx: DbOrTx, readingIds: string[]) {
  const toolsOf = new Map<string, string[]>();
  if (readingIds.length === 0) return toolsOf;
  const rows = await tx
    .select({ readingId: readingTools.readingId, toolId: readingTools.toolId })
    .from(readingTools)
    .where(anyId(readingTools.readingId, readingIds))
    .orderBy(asc(readingTools.position));
  for (const t of rows) {
    const list = toolsOf.get(t.readingId);
    if (list) list.push(t.toolId);
    else toolsOf.set(t.readingId, [t.toolId]);
  }
  return toolsOf;
}

export async function calibrationPointsOf(tx: DbOrTx, calibrationId: string) {
  return tx.select().from(calibrationPoints).where(eq(calibrationPoints.calibrationId, calibrationId)).orderBy(asc(calibrationPoints.seq));
}

/** The first calibration of a tool at or after an instant (for a damaged tool: its as-found tells the error). */
export async function firstCalibrationFrom(tx: DbOrTx, toolId: string, from: Date) {
  const [row] = await tx
    .select()
    .from(calibrations)
    .where(and(eq(calibrations.toolId, toolId), gte(calibrations.performedAt, from), calibrationNotSuperseded))
    .orderBy(asc(calibrations.performedAt))
    .limit(1);
  return row ?? null;
}

/** The next calibration of a tool after one (the end of the stretch that calibration vouched for). */
export async function nextCalibrationAfter(tx: DbOrTx, toolId: string, after: Date) {
  const [row] = await tx
    .select({ performedAt: calibrations.performedAt })
    .from(calibrations)
    .where(and(eq(calibrations.toolId, toolId), sql`${calibrations.performedAt} > ${after.toISOString()}`, calibrationNotSuperseded))
    .orderBy(asc(calibrations.performedAt))
    .limit(1);
  return row?.performedAt ?? null;
}

/** Calibrations performed with a standard in [start, end], superseded ones left out. */
export async function calibrationsWithStandard(tx: DbOrTx, standardId: string, start: Date | null, end: Date) {
  return tx
    .select({ calibration: calibrations, tool: tools })
    .from(calibrationStandards)
    .innerJoin(calibrations, eq(calibrations.id, calibrationStandards.calibrationId))
    .innerJoin(tools, eq(tools.id, calibrations.toolId))
    .where(
      and(
        eq(calibrationStandards.standardId, standardId),
        start ? gte(calibrations.performedAt, start) : undefined,
        lte(calibrations.performedAt, end),
        calibrationNotSuperseded,
      ),
    )
    .orderBy(asc(calibrations.performedAt));
}

/** Start of the day (shop time zone) the standard's latest certificate before the finding was issued: when it was last known good. */
export async function standardKnownGoodSince(tx: DbOrTx, standardId: string, foundAt: Date, timeZone: string): Promise<Date | null> {
  const [row] = await tx
    .select({ at: sql<string>`(${standardCertificates.issuedAt}::timestamp at time zone ${timeZone})` })
    .from(standardCertificates)
    .where(and(eq(standardCertificates.standardId, standardId), sql`(${standardCertificates.issuedAt}::timestamp at time zone ${timeZone}) < ${foundAt.toISOString()}`))
    .orderBy(desc(standardCertificates.issuedAt))
    .limit(1);
  return row ? new Date(row.at) : null;
}

export async function findStandard(tx: DbOrTx, id: string) {
  return (await tx.select().from(standards).where(eq(standards.id, id)))[0] ?? null;
}

export async function findTool(tx: DbOrTx, id: string) {
  return (await tx.select().from(tools).where(eq(tools.id, id)))[0] ?? null;
}

export async function insertInvestigation(tx: DbOrTx, values: typeof investigations.$inferInsert) {
  const [row] = await tx.insert(investigations).values(values).returning();
  return row;
}

/** An affected item as computed when the investigation opens (numbers as exact decimal strings). */
export interface ItemValues {
  readingId?: string | null;
  calibrationId?: string | null;
  toolId: string | null;
  verdictCouldChange: boolean;
  basis: string;
  marginBefore: string | null;
  marginAfter: string | null;
  correctedValue: string | null;
  rejudged?: unknown;
  /**
   * Copied from the reading (or the cascade's calibration) as the service read it in the same transaction: its sheet,
   * the sheet's engine serial, who took it, when (a calibration: when it was performed), its place index and the
   * verdict it was recorded with. Evidence never changes, so the copy is the record.
   */
  copied: { jobId: string | null; sheetSerial: string | null; takenBy: string | null; takenAt: Date; placeIndex: number | null; recordedVerdict: string | null };
}

/**
 * Inserts the affected items of an investigation set-based: one INSERT … SELECT per batch over the computed rows, sent
 * as one array parameter per column (`unnest`), never a statement per item. Arrays rather than one JSON document of
 * rows, and the copied fields from the service rather than joined again: PostgreSQL reads a text array several times
 * faster than it converts the same rows from jsonb, a probe into the readings' primary key per item cost as much as
 * writing the item, and opening the investigation of a busy tool writes thousands of items inside the finding's
 * transaction. The foreign keys still check that every reading, calibration and tool named exists.
 */
export async function insertItems(tx: DbOrTx, investigationId: string, values: ItemValues[]) {
  for (let i = 0; i < values.length; i += 2000) {
    const batch = values.slice(i, i + 2000);
    const col = (f: (v: ItemValues) => string | null) => pgArray(batch.map(f));
    // The long texts go as JSON arrays: JSON.stringify writes them natively, where escaping them into an array
    // literal took longer than PostgreSQL takes to read them.
    const jsonCol = (f: (v: ItemValues) => unknown) => JSON.stringify(batch.map(f));
    await tx.execute(sql`
      insert into investigation_items (investigation_id, reading_id, calibration_id, tool_id, verdict_could_change, basis, margin_before, margin_after, corrected_value, rejudged,
        job_id, sheet_serial, taken_by, taken_at, place_index, recorded_verdict)
      select ${investigationId}::uuid, x.reading_id, x.calibration_id, x.tool_id, x.verdict_could_change, x.basis, x.margin_before, x.margin_after, x.corrected_value,
        case when json_typeof(x.rejudged) = 'null' then null else x.rejudged end, x.job_id, x.sheet_serial, x.taken_by, x.taken_at, x.place_index, x.recorded_verdict
      from rows from (
          unnest(${col((v) => v.readingId ?? null)}::uuid[]), unnest(${col((v) => v.calibrationId ?? null)}::uuid[]), unnest(${col((v) => v.toolId)}::uuid[]),
          unnest(${col((v) => (v.verdictCouldChange ? "t" : "f"))}::boolean[]), json_array_elements_text(${jsonCol((v) => v.basis)}::json),
          unnest(${col((v) => v.marginBefore)}::numeric[]), unnest(${col((v) => v.marginAfter)}::numeric[]), unnest(${col((v) => v.correctedValue)}::numeric[]),
          json_array_elements(${jsonCol((v) => v.rejudged ?? null)}::json),
          unnest(${col((v) => v.copied.jobId)}::uuid[]), unnest(${col((v) => v.copied.sheetSerial)}::text[]), unnest(${col((v) => v.copied.takenBy)}::uuid[]),
          unnest(${col((v) => v.copied.takenAt.toISOString())}::timestamptz[]), unnest(${col((v) => (v.copied.placeIndex == null ? null : String(v.copied.placeIndex)))}::integer[]),
          unnest(${col((v) => v.copied.recordedVerdict)}::text[]))
        as x(reading_id, calibration_id, tool_id, verdict_could_change, basis, margin_before, margin_after, corrected_value, rejudged,
          job_id, sheet_serial, taken_by, taken_at, place_index, recorded_verdict)`);
  }
}

export async function setFinding(tx: DbOrTx, investigationId: string, finding: unknown) {
  await tx.update(investigations).set({ finding }).where(eq(investigations.id, investigationId));
}

/** Claims an investigation's pending notices (exactly once: only one caller sees them pending). */
export async function claimPendingNotices(tx: DbOrTx, investigationId: string) {
  const [claimed] = await tx
    .update(investigations)
    .set({ finding: sql`jsonb_set(${investigations.finding}, '{notifications,status}', '"sending"')` })
    .where(and(eq(investigations.id, investigationId), sql`${investigations.finding}->'notifications'->>'status' = 'pending'`))
    .returning();
  return claimed ?? null;
}

/** People to tell when an investigation opens: quality users, and for each affected job the inspector who signed it and whoever measured. */
export async function noticeRecipients(tx: DbOrTx, investigationId: string) {
  const quality = await tx.select({ id: users.id, email: users.email, name: users.name }).from(users).where(and(eq(users.role, "quality"), eq(users.active, true)));
  const measured = await tx
    .selectDistinct({ id: users.id, email: users.email, name: users.name, engineSerial: investigationItems.sheetSerial })
    .from(investigationItems)
    .innerJoin(users, eq(users.id, investigationItems.takenBy))
    .where(and(eq(investigationItems.investigationId, investigationId), eq(users.active, true)));
  const signed = await tx
    .selectDistinct({ id: users.id, email: users.email, name: users.name, engineSerial: investigationItems.sheetSerial })
    .from(investigationItems)
    .innerJoin(jobSignoffs, eq(jobSignoffs.jobId, investigationItems.jobId))
    .innerJoin(users, eq(users.id, jobSignoffs.inspectorId))
    .where(and(eq(investigationItems.investigationId, investigationId), eq(users.active, true)));
  return { quality, measured, signed };
}

export async function lockInvestigation(tx: DbOrTx, id: string) {
  const [row] = await tx.select().from(investigations).where(eq(investigations.id, id)).for("update");
  return row ?? null;
}

/** Every column of an investigation, for the statement the pages of its items ask beside the page. */
const INVESTIGATION = columnsOf(investigations, "investigations");

/** An investigation by id (a named prepared statement: every page of its items asks it). */
export async function findInvestigation(tx: DbOrTx, id: string): Promise<InvestigationRow | null> {
  const res = await executePrepared(tx, sql`select ${INVESTIGATION.list} from investigations where investigations.id = ${id}`);
  return res.rows[0] ? INVESTIGATION.read(res.rows[0]) : null;
}

export async function updateInvestigation(tx: DbOrTx, id: string, set: Partial<typeof investigations.$inferInsert>) {
  const [row] = await tx.update(investigations).set(set).where(eq(investigations.id, id)).returning();
  return row;
}

export async function itemsOf(tx: DbOrTx, investigationId: string) {
  return tx.select().from(investigationItems).where(eq(investigationItems.investigationId, investigationId));
}

/** Items of the investigation whose reading belongs to a job. */
export async function itemsOfJob(tx: DbOrTx, investigationId: string, jobId: string) {
  return tx
    .select({ item: investigationItems })
    .from(investigationItems)
    .innerJoin(readings, eq(readings.id, investigationItems.readingId))
    .where(and(eq(investigationItems.investigationId, investigationId), eq(readings.jobId, jobId)))
    .then((rows) => rows.map((r) => r.item));
}

export async function itemIdsWithoutDisposition(tx: DbOrTx, investigationId: string): Promise<string[]> {
  const rows = await tx
    .select({ id: investigationItems.id })
    .from(investigationItems)
    .where(
      and(
        eq(investigationItems.investigationId, investigationId),
        itemWithoutDisposition,
      ),
    );
  return rows.map((r) => r.id);
}

export async function insertDispositions(tx: DbOrTx, values: (typeof dispositions.$inferInsert)[]) {
  const out: (typeof dispositions.$inferSelect)[] = [];
  for (let i = 0; i < values.length; i += 1000) out.push(...(await tx.insert(dispositions).values(values.slice(i, i + 1000)).returning()));
  return out;
}

export async function findReading(tx: DbOrTx, id: string) {
  return (await tx.select().from(readings).where(eq(readings.id, id)))[0] ?? null;
}

/**
 * How many affected items of an investigation still wait for a disposition (one definition for lists and dashboards):
 * its items less the items with a disposition, read from its row of investigation_tallies (kept by database triggers
 * with every item and disposition added), not counted from its items on every request.
 */
export const undisposedItemsOf = (investigationId: SQL | typeof investigations.id) =>
  sql`coalesce((select ut.items - ut.disposed_items from investigation_tallies ut where ut.investigation_id = ${investigationId}), 0)`;

/** Investigations for the list, open first then newest; filters on the tool (or standard, or a cascaded tool), status, job and pending dispositions. */
export async function listInvestigations(tx: DbOrTx, f: { toolAssetTag?: string; status?: "open" | "closed"; jobId?: string; awaitingDisposition?: boolean; page: number; pageSize: number }) {
  const conds: SQL[] = [];
  if (f.status) conds.push(eq(investigations.status, f.status));
  if (f.awaitingDisposition !== undefined) conds.push(f.awaitingDisposition ? sql`${undisposedItemsOf(investigations.id)} > 0` : sql`${undisposedItemsOf(investigations.id)} = 0`);
  if (f.toolAssetTag) {
    const tag = f.toolAssetTag;
    conds.push(
      or(
        sql`${investigations.toolId} in (select ${tools.id} from ${tools} where ${tools.assetTag} = ${tag})`,
        sql`${investigations.standardId} in (select ${standards.id} from ${standards} where ${standards.assetTag} = ${tag})`,
        sql`exists (select 1 from ${investigationItems} join ${tools} on ${tools.id} = ${investigationItems.toolId}
                    where ${investigationItems.investigationId} = ${investigations.id} and ${tools.assetTag} = ${tag})`,
      )!,
    );
  }
  if (f.jobId) {
    conds.push(sql`exists (select 1 from ${investigationItems} join ${readings} on ${readings.id} = ${investigationItems.readingId}
                           where ${investigationItems.investigationId} = ${investigations.id} and ${readings.jobId} = ${f.jobId})`);
  }
  const where = conds.length ? and(...conds) : undefined;
  const [{ total }] = await tx.select({ total: sql<number>`count(*)::int` }).from(investigations).where(where);
  const rows = await tx
    .select({ inv: investigations, toolAssetTag: tools.assetTag, toolDescription: tools.description, standardAssetTag: standards.assetTag, standardName: standards.name })
    .from(investigations)
    .leftJoin(tools, eq(tools.id, investigations.toolId))
    .leftJoin(standards, eq(standards.id, investigations.standardId))
    .where(where)
    .orderBy(sql`case when ${investigations.status} = 'open' then 0 else 1 end`, desc(investigations.openedAt), desc(investigations.id))
    .limit(f.pageSize)
    .offset(pageOffset(f.page, f.pageSize));
  return { total, rows };
}

/** Per investigation: its affected readings (with job), and counts of items, could-change items and items without a disposition. */
export async function itemSummaries(tx: DbOrTx, investigationIds: string[]) {
  if (investigationIds.length === 0) return { readingsOf: new Map<string, { readingId: string; jobId: string; verdictCouldChange: boolean }[]>(), counts: new Map<string, { items: number; couldChange: number; undisposed: number }>() };
  const rs = await tx
    .select({ investigationId: investigationItems.investigationId, readingId: investigationItems.readingId, jobId: readings.jobId, verdictCouldChange: investigationItems.verdictCouldChange, takenAt: readings.takenAt })
    .from(investigationItems)
    .innerJoin(readings, eq(readings.id, investigationItems.readingId))
    .where(and(inArray(investigationItems.investigationId, investigationIds), isNotNull(investigationItems.readingId)))
    .orderBy(asc(readings.takenAt));
  const readingsOf = new Map<string, { readingId: string; jobId: string; verdictCouldChange: boolean }[]>();
  const seen = new Set<string>();
  for (const r of rs) {
    // One entry per reading, even when a cascade reaches it through two tools; could change if either says so.
    const key = `${r.investigationId}:${r.readingId}`;
    const list = readingsOf.get(r.investigationId) ?? [];
    if (seen.has(key)) {
      const e = list.find((x) => x.readingId === r.readingId)!;
      e.verdictCouldChange ||= r.verdictCouldChange;
      continue;
    }
    seen.add(key);
    list.push({ readingId: r.readingId!, jobId: r.jobId, verdictCouldChange: r.verdictCouldChange });
    readingsOf.set(r.investigationId, list);
  }
  const countRows = await tx
    .select({
      investigationId: investigationItems.investigationId,
      items: sql<number>`count(*)::int`,
      couldChange: sql<number>`count(*) filter (where ${investigationItems.verdictCouldChange})::int`,
      undisposed: sql<number>`count(*) filter (where ${itemWithoutDisposition})::int`,
    })
    .from(investigationItems)
    .where(inArray(investigationItems.investigationId, investigationIds))
    .groupBy(investigationItems.investigationId);
  return { readingsOf, counts: new Map(countRows.map((c) => [c.investigationId, c])) };
}

/** The disposition in force for an item: the latest one no later one supersedes. */
const currentDispositionKind = sql<string | null>`(select cd.kind from dispositions cd
  where cd.investigation_item_id = investigation_items.id and not exists (select 1 from dispositions cs where cs.supersedes_id = cd.id)
  order by cd.decided_at desc, cd.id desc limit 1)`;

export interface ItemFilter {
  couldChange?: boolean;
  verdict?: "within_limits" | "outside_limits" | "pending";
  disposition?: "no_impact" | "remeasure" | "notify_owner" | "recall" | "none";
  jobId?: string;
  q?: string;
}

function itemConditions(investigationId: string, f: ItemFilter): SQL {
  const conds: (SQL | undefined)[] = [eq(investigationItems.investigationId, investigationId)];
  if (f.couldChange !== undefined) conds.push(eq(investigationItems.verdictCouldChange, f.couldChange));
  if (f.verdict) conds.push(eq(investigationItems.recordedVerdict, f.verdict));
  if (f.disposition === "none") conds.push(itemWithoutDisposition);
  else if (f.disposition) conds.push(sql`${currentDispositionKind} = ${f.disposition}`);
  if (f.jobId) conds.push(eq(investigationItems.jobId, f.jobId));
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    conds.push(
      sql`(coalesce(${limitItems.label}, ${readings.itemKey}) ilike ${like} or ${jobs.engineSerial} ilike ${like} or ${jobs.workOrder} ilike ${like} or ${tools.assetTag} ilike ${like})`,
    );
  }
  return and(...conds)!;
}

/**
 * Could-change first, then by check sheet (a cascade's calibrations before any sheet), then by time and place: the
 * columns of investigation_items_page_idx, so a page is read off the index, whatever the investigation's size.
 */
const DEFAULT_ORDER = [
  sql`${investigationItems.verdictCouldChange} desc`,
  sql`${investigationItems.sheetSerial} asc nulls first`,
  sql`${investigationItems.takenAt} asc`,
  sql`${investigationItems.placeIndex} asc nulls first`,
  sql`${investigationItems.id} asc`,
];
const SORT_COLUMNS: Record<string, SQL> = {
  couldChange: sql`${investigationItems.verdictCouldChange}`,
  sheet: sql`${investigationItems.sheetSerial}`,
  takenAt: sql`${investigationItems.takenAt}`,
  item: sql`coalesce(${limitItems.label}, ${readings.itemKey})`,
  tool: sql`${tools.assetTag}`,
  verdict: sql`${investigationItems.recordedVerdict}`,
  margin: sql`${investigationItems.marginAfter}`,
  disposition: currentDispositionKind,
};

/** The joins every item query shares: tool, reading, its sheet and place, the cascade's calibration. */
function itemsFrom<T extends Record<string, unknown>>(tx: DbOrTx, fields: T) {
  const taker = alias(users, "taker");
  return tx
    .select(fields as never)
    .from(investigationItems)
    .leftJoin(tools, eq(tools.id, investigationItems.toolId))
    .leftJoin(readings, eq(readings.id, investigationItems.readingId))
    .leftJoin(jobs, eq(jobs.id, readings.jobId))
    .leftJoin(limitItems, and(eq(limitItems.limitTableId, jobs.limitTableId), eq(limitItems.key, readings.itemKey)))
    .leftJoin(taker, eq(taker.id, readings.takenBy))
    .leftJoin(calibrations, eq(calibrations.id, investigationItems.calibrationId));
}

/** One page of an investigation's affected items, filtered and sorted in the database. */
export async function itemPage(tx: DbOrTx, investigationId: string, f: ItemFilter & { sort?: string; page: number; pageSize: number }) {
  const taker = alias(users, "taker");
  const order: SQL[] = [];
  if (f.sort) {
    const desc = f.sort.startsWith("-");
    const col = SORT_COLUMNS[f.sort.replace(/^-/, "")];
    if (col) order.push(desc ? sql`${col} desc nulls last` : sql`${col} asc nulls first`);
  }
  order.push(...DEFAULT_ORDER);
  if (!f.q && !(f.sort && JOINED_SORTS.has(f.sort.replace(/^-/, "")))) return pageOffIndex(tx, investigationId, f, order);
  const rows = (await itemsFrom(tx, {
    item: investigationItems,
    toolAssetTag: tools.assetTag,
    reading: readings,
    job: jobs,
    itemLabel: limitItems.label,
    takenByName: taker.name,
    calibration: calibrations,
  })
    .where(itemConditions(investigationId, f))
    .orderBy(...order)
    .limit(f.pageSize)
    .offset(pageOffset(f.page, f.pageSize))) as unknown as {
    item: InvestigationItemRow;
    toolAssetTag: string | null;
    reading: ReadingRow | null;
    job: typeof jobs.$inferSelect | null;
    itemLabel: string | null;
    takenByName: string | null;
    calibration: typeof calibrations.$inferSelect | null;
  }[];
  return rows;
}

/** The columns of each table a page of items shows, under their TypeScript names with a prefix per table. */
const PAGE = {
  item: columnsOf(investigationItems, "investigation_items", "i."),
  reading: columnsPicked(readings, ["id", "jobId", "itemKey", "index", "unit", "values", "size", "verdict", "takenAt", "takenBy", "overrideReason"], "r", "r."),
  job: columnsPicked(jobs, ["id", "limitTableId", "engineSerial", "engineModel", "workOrder"], "j", "j."),
  calibration: columnsPicked(calibrations, ["id", "result", "performedAt", "performedByName"], "c", "c."),
};

/**
 * A page filtered and sorted on the items' own columns, in one statement: the page comes off
 * investigation_items_page_idx (the inner select, with its limit), then each of its items is joined by key to what it
 * shows (reading, sheet, place label, taker, tool tag, calibration). A named prepared statement, so the seven-table
 * join is planned once per connection, not at every page: one text per filter and sort, with the page's size in the
 * text and the first page without an offset, which lets PostgreSQL keep one generic plan (with `limit $n` or
 * `offset $n` it cannot tell how many rows the plan feeds, judges a generic plan dearer, and plans the join afresh at
 * every call: 1.5–2 ms). Later pages send their offset as a parameter and are planned each time. Where it read the
 * page, then what it names in three more rounds, a page now costs one round trip.
 */
async function pageOffIndex(tx: DbOrTx, investigationId: string, f: ItemFilter & { page: number; pageSize: number }, order: SQL[]) {
  if (!Number.isInteger(f.pageSize) || f.pageSize < 1 || f.pageSize > 500) throw new Error(`affected items: page size ${f.pageSize} out of bounds`);
  const offset = pageOffset(f.page, f.pageSize);
  const orderBy = sql.join(order, sql`, `);
  const res = await executePrepared(
    tx,
    sql`
    select ${PAGE.item.list}, ${PAGE.reading.list}, ${PAGE.job.list}, ${PAGE.calibration.list},
      t.asset_tag as "toolAssetTag", li.label as "itemLabel", taker.name as "takenByName"
    from (
      select * from investigation_items where ${itemConditions(investigationId, f)}
      order by ${orderBy} limit ${sql.raw(String(f.pageSize))}${offset ? sql` offset ${offset}` : sql``}
    ) investigation_items
    left join tools t on t.id = investigation_items.tool_id
    left join readings r on r.id = investigation_items.reading_id
    left join jobs j on j.id = r.job_id
    left join limit_items li on li.limit_table_id = j.limit_table_id and li.key = r.item_key
    left join users taker on taker.id = r.taken_by
    left join calibrations c on c.id = investigation_items.calibration_id
    order by ${orderBy}`,
  );
  return res.rows.map((row) => ({
    item: PAGE.item.read(row),
    toolAssetTag: (row.toolAssetTag as string | null) ?? null,
    reading: row["r.id"] == null ? null : PAGE.reading.read(row),
    job: row["j.id"] == null ? null : PAGE.job.read(row),
    itemLabel: (row.itemLabel as string | null) ?? null,
    takenByName: (row.takenByName as string | null) ?? null,
    calibration: row["c.id"] == null ? null : PAGE.calibration.read(row),
  }));
}

/** The sorts that read a joined table (the place's label, the tool's tag). */
const JOINED_SORTS = new Set(["item", "tool"]);

/** Counts over an investigation's items (or those a filter keeps): could change or hold, by recorded verdict, undisposed. */
type FixedTotals = { items: number; readings: number; calibrations: number; couldChange: number; within: number; outside: number; pending: number };

/** How many filtered totals one process keeps. */
const KEPT_TOTALS = 2_000;
const keptTotals = new Map<string, FixedTotals>();

/**
 * Totals of an investigation's affected items under a filter: how many, readings and calibrations, could change or
 * hold, by recorded verdict, and how many have no disposition yet.
 *
 * An investigation's items are written once, when it opens, and never changed by the app (the database refuses it once
 * it is closed), so the counts that read only the items are kept per process and filter; only the count of items without
 * a disposition, which moves with every disposition, is read each time, from the dispositions side. A text filter or a
 * disposition filter reads everything afresh, as does a read inside a transaction (its items may not be committed).
 */
export async function itemTotals(tx: DbOrTx, investigationId: string, f: ItemFilter = {}) {
  if (f.q || f.disposition) return itemTotalsRead(tx, investigationId, f);
  const key = JSON.stringify([investigationId, f.couldChange ?? null, f.verdict ?? null, f.jobId ?? null]);
  const inTx = "rollback" in tx;
  let fixed = inTx ? undefined : keptTotals.get(key);
  if (!fixed) {
    fixed = await fixedTotalsRead(tx, itemConditions(investigationId, f));
    // An investigation still gathering has no items yet (they are written in one transaction): not kept.
    if (!inTx && fixed.items > 0) {
      if (keptTotals.size >= KEPT_TOTALS) keptTotals.delete(keptTotals.keys().next().value!);
      keptTotals.set(key, fixed);
    }
  }
  // Counted from the dispositions' side (their own index by investigation): an investigation of thousands of items
  // with few dispositions yet costs those few rows, not a probe per item.
  // A named prepared statement (one text per filter), as the page it is asked beside.
  const res = await executePrepared(
    tx,
    sql`select count(distinct d.investigation_item_id)::int as disposed
      from dispositions d join investigation_items on investigation_items.id = d.investigation_item_id
      where d.investigation_id = ${investigationId} and ${itemConditions(investigationId, f)}`,
  );
  return totalsView(fixed, fixed.items - Number(res.rows[0].disposed));
}

const fixedCounts = {
  items: sql<number>`count(*)::int`,
  readings: sql<number>`count(${investigationItems.readingId})::int`,
  calibrations: sql<number>`count(${investigationItems.calibrationId})::int`,
  couldChange: sql<number>`count(*) filter (where ${investigationItems.verdictCouldChange})::int`,
  within: sql<number>`count(*) filter (where ${investigationItems.recordedVerdict} = 'within_limits')::int`,
  outside: sql<number>`count(*) filter (where ${investigationItems.recordedVerdict} = 'outside_limits')::int`,
  pending: sql<number>`count(*) filter (where ${investigationItems.recordedVerdict} = 'pending')::int`,
};

async function fixedTotalsRead(tx: DbOrTx, where: SQL): Promise<FixedTotals> {
  const [row] = (await tx.select(fixedCounts).from(investigationItems).where(where)) as unknown as FixedTotals[];
  return row;
}

/** Every total read in one statement, through the joined tables when the filter searches text. */
async function itemTotalsRead(tx: DbOrTx, investigationId: string, f: ItemFilter) {
  // Only a text filter reads the joined tables; otherwise the items alone answer (no joins to plan).
  const from = f.q ? itemsFrom : <T extends Record<string, unknown>>(db: DbOrTx, fields: T) => db.select(fields as never).from(investigationItems);
  const [row] = (await from(tx, { ...fixedCounts, undisposed: sql<number>`count(*) filter (where ${itemWithoutDisposition})::int` }).where(
    itemConditions(investigationId, f),
  )) as unknown as (FixedTotals & { undisposed: number })[];
  return totalsView(row, row.undisposed);
}

function totalsView(row: FixedTotals, undisposed: number) {
  return {
    items: row.items,
    readings: row.readings,
    calibrations: row.calibrations,
    couldChange: row.couldChange,
    holds: row.items - row.couldChange,
    undisposed,
    byVerdict: { within_limits: row.within, outside_limits: row.outside, pending: row.pending },
  };
}

/** The check sheets an investigation's readings belong to, with how many affected items each holds. */
export async function itemJobs(tx: DbOrTx, investigationId: string) {
  return tx
    .select({ id: jobs.id, engineSerial: jobs.engineSerial, workOrder: jobs.workOrder, count: sql<number>`count(*)::int` })
    .from(investigationItems)
    .innerJoin(jobs, eq(jobs.id, investigationItems.jobId))
    .where(eq(investigationItems.investigationId, investigationId))
    .groupBy(jobs.id, jobs.engineSerial, jobs.workOrder)
    .orderBy(asc(jobs.engineSerial));
}

/**
 * Every disposition of some items, oldest first, with who decided. Two decided within the same instant keep
 * their order along the chain of replacements: a disposition always comes after the one it supersedes.
 */
export async function dispositionsOfItems(tx: DbOrTx, itemIds: string[]) {
  if (itemIds.length === 0) return [];
  // The items as one array parameter, in a named prepared statement: a page of items asks it every time.
  const res = await executePrepared(
    tx,
    sql`select ${DISPOSITION.list}, u.name as "byName" from dispositions d join users u on u.id = d.decided_by
      where d.investigation_item_id = any(${pgArray(itemIds)}::uuid[]) order by d.decided_at, d.id`,
  );
  const rows = res.rows.map((r) => ({ d: DISPOSITION.read(r), byName: String(r.byName) }));
  const byId = new Map(rows.map((r) => [r.d.id, r.d]));
  const depth = (d: typeof dispositions.$inferSelect): number => {
    let n = 0;
    for (let at = d; at.supersedesId && byId.has(at.supersedesId) && n < rows.length; n++) at = byId.get(at.supersedesId)!;
    return n;
  };
  const depths = new Map(rows.map((r) => [r.d.id, depth(r.d)]));
  return rows.sort((a, b) => a.d.decidedAt.getTime() - b.d.decidedAt.getTime() || depths.get(a.d.id)! - depths.get(b.d.id)!);
}

const DISPOSITION = columnsOf(dispositions, "d", "d.");

/** The disposition in force for each of some items (none superseding it), by item. */
export async function currentDispositions(tx: DbOrTx, itemIds: string[]) {
  if (itemIds.length === 0) return new Map<string, typeof dispositions.$inferSelect>();
  const rows = await tx
    .selectDistinctOn([dispositions.investigationItemId])
    .from(dispositions)
    .where(and(inArray(dispositions.investigationItemId, itemIds), sql.raw("not exists (select 1 from dispositions cs where cs.supersedes_id = dispositions.id)")))
    .orderBy(dispositions.investigationItemId, desc(dispositions.decidedAt), desc(dispositions.id));
  return new Map(rows.map((r) => [r.investigationItemId, r]));
}

/**
 * Later readings of one place on one check sheet (same job, item and index, taken after `after`), current ones
 * only, with their tools: what a remeasurement of an affected reading can be.
 */
export async function laterReadingsOfPlace(tx: DbOrTx, place: { jobId: string; itemKey: string; index: number; after: Date; excludeId: string }) {
  const taker = alias(users, "taker");
  const rows = await tx
    .select({ reading: readings, takenByName: taker.name })
    .from(readings)
    .leftJoin(taker, eq(taker.id, readings.takenBy))
    .where(
      and(
        eq(readings.jobId, place.jobId),
        eq(readings.itemKey, place.itemKey),
        eq(readings.index, place.index),
        sql`${readings.takenAt} > ${place.after.toISOString()}`,
        ne(readings.id, place.excludeId),
        readingNotSuperseded,
      ),
    )
    .orderBy(desc(readings.takenAt))
    .limit(200);
  const ids = rows.map((r) => r.reading.id);
  const tags = ids.length
    ? await tx.select({ readingId: readingTools.readingId, tag: tools.assetTag }).from(readingTools).innerJoin(tools, eq(tools.id, readingTools.toolId)).where(inArray(readingTools.readingId, ids)).orderBy(asc(readingTools.position))
    : [];
  return rows.map((r) => ({ ...r, toolAssetTags: tags.filter((t) => t.readingId === r.reading.id).map((t) => t.tag) }));
}

export async function findItem(tx: DbOrTx, investigationId: string, itemId: string) {
  const [row] = await tx.select().from(investigationItems).where(and(eq(investigationItems.id, itemId), eq(investigationItems.investigationId, investigationId)));
  return row ?? null;
}

export async function userName(tx: DbOrTx, id: string | null) {
  if (!id) return null;
  return (await tx.select({ name: users.name }).from(users).where(eq(users.id, id)))[0]?.name ?? null;
}

/** Reading ids, among those given, that are affected readings of an open investigation. */
export async function openInvestigationReadingIds(tx: DbOrTx, readingIds: string[]): Promise<Set<string>> {
  if (readingIds.length === 0) return new Set();
  const rows = await tx
    .selectDistinct({ id: investigationItems.readingId })
    .from(investigationItems)
    .innerJoin(investigations, eq(investigations.id, investigationItems.investigationId))
    .where(and(inArray(investigationItems.readingId, readingIds), eq(investigations.status, "open")));
  return new Set(rows.map((r) => r.id!));
}

/** Investigations whose notices were recorded but not yet sent (delivered after the opening transaction commits). */
export async function pendingNoticeIds(tx: DbOrTx) {
  const rows = await tx.select({ id: investigations.id }).from(investigations).where(sql`${investigations.finding}->'notifications'->>'status' = 'pending'`);
  return rows.map((r) => r.id);
}

