import { sql } from "drizzle-orm";
import { pgTable, uuid, text, integer, numeric, boolean, jsonb, timestamp, date, doublePrecision, index, uniqueIndex, primaryKey } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";
import { families } from "../families/families.table";
import { tools } from "../tools/tools.table";
import { limitTables } from "../limit-tables/limit-tables.table";

// A gauge study (crossed design) is evidence from set-up on: every table here is append-only (migration
// studies_append_only). Its state is derived: complete once every appraiser has a value for every part and trial,
// which is when its first result row is written; a corrected value writes a new result row.
export const gaugeStudies = pgTable(
  "gauge_studies",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    /** Shown as GRR-0001 and so on. */
    number: integer("number").generatedAlwaysAsIdentity(),
    limitTableId: uuid("limit_table_id").notNull().references(() => limitTables.id),
    /** The first revision of the table, so the characteristic keeps its studies across revisions. */
    tableRootId: uuid("table_root_id").notNull().references(() => limitTables.id),
    itemKey: text("item_key").notNull(),
    familyId: uuid("family_id").notNull().references(() => families.id),
    toolId: uuid("tool_id").references(() => tools.id),
    parts: integer("parts").notNull(),
    appraisers: integer("appraisers").notNull(),
    trials: integer("trials").notNull(),
    /** Pooling threshold in force at set-up. */
    alpha: doublePrecision("alpha").notNull(),
    seed: text("seed").notNull(),
    runOrder: jsonb("run_order").$type<number[][][]>().notNull(),
    purpose: text("purpose"),
    isDemo: boolean("is_demo").notNull().default(false),
    createdBy: uuid("created_by").references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull(),
  },
  (t) => [
    uniqueIndex("gauge_studies_number_key").on(t.number),
    index("gauge_studies_characteristic_idx").on(t.tableRootId, t.itemKey, t.familyId),
    index("gauge_studies_family_idx").on(t.familyId),
    index("gauge_studies_limit_table_idx").on(t.limitTableId),
    index("gauge_studies_tool_idx").on(t.toolId),
    index("gauge_studies_created_by_idx").on(t.createdBy),
    index("gauge_studies_created_at_idx").on(t.createdAt),
  ],
);

export const gaugeStudyParts = pgTable(
  "gauge_study_parts",
  {
    studyId: uuid("study_id").notNull().references(() => gaugeStudies.id),
    seq: integer("seq").notNull(),
    label: text("label").notNull(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.seq] }), uniqueIndex("gauge_study_parts_label_key").on(t.studyId, sql`upper(${t.label})`)],
);

export const gaugeStudyAppraisers = pgTable(
  "gauge_study_appraisers",
  {
    studyId: uuid("study_id").notNull().references(() => gaugeStudies.id),
    seq: integer("seq").notNull(),
    userId: uuid("user_id").notNull().references(() => users.id),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.seq] }), uniqueIndex("gauge_study_appraisers_user_key").on(t.studyId, t.userId), index("gauge_study_appraisers_user_idx").on(t.userId)],
);

export const gaugeStudyValues = pgTable(
  "gauge_study_values",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    /** Order of entry (instants can tie under a test clock). */
    seq: integer("seq").generatedAlwaysAsIdentity(),
    studyId: uuid("study_id").notNull().references(() => gaugeStudies.id),
    appraiserSeq: integer("appraiser_seq").notNull(),
    part: integer("part").notNull(),
    trial: integer("trial").notNull(),
    /** Place in the appraiser's randomized sequence. */
    position: integer("position").notNull(),
    /** As typed, in the unit of the tool read. */
    value: numeric("value").notNull(),
    unit: text("unit", { enum: ["in", "mm"] }).notNull(),
    takenBy: uuid("taken_by").notNull().references(() => users.id),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull(),
    supersedesId: uuid("supersedes_id"),
    supersedeReason: text("supersede_reason"),
  },
  (t) => [
    // One first value per place, one correction per value: a double submission cannot both land.
    uniqueIndex("gauge_study_values_place_key").on(t.studyId, t.appraiserSeq, t.part, t.trial).where(sql`${t.supersedesId} is null`),
    uniqueIndex("gauge_study_values_supersedes_key").on(t.supersedesId).where(sql`${t.supersedesId} is not null`),
    index("gauge_study_values_study_idx").on(t.studyId, t.seq),
    index("gauge_study_values_taken_by_idx").on(t.takenBy),
  ],
);

/** The tools a value was taken with, with their status and due date at that moment. */
export const gaugeStudyValueTools = pgTable(
  "gauge_study_value_tools",
  {
    valueId: uuid("value_id").notNull().references(() => gaugeStudyValues.id),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    position: integer("position").notNull(),
    statusAtReading: text("status_at_reading").notNull(),
    dueAtReading: date("due_at_reading"),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.valueId, t.toolId] }), index("gauge_study_value_tools_tool_idx").on(t.toolId, t.takenAt)],
);

/** The analysis as reported when the study became complete, and again after each correction; the newest counts. */
export const gaugeStudyResults = pgTable(
  "gauge_study_results",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    /** Order of writing; the highest is the study's current result. */
    seq: integer("seq").generatedAlwaysAsIdentity(),
    studyId: uuid("study_id").notNull().references(() => gaugeStudies.id),
    computedAt: timestamp("computed_at", { withTimezone: true }).notNull(),
    verdict: text("verdict", { enum: ["acceptable", "conditional", "not_acceptable"] }).notNull(),
    percentGrr: doublePrecision("percent_grr"),
    ndc: integer("ndc"),
    pooled: boolean("pooled").notNull(),
    analysis: jsonb("analysis").notNull(),
  },
  (t) => [index("gauge_study_results_study_idx").on(t.studyId, t.seq)],
);
