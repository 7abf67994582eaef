import { sql } from "drizzle-orm";
import { pgTable, uuid, text, integer, numeric, boolean, jsonb, timestamp, index, primaryKey, date, uniqueIndex } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";
import { jobs } from "../jobs/jobs.table";
import { tools, setElements } from "../tools/tools.table";
import type { LeafStack } from "../../../shared/inspection/feeler";

/** The feeler check kept with a reading (thicknesses in the table's unit, as used). */
export interface StoredFeelerCheck {
  mode: "go_no_go" | "measured_gap";
  go: LeafStack | null;
  noGo: LeafStack | null;
  gap: LeafStack | null;
  why: string | null;
}

// Readings are evidence: raw values are kept exactly as entered (decimal
// strings), never updated; a correction is a new reading that supersedes.
export const readings = pgTable(
  "readings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    jobId: uuid("job_id").notNull().references(() => jobs.id),
    itemKey: text("item_key").notNull(),
    index: integer("index").notNull().default(1),
    values: jsonb("values").$type<string[]>().notNull().default([]),
    unit: text("unit", { enum: ["in", "mm"] }).notNull(),
    size: numeric("size"),
    outOfRound: numeric("out_of_round"),
    goEntered: boolean("go_entered"),
    noGoEntered: boolean("no_go_entered"),
    goLeafId: uuid("go_leaf_id").references(() => setElements.id),
    noGoLeafId: uuid("no_go_leaf_id").references(() => setElements.id),
    /** A feeler check as made: the leaves or stacks with the calibrated thicknesses used, or the measured gap, and why. */
    feelerCheck: jsonb("feeler_check").$type<StoredFeelerCheck>(),
    visualResult: text("visual_result", { enum: ["serviceable", "reject"] }),
    finding: text("finding"),
    verdict: text("verdict", { enum: ["within_limits", "outside_limits", "pending"] }).notNull(),
    flags: jsonb("flags").$type<string[]>().notNull().default([]),
    temperatureC: numeric("temperature_c"),
    partMaterial: text("part_material"),
    /** The tool's temperature when it differs from the part's (ISO 1 correction to 20 °C). */
    toolTemperatureC: numeric("tool_temperature_c"),
    takenBy: uuid("taken_by").references(() => users.id),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull(),
    supersedesId: uuid("supersedes_id"),
    supersedeReason: text("supersede_reason"),
    overrideReason: text("override_reason"),
    overrideBy: uuid("override_by").references(() => users.id),
  },
  (t) => [
    index("readings_job_item_idx").on(t.jobId, t.itemKey, t.index),
    index("readings_taken_at_idx").on(t.takenAt),
    // A sheet's last reading (is it signed? when was it last worked on?) is one index probe, whatever the sheet's size.
    index("readings_job_taken_idx").on(t.jobId, t.takenAt),
    index("readings_taken_by_idx").on(t.takenBy),
    // Columns empty on nearly every reading (a correction, a feeler leaf, an override) index only the rows that name
    // something: every lookup asks for one value, and no reading adds an entry it can never be found by.
    index("readings_supersedes_idx").on(t.supersedesId).where(sql`${t.supersedesId} is not null`),
    index("readings_go_leaf_idx").on(t.goLeafId).where(sql`${t.goLeafId} is not null`),
    index("readings_no_go_leaf_idx").on(t.noGoLeafId).where(sql`${t.noGoLeafId} is not null`),
    index("readings_override_by_idx").on(t.overrideBy).where(sql`${t.overrideBy} is not null`),
  ],
);

/** The tools a reading was taken with, with their status and due date at that moment. */
export const readingTools = pgTable(
  "reading_tools",
  {
    readingId: uuid("reading_id").notNull().references(() => readings.id),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    position: integer("position").notNull(),
    statusAtReading: text("status_at_reading").notNull(),
    dueAtReading: date("due_at_reading"),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.readingId, t.toolId] }), index("reading_tools_tool_taken_idx").on(t.toolId, t.takenAt)],
);

/**
 * The verdict of a reading under a version of the judging rules. Written when the reading is recorded and, for readings
 * recorded under earlier rules, by the re-judging job; never changed (a new rules version adds rows). The reading
 * itself — values, tools and the verdict it was recorded with — stays as it was.
 */
export const readingJudgements = pgTable(
  "reading_judgements",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    readingId: uuid("reading_id").notNull().references(() => readings.id),
    rulesVersion: integer("rules_version").notNull(),
    verdict: text("verdict", { enum: ["within_limits", "outside_limits", "pending"] }).notNull(),
    band: text("band", { enum: ["new", "serviceable", "reject"] }),
    text: text("text").notNull(),
    /** The place as judged (every reading, out-of-round, 20 °C, leaves). */
    detail: jsonb("detail").notNull(),
    judgedAt: timestamp("judged_at", { withTimezone: true }).notNull(),
  },
  (t) => [uniqueIndex("reading_judgements_reading_version").on(t.readingId, t.rulesVersion), index("reading_judgements_version_verdict_idx").on(t.rulesVersion, t.verdict)],
);
