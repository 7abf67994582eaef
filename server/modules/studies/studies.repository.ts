import { asc, eq, inArray, sql, type Placeholder, type SQL } from "drizzle-orm";
import { inList, pgArray } from "../../db/values";
import type { DbOrTx } from "../../db/client";
import { users } from "../users/users.table";
import { tools } from "../tools/tools.table";
import { families } from "../families/families.table";
import { gaugeStudies, gaugeStudyAppraisers, gaugeStudyParts, gaugeStudyResults, gaugeStudyValues, gaugeStudyValueTools } from "./studies.table";

type Row = Record<string, unknown>;

export type StudyInsert = typeof gaugeStudies.$inferInsert;
export type StudyValueInsert = typeof gaugeStudyValues.$inferInsert;

/** A study with what its summary shows: characteristic, family, tool, creator, progress and current result. */
export interface StudyRow {
  id: string;
  number: number;
  limitTableId: string;
  tableRootId: string;
  itemKey: string;
  familyId: string;
  familyName: string;
  familyKind: string;
  toolId: string | null;
  toolAssetTag: string | null;
  toolDescription: string | null;
  parts: number;
  appraisers: number;
  trials: number;
  alpha: number;
  runOrder: number[][][];
  purpose: string | null;
  isDemo: boolean;
  createdAt: Date;
  createdBy: string | null;
  creatorName: string | null;
  tableName: string;
  engineModel: string;
  tableVersion: number;
  tableUnit: "in" | "mm";
  itemLabel: string;
  itemKind: string;
  itemMin: string | null;
  itemMax: string | null;
  valuesTaken: number;
  completedAt: Date | null;
  verdict: "acceptable" | "conditional" | "not_acceptable" | null;
  percentGrr: number | null;
  ndc: number | null;
  analysis: unknown;
}

const date = (v: unknown) => (v == null ? null : v instanceof Date ? v : new Date(String(v)));

function toStudyRow(r: Row): StudyRow {
  return {
    id: String(r.id),
    number: Number(r.number),
    limitTableId: String(r.limit_table_id),
    tableRootId: String(r.table_root_id),
    itemKey: String(r.item_key),
    familyId: String(r.family_id),
    familyName: String(r.family_name),
    familyKind: String(r.family_kind),
    toolId: (r.tool_id as string) ?? null,
    toolAssetTag: (r.tool_asset_tag as string) ?? null,
    toolDescription: (r.tool_description as string) ?? null,
    parts: Number(r.parts),
    appraisers: Number(r.appraisers),
    trials: Number(r.trials),
    alpha: Number(r.alpha),
    runOrder: r.run_order as number[][][],
    purpose: (r.purpose as string) ?? null,
    isDemo: Boolean(r.is_demo),
    createdAt: date(r.created_at)!,
    createdBy: (r.created_by as string) ?? null,
    creatorName: (r.creator_name as string) ?? null,
    tableName: String(r.table_name),
    engineModel: String(r.engine_model),
    tableVersion: Number(r.table_version),
    tableUnit: r.table_unit as "in" | "mm",
    itemLabel: String(r.item_label),
    itemKind: String(r.item_kind),
    itemMin: (r.item_min as string) ?? null,
    itemMax: (r.item_max as string) ?? null,
    valuesTaken: Number(r.values_taken),
    completedAt: date(r.completed_at),
    verdict: (r.verdict as StudyRow["verdict"]) ?? null,
    percentGrr: r.percent_grr == null ? null : Number(r.percent_grr),
    ndc: r.ndc == null ? null : Number(r.ndc),
    analysis: r.analysis ?? null,
  };
}

