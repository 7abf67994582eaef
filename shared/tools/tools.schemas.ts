import { z } from "zod";
import { InstantSchema, LengthSchema, PageQuerySchema, UnitSchema, optionalText, CalendarDateSchema } from "../common/lists.schemas";
import { TOOL_STATUSES, type ToolStatus } from "./tool-status";
import { isCalendarDate } from "../common/dates";
import { FamilySchema, ToolKindSchema } from "../families/families.schemas";

export const ToolStatusSchema = z.enum(TOOL_STATUSES);
export const OWNER_TYPES = ["shop", "personal", "customer", "loaner"] as const;
export const OwnerTypeSchema = z.enum(OWNER_TYPES);
export const OWNER_TYPE_LABELS: Record<(typeof OWNER_TYPES)[number], string> = {
  shop: "Shop",
  personal: "Mechanic's own",
  customer: "Customer's",
  loaner: "Loaner",
};
export const LIFECYCLES = ["active", "inactive", "lost", "retired"] as const;
export const LifecycleSchema = z.enum(LIFECYCLES);

/** Asset tags are printed on labels and used in URLs: letters, digits, dot, dash, underscore. */
export const AssetTagSchema = z
  .string()
  .trim()
  .min(1, "Give the asset tag.")
  .max(40)
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, "Use letters, digits, dots, dashes and underscores only.");

/** One element of a set: a feeler leaf or a gauge block. */
export const SetElementInputSchema = z.object({
  label: z.string().trim().min(1).max(40),
  nominal: LengthSchema.nonnegative(),
  grade: optionalText(20),
  certifiedDeviation: LengthSchema.nullish(),
});
export type SetElementInput = z.infer<typeof SetElementInputSchema>;

const PositiveLength = LengthSchema.positive("Must be greater than zero.");

const toolFields = {
  description: z.string().trim().min(1, "Describe the tool.").max(200),
  serialNumber: z.string().trim().min(1, "Give the maker's serial number (or 'none').").max(80),
  maker: optionalText(80),
  model: optionalText(80),
  location: optionalText(80),
  intervalDays: z.number().int().min(1, "An interval is at least one day.").max(3650),
  usageLimit: z.number().int().min(1).nullish(),
  ownerType: OwnerTypeSchema.default("shop"),
  ownerUserId: z.string().uuid().nullish(),
  ownerName: optionalText(120),
  calibrationRequired: z.boolean().default(true),
  /** May take acceptance readings; always false for a tool that needs no calibration (reference only). */
  acceptanceUse: z.boolean().default(true),
  notes: optionalText(2000),
};

const personalNeedsOwner = (v: { ownerType?: string; ownerUserId?: string | null }) => v.ownerType !== "personal" || !!v.ownerUserId;
const personalMessage = { message: "A mechanic's own tool names its owner.", path: ["ownerUserId"] };

/** POST /api/tools (api.md fields plus maker, model, location, owner, acceptance use, set elements). */
export const CreateToolSchema = z
  .object({
    assetTag: AssetTagSchema,
    familyId: z.string().uuid("Choose a family."),
    unit: UnitSchema,
    rangeMin: LengthSchema.nonnegative(),
    rangeMax: LengthSchema.nonnegative(),
    resolution: PositiveLength,
    ...toolFields,
    /** Leaves of a feeler set, blocks of a gauge block set. */
    elements: z.array(SetElementInputSchema).max(200).optional(),
  })
  .refine((v) => v.rangeMax >= v.rangeMin, { message: "The top of the range is below the bottom.", path: ["rangeMax"] })
  // A tool reads its range in steps of its resolution: a step larger than the whole range is a typing slip.
  .refine((v) => v.rangeMax === v.rangeMin || v.resolution <= v.rangeMax - v.rangeMin, { message: "The resolution is larger than the whole range; check the unit and the figures.", path: ["resolution"] })
  .refine(personalNeedsOwner, personalMessage)
  .refine((v) => new Set((v.elements ?? []).map((e) => e.label)).size === (v.elements ?? []).length, {
    message: "Each element of a set needs its own label.",
    path: ["elements"],
  });
export type CreateToolInput = z.input<typeof CreateToolSchema>;
export type CreateTool = z.infer<typeof CreateToolSchema>;

