import { pgTable, uuid, text, date, numeric, jsonb, timestamp, uniqueIndex, index } from "drizzle-orm/pg-core";
import { labs } from "../labs/labs.table";

/** Reference standards: gauge block sets, setting standards, check blocks. */
export const standards = pgTable(
  "standards",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    assetTag: text("asset_tag").notNull(),
    name: text("name").notNull(),
    kind: text("kind").notNull(),
    unit: text("unit", { enum: ["in", "mm"] }).notNull(),
    nominal: numeric("nominal"),
    grade: text("grade"),
    location: text("location"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("standards_asset_tag_key").on(t.assetTag)],
);

/** A standard's calibration certificate; in calibration from issuedAt through dueAt. */
export const standardCertificates = pgTable(
  "standard_certificates",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    standardId: uuid("standard_id").notNull().references(() => standards.id),
    number: text("number").notNull(),
    labId: uuid("lab_id").references(() => labs.id),
    labName: text("lab_name").notNull(),
    accreditationBody: text("accreditation_body"),
    scope: text("scope"),
    nationalInstitute: text("national_institute"),
    issuedAt: date("issued_at").notNull(),
    dueAt: date("due_at").notNull(),
    expandedUncertainty: numeric("expanded_uncertainty").notNull(),
    coverageFactor: numeric("coverage_factor").notNull(),
    /** Degrees of freedom of U when the certificate states them; null = infinite. */
    degreesOfFreedom: numeric("degrees_of_freedom"),
    /** Certified value of the standard (or per element of a set: label → value). */
    certifiedValue: numeric("certified_value"),
    /** Blocks of a set: nominal and certified deviation (null when the certificate gives no value for the block). */
    elementValues: jsonb("element_values").$type<{ label: string; nominal: string; deviation: string | null }[]>(),
    fileKey: text("file_key"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("standard_certificates_standard_idx").on(t.standardId, t.dueAt), index("standard_certificates_lab_idx").on(t.labId)],
);