/** The summary select; `withAnalysis` adds the current result's analysis (only one study's page needs it). */
function studySelect(where: SQL, tail: SQL = sql``, withAnalysis = false) {
  return sql`
    select s.id, s.number, s.limit_table_id, s.table_root_id, s.item_key, s.family_id, f.name as family_name, f.kind as family_kind,
      s.tool_id, t.asset_tag as tool_asset_tag, t.description as tool_description, s.parts, s.appraisers, s.trials, s.alpha, s.run_order,
      s.purpose, s.is_demo, s.created_at, s.created_by, u.name as creator_name,
      lt.name as table_name, lt.engine_model, lt.version as table_version, lt.unit as table_unit,
      li.label as item_label, li.kind as item_kind, li.min as item_min, li.max as item_max,
      (select count(*)::int from gauge_study_values v where v.study_id = s.id and v.supersedes_id is null) as values_taken,
      first.completed_at, cur.verdict, cur.percent_grr, cur.ndc ${withAnalysis ? sql`, cur.analysis` : sql``}
    from gauge_studies s
    join families f on f.id = s.family_id
    left join tools t on t.id = s.tool_id
    join limit_tables lt on lt.id = s.limit_table_id
    join limit_items li on li.limit_table_id = s.limit_table_id and li.key = s.item_key
    left join users u on u.id = s.created_by
    left join lateral (select r.verdict, r.percent_grr, r.ndc, r.analysis from gauge_study_results r where r.study_id = s.id order by r.seq desc limit 1) cur on true
    left join lateral (select min(r.computed_at) as completed_at from gauge_study_results r where r.study_id = s.id) first on true
    where ${where}
    ${tail}`;
}

/**
 * The latest finished study of each (characteristic, family) pair, with its current verdict. "Latest" is by the
 * time the study was completed; the verdict is its newest result (after any corrections).
 */
function latestSelect(where: SQL) {
  return sql`
    select distinct on (s.table_root_id, s.item_key, s.family_id)
      s.id, s.number, s.table_root_id, s.item_key, s.family_id, s.is_demo, first.completed_at, cur.verdict, cur.percent_grr, cur.ndc
    from gauge_studies s
    join lateral (select min(r.computed_at) as completed_at from gauge_study_results r where r.study_id = s.id) first on first.completed_at is not null
    join lateral (select r.verdict, r.percent_grr, r.ndc from gauge_study_results r where r.study_id = s.id order by r.seq desc limit 1) cur on true
    where ${where}
    order by s.table_root_id, s.item_key, s.family_id, first.completed_at desc, s.number desc`;
}

export interface LatestRow {
  id: string;
  number: number;
  tableRootId: string;
  itemKey: string;
  familyId: string;
  isDemo: boolean;
  completedAt: Date;
  verdict: "acceptable" | "conditional" | "not_acceptable";
  percentGrr: number | null;
  ndc: number | null;
}

const toLatest = (r: Row): LatestRow => ({
  id: String(r.id),
  number: Number(r.number),
  tableRootId: String(r.table_root_id),
  itemKey: String(r.item_key),
  familyId: String(r.family_id),
  isDemo: Boolean(r.is_demo),
  completedAt: date(r.completed_at)!,
  verdict: r.verdict as LatestRow["verdict"],
  percentGrr: r.percent_grr == null ? null : Number(r.percent_grr),
  ndc: r.ndc == null ? null : Number(r.ndc),
});

