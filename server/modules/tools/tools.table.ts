import { sql } from "drizzle-orm";
import { pgTable, uuid, text, integer, numeric, boolean, timestamp, uniqueIndex, index } from "drizzle-orm/pg-core";
import { families } from "../families/families.table";
import { users } from "../users/users.table";

export const tools = pgTable(
  "tools",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    assetTag: text("asset_tag").notNull(),
    familyId: uuid("family_id").notNull().references(() => families.id),
    description: text("description").notNull(),
    maker: text("maker"),
    model: text("model"),
    serialNumber: text("serial_number").notNull(),
    unit: text("unit", { enum: ["in", "mm"] }).notNull(),
    rangeMin: numeric("range_min").notNull(),
    rangeMax: numeric("range_max").notNull(),
    resolution: numeric("resolution").notNull(),
    intervalDays: integer("interval_days").notNull(),
    usageLimit: integer("usage_limit"),
    location: text("location"),
    ownerType: text("owner_type", { enum: ["shop", "personal", "customer", "loaner"] }).notNull().default("shop"),
    ownerUserId: uuid("owner_user_id").references(() => users.id),
    ownerName: text("owner_name"),
    calibrationRequired: boolean("calibration_required").notNull().default(true),
    acceptanceUse: boolean("acceptance_use").notNull().default(true),
    /** Current lifecycle; its history is in tool_lifecycle_events. */
    lifecycle: text("lifecycle", { enum: ["active", "inactive", "lost", "retired"] }).notNull().default("active"),
    photoKey: text("photo_key"),
    notes: text("notes"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("tools_asset_tag_key").on(t.assetTag),
    // A scanned or typed tag that differs in case only (the status lookup's and the crib's second try).
    index("tools_asset_tag_lower_idx").on(sql`lower(${t.assetTag})`),
    index("tools_family_idx").on(t.familyId),
    index("tools_owner_user_idx").on(t.ownerUserId),
    index("tools_location_idx").on(t.location),
    index("tools_lifecycle_idx").on(t.lifecycle),
    index("tools_serial_idx").on(t.serialNumber),
  ],
);

/** Elements of a set: feeler leaves, gauge blocks; each calibrated and rejected on its own. */
export const setElements = pgTable(
  "set_elements",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    label: text("label").notNull(),
    nominal: numeric("nominal").notNull(),
    grade: text("grade"),
    certifiedDeviation: numeric("certified_deviation"),
    rejectedAt: timestamp("rejected_at", { withTimezone: true }),
    rejectedReason: text("rejected_reason"),
  },
  (t) => [index("set_elements_tool_idx").on(t.toolId), uniqueIndex("set_elements_tool_label_key").on(t.toolId, t.label)],
);

/** Lifecycle history (inactive, lost, found, retired, reactivated), so status can be derived at any instant. */
export const toolLifecycleEvents = pgTable(
  "tool_lifecycle_events",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    at: timestamp("at", { withTimezone: true }).notNull(),
    byUserId: uuid("by_user_id").references(() => users.id),
    lifecycle: text("lifecycle", { enum: ["active", "inactive", "lost", "retired"] }).notNull(),
    reason: text("reason").notNull(),
  },
  (t) => [index("tool_lifecycle_events_tool_at_idx").on(t.toolId, t.at), index("tool_lifecycle_events_by_idx").on(t.byUserId)],
);

/** Quarantine holds: placed with a reason, released with a reason. */
export const holds = pgTable(
  "holds",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    placedAt: timestamp("placed_at", { withTimezone: true }).notNull(),
    placedBy: uuid("placed_by").references(() => users.id),
    reason: text("reason").notNull(),
    releasedAt: timestamp("released_at", { withTimezone: true }),
    releasedBy: uuid("released_by").references(() => users.id),
    releaseReason: text("release_reason"),
  },
  (t) => [
    index("holds_tool_idx").on(t.toolId, t.placedAt),
    index("holds_placed_by_idx").on(t.placedBy),
    index("holds_released_by_idx").on(t.releasedBy),
  ],
);
