import { z } from "zod";
import { InstantSchema, optionalText, PageQuerySchema } from "../common/lists.schemas";
import { LimitItemSchema, LimitTableSummarySchema } from "../limit-tables/limit-tables.schemas";
import { PlaceSchema, ReadingViewSchema } from "../readings/readings.schemas";

/** Open a job: an engine on a limits table revision (kept for the life of the job). */
export const CreateJobSchema = z.object({
  limitTableId: z.string().uuid("Choose a limits table."),
  engineSerial: z.string().trim().min(1, "Give the engine serial number.").max(60),
  workOrder: optionalText(60),
});
export type CreateJobInput = z.input<typeof CreateJobSchema>;

export const JOB_STATUSES = ["open", "signed"] as const;
export const JobStatusSchema = z.enum(JOB_STATUSES);

/**
 * List filters on a sheet's state: open (not signed, or corrected since its sign-off), awaiting signature
 * (open with readings on it: what an inspector has to sign) or signed.
 */
export const JOB_LIST_STATUSES = ["open", "awaiting_signature", "signed"] as const;
export type JobListStatus = (typeof JOB_LIST_STATUSES)[number];

export const JobListQuerySchema = PageQuerySchema.extend({
  engineSerial: z.string().trim().max(60).optional(),
  status: z.enum(JOB_LIST_STATUSES, { message: `Status is one of ${JOB_LIST_STATUSES.join(", ")}.` }).optional(),
  /** Jobs I opened or took readings on. */
  mine: z.enum(["true", "false"]).transform((v) => v === "true").optional(),
  sort: z.enum(["openedAt", "-openedAt", "engineSerial", "-engineSerial"]).default("-openedAt"),
});
export type JobListQuery = z.input<typeof JobListQuerySchema>;

const PersonRef = z.object({ id: z.string(), name: z.string() });

export const JobSummarySchema = z.object({
  id: z.string().uuid(),
  engineSerial: z.string(),
  engineModel: z.string(),
  workOrder: z.string().nullable(),
  limitTableId: z.string().uuid(),
  limitTableName: z.string(),
  limitTableVersion: z.number().int(),
  openedAt: InstantSchema,
  openedBy: PersonRef.nullable(),
  status: JobStatusSchema,
  readingCount: z.number().int(),
  signedAt: InstantSchema.nullable(),
});
export type JobSummary = z.infer<typeof JobSummarySchema>;

export const SignJobSchema = z.object({
  certificateNumber: z.string().trim().min(1, "Give your inspector certificate number.").max(64),
  note: optionalText(1000),
});
export type SignJobInput = z.input<typeof SignJobSchema>;

/** GET /api/me/inspector-certificate — what the sign-off form fills in: the signer's number from their user record. */
export const SignerCertificateSchema = z.object({ name: z.string(), certificateNumber: z.string().nullable() });
export type SignerCertificate = z.infer<typeof SignerCertificateSchema>;

export const SignoffSchema = z.object({
  id: z.string().uuid(),
  inspector: PersonRef,
  certificateNumber: z.string(),
  signedAt: InstantSchema,
  note: z.string().nullable(),
});

const LimitJudgementSchema = z.object({
  verdict: z.enum(["within_limits", "outside_limits"]),
  band: z.enum(["new", "serviceable", "reject"]),
  marginToNearestLimit: z.number(),
  decidingLimits: z.object({ min: z.number().nullable(), max: z.number().nullable() }),
});

/**
 * A place's current reading on the sheet: the reading as recorded, without its judged place, which is the row's
 * `place` (sent once: it is the largest part of a row, and a sheet of 1,000 readings sent it twice).
 */
export const SheetReadingSchema = ReadingViewSchema.omit({ place: true });
export type SheetReading = z.infer<typeof SheetReadingSchema>;

export const SheetRowSchema = z.object({
  index: z.number().int(),
  /** The current reading (latest, not superseded); clearance rows have none. Its judged place is the row's `place`. */
  reading: SheetReadingSchema.nullable(),
  /** Readings this place held before, each superseded with a reason. */
  history: z.array(ReadingViewSchema),
  /** Clearance rows: the loosest fit (radial where the table says radial); `place` carries both fits. */
  clearance: z.number().nullable(),
  judgement: LimitJudgementSchema.nullable(),
  /** The verdict under the current rules. */
  verdict: z.enum(["within_limits", "outside_limits", "pending"]),
  verdictText: z.string(),
  /** The place as judged: every reading, both fits, radial, out-of-round, taper, 20 °C, feeler leaves. */
  place: PlaceSchema,
  /** A reading recorded under earlier rules that the current rules judge otherwise. */
  judgedDifferently: z.boolean(),
  /** The place's flags, less those its item shows once (`SheetItem.flags`); the reading keeps all its flags. */
  flags: z.array(z.string()),
});
export type SheetRow = z.infer<typeof SheetRowSchema>;

export const SheetItemSchema = LimitItemSchema.extend({
  rows: z.array(SheetRowSchema),
  /** Flags every reading of the item carries (at least two readings, or the item's only place): shown once, on the item. */
  flags: z.array(z.string()),
});
export type SheetItem = z.infer<typeof SheetItemSchema>;

/** GET /api/jobs/:id — the check sheet. */
export const CheckSheetSchema = JobSummarySchema.extend({
  limitTable: LimitTableSummarySchema.pick({ id: true, name: true, engineModel: true, unit: true, sourceDocument: true, sourceRevision: true, version: true, isDemo: true, supersededById: true, expansionPerK: true }),
  items: z.array(SheetItemSchema),
  signoffs: z.array(SignoffSchema),
  /** The sheet is locked: signed, and nothing corrected since. */
  locked: z.boolean(),
  /** A reading was corrected after the last sign-off: the sheet needs signing again. */
  changedSinceSignoff: z.boolean(),
  summary: z.object({
    places: z.number().int(),
    recorded: z.number().int(),
    missing: z.array(z.object({ itemKey: z.string(), index: z.number().int(), label: z.string() })),
    outside: z.number().int(),
    flagged: z.number().int(),
    /** Places whose reading was recorded with another verdict than the current rules give. */
    judgedDifferently: z.number().int(),
    rulesVersion: z.number().int(),
  }),
  tools: z.array(z.object({ assetTag: z.string(), description: z.string(), statusAtReading: z.string(), dueAtReading: z.string().nullable(), readings: z.number().int() })),
});
export type CheckSheet = z.infer<typeof CheckSheetSchema>;
