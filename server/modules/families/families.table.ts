import { pgTable, uuid, text, integer, numeric, jsonb, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
import { TOOL_KINDS } from "../../../shared/families/families.schemas";

export { TOOL_KINDS };

// Lengths are PostgreSQL numeric and travel through the server as exact
// decimal strings; nothing is rounded on the way in.
export const families = pgTable(
  "families",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    kind: text("kind", { enum: TOOL_KINDS }).notNull(),
    unit: text("unit", { enum: ["in", "mm"] }).notNull(),
    defaultIntervalDays: integer("default_interval_days").notNull(),
    mpe: numeric("mpe"),
    /** Check plan: nominal sizes, as exact decimal strings; optional per-point MPE. */
    checkPoints: jsonb("check_points").$type<{ nominal: string; mpe?: string | null }[]>().notNull().default([]),
    usageLimit: integer("usage_limit"),
    resolution: numeric("resolution"),
    /** Permissible deviation of an intermediate (pre-use) check. */
    checkTolerance: numeric("check_tolerance"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("families_name_key").on(t.name)],
);
