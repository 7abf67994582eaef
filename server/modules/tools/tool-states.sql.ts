// The date-dependent part of a tool's status, in SQL, over tool_states (alias `s`):
// docs/decisions/013-indexed-status.md. The same rules as shared/tools/tool-status.ts
// (the definition; tests/api/tool-states-property.api.test.ts holds them equal), written so
// that a filter by status or a count by status is a range scan on (base_status, cal_next_due).
import { sql, type SQL } from "drizzle-orm";
import { pgArray } from "../../db/values";
import type { DbOrTx } from "../../db/client";
import { TOOL_STATUSES, type ToolStatus } from "../../../shared/tools/tool-status";
import { calendarDate } from "../../../shared/common/dates";

/**
 * The tool_states columns the derivation reads (fromState), named: `s.*` also brought the columns only SQL reads
 * (base_status, usage_exhausted, usage_warn, tool_id), and every column of a page's 50 rows is parsed.
 */
const STATE_COLUMNS = [
  "lifecycle", "calibration_required", "usage_limit",
  "cal_id", "cal_performed_at", "cal_result", "cal_next_due", "cal_limited_min", "cal_limited_max", "cal_limited_note",
  "pending_performed_at", "pending_lab", "uses_since_cal", "failed_check_at", "failed_check_deviation",
  "hold_since", "hold_reason", "lab_since", "lab_name", "lab_expected_back",
  "custody_checkout_id", "custody_user_id", "custody_since", "custody_due_back", "settled_at",
]
  .map((c) => `s.${c}`)
  .join(", ");

/**
 * The columns a tool's status is derived from (statusesOfRows in tool-status.service.ts) and a status answer shows,
 * for a statement over `tools` named `tool`, its `tool_states s` and the custodian `users` named `custodian`, both
 * outer-joined.
 */
export function statusColumns(tool: string, custodian: string): SQL {
  return sql.raw(
    `${tool}.id, ${tool}.asset_tag, ${tool}.unit, ${tool}.description, ${tool}.location, ${tool}.owner_type, ${tool}.owner_user_id, ${tool}.owner_name, ` +
      `${STATE_COLUMNS}, s.tool_id is not null as has_state, ${custodian}.name as custody_name, ${custodian}.email as custody_email`,
  );
}

/** What a status question needs besides the records: the shop's zone (for "today") and the warning window in days. */
export interface StatusContext {
  timeZone: string;
  dueSoonDays: number;
}

/** Statuses that the date never changes: tool_states.base_status holds them as they are. */
export const FIXED_STATUSES = ["out_of_tolerance", "quarantined", "at_calibration", "never_calibrated", "inactive", "lost", "retired", "reference_only"] as const satisfies readonly ToolStatus[];

/** "Now" for a status question: the calendar date in the shop's zone at the instant asked, the warning window. */
export interface StatusNow {
  today: SQL;
  window: number;
}

/**
 * Today's date in the shop's zone at instant `now`, as SQL: a date literal, worked out by the same calendar function
 * as the shared derivation (calendarDate). Written into the statement's text rather than sent as a parameter, so a
 * statement that names it is one text for the whole day: PostgreSQL plans it for the real date once per connection
 * and keeps that plan by name, where a date parameter made it judge the one plan for every date dearer and plan the
 * statement afresh at every call (0.35 ms of the register's count).
 */
export function statusNow(now: Date, ctx: StatusContext): StatusNow {
  const today = calendarDate(now, ctx.timeZone);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(today)) throw new RangeError(`Not a calendar date: ${today}`);
  return { today: sql.raw(`'${today}'::date`), window: ctx.dueSoonDays };
}

/** The status of the tool_states row `s` on that date. */
export function statusCase({ today, window }: StatusNow): SQL {
  return sql`(case
    when s.base_status <> 'calibrated' then s.base_status
    when s.cal_next_due < ${today} or s.usage_exhausted then 'overdue'
    when s.cal_result = 'limited' then 'limited'
    when s.cal_next_due <= ${today} + ${window}::int or s.usage_warn then 'due_soon'
    else 'in_calibration' end)`;
}

/** The position of the status in TOOL_STATUSES (the register's "sort by status"). */
export function statusOrder(now: StatusNow): SQL {
  return sql`(array_position(array[${sql.raw(TOOL_STATUSES.map((s) => `'${s}'`).join(","))}]::text[], ${statusCase(now)}) - 1)`;
}

/** One status as a predicate on `s` that an index on (base_status, cal_next_due) can answer. */
function statusIs(status: ToolStatus, { today, window }: StatusNow): SQL {
  const calibrated = sql`s.base_status = 'calibrated'`;
  const notOverdue = sql`s.cal_next_due >= ${today} and not s.usage_exhausted`;
  switch (status) {
    case "overdue":
      return sql`(${calibrated} and (s.cal_next_due < ${today} or s.usage_exhausted))`;
    case "limited":
      return sql`(${calibrated} and s.cal_result = 'limited' and ${notOverdue})`;
    case "due_soon":
      return sql`(${calibrated} and s.cal_result <> 'limited' and ${notOverdue} and (s.cal_next_due <= ${today} + ${window}::int or s.usage_warn))`;
    case "in_calibration":
      return sql`(${calibrated} and s.cal_result <> 'limited' and s.cal_next_due > ${today} + ${window}::int and not s.usage_exhausted and not s.usage_warn)`;
    default:
      return sql`s.base_status = ${status}`;
  }
}

