// Pure steps of importing a shop's existing register from CSV: propose a column
// mapping, map each row, and check every row before anything is written.
import { CreateToolSchema } from "../tools/tools.schemas";
import { ImportRowSchema, IMPORT_FIELDS, IMPORT_FIELD_LABELS, REQUIRED_IMPORT_FIELDS, type ImportError, type ImportField, type ImportMapping, type ImportRow } from "./transfers.schemas";

// Header spellings a shop's spreadsheet is likely to use (common practice, no source).
const ALIASES: Record<ImportField, string[]> = {
  assetTag: ["assettag", "tag", "asset", "assetno", "assetnumber", "toolid", "gaugeid", "idno", "id"],
  family: ["family", "toolfamily", "type", "tooltype", "category", "group"],
  familyKind: ["familykind", "kind"],
  description: ["description", "desc", "name", "toolname", "tooldescription"],
  serialNumber: ["serialnumber", "serial", "serialno", "sn"],
  unit: ["unit", "units", "uom"],
  rangeMin: ["rangemin", "rangefrom", "min", "from", "lowerrange", "rangelow"],
  rangeMax: ["rangemax", "rangeto", "max", "to", "upperrange", "rangehigh"],
  resolution: ["resolution", "res", "graduation", "grad"],
  intervalDays: ["intervaldays", "interval", "calinterval", "calibrationinterval", "intervald"],
  maker: ["maker", "manufacturer", "make", "mfr"],
  model: ["model", "modelno", "modelnumber"],
  location: ["location", "loc", "storage", "bin"],
  lastCalibratedAt: ["lastcalibratedat", "lastcalibrated", "lastcal", "lastcalibration", "lastcalibrationdate", "caldate", "calibrated", "lastcaldate"],
};

/** Header text reduced to letters and digits, lower case, for matching. */
export function normalizeHeader(h: string): string {
  return h.toLowerCase().replace(/[^a-z0-9]/g, "");
}

/** A first guess at which column fills which field, from the header names. */
export function proposeMapping(columns: string[]): ImportMapping {
  const out: ImportMapping = {};
  const used = new Set<string>();
  for (const field of IMPORT_FIELDS) {
    const hit = columns.find((c) => !used.has(c) && ALIASES[field].includes(normalizeHeader(c)));
    if (hit) {
      out[field] = hit;
      used.add(hit);
    }
  }
  return out;
}

/** Required fields the mapping leaves without a column of the file. */
export function missingFields(mapping: ImportMapping, columns: string[]): ImportField[] {
  return REQUIRED_IMPORT_FIELDS.filter((f) => !mapping[f] || !columns.includes(mapping[f]!));
}

export interface RegisterLookups {
  /** Asset tags already in the register (of the tags in the file). */
  existingTags: Set<string>;
  /** Families by lower-case name. */
  families: Map<string, { id: string; name: string; defaultIntervalDays: number }>;
  createMissingFamilies: boolean;
}

export interface CheckedRow {
  row: number;
  value: ImportRow;
  /** Interval the tool gets: the row's, or its family's default. */
  intervalDays: number;
  familyKey: string;
}

export interface ImportCheck {
  valid: CheckedRow[];
  errors: ImportError[];
  /** New families, by name, with what the first row naming them gives. */
  familiesToCreate: Map<string, { name: string; kind: NonNullable<ImportRow["familyKind"]>; unit: ImportRow["unit"]; defaultIntervalDays: number }>;
}

const labelled = (field: string | null, message: string) => (field ? `${IMPORT_FIELD_LABELS[field as ImportField] ?? field}: ${message}` : message);

const PLACEHOLDER_UUID = "00000000-0000-4000-8000-000000000000";

/** Row number as a spreadsheet shows it: the header is row 1, the first record row 2. */
export const rowNumber = (index: number) => index + 2;

/**
 * Checks every row: the shared row schema, duplicate tags within the file and
 * against the register, and the family each row names. Nothing is written here.
 */
