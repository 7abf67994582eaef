import { z } from "zod";
import { InstantSchema, LengthSchema, UnitSchema, optionalText } from "../common/lists.schemas";

export {
  INVESTIGATION_TRIGGERS,
  TRIGGER_LABELS,
  INVESTIGATION_STATUSES,
  INVESTIGATION_STATUS_LABELS,
  READING_VERDICT_LABELS,
  DISPOSITION_KINDS,
  DISPOSITION_LABELS,
  type InvestigationTrigger,
  type InvestigationStatus,
  type DispositionKind,
} from "./labels";
import { INVESTIGATION_TRIGGERS, INVESTIGATION_STATUSES, DISPOSITION_KINDS } from "./labels";

const uuid = z.string().uuid("Not a valid id.");

/**
 * GET /api/investigations. api.md fixes `?toolAssetTag=` and the answer (an array); the other filters are
 * extras: `status`, `jobId` (for the check sheet's banner), and `page`/`pageSize` (the total travels in the
 * `X-Total-Count` header so the answer stays an array).
 */
export const InvestigationListQuerySchema = z.object({
  toolAssetTag: optionalText(60),
  status: z.enum(INVESTIGATION_STATUSES).optional(),
  jobId: uuid.optional(),
  /** Only investigations with affected items still waiting for a disposition. */
  awaitingDisposition: z.union([z.boolean(), z.enum(["true", "false"]).transform((v) => v === "true")]).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(100),
});
export type InvestigationListQuery = z.input<typeof InvestigationListQuerySchema>;

export const AffectedReadingSchema = z.object({ readingId: uuid, jobId: uuid, verdictCouldChange: z.boolean() });

/** One entry of GET /api/investigations: the api.md fields first, then extras for the screens. */
export const InvestigationSummarySchema = z.object({
  id: uuid,
  toolAssetTag: z.string().nullable(),
  status: z.enum(INVESTIGATION_STATUSES),
  windowStart: z.string().nullable(),
  windowEnd: z.string(),
  affectedReadings: z.array(AffectedReadingSchema),
  trigger: z.enum(INVESTIGATION_TRIGGERS),
  /** Set when the finding is on a reference standard (the cascade); toolAssetTag then carries the standard's tag. */
  standardAssetTag: z.string().nullable(),
  description: z.string(),
  openedAt: z.string(),
  closedAt: z.string().nullable(),
  affectedCount: z.number().int(),
  couldChangeCount: z.number().int(),
  /** Items (readings and, in a cascade, calibrations) still waiting for a disposition. */
  undisposedCount: z.number().int(),
  /** The affected readings are still being gathered (a large window, just opened): the counts are not final yet. */
  gathering: z.boolean(),
});
export type InvestigationSummary = z.infer<typeof InvestigationSummarySchema>;
export const InvestigationListSchema = z.array(InvestigationSummarySchema);

export const DispositionSchema = z.object({
  id: uuid,
  itemId: uuid,
  kind: z.enum(DISPOSITION_KINDS),
  rationale: z.string(),
  decidedBy: z.object({ id: uuid, name: z.string() }),
  decidedAt: z.string(),
  notifiedWhom: z.string().nullable(),
  notifiedHow: z.string().nullable(),
  notifiedAt: z.string().nullable(),
  remeasureReadingId: z.string().nullable(),
  /** The disposition this one replaced (a change of mind is a new row; the old one stays as evidence). */
  supersedesId: z.string().nullable(),
});
export type Disposition = z.infer<typeof DispositionSchema>;

/** One affected reading (or, in a standard's cascade, one affected calibration) as re-judged. */
export const InvestigationItemSchema = z.object({
  id: uuid,
  kind: z.enum(["reading", "calibration"]),
  toolAssetTag: z.string().nullable(),
  readingId: z.string().nullable(),
  calibrationId: z.string().nullable(),
  job: z.object({ id: uuid, engineSerial: z.string(), engineModel: z.string(), workOrder: z.string().nullable() }).nullable(),
  itemKey: z.string().nullable(),
  itemLabel: z.string().nullable(),
  index: z.number().int().nullable(),
  unit: UnitSchema.nullable(),
  values: z.array(z.number()),
  /** What the reading measured ("diameter", "bore diameter", "gap"): a stem shows its diameter, never a clearance. */
  quantity: z.string().nullable(),
  /** That quantity as judged (at 20 °C when corrected); for a calibration, the as-found error. */
  measuredValue: z.number().nullable(),
  /** The span the measured quantity may have had over the tool's error band (both signs, up to the largest |error|). */
  bandLow: z.number().nullable(),
  bandHigh: z.number().nullable(),
  /** Every place the reading decides, re-judged: its own, and the clearances and tapers it feeds. */
  places: z.array(
    z.object({
      itemKey: z.string(),
      label: z.string(),
      kind: z.string(),
      quantity: z.string(),
      value: z.number().nullable(),
      low: z.number().nullable(),
      high: z.number().nullable(),
      verdictNow: z.enum(["within_limits", "outside_limits", "pending"]),
      couldChange: z.boolean(),
      text: z.string(),
    }),
  ),
  originalVerdict: z.string().nullable(),
  correctedValue: z.number().nullable(),
  marginBefore: z.number().nullable(),
  marginAfter: z.number().nullable(),
  verdictCouldChange: z.boolean(),
  basis: z.string(),
  takenAt: z.string().nullable(),
  takenBy: z.string().nullable(),
  override: z.boolean(),
  /** The disposition in force (the latest, superseding any earlier one), or null while none is recorded. */
  disposition: DispositionSchema.nullable(),
  /** Every disposition recorded for the item, oldest first (superseded ones included). */
  dispositions: z.array(DispositionSchema),
});
export type InvestigationItem = z.infer<typeof InvestigationItemSchema>;