/** The row `s` has one of these statuses on that date. */
export function statusIn(statuses: readonly ToolStatus[], now: StatusNow): SQL {
  const wanted = [...new Set(statuses)];
  if (wanted.length === 0) return sql`false`;
  const fixed = wanted.filter((x) => (FIXED_STATUSES as readonly string[]).includes(x));
  const parts = wanted.filter((x) => !fixed.includes(x)).map((x) => statusIs(x, now));
  if (fixed.length) parts.push(sql`s.base_status = any(${pgArray(fixed)}::text[])`);
  return sql`(${sql.join(parts, sql` or `)})`;
}

/**
 * The kept counts (tool_state_counts, docs/decisions/027-status-counts-kept.md) as a relation `s` with the columns
 * statusCase and statusIs read and `n`, the number of tools at each combination: a few hundred rows (one per due
 * date) whatever the register's size, where tool_states has one per tool. `pieces` is how many stored pieces were
 * summed, for the decision to fold them (foldWanted).
 */
const KEPT_COUNTS = sql.raw(`(select base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, sum(n)::int as n, count(*)::int as pieces
  from tool_state_counts group by 1, 2, 3, 4, 5)`);

/**
 * How many tools have one of these statuses on that date, as SQL: the number of tools at each combination of the
 * status's columns that has the status, summed from the kept counts. The same predicates as the register's status
 * filter (statusIs), over a few hundred combinations instead of one index entry per tool.
 */
export function statusCountSql(statuses: readonly ToolStatus[], now: StatusNow): SQL {
  if (new Set(statuses).size === 0) return sql`0`;
  return sql`(select coalesce(sum(s.n), 0) from ${KEPT_COUNTS} s where ${statusIn(statuses, now)})::int`;
}

/** More stored pieces than this over the combinations they sum to, and a count asks for a fold (foldToolStateCounts). */
const FOLD_SLACK = 256;

/** True when the kept counts hold enough pieces beyond one per combination that folding them is worth a statement. */
export const foldWanted = (c: { pieces: number; combinations: number }) => c.pieces > 2 * c.combinations + FOLD_SLACK;

/** Replaces the kept counts' pieces with one sum per combination (one fold at a time; see migration 0027). */
export async function foldToolStateCounts(db: DbOrTx): Promise<void> {
  await db.execute(sql`select tool_state_counts_fold()`);
}

/**
 * Count of tools by status, of tools still in calibration due within each of some numbers of days, and of those due
 * in each of the next `weeks` weeks counted from today: all from the kept counts, one row per combination of the
 * columns the status reads, so the work is the same at 2,000 tools as at 20,000. The status is worked out once per
 * combination, not once per tool.
 */
export async function countByStatus(db: DbOrTx, now: StatusNow, dueWithin: number[] = [], weeks = 0) {
  const { today } = now;
  const inCal = sql`s.base_status = 'calibrated' and s.cal_next_due >= ${today} and not s.usage_exhausted`;
  const res = await db.execute(sql`
    with s as materialized ${KEPT_COUNTS}
    select coalesce(jsonb_object_agg(k, n), '{}'::jsonb) as by_status, coalesce(sum(n), 0)::int as total,
      (select coalesce(sum(pieces), 0)::int from s) as pieces, (select count(*)::int from s) as combinations,
      (select coalesce(jsonb_object_agg(w, n), '{}'::jsonb) from (
        select (s.cal_next_due - ${today}) / 7 as w, sum(s.n)::int as n from s
        where ${inCal} and s.cal_next_due < ${today} + ${weeks * 7}::int group by 1) x) as by_week
      ${sql.join(
        dueWithin.map((d, i) => sql`, (select coalesce(sum(s.n), 0)::int from s where ${inCal} and s.cal_next_due <= ${today} + ${d}::int) as ${sql.raw(`due_${i}`)}`),
        sql``,
      )}
    from (select ${statusCase(now)} as k, sum(s.n)::int as n from s group by 1 having sum(s.n) <> 0) c`);
  const row = res.rows[0] as Record<string, unknown>;
  const json = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v) as Record<string, number>;
  const raw = json(row.by_status);
  const byStatus = Object.fromEntries(TOOL_STATUSES.map((st) => [st, Number(raw[st] ?? 0)])) as Record<ToolStatus, number>;
  const weekly = json(row.by_week);
  return {
    byStatus,
    total: Number(row.total),
    dueWithin: dueWithin.map((_, i) => Number(row[`due_${i}`])),
    dueByWeek: Array.from({ length: weeks }, (_, w) => Number(weekly[w] ?? 0)),
    pieces: Number(row.pieces),
    combinations: Number(row.combinations),
  };
}

/** True when some tool has a recorded event after `now` (a clock set back, a record dated ahead): lists then use the full derivation. */
export async function eventsAfter(db: DbOrTx, now: Date): Promise<boolean> {
  const r = await db.execute(sql`select ${eventsAfterSql(now)} as x`);
  return Boolean((r.rows[0] as Record<string, unknown>).x);
}

/**
 * eventsAfter as an SQL condition, for a statement that asks it beside other things. The latest event of any tool
 * (one step back along the settled_at index) compared with `now`: a plan kept for every instant stays one index probe,
 * where "any row after this instant" was judged, for an instant not yet known, to match a third of the register.
 */
export function eventsAfterSql(now: Date): SQL {
  return sql`coalesce((select max(settled_at) from tool_states) > ${now.toISOString()}::timestamptz, false)`;
}
