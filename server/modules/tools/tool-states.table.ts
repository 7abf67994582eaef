import { sql } from "drizzle-orm";
import { pgTable, uuid, text, integer, numeric, boolean, timestamp, date, index } from "drizzle-orm/pg-core";
import { tools } from "./tools.table";

/**
 * One row per tool: the inputs of its status as of every event recorded so far, and the part of the
 * status that does not depend on the date (docs/decisions/013-indexed-status.md). Kept by database
 * triggers (tenthwise_refresh_tool_states) in the transaction of every event that changes an input;
 * never written by the app. The date-dependent part (overdue, due soon) is read from cal_next_due
 * against today's date in the shop's zone.
 */
export const toolStates = pgTable(
  "tool_states",
  {
    toolId: uuid("tool_id")
      .primaryKey()
      .references(() => tools.id, { onDelete: "cascade" }),
    lifecycle: text("lifecycle", { enum: ["active", "inactive", "lost", "retired"] }).notNull(),
    calibrationRequired: boolean("calibration_required").notNull(),
    usageLimit: integer("usage_limit"),
    /** The calibration that counts (latest not superseded; outside-lab ones once their certificate review is accepted). */
    calId: uuid("cal_id"),
    calPerformedAt: timestamp("cal_performed_at", { withTimezone: true }),
    calResult: text("cal_result", { enum: ["pass", "adjusted", "fail", "limited"] }),
    calNextDue: date("cal_next_due"),
    calLimitedMin: numeric("cal_limited_min"),
    calLimitedMax: numeric("cal_limited_max"),
    calLimitedNote: text("cal_limited_note"),
    pendingPerformedAt: timestamp("pending_performed_at", { withTimezone: true }),
    pendingLab: text("pending_lab"),
    usesSinceCal: integer("uses_since_cal").notNull().default(0),
    failedCheckAt: timestamp("failed_check_at", { withTimezone: true }),
    failedCheckDeviation: numeric("failed_check_deviation"),
    holdSince: timestamp("hold_since", { withTimezone: true }),
    holdReason: text("hold_reason"),
    labSince: timestamp("lab_since", { withTimezone: true }),
    labName: text("lab_name"),
    labExpectedBack: date("lab_expected_back"),
    custodyCheckoutId: uuid("custody_checkout_id"),
    custodyUserId: uuid("custody_user_id"),
    custodySince: timestamp("custody_since", { withTimezone: true }),
    custodyDueBack: timestamp("custody_due_back", { withTimezone: true }),
    /** The latest instant among the events read; an instant before it is answered by the full derivation. */
    settledAt: timestamp("settled_at", { withTimezone: true }),
    /** The status whatever the date (retired … never_calibrated), or "calibrated" when the date decides. */
    baseStatus: text("base_status").notNull(),
    /** Calibrated, and the usage limit is reached: overdue whatever the date. */
    usageExhausted: boolean("usage_exhausted").notNull().default(false),
    /** Calibrated, and in the last tenth of its usage limit: due soon whatever the date. */
    usageWarn: boolean("usage_warn").notNull().default(false),
  },
  (t) => [
    // Every column the date-dependent status reads (statusCase), in that order: a status filter or sort is a range
    // scan on its first two, and the count by status reads the index alone, already grouped (decision 019).
    index("tool_states_status_idx").on(t.baseStatus, t.calNextDue, t.calResult, t.usageExhausted, t.usageWarn),
    index("tool_states_due_idx").on(t.calNextDue),
    index("tool_states_usage_idx").on(t.toolId).where(sql`${t.usageExhausted} or ${t.usageWarn}`),
    index("tool_states_settled_idx").on(t.settledAt),
    index("tool_states_custody_user_idx").on(t.custodyUserId),
  ],
);

/**
 * How many tools stand at each combination of the tool_states columns the date-dependent status reads (statusCase),
 * as signed pieces (docs/decisions/027-status-counts-kept.md): a statement that moves tools between combinations adds
 * one piece per combination it changed (−1 for each tool that left, +1 for each that came), by a trigger on
 * tool_states in the same transaction. Pieces are only added, so concurrent writes never wait on each other here;
 * a fold (tool_state_counts_fold) now and then replaces them with one sum per combination. The sum of `n` over a
 * combination is its number of tools: a few hundred combinations (one per due date), whatever the register's size.
 * Kept by the database alone; read-only to the app.
 */
export const toolStateCounts = pgTable("tool_state_counts", {
  baseStatus: text("base_status").notNull(),
  calNextDue: date("cal_next_due"),
  calResult: text("cal_result"),
  usageExhausted: boolean("usage_exhausted").notNull(),
  usageWarn: boolean("usage_warn").notNull(),
  n: integer("n").notNull(),
});