export const FindingErrorSchema = z.object({
  nominal: z.number(),
  error: z.number(),
  uncertainty: z.number().nullable(),
  mpe: z.number().nullable(),
});

export const NotificationRecordSchema = z.object({
  status: z.enum(["pending", "sending", "sent", "failed"]),
  recipients: z.array(z.object({ email: z.string(), name: z.string(), reasons: z.array(z.string()) })),
  sentAt: z.string().nullable(),
  error: z.string().nullable().optional(),
});

/** Counts of affected items: by whether the verdict could change, by the verdict recorded, and still undisposed. */
export const AffectedTotalsSchema = z.object({
  items: z.number().int(),
  readings: z.number().int(),
  calibrations: z.number().int(),
  couldChange: z.number().int(),
  holds: z.number().int(),
  undisposed: z.number().int(),
  byVerdict: z.object({ within_limits: z.number().int(), outside_limits: z.number().int(), pending: z.number().int() }),
});
export type AffectedTotals = z.infer<typeof AffectedTotalsSchema>;

export const InvestigationDetailSchema = InvestigationSummarySchema.omit({ affectedReadings: true }).extend({
  tool: z.object({ assetTag: z.string(), description: z.string(), unit: UnitSchema }).nullable(),
  standard: z.object({ assetTag: z.string(), name: z.string(), unit: UnitSchema }).nullable(),
  calibrationId: z.string().nullable(),
  checkId: z.string().nullable(),
  checkoutId: z.string().nullable(),
  openedBy: z.string().nullable(),
  closedBy: z.string().nullable(),
  closingSummary: z.string().nullable(),
  finding: z.object({
    summary: z.string(),
    unit: UnitSchema.nullable(),
    /** The errors found, per check point; null when unknown (a lost or damaged tool). */
    errors: z.array(FindingErrorSchema).nullable(),
    windowRule: z.string(),
    note: z.string().nullable(),
    notifications: NotificationRecordSchema.nullable(),
  }),
  /** Counts over every affected item (the items themselves are paged: GET /api/investigations/:id/items). */
  totals: AffectedTotalsSchema,
  /** The check sheets the affected readings belong to, for the table's filter. */
  jobs: z.array(z.object({ id: uuid, engineSerial: z.string(), workOrder: z.string().nullable(), count: z.number().int() })),
});
export type InvestigationDetail = z.infer<typeof InvestigationDetailSchema>;


/** Columns the affected-items table sorts on ("-" first: descending). Without one: could-change first, then sheet, then time. */
export const AFFECTED_SORTS = ["couldChange", "sheet", "takenAt", "item", "tool", "verdict", "margin", "disposition"] as const;
export type AffectedSort = (typeof AFFECTED_SORTS)[number];

const boolParam = z.union([z.boolean(), z.enum(["true", "false"]).transform((v) => v === "true")]);

/** GET /api/investigations/:id/items: one page of affected items, sorted and filtered on the server. */
export const AffectedItemsQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.enum([...AFFECTED_SORTS, ...AFFECTED_SORTS.map((x) => `-${x}` as const)] as [string, ...string[]]).optional(),
  couldChange: boolParam.optional(),
  verdict: z.enum(["within_limits", "outside_limits", "pending"]).optional(),
  /** "none": only items still waiting for a disposition. */
  disposition: z.enum([...DISPOSITION_KINDS, "none"]).optional(),
  jobId: uuid.optional(),
  /** Free text over the place, the engine serial, the work order and the tool's tag. */
  q: optionalText(80),
});
export type AffectedItemsQuery = z.input<typeof AffectedItemsQuerySchema>;
export type AffectedItemsQueryParsed = z.output<typeof AffectedItemsQuerySchema>;

export const AffectedItemsPageSchema = z.object({ items: z.array(InvestigationItemSchema), total: z.number().int(), totals: AffectedTotalsSchema });
export type AffectedItemsPage = z.infer<typeof AffectedItemsPageSchema>;

