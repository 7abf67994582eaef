import { pgTable, uuid, text, numeric, boolean, timestamp, index } from "drizzle-orm/pg-core";
import { tools } from "../tools/tools.table";
import { users } from "../users/users.table";
import { standards } from "../standards/standards.table";

/** Intermediate (pre-use) checks against a check block or setting standard; append-only evidence. */
export const intermediateChecks = pgTable(
  "intermediate_checks",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    performedAt: timestamp("performed_at", { withTimezone: true }).notNull(),
    performedBy: uuid("performed_by").references(() => users.id),
    standardId: uuid("standard_id").references(() => standards.id),
    nominal: numeric("nominal").notNull(),
    reading: numeric("reading").notNull(),
    deviation: numeric("deviation").notNull(),
    tolerance: numeric("tolerance").notNull(),
    passed: boolean("passed").notNull(),
    context: text("context", { enum: ["pre_use", "return_zero_check", "found_check"] }).notNull().default("pre_use"),
    note: text("note"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("intermediate_checks_tool_idx").on(t.toolId, t.performedAt),
    index("intermediate_checks_by_idx").on(t.performedBy),
    index("intermediate_checks_standard_idx").on(t.standardId),
  ],
);
