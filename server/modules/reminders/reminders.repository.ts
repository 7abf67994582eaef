import { and, count, desc, eq, inArray, or, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { reminderLog, reminderRuns, notificationPreferences } from "./reminders.table";
import { users } from "../users/users.table";
import { tools } from "../tools/tools.table";
import type { PlannedReminder } from "../../../shared/reminders/reminder-plan";
import { listPage, pageOffset } from "../../db/paging";
import { pgArray } from "../../db/values";
import { statusCase, type StatusNow } from "../tools/tool-states.sql";

export type ReminderRunRow = typeof reminderRuns.$inferSelect;
export type ReminderLogRow = typeof reminderLog.$inferSelect;
/** A reminder a run claimed: what the run needs to word and send it. */
export type ClaimedReminder = Pick<ReminderLogRow, "id" | "toolId" | "stage" | "recipientId">;

const CHUNK = 1000;

// Who pressed "Run reminders now": the run's audit line names them (entity index); scheduled runs have none.
const startedByName = sql<string | null>`(select u.name from audit_events a join users u on u.id = a.actor_id
  where a.entity_type = 'reminder_run' and a.entity_id = reminder_runs.id::text and a.action = 'reminders.run' limit 1)`;
const chunks = <T>(xs: T[], n = CHUNK) => Array.from({ length: Math.ceil(xs.length / n) }, (_, i) => xs.slice(i * n, (i + 1) * n));

export const remindersRepository = {
  /**
   * A select of the tools that may need a reminder at `at`, from tool_states' indexed due dates (docs/decisions/013):
   * calibrated with a due date by the horizon (overdue ones included) or a usage limit running low, or out past the
   * time they were due back. A superset; the status derivation decides. Used as a subquery, so a run over thousands
   * of due tools never ships their ids back and forth.
   */
  candidateToolIds(at: Date, horizon: string): SQL {
    // In service: the tool's current lifecycle, as the register shows it.
    return sql`
      select s.tool_id from tool_states s join tools t on t.id = s.tool_id
      where s.base_status = 'calibrated' and s.cal_next_due <= ${horizon}::date and t.lifecycle = 'active'
      union
      select s.tool_id from tool_states s join tools t on t.id = s.tool_id
      where (s.usage_exhausted or s.usage_warn) and s.base_status = 'calibrated' and t.lifecycle = 'active'
      union
      select c.tool_id from checkouts c where c.returned_at is null and c.due_back_at < ${at.toISOString()}`;
  },

  /** The same superset from the records themselves, for a run whose instant is before some recorded event (a clock set back). */
  candidateToolIdsFromRecords(at: Date, horizon: string): SQL {
    return sql`
      select t.id as tool_id from tools t
      where t.lifecycle = 'active' and t.calibration_required
        and (t.usage_limit is not null or exists (select 1 from calibrations c where c.tool_id = t.id and c.next_due_at <= ${horizon}))
      union
      select c.tool_id from checkouts c where c.returned_at is null and c.due_back_at < ${at.toISOString()}`;
  },

  /**
   * What the reminder plan reads of each candidate tool, worked out by the database from tool_states: the status on
   * the run's date (statusCase, held equal to the one derivation by tests/api/tool-states-property.api.test.ts), the
   * due date, days to it, uses left, owner and custodian. A row whose state was settled after `at` (a clock set back),
   * or a tool without a state, comes back with `settled = false`: the service derives those from the records instead.
   * Each row also names the reminders about the tool already sent (in the same statement: the candidate set is
   * worked out once).
   */
  async planFacts(db: DbOrTx, toolIdsQuery: SQL, at: Date, now: StatusNow) {
    const res = await db.execute(sql`
      select t.id, s.usage_limit, case when t.owner_type = 'personal' then t.owner_user_id end as owner_user_id,
        s.tool_id is not null and (s.settled_at is null or s.settled_at <= ${at.toISOString()}::timestamptz) as settled,
        ${statusCase(now)} as status,
        case when s.cal_id is not null then to_char(s.cal_next_due, 'YYYY-MM-DD') end as due_at,
        case when s.cal_id is not null then s.cal_next_due - ${now.today} end as days_to_due,
        case when s.cal_id is not null and s.usage_limit is not null then greatest(0, s.usage_limit - s.uses_since_cal) end as uses_remaining,
        s.custody_user_id, s.custody_due_back,
        (select string_agg(l.due_at::text || '|' || l.stage || '|' || l.recipient_id::text, ',') from reminder_log l
          where l.tool_id = t.id and l.status = 'sent') as sent
      from tools t left join tool_states s on s.tool_id = t.id
      where t.id in (${toolIdsQuery})`);
    return res.rows as {
      id: string;
      usage_limit: number | null;
      owner_user_id: string | null;
      settled: boolean;
      status: string;
      due_at: string | null;
      days_to_due: number | null;
      uses_remaining: number | null;
      custody_user_id: string | null;
      custody_due_back: unknown;
      /** The reminders about the tool already sent, as "due date|stage|recipient", comma-separated: never sent again. */
      sent: string | null;
    }[];
  },

  /** Active people who may receive mail: by id, plus everyone holding one of the roles. */
  async people(db: DbOrTx, ids: string[], roles: ("crib" | "quality")[]) {
    const rows = await db
      .select({ id: users.id, name: users.name, email: users.email, role: users.role, digests: notificationPreferences.digests })
      .from(users)
      .leftJoin(notificationPreferences, eq(notificationPreferences.userId, users.id))
      .where(and(eq(users.active, true), or(ids.length ? inArray(users.id, ids) : undefined, inArray(users.role, roles))));
    return rows;
  },

  async insertRun(db: DbOrTx, values: typeof reminderRuns.$inferInsert) {
    return (await db.insert(reminderRuns).values(values).returning())[0];
  },

  async updateRun(db: DbOrTx, id: string, values: Partial<typeof reminderRuns.$inferInsert>) {
    return (await db.update(reminderRuns).set(values).where(eq(reminderRuns.id, id)).returning())[0];
  },

  /** Runs left "running" by a process that stopped; only called while holding the run lock. */
  async closeInterruptedRuns(db: DbOrTx, at: Date) {
    await db
      .update(reminderRuns)
      .set({ status: "failed", finishedAt: at, error: "Interrupted before it finished (the process stopped); its unsent reminders were retried by the next run." })
      .where(eq(reminderRuns.status, "running"));
  },

  /**
   * Claims reminders for a run: a new key is inserted; a key an earlier run
   * claimed but never sent (crash, SMTP failure) is taken over; a key already
   * sent is left alone and not returned. One statement per 5,000 reminders, each
   * column sent as one array.
   */
  async claim(db: DbOrTx, runId: string, at: Date, planned: PlannedReminder[]): Promise<ClaimedReminder[]> {
    const claimed: ClaimedReminder[] = [];
    for (const part of chunks(planned, 5000)) {
      const res = await db.execute(sql`
        insert into reminder_log (tool_id, due_at, stage, recipient_id, run_id, status, claimed_at)
        select p.tool_id, p.due_at, p.stage, p.recipient_id, ${runId}::uuid, 'claimed', ${at.toISOString()}::timestamptz
        from unnest(${pgArray(part.map((p) => p.toolId))}::uuid[], ${pgArray(part.map((p) => p.dueAt))}::date[],
                    ${pgArray(part.map((p) => p.stage))}::text[], ${pgArray(part.map((p) => p.recipientId))}::uuid[]) as p(tool_id, due_at, stage, recipient_id)
        on conflict (tool_id, due_at, stage, recipient_id) do update set run_id = excluded.run_id, status = 'claimed', claimed_at = excluded.claimed_at
          where reminder_log.status <> 'sent' and reminder_log.run_id is distinct from excluded.run_id
        returning id, tool_id, stage, recipient_id`);
      for (const r of res.rows as Record<string, unknown>[]) claimed.push({ id: String(r.id), toolId: String(r.tool_id), stage: String(r.stage), recipientId: String(r.recipient_id) });
    }
    return claimed;
  },

  async markSent(db: DbOrTx, ids: string[], at: Date, attempts: number) {
    await db
      .update(reminderLog)
      .set({ status: "sent", sentAt: at, attempts: sql`${reminderLog.attempts} + ${attempts}`, lastError: null })
      .where(sql`${reminderLog.id} = any(${pgArray(ids)}::uuid[])`);
  },

  async markFailed(db: DbOrTx, ids: string[], attempts: number, error: string) {
    await db
      .update(reminderLog)
      .set({ status: "failed", attempts: sql`${reminderLog.attempts} + ${attempts}`, lastError: error })
      .where(sql`${reminderLog.id} = any(${pgArray(ids)}::uuid[])`);
  },

  async listRuns(db: DbOrTx, page: number, pageSize: number) {
    return listPage(
      db.select({ run: reminderRuns, startedByName }).from(reminderRuns).orderBy(desc(reminderRuns.startedAt), desc(reminderRuns.id)).limit(pageSize).offset(pageOffset(page, pageSize)),
      db.select({ total: count() }).from(reminderRuns),
    );
  },

  findRun: async (db: DbOrTx, id: string) => (await db.select({ run: reminderRuns, startedByName }).from(reminderRuns).where(eq(reminderRuns.id, id)))[0],

  async entriesOfRun(db: DbOrTx, runId: string) {
    return db
      .select({
        assetTag: tools.assetTag,
        dueAt: reminderLog.dueAt,
        stage: reminderLog.stage,
        recipientName: users.name,
        recipientEmail: users.email,
        status: reminderLog.status,
        attempts: reminderLog.attempts,
        sentAt: reminderLog.sentAt,
        lastError: reminderLog.lastError,
      })
      .from(reminderLog)
      .innerJoin(tools, eq(tools.id, reminderLog.toolId))
      .innerJoin(users, eq(users.id, reminderLog.recipientId))
      .where(eq(reminderLog.runId, runId))
      .orderBy(users.name, tools.assetTag, reminderLog.stage)
      .limit(5000);
  },

  findPreferences: (db: DbOrTx, userId: string) => db.query.notificationPreferences.findFirst({ where: eq(notificationPreferences.userId, userId) }),

  async savePreferences(db: DbOrTx, userId: string, digests: Record<string, boolean>, at: Date) {
    await db
      .insert(notificationPreferences)
      .values({ userId, digests, updatedAt: at })
      .onConflictDoUpdate({ target: notificationPreferences.userId, set: { digests, updatedAt: at } });
  },
};