export function checkRows(records: Record<string, string>[], mapping: ImportMapping, lookups: RegisterLookups, onProgress?: (done: number) => void): ImportCheck {
  const errors: ImportError[] = [];
  const valid: CheckedRow[] = [];
  const familiesToCreate: ImportCheck["familiesToCreate"] = new Map();
  const seen = new Map<string, number>();
  const columnOf = (field: string) => (mapping as Record<string, string | undefined>)[field] ?? null;

  records.forEach((rec, i) => {
    const row = rowNumber(i);
    const cells: Record<string, string | undefined> = {};
    for (const f of IMPORT_FIELDS) {
      const col = mapping[f];
      if (col) cells[f] = rec[col] ?? "";
    }
    const parsed = ImportRowSchema.safeParse(cells);
    const rowErrors: ImportError[] = [];
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const field = String(issue.path[0] ?? "") || null;
        rowErrors.push({ row, field, column: field ? columnOf(field) : null, code: "invalid_value", message: labelled(field, issue.message) });
      }
    }
    const tag = (cells.assetTag ?? "").trim();
    if (tag) {
      const first = seen.get(tag);
      if (first !== undefined) rowErrors.push({ row, field: "assetTag", column: columnOf("assetTag"), code: "duplicate_in_file", message: `Asset tag ${tag} also appears in row ${first}.` });
      else seen.set(tag, row);
      if (lookups.existingTags.has(tag)) rowErrors.push({ row, field: "assetTag", column: columnOf("assetTag"), code: "already_registered", message: `Asset tag ${tag} is already in the register.` });
    }
    let intervalDays = 0;
    let familyKey = "";
    if (parsed.success) {
      const v = parsed.data;
      familyKey = v.family.toLowerCase();
      const existing = lookups.families.get(familyKey);
      if (existing) intervalDays = v.intervalDays ?? existing.defaultIntervalDays;
      else if (!lookups.createMissingFamilies) {
        rowErrors.push({ row, field: "family", column: columnOf("family"), code: "unknown_family", message: `There is no family "${v.family}" in the register; add it first or allow new families with a kind column.` });
      } else {
        const planned = familiesToCreate.get(familyKey);
        if (!planned && !v.familyKind) rowErrors.push({ row, field: "familyKind", column: columnOf("familyKind"), code: "family_kind_missing", message: `Family "${v.family}" is new: give its kind.` });
        else if (!planned && !v.intervalDays) rowErrors.push({ row, field: "intervalDays", column: columnOf("intervalDays"), code: "interval_missing", message: `Family "${v.family}" is new: give the interval in days.` });
        else if (!planned) familiesToCreate.set(familyKey, { name: v.family, kind: v.familyKind!, unit: v.unit, defaultIntervalDays: v.intervalDays! });
        intervalDays = v.intervalDays ?? planned?.defaultIntervalDays ?? 0;
      }
    }
    if (parsed.success && intervalDays > 0) {
      // The same rules as registering one tool by hand (shared CreateToolSchema); the family is resolved above.
      const asTool = CreateToolSchema.safeParse({
        assetTag: parsed.data.assetTag,
        familyId: PLACEHOLDER_UUID,
        unit: parsed.data.unit,
        rangeMin: Number(parsed.data.rangeMin),
        rangeMax: Number(parsed.data.rangeMax),
        resolution: Number(parsed.data.resolution),
        description: parsed.data.description,
        serialNumber: parsed.data.serialNumber,
        maker: parsed.data.maker,
        model: parsed.data.model,
        location: parsed.data.location,
        intervalDays,
      });
      if (!asTool.success) {
        for (const issue of asTool.error.issues) {
          const field = String(issue.path[0] ?? "") || null;
          rowErrors.push({ row, field, column: field ? columnOf(field) : null, code: "invalid_value", message: labelled(field, issue.message) });
        }
      }
    }
    if (rowErrors.length) errors.push(...rowErrors);
    else if (parsed.success) valid.push({ row, value: parsed.data, intervalDays, familyKey });
    if (onProgress && (i + 1) % 500 === 0) onProgress(i + 1);
  });
  onProgress?.(records.length);
  return { valid, errors, familiesToCreate };
}

/** The instant of noon on a calendar date in a time zone: a date-only record lands on that date whatever the offset. */
export function localNoon(date: string, timeZone: string): Date {
  const [y, m, d] = date.split("-").map(Number);
  const guess = Date.UTC(y, m - 1, d, 12);
  const parts = new Intl.DateTimeFormat("en-US", { timeZone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit" }).formatToParts(new Date(guess));
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const wall = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"));
  return new Date(guess - (wall - guess));
}
