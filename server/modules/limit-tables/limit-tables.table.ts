import { pgTable, uuid, text, integer, numeric, boolean, jsonb, timestamp, index, uniqueIndex } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";

// A limits table is versioned: a revision is a new row (supersedesId names the
// previous one) and a job keeps the row it started with.
export const limitTables = pgTable(
  "limit_tables",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    engineModel: text("engine_model").notNull(),
    unit: text("unit", { enum: ["in", "mm"] }).notNull(),
    sourceDocument: text("source_document").notNull(),
    sourceRevision: text("source_revision").notNull(),
    version: integer("version").notNull().default(1),
    supersedesId: uuid("supersedes_id"),
    isDemo: boolean("is_demo").notNull().default(false),
    /** Expansion coefficient (per kelvin) of the table's parts, for the correction to 20 °C. */
    expansionPerK: numeric("expansion_per_k"),
    createdBy: uuid("created_by").references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("limit_tables_engine_model_idx").on(t.engineModel), index("limit_tables_supersedes_idx").on(t.supersedesId), index("limit_tables_created_by_idx").on(t.createdBy)],
);

export const limitItems = pgTable(
  "limit_items",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    limitTableId: uuid("limit_table_id").notNull().references(() => limitTables.id),
    seq: integer("seq").notNull(),
    key: text("key").notNull(),
    label: text("label").notNull(),
    section: text("section"),
    kind: text("kind", { enum: ["visual", "journal", "bore", "clearance", "feeler", "taper"] }).notNull(),
    min: numeric("min"),
    max: numeric("max"),
    serviceableMin: numeric("serviceable_min"),
    serviceableMax: numeric("serviceable_max"),
    boreKey: text("bore_key"),
    journalKey: text("journal_key"),
    directions: integer("directions").notNull().default(2),
    repeat: integer("repeat").notNull().default(1),
    toolKinds: jsonb("tool_kinds").$type<string[]>(),
    radial: boolean("radial").notNull().default(false),
    outOfRoundMax: numeric("out_of_round_max"),
    /** A taper item's two stations (size items of the same table). */
    stationAKey: text("station_a_key"),
    stationBKey: text("station_b_key"),
    expansionPerK: numeric("expansion_per_k"),
    note: text("note"),
  },
  (t) => [uniqueIndex("limit_items_table_key").on(t.limitTableId, t.key), index("limit_items_table_seq_idx").on(t.limitTableId, t.seq)],
);
