import { pgTable, uuid, text, timestamp, index } from "drizzle-orm/pg-core";
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
