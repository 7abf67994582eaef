import { z } from "zod";
import { UnitSchema, CalendarDateSchema } from "../common/lists.schemas";
import { isCalendarDate } from "../common/dates";
import { TOOL_KINDS } from "../families/families.schemas";
import { AssetTagSchema } from "../tools/tools.schemas";

/** The register fields a column of an imported file can fill. */
export const IMPORT_FIELDS = [
  "assetTag",
  "family",
  "familyKind",
  "description",
  "serialNumber",
  "unit",
  "rangeMin",
  "rangeMax",
  "resolution",
  "intervalDays",
  "maker",
  "model",
  "location",
  "lastCalibratedAt",
] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];

export const REQUIRED_IMPORT_FIELDS: readonly ImportField[] = ["assetTag", "family", "description", "serialNumber", "unit", "rangeMin", "rangeMax", "resolution"];

export const IMPORT_FIELD_LABELS: Record<ImportField, string> = {
  assetTag: "Asset tag",
  family: "Family (name)",
  familyKind: "Family kind (for new families)",
  description: "Description",
  serialNumber: "Serial number",
  unit: "Unit (in or mm)",
  rangeMin: "Range from",
  rangeMax: "Range to",
  resolution: "Resolution",
  intervalDays: "Interval (days)",
  maker: "Maker",
  model: "Model",
  location: "Location",
  lastCalibratedAt: "Last calibrated (YYYY-MM-DD)",
};

/** Which file column fills which field; a field left out is not imported. */
export const ImportMappingSchema = z.partialRecord(z.enum(IMPORT_FIELDS), z.string().min(1).max(200));
export type ImportMapping = z.infer<typeof ImportMappingSchema>;

const jsonText = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => {
    if (typeof v !== "string") return v;
    try {
      return JSON.parse(v);
    } catch {
      return v;
    }
  }, schema);

/** POST /api/imports/dry-run and /commit: the CSV (multipart field "file", or `csv` as text), the column mapping and options. */
export const ImportRequestSchema = z.object({
  csv: z.string().max(20_000_000).optional(),
  mapping: jsonText(ImportMappingSchema).optional(),
  createMissingFamilies: z.preprocess((v) => (v === "true" ? true : v === "false" ? false : v), z.boolean()).default(false),
});
export type ImportRequest = z.input<typeof ImportRequestSchema>;

const decimalText = () =>
  z
    .string()
    .trim()
    .regex(/^-?\d+(\.\d+)?$|^-?\.\d+$/, "Not a number (use a point for decimals, e.g. 0.0001).");

const optionalCell = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .optional()
    .transform((v) => (v ? v : undefined));

/** One row of an imported register, after mapping: every cell as text from the file; the tool part is then checked with the register's CreateToolSchema. */
export const ImportRowSchema = z
  .object({
    assetTag: AssetTagSchema,
    family: z.string().trim().min(1, "Empty.").max(120),
    familyKind: z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.enum(TOOL_KINDS, { message: `One of ${TOOL_KINDS.join(", ")}.` }).optional()),
    description: z.string().trim().min(1, "Empty.").max(200),
    serialNumber: z.string().trim().min(1, "Empty.").max(80),
    unit: z.preprocess((v) => (typeof v === "string" ? v.trim().toLowerCase() : v), z.enum(UnitSchema.options, { message: "Write in or mm." })),
    rangeMin: decimalText(),
    rangeMax: decimalText(),
    resolution: decimalText(),
    intervalDays: z.preprocess(
      (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
      z.coerce
        .number({ message: "Not a number of days." })
        .int("A whole number of days.")
        .min(1, "At least one day.")
        .max(3650, "Longer than ten years.")
        .optional(),
    ),
    maker: optionalCell(120),
    model: optionalCell(120),
    location: optionalCell(120),
    lastCalibratedAt: z
      .string()
      .trim()
      .optional()
      .transform((v) => (v ? v : undefined))
      .pipe(CalendarDateSchema.refine(isCalendarDate, "Not a real date (YYYY-MM-DD).").optional()),
  });
export type ImportRow = z.infer<typeof ImportRowSchema>;

export const ImportErrorSchema = z.object({
  /** Row of the file as a spreadsheet numbers it: the header is row 1. */
  row: z.number().int(),
  field: z.string().nullable(),
  column: z.string().nullable(),
  code: z.string(),
  message: z.string(),
});
export type ImportError = z.infer<typeof ImportErrorSchema>;

export const DryRunResultSchema = z.object({
  columns: z.array(z.string()),
  mapping: ImportMappingSchema,
  missingFields: z.array(z.enum(IMPORT_FIELDS)),
  rows: z.number().int(),
  validRows: z.number().int(),
  errorCount: z.number().int(),
  /** At most the first 1,000 errors, by row. */
  errors: z.array(ImportErrorSchema),
  familiesToCreate: z.array(z.string()),
  calibrationsToImport: z.number().int(),
  preview: z.array(z.record(z.string(), z.string().nullable())),
});
export type DryRunResult = z.infer<typeof DryRunResultSchema>;

export const CommitResultSchema = z.object({
  tools: z.number().int(),
  familiesCreated: z.number().int(),
  calibrations: z.number().int(),
});
export type CommitResult = z.infer<typeof CommitResultSchema>;

/** A line of a streamed import answer (Accept: application/x-ndjson): progress, then the result or the error. */
export type ImportStreamLine =
  | { progress: { done: number; total: number; phase: "validating" | "importing" } }
  | { result: DryRunResult | CommitResult }
  | { error: { code: string; message: string; details?: unknown } };

/** The note every imported calibration record carries, so no one mistakes it for a calibration performed in Tenthwise. */
export const IMPORTED_CALIBRATION_NOTE = "imported from previous register";
