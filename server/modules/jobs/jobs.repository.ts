import { and, asc, count, desc, eq, ilike, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { jobs, jobSignoffs } from "./jobs.table";
import { limitTables } from "../limit-tables/limit-tables.table";
import { users } from "../users/users.table";
import { jobState, jobStatusCondition } from "./job-state";
import type { JobListStatus } from "../../../shared/jobs/jobs.schemas";
import { listPage, pageOffset } from "../../db/paging";
import { columnsOf } from "../../db/columns";
import { executePrepared, executeShaped } from "../../db/prepared";

export type JobRow = typeof jobs.$inferSelect;

// A sheet is signed when it has a sign-off and no reading was taken after the latest one (job-state.ts).
const state = jobState(jobs.id);
/** A job's columns as `"job.<name>"`, for the statement each reading runs (forReading). */
const JOB = columnsOf(jobs, "jobs", "job.");

const SORTS: Record<string, SQL[]> = {
  openedAt: [asc(jobs.openedAt)],
  "-openedAt": [desc(jobs.openedAt)],
  engineSerial: [asc(jobs.engineSerial), desc(jobs.openedAt)],
  "-engineSerial": [desc(jobs.engineSerial), desc(jobs.openedAt)],
};

const summaryColumns = {
  job: jobs,
  openerName: users.name,
  tableName: limitTables.name,
  tableVersion: limitTables.version,
  signed: state.signed,
  signedAt: state.lastSignedAt,
  readingCount: sql<number>`(select count(*)::int from readings r where r.job_id = ${jobs.id} and not exists (select 1 from readings x where x.supersedes_id = r.id))`,
};

export const jobsRepository = {
  insert: async (db: DbOrTx, values: typeof jobs.$inferInsert) => (await db.insert(jobs).values(values).returning())[0],

  /** A job as the lists show it; `count: false` leaves its reading count out (0) for a caller that counts them itself. */
  async summary(db: DbOrTx, id: string, opts: { count?: boolean } = {}) {
    const [row] = await db
      .select(opts.count === false ? { ...summaryColumns, readingCount: sql<number>`0` } : summaryColumns)
      .from(jobs)
      .innerJoin(limitTables, eq(limitTables.id, jobs.limitTableId))
      .leftJoin(users, eq(users.id, jobs.openedBy))
      .where(eq(jobs.id, id));
    return row;
  },

  async list(db: DbOrTx, q: { engineSerial?: string; status?: JobListStatus; mine?: boolean; sort: string; page: number; pageSize: number }, userId: string) {
    const where = and(
      q.engineSerial ? ilike(jobs.engineSerial, `%${q.engineSerial}%`) : undefined,
      q.status ? jobStatusCondition(jobs.id, q.status) : undefined,
      // Who took readings on a sheet comes from job_people (kept by a trigger with every reading), not from the readings.
      q.mine ? sql`(${jobs.openedBy} = ${userId} or exists (select 1 from job_people p where p.job_id = ${jobs.id} and p.user_id = ${userId}))` : undefined,
    );
    return listPage(
      db
        .select(summaryColumns)
        .from(jobs)
        .innerJoin(limitTables, eq(limitTables.id, jobs.limitTableId))
        .leftJoin(users, eq(users.id, jobs.openedBy))
        .where(where)
        .orderBy(...SORTS[q.sort])
        .limit(q.pageSize)
        .offset(pageOffset(q.page, q.pageSize)),
      db.select({ total: count() }).from(jobs).where(where),
    );
  },

  /** Locks the job while a reading or sign-off is recorded, so they cannot cross. */
  async lock(db: DbOrTx, id: string) {
    const res = await db.execute(sql`select id from jobs where id = ${id} for update`);
    return res.rows.length > 0;
  },

  /**
   * What a reading's write needs of its sheet — the job, its table's unit and expansion coefficient, and whether it is
   * signed — in one indexed query, whatever the sheet's size. Nothing is locked here: the write itself takes the
   * sheet's and the place's locks and looks again (readingsRepository.insertRecorded). `also.alsoRead`, a select asked
   * in the same statement (the reading's tools with their status): its rows come back as `alsoRead`, one per row it
   * gives (none when it gives none), each beside the job's columns. `also.flag`, a condition asked beside (the
   * gauge-study flag; it may name the sheet's columns as `jobs.…`), comes back as `flagged`. Both are built once per
   * `also.shape`, with placeholders whose values are `also.values`.
   */
  async forReading(db: DbOrTx, id: string, also?: { shape: string; alsoRead: () => SQL; flag: () => SQL; values: Record<string, unknown> }): Promise<JobForReading | undefined> {
    // Written as SQL: every reading runs it, and the query builder's cost was more than the statement's own. Built once
    // per shape with placeholders (executeShaped) and run as a named prepared statement: planned once per connection.
    const res = await executeShaped(
      db,
      `job-for-reading|${also?.shape ?? "-"}`,
      () => sql`
        select ${JOB.list}, lt.unit as "tableUnit", lt.expansion_per_k as "tableExpansionPerK", ${state.signed} as signed,
          ${also ? also.flag() : sql`false`} as "flagged"
          ${also ? sql`, x.*` : sql``}
        from jobs join limit_tables lt on lt.id = jobs.limit_table_id
        ${also ? sql`left join (${also.alsoRead()}) x on true` : sql``}
        where jobs.id = ${sql.placeholder("jobId")}::uuid`,
      { ...also?.values, jobId: id },
    );
    const row = res.rows[0] as Record<string, unknown> | undefined;
    if (!row) return undefined;
    return {
      job: JOB.read(row),
      tableUnit: row.tableUnit as JobForReading["tableUnit"],
      tableExpansionPerK: (row.tableExpansionPerK as string | null) ?? null,
      signed: row.signed === true,
      flagged: row.flagged === true,
      alsoRead: also ? (res.rows as Record<string, unknown>[]) : undefined,
    };
  },

  /**
   * What a kept check sheet is good for, in one statement: the sheet's version and the shared records' version (both
   * kept by triggers, with their row versions, so a database restored under a running app never matches an old
   * answer), and which investigations are open (a reading is marked suspect while one that names it is open; an
   * investigation's items are all written at once, with it or when it has gathered them). Null for an unknown job.
   */
  async sheetStamp(db: DbOrTx, jobId: string): Promise<string | null> {
    const res = await executePrepared(
      db,
      sql`select concat_ws(':', coalesce(a.sheet_version::text, '-'), coalesce(a.xmin::text, '-'), s.version, s.xmin,
            (select md5(coalesce(string_agg(i.id::text || case when i.gathering then '~' else '' end, ',' order by i.id), '')) from investigations i where i.status = 'open')) as stamp
          from jobs j left join job_activity a on a.job_id = j.id left join sheet_references s on s.id = 1
          where j.id = ${jobId}`,
    );
    return (res.rows[0]?.stamp as string | undefined) ?? null;
  },

  signoffs: (db: DbOrTx, jobId: string) =>
    db
      .select({ s: jobSignoffs, inspectorName: users.name })
      .from(jobSignoffs)
      .innerJoin(users, eq(users.id, jobSignoffs.inspectorId))
      .where(eq(jobSignoffs.jobId, jobId))
      .orderBy(asc(jobSignoffs.signedAt)),

  insertSignoff: async (db: DbOrTx, values: typeof jobSignoffs.$inferInsert) => (await db.insert(jobSignoffs).values(values).returning())[0],
};
export type JobSummaryRow = NonNullable<Awaited<ReturnType<typeof jobsRepository.summary>>>;
/** What a reading's write needs of its sheet (forReading). */
export interface JobForReading {
  job: JobRow;
  tableUnit: (typeof limitTables.$inferSelect)["unit"];
  tableExpansionPerK: string | null;
  signed: boolean;
  /** forReading's `flag`, when it was given (else false). */
  flagged: boolean;
  /** The rows of forReading's `alsoRead`, when it was given. */
  alsoRead?: Record<string, unknown>[];
}
