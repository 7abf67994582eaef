import { sql } from "drizzle-orm";
import { pgTable, uuid, text, numeric, boolean, json, jsonb, timestamp, integer, index, uniqueIndex, type AnyPgColumn } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";
import { tools } from "../tools/tools.table";
import { standards } from "../standards/standards.table";
import { calibrations } from "../calibrations/calibrations.table";
import { intermediateChecks } from "../checks/checks.table";
import { readings } from "../readings/readings.table";

export const investigations = pgTable(
  "investigations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").references(() => tools.id),
    standardId: uuid("standard_id").references(() => standards.id),
    trigger: text("trigger", { enum: ["as_found_failure", "check_failure", "lost", "damaged"] }).notNull(),
    calibrationId: uuid("calibration_id").references(() => calibrations.id),
    checkId: uuid("check_id").references(() => intermediateChecks.id),
    openedAt: timestamp("opened_at", { withTimezone: true }).notNull(),
    openedBy: uuid("opened_by").references(() => users.id),
    windowStart: timestamp("window_start", { withTimezone: true }),
    windowEnd: timestamp("window_end", { withTimezone: true }).notNull(),
    /** The errors found (per check point), or null when unknown (lost tool). */
    finding: jsonb("finding"),
    status: text("status", { enum: ["open", "closed"] }).notNull().default("open"),
    closedAt: timestamp("closed_at", { withTimezone: true }),
    closedBy: uuid("closed_by").references(() => users.id),
    closingSummary: text("closing_summary"),
    /**
     * True from the opening of a tool's investigation over more readings than are re-judged in the finding's own
     * transaction until its affected readings are written (after that transaction commits, or by the minute's sweep).
     */
    gathering: boolean("gathering").notNull().default(false),
    /** A tool's error as its readings are re-judged with (unit, points, range): what the gathering reads. */
    rejudgedWith: jsonb("rejudged_with"),
  },
  (t) => [
    index("investigations_tool_idx").on(t.toolId),
    index("investigations_standard_idx").on(t.standardId),
    index("investigations_calibration_idx").on(t.calibrationId),
    index("investigations_check_idx").on(t.checkId),
    index("investigations_status_idx").on(t.status, t.openedAt),
    index("investigations_opened_by_idx").on(t.openedBy),
    index("investigations_closed_by_idx").on(t.closedBy),
    index("investigations_gathering_idx").on(t.openedAt).where(sql`${t.gathering}`),
  ],
);

/** One affected reading (or, in a cascade, one affected calibration) re-judged. */
export const investigationItems = pgTable(
  "investigation_items",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    investigationId: uuid("investigation_id").notNull().references(() => investigations.id),
    readingId: uuid("reading_id").references(() => readings.id),
    calibrationId: uuid("calibration_id").references(() => calibrations.id),
    toolId: uuid("tool_id").references(() => tools.id),
    verdictCouldChange: boolean("verdict_could_change").notNull(),
    basis: text("basis").notNull(),
    marginBefore: numeric("margin_before"),
    marginAfter: numeric("margin_after"),
    correctedValue: numeric("corrected_value"),
    /**
     * The measured quantity, its span over the error band and every place re-judged (see
     * shared/investigations/affected-reading). Kept as written (json, not jsonb): nothing queries inside it, and an
     * investigation writes thousands at once, where jsonb's conversion took twice as long as the rest of the values.
     */
    rejudged: json("rejudged"),
    // Copied from the reading (or the cascade's calibration) when the item is written; evidence never changes, so the
    // copies never go stale. They let a page of thousands of items come off one index in the order it is shown.
    /** The reading's check sheet and its engine serial (null for a cascade's calibration: those come before any sheet). */
    jobId: uuid("job_id"),
    sheetSerial: text("sheet_serial"),
    /** Who took the reading (told of the investigation). */
    takenBy: uuid("taken_by"),
    /** When the reading was taken (or the calibration performed). */
    takenAt: timestamp("taken_at", { withTimezone: true }),
    /** The place's index on the sheet. */
    placeIndex: integer("place_index"),
    /** The verdict the reading was recorded with. */
    recordedVerdict: text("recorded_verdict", { enum: ["within_limits", "outside_limits", "pending"] }),
  },
  (t) => [
    // Also the index of every question asked by investigation alone (its leading column).
    // The default order of the affected readings: could change first, then by sheet, time and place.
    index("investigation_items_page_idx").on(t.investigationId, t.verdictCouldChange.desc().nullsFirst(), t.sheetSerial.asc().nullsFirst(), t.takenAt, t.placeIndex.asc().nullsFirst(), t.id),
    index("investigation_items_reading_idx").on(t.readingId),
    // Only a reference standard's cascade names calibrations; a tool's items would each add an entry never looked up.
    index("investigation_items_calibration_idx").on(t.calibrationId).where(sql`${t.calibrationId} is not null`),
    index("investigation_items_tool_idx").on(t.toolId),
  ],
);

export const dispositions = pgTable(
  "dispositions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    investigationItemId: uuid("investigation_item_id").notNull().references(() => investigationItems.id),
    /** The investigation of the item (a copy, as the item never moves): its dispositions are counted off one index. */
    investigationId: uuid("investigation_id").notNull().references(() => investigations.id),
    kind: text("kind", { enum: ["no_impact", "remeasure", "notify_owner", "recall"] }).notNull(),
    rationale: text("rationale").notNull(),
    decidedBy: uuid("decided_by").notNull().references(() => users.id),
    decidedAt: timestamp("decided_at", { withTimezone: true }).notNull(),
    notifiedWhom: text("notified_whom"),
    notifiedHow: text("notified_how"),
    notifiedAt: timestamp("notified_at", { withTimezone: true }),
    remeasureReadingId: uuid("remeasure_reading_id").references(() => readings.id),
    /** The disposition of the same item this one replaces; the old row stays (dispositions are evidence). */
    supersedesId: uuid("supersedes_id").references((): AnyPgColumn => dispositions.id),
  },
  (t) => [
    // A disposition is replaced at most once: a later change supersedes the one in force, never an old one again.
    uniqueIndex("dispositions_supersedes_idx").on(t.supersedesId),
    index("dispositions_item_idx").on(t.investigationItemId),
    index("dispositions_investigation_idx").on(t.investigationId, t.investigationItemId),
    index("dispositions_decided_by_idx").on(t.decidedBy),
    index("dispositions_remeasure_idx").on(t.remeasureReadingId),
  ],
);

/**
 * How many affected items each investigation has and how many of them have a disposition, kept by database triggers
 * in the transaction of every item and disposition added (never written by the app): "items awaiting a disposition"
 * on the home pages and the investigations list is then one row per investigation, not a count of its items.
 */
export const investigationTallies = pgTable("investigation_tallies", {
  investigationId: uuid("investigation_id")
    .primaryKey()
    .references(() => investigations.id),
  items: integer("items").notNull().default(0),
  /** Items with at least one disposition (a superseding disposition does not count its item again). */
  disposedItems: integer("disposed_items").notNull().default(0),
});
