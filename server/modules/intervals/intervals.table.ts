import { pgTable, uuid, text, integer, jsonb, timestamp, index } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";
import { families } from "../families/families.table";

/** A recorded decision to change a family's calibration interval, with the data it rested on. */
export const intervalDecisions = pgTable(
  "interval_decisions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    familyId: uuid("family_id").notNull().references(() => families.id),
    decidedBy: uuid("decided_by").notNull().references(() => users.id),
    decidedAt: timestamp("decided_at", { withTimezone: true }).notNull(),
    previousIntervalDays: integer("previous_interval_days").notNull(),
    newIntervalDays: integer("new_interval_days").notNull(),
    method: text("method").notNull(),
    rationale: text("rationale").notNull(),
    data: jsonb("data").notNull(),
  },
  (t) => [index("interval_decisions_family_idx").on(t.familyId, t.decidedAt), index("interval_decisions_by_idx").on(t.decidedBy)],
);
