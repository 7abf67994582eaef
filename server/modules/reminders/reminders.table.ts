import { sql } from "drizzle-orm";
import { pgTable, uuid, text, integer, date, jsonb, timestamp, index, uniqueIndex } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";
import { tools } from "../tools/tools.table";
import { REMINDER_TRIGGERS } from "../../../shared/reminders/reminders.schemas";

export const reminderRuns = pgTable(
  "reminder_runs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trigger: text("trigger", { enum: REMINDER_TRIGGERS }).notNull(),
    startedAt: timestamp("started_at", { withTimezone: true }).notNull(),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
    status: text("status", { enum: ["running", "finished", "failed", "skipped_locked"] }).notNull(),
    sent: integer("sent").notNull().default(0),
    skipped: integer("skipped").notNull().default(0),
    failed: integer("failed").notNull().default(0),
    error: text("error"),
  },
  (t) => [index("reminder_runs_started_idx").on(t.startedAt)],
);

// Exactly once: one row per (tool, due date, stage, recipient), claimed in the
// same transaction that decides to send it.
export const reminderLog = pgTable(
  "reminder_log",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    dueAt: date("due_at").notNull(),
    stage: text("stage").notNull(),
    recipientId: uuid("recipient_id").notNull().references(() => users.id),
    runId: uuid("run_id").references(() => reminderRuns.id),
    status: text("status", { enum: ["claimed", "sent", "failed"] }).notNull(),
    attempts: integer("attempts").notNull().default(0),
    claimedAt: timestamp("claimed_at", { withTimezone: true }).notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    lastError: text("last_error"),
  },
  (t) => [
    uniqueIndex("reminder_log_once_key").on(t.toolId, t.dueAt, t.stage, t.recipientId),
    index("reminder_log_recipient_idx").on(t.recipientId),
    index("reminder_log_run_idx").on(t.runId),
    index("reminder_log_status_idx").on(t.status),
    // The reminders already sent about a tool (the run's plan asks once per candidate tool), off this index alone. With
    // only the status index, the planner once chose that one on the bench after a run had rewritten the log, walking
    // every sent reminder for each of 6,191 candidates: 7.8 s for the plan's statement instead of about 65 ms.
    index("reminder_log_sent_idx").on(t.toolId, t.dueAt, t.stage, t.recipientId).where(sql`status = 'sent'`),
  ],
);

export const notificationPreferences = pgTable("notification_preferences", {
  userId: uuid("user_id").primaryKey().references(() => users.id),
  digests: jsonb("digests").$type<Record<string, boolean>>().notNull().default({}),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});