/** A later reading of the same place on the same check sheet, offered as the remeasurement of an affected reading. */
export const RemeasureCandidateSchema = z.object({
  id: uuid,
  takenAt: z.string(),
  takenBy: z.string().nullable(),
  values: z.array(z.number()),
  unit: UnitSchema,
  size: z.number().nullable(),
  verdict: z.enum(["within_limits", "outside_limits", "pending"]),
  toolAssetTags: z.array(z.string()),
  /** True when it was recorded as a correction of the affected reading (directly or through later corrections). */
  correctsAffected: z.boolean(),
});
export type RemeasureCandidate = z.infer<typeof RemeasureCandidateSchema>;
export const RemeasureCandidatesSchema = z.array(RemeasureCandidateSchema);

/**
 * A disposition for some items of one investigation: either `itemIds` or a whole `jobId`. Every kind needs a
 * rationale; `notify_owner` records whom and how; `remeasure` names the new reading of the same place (a later reading on the same check sheet).
 */
export const CreateDispositionSchema = z
  .object({
    itemIds: z.array(uuid).min(1).max(5000).optional(),
    jobId: uuid.optional(),
    kind: z.enum(DISPOSITION_KINDS, { message: "Choose a disposition." }),
    rationale: z.string().trim().min(1, "Give the reason for this disposition.").max(4000),
    notifiedWhom: optionalText(200),
    notifiedHow: optionalText(200),
    notifiedAt: InstantSchema.optional(),
    // A form sends "" for a field left blank (or left behind when the kind changed): blank means absent.
    // Checked only for a remeasurement; a form switched from "Remeasured" to another kind may still carry it.
    remeasureReadingId: z.string().trim().max(100).optional(),
  })
  .superRefine((v, ctx) => {
    if (!!v.itemIds === !!v.jobId) ctx.addIssue({ code: "custom", path: ["itemIds"], message: "Name the affected items, or a whole job — one of the two." });
    if (v.kind === "notify_owner") {
      if (!v.notifiedWhom) ctx.addIssue({ code: "custom", path: ["notifiedWhom"], message: "Say who was notified." });
      if (!v.notifiedHow) ctx.addIssue({ code: "custom", path: ["notifiedHow"], message: "Say how they were notified." });
    }
    if (v.kind === "remeasure") {
      if (!v.remeasureReadingId) ctx.addIssue({ code: "custom", path: ["remeasureReadingId"], message: "Pick the new reading of this place from the check sheet." });
      else if (!uuid.safeParse(v.remeasureReadingId).success) ctx.addIssue({ code: "custom", path: ["remeasureReadingId"], message: "Not a valid id." });
      if (v.jobId || (v.itemIds && v.itemIds.length !== 1)) ctx.addIssue({ code: "custom", path: ["itemIds"], message: "A remeasurement answers one affected reading." });
    }
  })
  // What belongs to another kind is dropped, so a form switched from one kind to another records only what it shows.
  .transform((v) => ({
    ...v,
    notifiedWhom: v.kind === "notify_owner" ? v.notifiedWhom : undefined,
    notifiedHow: v.kind === "notify_owner" ? v.notifiedHow : undefined,
    notifiedAt: v.kind === "notify_owner" ? v.notifiedAt : undefined,
    remeasureReadingId: v.kind === "remeasure" ? v.remeasureReadingId : undefined,
  }));
export type CreateDispositionInput = z.input<typeof CreateDispositionSchema>;
export type CreateDisposition = z.output<typeof CreateDispositionSchema>;

export const CreateDispositionResultSchema = z.object({ dispositions: z.array(DispositionSchema) });

export const CloseInvestigationSchema = z.object({
  summary: z.string().trim().min(1, "Write the closing summary.").max(8000),
});
export type CloseInvestigationInput = z.infer<typeof CloseInvestigationSchema>;

/**
 * A finding on a reference standard: the errors found at its recalibration (error = the standard's actual
 * value − the value it was used as; positive means it is larger than was assumed), in the standard's unit.
 */
export const StandardFindingSchema = z.object({
  foundAt: InstantSchema,
  errors: z
    .array(z.object({ nominal: LengthSchema.nonnegative(), error: LengthSchema, uncertainty: LengthSchema.nonnegative().optional() }))
    .min(1, "Give at least one error found.")
    .max(200),
  note: optionalText(2000),
});
export type StandardFindingInput = z.input<typeof StandardFindingSchema>;

export const StandardFindingResultSchema = z.object({ investigationId: uuid });

/** The three sentences the Cautions component shows wherever the product judges (product.md, Cautions), for PDFs and mail. */
export const CAUTION_SENTENCES = [
  "Limits must come from the manufacturer's current data for the exact engine model and revision.",
  "Verdicts and flags here support, and never replace, the judgement of appropriately certificated persons, who alone decide airworthiness and return to service under the applicable regulations.",
  "Local regulations and the shop's approved procedures govern.",
] as const;

/** What an investigation's flags are, and are not. */
export const INVESTIGATION_FLAG_CAUTION =
  "The flags of this investigation (\"verdict could change\") prompt a qualified evaluation of each affected reading; they are not determinations.";

export const INVESTIGATION_CAUTIONS = [...CAUTION_SENTENCES, INVESTIGATION_FLAG_CAUTION] as const;