export const studiesRepository = {
  /** The first revision of a limits table (revisions name the one they supersede). */
  async tableRoot(db: DbOrTx, limitTableId: string): Promise<string | null> {
    const res = await db.execute(sql`
      with recursive up(id, supersedes_id) as (
        select id, supersedes_id from limit_tables where id = ${limitTableId}
        union all
        select t.id, t.supersedes_id from limit_tables t join up on t.id = up.supersedes_id
      )
      select id from up where supersedes_id is null limit 1`);
    return (res.rows[0]?.id as string) ?? null;
  },

  async insertStudy(db: DbOrTx, study: StudyInsert, partLabels: string[], appraiserIds: string[]) {
    const [row] = await db.insert(gaugeStudies).values(study).returning();
    await db.insert(gaugeStudyParts).values(partLabels.map((label, i) => ({ studyId: row.id, seq: i + 1, label })));
    await db.insert(gaugeStudyAppraisers).values(appraiserIds.map((userId, i) => ({ studyId: row.id, seq: i + 1, userId })));
    return row;
  },

  /** Holds the study while a value is recorded, so two entries cannot both take the same place or both complete it. */
  async lock(db: DbOrTx, id: string) {
    const res = await db.execute(sql`select id from gauge_studies where id = ${id} for update`);
    return res.rows.length > 0;
  },

  async find(db: DbOrTx, id: string, withAnalysis = false): Promise<StudyRow | undefined> {
    const res = await db.execute(studySelect(sql`s.id = ${id}`, sql``, withAnalysis));
    return res.rows[0] ? toStudyRow(res.rows[0] as Row) : undefined;
  },

  async list(db: DbOrTx, q: { state?: "in_progress" | "complete"; familyId?: string; limitTableId?: string; itemKey?: string; sort: string; page: number; pageSize: number }) {
    const conds: SQL[] = [sql`true`];
    if (q.state === "complete") conds.push(sql`exists (select 1 from gauge_study_results r where r.study_id = s.id)`);
    if (q.state === "in_progress") conds.push(sql`not exists (select 1 from gauge_study_results r where r.study_id = s.id)`);
    if (q.familyId) conds.push(sql`s.family_id = ${q.familyId}`);
    if (q.limitTableId) conds.push(sql`s.table_root_id = (${rootOf(q.limitTableId)})`);
    if (q.itemKey) conds.push(sql`s.item_key = ${q.itemKey}`);
    const where = sql.join(conds, sql` and `);
    const order = q.sort === "createdAt" ? sql`order by s.created_at asc, s.number asc` : sql`order by s.created_at desc, s.number desc`;
    const [rows, count] = await Promise.all([
      db.execute(studySelect(where, sql`${order} limit ${q.pageSize} offset ${(q.page - 1) * q.pageSize}`)),
      db.execute(sql`select count(*)::int as total from gauge_studies s where ${where}`),
    ]);
    return { items: (rows.rows as Row[]).map(toStudyRow), total: Number(count.rows[0].total) };
  },

  /** Studies in which this person is an appraiser and still has places to measure. */
  async openFor(db: DbOrTx, userId: string) {
    const res = await db.execute(
      studySelect(
        sql`exists (select 1 from gauge_study_appraisers a where a.study_id = s.id and a.user_id = ${userId})
          and (select count(*) from gauge_study_values v join gauge_study_appraisers a on a.study_id = v.study_id and a.seq = v.appraiser_seq
               where v.study_id = s.id and a.user_id = ${userId} and v.supersedes_id is null) < s.parts * s.trials`,
        sql`order by s.created_at asc`,
      ),
    );
    return (res.rows as Row[]).map(toStudyRow);
  },

  parts: (db: DbOrTx, studyId: string) => db.select().from(gaugeStudyParts).where(eq(gaugeStudyParts.studyId, studyId)).orderBy(asc(gaugeStudyParts.seq)),

  appraisersOf: (db: DbOrTx, studyIds: string[]) =>
    studyIds.length
      ? db
          .select({ studyId: gaugeStudyAppraisers.studyId, seq: gaugeStudyAppraisers.seq, userId: gaugeStudyAppraisers.userId, name: users.name })
          .from(gaugeStudyAppraisers)
          .innerJoin(users, eq(users.id, gaugeStudyAppraisers.userId))
          .where(inArray(gaugeStudyAppraisers.studyId, studyIds))
          .orderBy(asc(gaugeStudyAppraisers.studyId), asc(gaugeStudyAppraisers.seq))
      : Promise.resolve([]),

  /** Every value of a study (superseded ones too), oldest first, with the value that supersedes each. */
  async values(db: DbOrTx, studyId: string) {
    const res = await db.execute(sql`
      select v.id, v.seq, v.appraiser_seq, v.part, v.trial, v.position, v.value, v.unit, v.taken_by, u.name as taker_name, v.taken_at,
        v.supersedes_id, v.supersede_reason, (select n.id from gauge_study_values n where n.supersedes_id = v.id) as superseded_by_id
      from gauge_study_values v join users u on u.id = v.taken_by
      where v.study_id = ${studyId}
      order by v.seq`);
    return (res.rows as Row[]).map((r) => ({
      id: String(r.id),
      seq: Number(r.seq),
      appraiserSeq: Number(r.appraiser_seq),
      part: Number(r.part),
      trial: Number(r.trial),
      position: Number(r.position),
      value: String(r.value),
      unit: r.unit as "in" | "mm",
      takenBy: String(r.taken_by),
      takerName: String(r.taker_name),
      takenAt: date(r.taken_at)!,
      supersedesId: (r.supersedes_id as string) ?? null,
      supersedeReason: (r.supersede_reason as string) ?? null,
      supersededById: (r.superseded_by_id as string) ?? null,
    }));
  },

  toolsOfValues: (db: DbOrTx, valueIds: string[]) =>
    valueIds.length
      ? db
          .select({ valueId: gaugeStudyValueTools.valueId, position: gaugeStudyValueTools.position, statusAtReading: gaugeStudyValueTools.statusAtReading, dueAtReading: gaugeStudyValueTools.dueAtReading, assetTag: tools.assetTag, description: tools.description })
          .from(gaugeStudyValueTools)
          .innerJoin(tools, eq(tools.id, gaugeStudyValueTools.toolId))
          .where(inArray(gaugeStudyValueTools.valueId, valueIds))
          .orderBy(asc(gaugeStudyValueTools.position))
      : Promise.resolve([]),

  findValue: async (db: DbOrTx, id: string) => (await db.select().from(gaugeStudyValues).where(eq(gaugeStudyValues.id, id)))[0],
  successorOf: async (db: DbOrTx, id: string) => (await db.select({ id: gaugeStudyValues.id }).from(gaugeStudyValues).where(eq(gaugeStudyValues.supersedesId, id)))[0],

  async insertValue(db: DbOrTx, value: StudyValueInsert, toolRows: Omit<typeof gaugeStudyValueTools.$inferInsert, "valueId">[]) {
    const [row] = await db.insert(gaugeStudyValues).values(value).returning();
    await db.insert(gaugeStudyValueTools).values(toolRows.map((t) => ({ ...t, valueId: row.id })));
    return row;
  },

  insertResult: (db: DbOrTx, row: typeof gaugeStudyResults.$inferInsert) => db.insert(gaugeStudyResults).values(row),

  /** Tools by asset tag, with their family. */
  toolsByTags: (db: DbOrTx, tags: string[]) =>
    tags.length
      ? db
          .select({ tool: tools, familyName: families.name, kind: families.kind })
          .from(tools)
          .innerJoin(families, eq(families.id, tools.familyId))
          .where(inArray(sql`upper(${tools.assetTag})`, tags.map((t) => t.toUpperCase())))
      : Promise.resolve([]),

  family: async (db: DbOrTx, id: string) => (await db.select().from(families).where(eq(families.id, id)))[0],
  usersByIds: (db: DbOrTx, ids: string[]) => (ids.length ? db.select().from(users).where(inArray(users.id, ids)) : Promise.resolve([])),

  /**
   * "The latest finished study of this characteristic with any of these families is not acceptable", as an SQL
   * condition: for a statement that asks it beside other things (recording a reading asks it with its sheet). The
   * table and the families may be given as SQL of that statement (the sheet's table column, a select of family ids).
   */
  notAcceptableLatest: (filter: { limitTableId: string | SQL; itemKey: string | Placeholder; familyIds: string[] | SQL }): SQL => {
    const families = Array.isArray(filter.familyIds)
      ? filter.familyIds.length
        ? inList(sql`s.family_id`, filter.familyIds, "uuid")
        : null
      : sql`s.family_id in (${filter.familyIds})`;
    return families
      ? sql`exists (select 1 from (${latestSelect(sql`${families} and s.table_root_id = (${rootOf(filter.limitTableId)}) and s.item_key = ${filter.itemKey}`)}) l where l.verdict = 'not_acceptable')`
      : sql`false`;
  },

  /** Latest finished studies for one family, or for every characteristic of one table's lineage. */
  async latest(db: DbOrTx, filter: { familyId?: string; limitTableId?: string; familyIds?: string[]; itemKey?: string }): Promise<LatestRow[]> {
    const conds: SQL[] = [sql`true`];
    if (filter.familyId) conds.push(sql`s.family_id = ${filter.familyId}`);
    if (filter.familyIds) conds.push(filter.familyIds.length ? sql`s.family_id = any(${pgArray(filter.familyIds)}::uuid[])` : sql`false`);
    if (filter.limitTableId) conds.push(sql`s.table_root_id = (${rootOf(filter.limitTableId)})`);
    if (filter.itemKey) conds.push(sql`s.item_key = ${filter.itemKey}`);
    const res = await db.execute(latestSelect(sql.join(conds, sql` and `)));
    return (res.rows as Row[]).map(toLatest);
  },

  /** Unfinished studies for one family or one table's lineage. */
  async inProgress(db: DbOrTx, filter: { familyId?: string; limitTableId?: string }) {
    const conds: SQL[] = [sql`not exists (select 1 from gauge_study_results r where r.study_id = s.id)`];
    if (filter.familyId) conds.push(sql`s.family_id = ${filter.familyId}`);
    if (filter.limitTableId) conds.push(sql`s.table_root_id = (${rootOf(filter.limitTableId)})`);
    const res = await db.execute(sql`select s.id, s.number, s.table_root_id, s.item_key, s.family_id from gauge_studies s where ${sql.join(conds, sql` and `)} order by s.created_at desc`);
    return (res.rows as Row[]).map((r) => ({ id: String(r.id), number: Number(r.number), tableRootId: String(r.table_root_id), itemKey: String(r.item_key), familyId: String(r.family_id) }));
  },

  /** Names for the latest-study cards: characteristic labels (from the newest revision of each lineage) and family names. */
  async characteristicNames(db: DbOrTx, pairs: { tableRootId: string; itemKey: string }[]) {
    if (!pairs.length) return new Map<string, { limitTableId: string; label: string; engineModel: string }>();
    const roots = [...new Set(pairs.map((p) => p.tableRootId))];
    const res = await db.execute(sql`
      with recursive down(id, root_id, version) as (
        select id, id, version from limit_tables where id = any(${pgArray(roots)}::uuid[])
        union all
        select t.id, d.root_id, t.version from limit_tables t join down d on t.supersedes_id = d.id
      ), newest as (select distinct on (root_id) id, root_id from down order by root_id, version desc)
      select n.root_id, n.id as limit_table_id, i.key, i.label, lt.engine_model
      from newest n join limit_items i on i.limit_table_id = n.id join limit_tables lt on lt.id = n.id`);
    return new Map((res.rows as Row[]).map((r) => [`${r.root_id}/${r.key}`, { limitTableId: String(r.limit_table_id), label: String(r.label), engineModel: String(r.engine_model) }]));
  },

  familyNames: async (db: DbOrTx, ids: string[]) =>
    new Map((ids.length ? await db.select({ id: families.id, name: families.name }).from(families).where(inArray(families.id, ids)) : []).map((f) => [f.id, f.name])),

  /**
   * Characteristics (journal and bore items with both limits) of the current revision of every table, each with
   * whether any study of it is finished and whether every family's latest study of it is not acceptable.
   */
  async gaps(db: DbOrTx, limit: number) {
    const res = await db.execute(sql`
      with recursive chain(id, root_id) as (
        select id, id from limit_tables where supersedes_id is null
        union all
        select t.id, c.root_id from limit_tables t join chain c on t.supersedes_id = c.id
      ),
      current_items as (
        select lt.id as limit_table_id, lt.name as table_name, lt.engine_model, lt.is_demo, c.root_id, i.key, i.label, i.seq
        from limit_tables lt
        join chain c on c.id = lt.id
        join limit_items i on i.limit_table_id = lt.id
        where not exists (select 1 from limit_tables n where n.supersedes_id = lt.id)
          and i.kind in ('journal', 'bore') and i.min is not null and i.max is not null
      ),
      latest as (${latestSelect(sql`s.table_root_id in (select root_id from current_items)`)}),
      judged as (
        select ci.*, count(l.id) as studies,
          bool_and(l.verdict = 'not_acceptable') filter (where l.id is not null) as all_failed,
          (array_agg(l.id order by l.completed_at desc) filter (where l.verdict = 'not_acceptable'))[1] as failed_id
        from current_items ci left join latest l on l.table_root_id = ci.root_id and l.item_key = ci.key
        group by ci.limit_table_id, ci.table_name, ci.engine_model, ci.is_demo, ci.root_id, ci.key, ci.label, ci.seq
      ),
      gaps as (
        select j.*, case when j.studies = 0 then 'no_study' else 'not_acceptable' end as reason
        from judged j where j.studies = 0 or j.all_failed
      )
      select g.*, s.number as failed_number, f.name as failed_family, r.verdict as failed_verdict, r.percent_grr as failed_percent,
        count(*) over () as total, count(*) filter (where g.reason = 'no_study') over () as no_study, count(*) filter (where g.reason = 'not_acceptable') over () as not_acceptable
      from gaps g
      left join gauge_studies s on s.id = g.failed_id
      left join families f on f.id = s.family_id
      left join lateral (select verdict, percent_grr from gauge_study_results x where x.study_id = s.id order by x.seq desc limit 1) r on true
      order by (g.reason = 'not_acceptable') desc, g.engine_model, g.table_name, g.seq
      limit ${limit}`);
    return res.rows as Row[];
  },
};

/** The root of a table's lineage, as a scalar subquery. */
function rootOf(limitTableId: string | SQL) {
  return sql`with recursive up(id, supersedes_id) as (
      select id, supersedes_id from limit_tables where id = ${limitTableId}
      union all select t.id, t.supersedes_id from limit_tables t join up on t.id = up.supersedes_id
    ) select id from up where supersedes_id is null limit 1`;
}

