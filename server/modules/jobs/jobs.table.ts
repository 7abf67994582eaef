import { sql } from "drizzle-orm";
import { pgTable, uuid, text, timestamp, integer, bigint, smallint, index, primaryKey } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";
import { limitTables } from "../limit-tables/limit-tables.table";

export const jobs = pgTable(
  "jobs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    limitTableId: uuid("limit_table_id").notNull().references(() => limitTables.id),
    engineSerial: text("engine_serial").notNull(),
    engineModel: text("engine_model").notNull(),
    workOrder: text("work_order"),
    openedBy: uuid("opened_by").references(() => users.id),
    openedAt: timestamp("opened_at", { withTimezone: true }).notNull(),
  },
  (t) => [
    index("jobs_limit_table_idx").on(t.limitTableId),
    index("jobs_engine_serial_idx").on(t.engineSerial),
    index("jobs_opened_by_idx").on(t.openedBy),
    index("jobs_opened_at_idx").on(t.openedAt),
  ],
);

/** Inspector sign-off; a signed sheet is locked. Append-only. */
export const jobSignoffs = pgTable(
  "job_signoffs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id").notNull().references(() => jobs.id),
    inspectorId: uuid("inspector_id").notNull().references(() => users.id),
    certificateNumber: text("certificate_number").notNull(),
    signedAt: timestamp("signed_at", { withTimezone: true }).notNull(),
    note: text("note"),
  },
  (t) => [index("job_signoffs_job_idx").on(t.jobId), index("job_signoffs_inspector_idx").on(t.inspectorId)],
);

/**
 * Where each check sheet stands, kept by database triggers in the transaction of every reading and sign-off
 * (never written by the app): its latest reading, how many readings it holds and its latest sign-off. "Awaiting
 * signature" (readings since the last sign-off, or never signed) is then an index scan, not a walk of every sheet.
 */
export const jobActivity = pgTable(
  "job_activity",
  {
    jobId: uuid("job_id")
      .primaryKey()
      .references(() => jobs.id),
    lastReadingAt: timestamp("last_reading_at", { withTimezone: true }),
    readings: integer("readings").notNull().default(0),
    lastSignedAt: timestamp("last_signed_at", { withTimezone: true }),
    /**
     * Moved by every change to what the sheet shows of its own records: a reading or correction, a sign-off, a reading
     * judged under new rules. (Which readings are suspect is read from the open investigations instead, in the same
     * stamp: docs/decisions/020-kept-check-sheets.md.)
     */
    sheetVersion: bigint("sheet_version", { mode: "number" }).notNull().default(0),
  },
  (t) => [index("job_activity_awaiting_idx").on(t.jobId).where(sql`last_reading_at is not null and (last_signed_at is null or last_reading_at > last_signed_at)`)],
);

/**
 * Who took readings on each check sheet, kept by a database trigger with every reading (never written by the app):
 * "the sheets I worked on" is then a person's few rows here, not every reading they ever took.
 */
export const jobPeople = pgTable(
  "job_people",
  {
    jobId: uuid("job_id")
      .notNull()
      .references(() => jobs.id),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id),
  },
  (t) => [primaryKey({ columns: [t.userId, t.jobId] })],
);

/**
 * One row, kept by database triggers (never written by the app): moved by every change to the records a check sheet
 * shows beside its own, which are shared by many sheets and seldom change: people's names, tools' tags, descriptions
 * and units, families' kinds, limit tables and their items, the sheets' own rows. A kept check sheet is good while
 * its sheet's version and this one are both unchanged (docs/decisions/020-kept-check-sheets.md).
 */
export const sheetReferences = pgTable("sheet_references", {
  id: smallint("id").primaryKey(),
  version: bigint("version", { mode: "number" }).notNull().default(0),
});