/** PATCH /api/tools/:assetTag: fields that are not evidence (identity, range and resolution stay as registered). */
export const UpdateToolSchema = z
  .object({
    description: toolFields.description,
    serialNumber: toolFields.serialNumber,
    maker: z.string().trim().max(80).nullable(),
    model: z.string().trim().max(80).nullable(),
    location: z.string().trim().max(80).nullable(),
    intervalDays: toolFields.intervalDays,
    usageLimit: z.number().int().min(1).nullable(),
    ownerType: OwnerTypeSchema,
    ownerUserId: z.string().uuid().nullable(),
    ownerName: z.string().trim().max(120).nullable(),
    calibrationRequired: z.boolean(),
    acceptanceUse: z.boolean(),
    notes: z.string().trim().max(2000).nullable(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, "Change at least one field.");
export type UpdateTool = z.infer<typeof UpdateToolSchema>;

/** Sort keys of the register; "-" in front sorts descending (e.g. "-dueAt"). */
export const ToolSortSchema = z.enum([
  "assetTag", "-assetTag",
  "description", "-description",
  "family", "-family",
  "location", "-location",
  "dueAt", "-dueAt",
  "status", "-status",
  "custodian", "-custodian",
  "createdAt", "-createdAt",
]);
export type ToolSort = z.infer<typeof ToolSortSchema>;

/** Comma-separated list in a query string, e.g. ?status=overdue,quarantined. */
const csvList = <T extends z.ZodTypeAny>(item: T) =>
  z.preprocess((v) => (typeof v === "string" ? v.split(",").map((s) => s.trim()).filter(Boolean) : v), z.array(item).max(20)).optional();

/** A real calendar date in a query string (2026-02-30 is refused). */
const QueryDateSchema = CalendarDateSchema.refine(isCalendarDate, "Not a calendar date.");

/** The due-date filters of the register (dashboard links): within N days from today, or in a date range. */
export const DUE_FILTERS = ["dueWithinDays", "dueFrom", "dueTo"] as const;
/** Statuses of a tool still in calibration: the ones that can come due. */
export const STILL_IN_CALIBRATION = ["in_calibration", "due_soon", "limited"] as const satisfies readonly ToolStatus[];

/** GET /api/tools query: filters, sort ("-" for descending), paging, ?format=csv for the current view as CSV. */
export const ToolListQuerySchema = PageQuerySchema.extend({
  status: csvList(ToolStatusSchema),
  familyId: z.string().uuid().optional(),
  kind: ToolKindSchema.optional(),
  q: optionalText(100),
  custodianId: z.string().uuid().optional(),
  ownerUserId: z.string().uuid().optional(),
  location: optionalText(80),
  ownerType: OwnerTypeSchema.optional(),
  usable: z.enum(["true", "false"]).transform((v) => v === "true").optional(),
  /** Tools still in calibration (in calibration, due soon, limited) due within N days from today in the shop's zone, today and day N included. */
  dueWithinDays: z
    .string()
    .regex(/^\d{1,4}$/, "A whole number of days.")
    .transform(Number)
    .pipe(z.number().int().max(3650, "At most 3650 days."))
    .optional(),
  /** Due on or after this calendar date. */
  dueFrom: QueryDateSchema.optional(),
  /** Due on or before this calendar date. */
  dueTo: QueryDateSchema.optional(),
  sort: ToolSortSchema.default("assetTag"),
  /** Keyset paging: the nextCursor of the page before (same filters and sort); page is then ignored. */
  after: z.string().trim().max(600).regex(/^[A-Za-z0-9_-]*$/, "Not a cursor from this list.").optional().transform((v) => (v ? v : undefined)),
  format: z.enum(["json", "csv"]).default("json"),
}).refine((v) => !v.dueFrom || !v.dueTo || v.dueFrom <= v.dueTo, { message: "The start of the due-date range is after its end.", path: ["dueTo"] });
export type ToolListQuery = z.infer<typeof ToolListQuerySchema>;
export type ToolListQueryInput = z.input<typeof ToolListQuerySchema>;

export const CustodianSchema = z.object({
  checkoutId: z.string(),
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  since: z.string(),
  dueBackAt: z.string(),
});
export type Custodian = z.infer<typeof CustodianSchema>;

export const LimitedRangeSchema = z.object({ min: z.number(), max: z.number(), unit: UnitSchema, note: z.string().nullable().optional() });

export const LastCalibrationSchema = z.object({
  id: z.string(),
  performedAt: z.string(),
  result: z.enum(["pass", "adjusted", "fail", "limited"]),
  nextDueAt: CalendarDateSchema,
  limitedRange: LimitedRangeSchema.nullable().optional(),
});

/** Derived status fields, the same on the list, the detail and the status answer. */
const statusFields = {
  status: ToolStatusSchema,
  usable: z.boolean(),
  usableForAcceptance: z.boolean(),
  reasons: z.array(z.string()),
  dueAt: CalendarDateSchema.nullable(),
  daysToDue: z.number().int().nullable(),
  usesRemaining: z.number().int().nullable(),
  custodian: CustodianSchema.nullable(),
};

/** A row of the register. */
export const ToolSummarySchema = z.object({
  id: z.string(),
  assetTag: z.string(),
  description: z.string(),
  familyId: z.string(),
  familyName: z.string(),
  kind: ToolKindSchema,
  unit: UnitSchema,
  rangeMin: z.number(),
  rangeMax: z.number(),
  resolution: z.number(),
  serialNumber: z.string(),
  maker: z.string().nullable(),
  model: z.string().nullable(),
  location: z.string().nullable(),
  ownerType: OwnerTypeSchema,
  ownerUserId: z.string().nullable(),
  ownerName: z.string().nullable(),
  intervalDays: z.number().int(),
  lifecycle: LifecycleSchema,
  calibrationRequired: z.boolean(),
  acceptanceUse: z.boolean(),
  ...statusFields,
});
export type ToolSummary = z.infer<typeof ToolSummarySchema>;

/** A page of the register; nextCursor (when more rows follow) asks for the next page by ?after= without counting rows to skip. */
export const ToolPageSchema = z.object({ items: z.array(ToolSummarySchema), total: z.number().int(), nextCursor: z.string().nullable().optional() });
export type ToolPage = z.infer<typeof ToolPageSchema>;

export const SetElementSchema = z.object({
  id: z.string(),
  label: z.string(),
  nominal: z.number(),
  grade: z.string().nullable(),
  certifiedDeviation: z.number().nullable(),
  rejectedAt: z.string().nullable(),
  rejectedReason: z.string().nullable(),
  /** False once rejected: a rejected leaf or block is never chosen again. */
  usable: z.boolean(),
});
export type SetElement = z.infer<typeof SetElementSchema>;

export const HoldSchema = z.object({ id: z.string(), reason: z.string(), placedAt: z.string(), placedBy: z.string().nullable() });

export const LifecycleEventSchema = z.object({
  at: z.string(),
  lifecycle: LifecycleSchema,
  reason: z.string(),
  byName: z.string().nullable(),
});

/** GET /api/tools/:assetTag: the tool with its status, custody, last calibration, family, elements, open hold and lifecycle history. */
export const ToolDetailSchema = ToolSummarySchema.extend({
  usageLimit: z.number().int().nullable(),
  ownerUserName: z.string().nullable(),
  notes: z.string().nullable(),
  hasPhoto: z.boolean(),
  createdAt: z.string(),
  lastCalibration: LastCalibrationSchema.nullable(),
  family: FamilySchema,
  elements: z.array(SetElementSchema),
  openHold: HoldSchema.nullable(),
  lifecycleEvents: z.array(LifecycleEventSchema),
});
export type ToolDetail = z.infer<typeof ToolDetailSchema>;

/** GET /api/tools/:assetTag/status?at=ISO (api.md). */
export const ToolStatusQuerySchema = z.object({ at: InstantSchema.optional() });
export const ToolStatusResponseSchema = z.object({
  assetTag: z.string(),
  at: z.string(),
  description: z.string(),
  unit: UnitSchema,
  lastCalibration: LastCalibrationSchema.nullable(),
  ...statusFields,
});
export type ToolStatusResponse = z.infer<typeof ToolStatusResponseSchema>;

/** Body of quarantine, release and element rejection: why. */
export const ReasonSchema = z.object({ reason: z.string().trim().min(3, "Say why (a few words at least).").max(500) });
export type ReasonInput = z.infer<typeof ReasonSchema>;
export const QuarantineSchema = ReasonSchema;
export const ReleaseSchema = ReasonSchema;
export const RejectElementSchema = ReasonSchema;

/** POST /api/tools/:assetTag/lifecycle: mark inactive, reactivate, or retire (lost and found belong to the crib). */
export const LifecycleChangeSchema = ReasonSchema.extend({ lifecycle: z.enum(["inactive", "active", "retired"]) });
export type LifecycleChange = z.infer<typeof LifecycleChangeSchema>;

/** Answer of quarantine, release and lifecycle changes: the tool's status afterwards. */
export const ToolActionResultSchema = z.object({ assetTag: z.string(), status: ToolStatusSchema, usable: z.boolean(), reasons: z.array(z.string()) });
export type ToolActionResult = z.infer<typeof ToolActionResultSchema>;

/** GET /api/tools/locations: every location named in the register, for the location filter. */
export const ToolLocationsSchema = z.object({ items: z.array(z.string()) });
export type ToolLocations = z.infer<typeof ToolLocationsSchema>;

/** Columns of the CSV export of the register, in order. */
export const TOOL_CSV_COLUMNS = [
  "assetTag",
  "description",
  "familyName",
  "kind",
  "unit",
  "rangeMin",
  "rangeMax",
  "resolution",
  "serialNumber",
  "maker",
  "model",
  "location",
  "ownerType",
  "ownerName",
  "status",
  "dueAt",
  "custodian",
  "intervalDays",
] as const;
