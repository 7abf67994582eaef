import { sql } from "drizzle-orm";
import { pgTable, uuid, text, integer, numeric, boolean, date, timestamp, index, primaryKey, jsonb } from "drizzle-orm/pg-core";
import type { UncertaintyBudget } from "../../../shared/calibrations/uncertainty";
import type { ReferencePart } from "../../../shared/calibrations/calibration-compute";
import type { OtherUncertainty } from "../../../shared/calibrations/calibrations.schemas";
import { tools, setElements } from "../tools/tools.table";
import { users } from "../users/users.table";
import { labs } from "../labs/labs.table";
import { standards } from "../standards/standards.table";

// Calibration records are evidence: signed at creation, never updated or
// deleted (database triggers refuse it). A correction is a new record whose
// supersedesId names the old one, with a reason.
export const calibrations = pgTable(
  "calibrations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    performedAt: timestamp("performed_at", { withTimezone: true }).notNull(),
    performedBy: uuid("performed_by").references(() => users.id),
    performedByName: text("performed_by_name"),
    source: text("source", { enum: ["in_house", "outside_lab"] }).notNull().default("in_house"),
    labId: uuid("lab_id").references(() => labs.id),
    certificateNumber: text("certificate_number"),
    certificateFileKey: text("certificate_file_key"),
    temperatureC: numeric("temperature_c"),
    /** ± variation of temperature between tool and standard, °C. */
    temperatureVariationC: numeric("temperature_variation_c"),
    humidityPct: numeric("humidity_pct"),
    decisionRule: text("decision_rule", { enum: ["simple", "guarded", "guarded_scaled"] }).notNull(),
    /** r of the rule, as it was when signed (w = r·U); null on records signed before it was kept (then 0 simple, 1 guarded). */
    guardBandMultiplier: numeric("guard_band_multiplier"),
    /** The record says an adjustment was made; null on records signed before the field existed. */
    adjusted: boolean("adjusted"),
    result: text("result", { enum: ["pass", "adjusted", "fail", "limited"] }).notNull(),
    /** As-found condition: every point's error within ± MPE (ILAC-G8 simple acceptance). */
    asFoundInTolerance: boolean("as_found_in_tolerance").notNull(),
    /** Worst ILAC-G8 non-binary statement of the as-found points; null on older records. */
    asFoundStatement: text("as_found_statement", { enum: ["pass", "conditional_pass", "conditional_fail", "fail"] }),
    otherUncertainties: jsonb("other_uncertainties").$type<OtherUncertainty[]>(),
    intervalDays: integer("interval_days").notNull(),
    nextDueAt: date("next_due_at").notNull(),
    limitedMin: numeric("limited_min"),
    limitedMax: numeric("limited_max"),
    limitedNote: text("limited_note"),
    notes: text("notes"),
    supersedesId: uuid("supersedes_id"),
    supersedeReason: text("supersede_reason"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("calibrations_tool_performed_idx").on(t.toolId, t.performedAt),
    index("calibrations_performed_by_idx").on(t.performedBy),
    index("calibrations_lab_idx").on(t.labId),
    index("calibrations_supersedes_idx").on(t.supersedesId),
    index("calibrations_next_due_idx").on(t.nextDueAt),
  ],
);

export const calibrationStandards = pgTable(
  "calibration_standards",
  {
    calibrationId: uuid("calibration_id").notNull().references(() => calibrations.id),
    standardId: uuid("standard_id").notNull().references(() => standards.id),
  },
  (t) => [primaryKey({ columns: [t.calibrationId, t.standardId] }), index("calibration_standards_standard_idx").on(t.standardId)],
);

export const calibrationPoints = pgTable(
  "calibration_points",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    calibrationId: uuid("calibration_id").notNull().references(() => calibrations.id),
    seq: integer("seq").notNull(),
    elementId: uuid("element_id").references(() => setElements.id),
    nominal: numeric("nominal").notNull(),
    reference: numeric("reference").notNull(),
    asFound: numeric("as_found").notNull(),
    asLeft: numeric("as_left"),
    errorAsFound: numeric("error_as_found").notNull(),
    errorAsLeft: numeric("error_as_left"),
    mpe: numeric("mpe").notNull(),
    uncertainty: numeric("uncertainty"),
    /** Guard band w and the release limit MPE − w, exact; null on older records. */
    guardBand: numeric("guard_band"),
    acceptanceLimit: numeric("acceptance_limit"),
    tur: numeric("tur"),
    asFoundInTolerance: boolean("as_found_in_tolerance").notNull(),
    /** ILAC-G8 non-binary statement of the as-found error; null on older records. */
    asFoundStatement: text("as_found_statement", { enum: ["pass", "conditional_pass", "conditional_fail", "fail"] }),
    /** Release verdict under the decision rule. */
    verdict: text("verdict", { enum: ["pass", "fail"] }).notNull(),
    releasedOn: text("released_on", { enum: ["as_found", "as_left"] }),
    /** Repeated as-found readings, exact decimal strings. */
    repeatReadings: jsonb("repeat_readings").$type<string[]>(),
    referenceParts: jsonb("reference_parts").$type<ReferencePart[]>(),
    /** The uncertainty budget as signed. */
    budget: jsonb("budget").$type<UncertaintyBudget>(),
  },
  (t) => [
    index("calibration_points_calibration_idx").on(t.calibrationId, t.seq),
    index("calibration_points_element_idx").on(t.elementId),
    // The quality manager's list of conditional statements reads only these rows.
    index("calibration_points_conditional_idx").on(t.calibrationId).where(sql`${t.asFoundStatement} in ('conditional_pass', 'conditional_fail')`),
  ],
);

/** Certificate review of an outside-lab record; required before the tool counts as in calibration. */
export const calibrationReviews = pgTable(
  "calibration_reviews",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    calibrationId: uuid("calibration_id").notNull().references(() => calibrations.id),
    reviewedBy: uuid("reviewed_by").references(() => users.id),
    reviewedAt: timestamp("reviewed_at", { withTimezone: true }).notNull(),
    accepted: boolean("accepted").notNull(),
    findings: text("findings").notNull(),
  },
  (t) => [index("calibration_reviews_calibration_idx").on(t.calibrationId), index("calibration_reviews_by_idx").on(t.reviewedBy)],
);
