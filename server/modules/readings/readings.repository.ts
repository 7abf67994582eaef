import { and, asc, eq, inArray, isNull, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { timeOrderedId } from "../../db/ids";
import { columnsOf, insertShape, keysOfRow, shapeValues } from "../../db/columns";
import { executePrepared, executeShaped } from "../../db/prepared";
import { inList } from "../../db/values";
import { auditRow, type AuditEntry } from "../audit/audit.repository";
import { auditEvents } from "../audit/audit.table";
import { driverError } from "../../http/error-handler";
import { readings, readingTools, readingJudgements } from "./readings.table";
import { setElements } from "../tools/tools.table";
import { calibrationPoints } from "../calibrations/calibrations.table";
import { jobs } from "../jobs/jobs.table";
import { limitTables } from "../limit-tables/limit-tables.table";

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

/** A reading as the check sheet reads it (readingsRepository.ofJob). */
export interface SheetReadingRow {
  r: ReadingRow;
  takerName: string | null;
  overriderName: string | null;
  supersededById: string | null;
  tools: ReadingToolOfSheet[];
  suspect: boolean;
  judgedAt: Date | null;
  judgedView: unknown;
}

/** Why the write of a reading was refused by its place's guard (tenthwise_reading_place, migration 0024). */
export type PlaceRefusal = { code: "sheet_signed" | "reading_exists" | "reading_superseded"; holderId: string | null };
const PLACE_REFUSALS = new Set<PlaceRefusal["code"]>(["sheet_signed", "reading_exists", "reading_superseded"]);

/** Every column of a reading, under its TypeScript name (`r.job_id as "jobId"`), for queries written as SQL. */
const READING = columnsOf(readings, "r");
const READING_P = columnsOf(readings, "p");
export type ReadingJudgementInsert = typeof readingJudgements.$inferInsert;
export type ReadingInsert = typeof readings.$inferInsert;

const successor = alias(readings, "successor");

export const readingsRepository = {
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

  /** The refusal of a reading's place guard, when `e` is one (else null). */
  placeRefusal(e: unknown): PlaceRefusal | null {
    const pg = driverError(e);
    const code = String(pg?.message ?? "") as PlaceRefusal["code"];
    return pg?.code === "P0001" && PLACE_REFUSALS.has(code) ? { code, holderId: (pg as { detail?: string }).detail ?? null } : null;
  },

  findById: async (db: DbOrTx, id: string) => (await db.select().from(readings).where(eq(readings.id, id)))[0],
  successorOf: async (db: DbOrTx, id: string) => (await db.select({ id: readings.id }).from(readings).where(eq(readings.supersedesId, id)))[0],

  async insert(db: DbOrTx, values: ReadingInsert, toolRows: Omit<typeof readingTools.$inferInsert, "readingId">[]) {
    const [row] = await db.insert(readings).values(values).returning();
    if (toolRows.length) await db.insert(readingTools).values(toolRows.map((t) => ({ ...t, readingId: row.id })));
    return row;
  },

  /**
   * Records a reading with its tools, its judgement and its audit line in one statement (data-modifying WITH parts; the
   * foreign keys are checked at the statement's end, when all four rows are in), on its own: no transaction around it.
   * The reading's id is chosen by the caller so that the rows naming it go in together. The reading's job_id is given
   * by the place's guard (tenthwise_reading_place): before the row goes in it takes the sheet's lock (shared; a
   * sign-off waits for it and it for a sign-off) and the place's lock, and looks at the place again as committed then.
   * It refuses, and the statement writes nothing, when the sheet was signed (a new reading, `onSigned` false), the
   * place was taken, or the reading corrected was corrected meanwhile (placeRefusal reads which).
   *
   * `partnerKeys`: the same statement answers the current readings at the reading's index of these places (the other
   * sides of the clearances and the other stations of the tapers it completes), as they stood when it began; by item key.
   */
  async insertRecorded(
    db: DbOrTx,
    values: ReadingInsert & { id: string },
    toolRows: Omit<typeof readingTools.$inferInsert, "readingId">[],
    judgement: Omit<ReadingJudgementInsert, "readingId">,
    audit: AuditEntry,
    opts: { onSigned: boolean; partnerKeys: string[] },
  ): Promise<Map<string, ReadingRow>> {
    // Built once per shape (executeShaped): which columns the reading gives, how many tools, the audit line's columns,
    // whether partners are asked. Every value is a placeholder.
    const { jobId, ...row } = values;
    const readingKeys = keysOfRow(row);
    // The judgement's own key in the order made, as the reading's (server/db/ids.ts).
    const judgementRow = { ...judgement, id: timeOrderedId(), readingId: values.id };
    const judgementKeys = keysOfRow(judgementRow);
    const toolLinks = toolRows.map((t) => ({ ...t, readingId: values.id }));
    const toolKeys = toolLinks.length ? keysOfRow(toolLinks[0]) : [];
    const line = auditRow(audit);
    const auditKeys = keysOfRow(line);
    const withPartners = opts.partnerKeys.length > 0;
    const shape = `reading-write|${readingKeys}|${judgementKeys}|${toolLinks.length}:${toolKeys}|${auditKeys}|${opts.partnerKeys.length}`;
    const v: Record<string, unknown> = {
      "g.job": jobId,
      "g.item": values.itemKey,
      "g.index": values.index ?? 1,
      "g.supersedes": values.supersedesId ?? null,
      "g.onSigned": opts.onSigned,
    };
    shapeValues(readings, row as ReadingInsert, "r.", v);
    shapeValues(readingJudgements, judgementRow, "j.", v);
    toolLinks.forEach((t, i) => shapeValues(readingTools, t, `t${i}.`, v));
    shapeValues(auditEvents, line, "a.", v);
    opts.partnerKeys.forEach((k, i) => (v[`p.key${i}`] = k));
    const res = await executeShaped(db, shape, () => {
      const p = (name: string) => sql.placeholder(name);
      const guard = sql`tenthwise_reading_place(${p("g.job")}::uuid, ${p("g.item")}::text, ${p("g.index")}::integer, ${p("g.supersedes")}::uuid, ${p("g.onSigned")}::boolean)`;
      const parts = [
        sql`r as (${insertShape(readings, ["jobId", ...readingKeys], ["r."], { jobId: guard })})`,
        sql`j as (${insertShape(readingJudgements, judgementKeys, ["j."])})`,
      ];
      if (toolLinks.length) parts.push(sql`t as (${insertShape(readingTools, toolKeys, toolLinks.map((_, i) => `t${i}.`))})`);
      if (!withPartners) return sql`with ${sql.join(parts, sql`, `)} ${insertShape(auditEvents, auditKeys, ["a."])}`;
      parts.push(sql`a as (${insertShape(auditEvents, auditKeys, ["a."])})`);
      return sql`
        with ${sql.join(parts, sql`, `)}
        select distinct on (p.item_key) ${READING_P.list} from readings p
        where p.job_id = ${p("g.job")}::uuid and p.index = ${p("g.index")}::integer and ${inList(sql`p.item_key`, opts.partnerKeys.map((_, i) => p(`p.key${i}`)), "text")}
          and not exists (select 1 from readings s where s.supersedes_id = p.id)
        order by p.item_key, p.taken_at desc`;
    }, v);
    const partners = new Map<string, ReadingRow>();
    for (const r of res.rows as Record<string, unknown>[]) {
      const read = READING_P.read(r);
      partners.set(read.itemKey, read);
    }
    return partners;
  },

  /**
   * Every reading of a job (superseded ones too), as the check sheet shows them: the people named, the reading that
   * superseded it (a correction is a reading of the same sheet, so it is read off the rows), its tools with the status
   * and due date stored at the reading (never derived again), whether an open investigation holds it, and its stored
   * judgement under `rulesVersion` (null until judged).
   *
   * Written as SQL with the row's columns under their TypeScript names: a sheet of 1,000 readings spent more time in
   * the ORM's per-column mapping than in the database. The open-investigation mark is one index probe per reading
   * against the open investigations' ids, read once (an uncorrelated array): joining every open investigation to
   * each reading cost a probe per reading *and* investigation. The tools come in a second query, one plain join
   * (`toolsOfJob`), rather than a JSON list built per reading; the two run one after the other, as they share one
   * connection inside a transaction.
   */
  async ofJob(db: DbOrTx, jobId: string, rulesVersion: number): Promise<SheetReadingRow[]> {
    const res = await db.execute(sql`
      select ${READING.list}, tk.name as "takerName", ov.name as "overriderName",
        exists (select 1 from investigation_items ii
                where ii.reading_id = r.id and ii.investigation_id = any(array(select id from investigations where status = 'open'))) as suspect,
        rj.judged_at as "judgedAt", rj.detail as "judgedView"
      from readings r
      left join users tk on tk.id = r.taken_by
      left join users ov on ov.id = r.override_by
      left join reading_judgements rj on rj.reading_id = r.id and rj.rules_version = ${rulesVersion}
      where r.job_id = ${jobId}
      order by r.taken_at, r.id`);
    const toolsOf = await readingsRepository.toolsOfJob(db, jobId);
    // A correction is a reading of the same sheet: which reading superseded which is read off the rows themselves.
    const successorOf = new Map<string, string>();
    for (const x of res.rows as Record<string, unknown>[]) if (x.supersedesId) successorOf.set(x.supersedesId as string, x.id as string);
    return (res.rows as Record<string, unknown>[]).map((x) => {
      const { takerName, overriderName, suspect, judgedAt, judgedView } = x;
      const r = READING.read(x);
      return {
        r,
        takerName: (takerName as string | null) ?? null,
        overriderName: (overriderName as string | null) ?? null,
        supersededById: successorOf.get(r.id) ?? null,
        tools: toolsOf.get(r.id) ?? [],
        suspect: suspect === true,
        judgedAt: judgedAt == null ? null : new Date(judgedAt as string | Date),
        judgedView: (judgedView as unknown) ?? null,
      };
    });
  },

  /** The tools of every reading of a job, by reading id, in the order the reading names them. */
  async toolsOfJob(db: DbOrTx, jobId: string): Promise<Map<string, ReadingToolOfSheet[]>> {
    // Unordered: sorting a sheet's link rows cost more than the query; a reading names one tool or a few.
    const links = await db.execute(sql`
      select rt.reading_id as "readingId", rt.position, t.asset_tag as "assetTag", t.description, f.kind, t.unit,
        rt.status_at_reading as "statusAtReading", rt.due_at_reading::text as "dueAtReading"
      from readings r join reading_tools rt on rt.reading_id = r.id join tools t on t.id = rt.tool_id join families f on f.id = t.family_id
      where r.job_id = ${jobId}`);
    const byReading = new Map<string, (ReadingToolOfSheet & { position: number })[]>();
    for (const { readingId, ...tool } of links.rows as unknown as (ReadingToolOfSheet & { readingId: string; position: number })[]) {
      const list = byReading.get(readingId);
      if (list) list.push(tool);
      else byReading.set(readingId, [tool]);
    }
    const out = new Map<string, ReadingToolOfSheet[]>();
    for (const [id, list] of byReading) out.set(id, list.sort((a, b) => a.position - b.position).map(({ position: _p, ...t }) => t));
    return out;
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
