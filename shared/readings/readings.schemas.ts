import { z } from "zod";
import { UnitSchema, InstantSchema, optionalText } from "../common/lists.schemas";
import { EXPANSION_COEFFICIENTS, type MaterialKey } from "../common/units";
import { TOOL_STATUSES } from "../tools/tool-status";

/** Flag names on readings (api.md). */
export const READING_FLAGS = [
  "tool_overdue",
  "tool_out_of_tolerance",
  "tool_quarantined",
  "tool_never_calibrated",
  "resolution_too_coarse",
  "outside_tool_range",
  "not_in_custody",
  "suspect",
  "override",
  "gauge_study_not_acceptable",
] as const;
export type ReadingFlag = (typeof READING_FLAGS)[number];

export const FLAG_LABELS: Record<ReadingFlag, string> = {
  tool_overdue: "Tool was overdue",
  tool_out_of_tolerance: "Tool was out of tolerance",
  tool_quarantined: "Tool was quarantined",
  tool_never_calibrated: "Tool was never calibrated",
  resolution_too_coarse: "Tool resolution too coarse for this tolerance (the shop's resolution ratio)",
  outside_tool_range: "Value outside the tool's range",
  not_in_custody: "Tool not issued to the reader",
  suspect: "Suspect: the tool was later found out of tolerance",
  override: "Accepted by quality despite an unusable tool",
  gauge_study_not_acceptable: "The tool family's latest gauge study on this characteristic is not acceptable",
};

export const MATERIAL_KEYS = Object.keys(EXPANSION_COEFFICIENTS) as [MaterialKey, ...MaterialKey[]];
export const MaterialSchema = z.enum(MATERIAL_KEYS);

/** What a person is told when a value is not a number ("abc", an empty cell sent as NaN or null): the form and the route say the same. */
export const ENTER_A_NUMBER = "Enter a number, e.g. 1.1245";
export const ENTER_A_TEMPERATURE = "Enter the temperature in °C as a number, e.g. 21.5";

/** A value as read on a tool: a length (the bounds of LengthSchema), with a plain message when it is not a number. */
export const ReadingValueSchema = z
  .number({ error: ENTER_A_NUMBER })
  .min(-1e6, "A length this large is not a measurement; check the unit.")
  .max(1e6, "A length this large is not a measurement; check the unit.")
  .refine((v) => v === 0 || Math.abs(v) >= 1e-9, "A length this small is below any tool's resolution; enter 0 or check the unit.");

const TempSchema = z.number({ error: ENTER_A_TEMPERATURE }).min(-40, "Below −40 °C is not a shop temperature.").max(80, "Above 80 °C is not a shop temperature.");
const AssetTagSchema = z.string().trim().min(1, "Scan or type the tool's tag.").max(40);

/**
 * A reading on a check sheet. A size item sends `values` (one per direction) and the tools used (a bore read
 * through a telescoping gauge names the gauge and the micrometer); a feeler item sends the set and goEntered /
 * noGoEntered; a visual item sends visualResult and finding. Values are kept exactly as typed.
 */
export const CreateReadingSchema = z.object({
  itemKey: z.string().trim().min(1, "Choose the item.").max(60),
  index: z.number().int().min(1).max(64).optional(),
  values: z.array(ReadingValueSchema, { error: "Give the values as a list of numbers." }).max(12).optional(),
  toolAssetTags: z.array(AssetTagSchema).max(4).default([]),
  temperatureC: TempSchema.optional(),
  toolTemperatureC: TempSchema.optional(),
  partMaterial: MaterialSchema.optional(),
  goEntered: z.boolean().optional(),
  noGoEntered: z.boolean().optional(),
  /**
   * Feeler item whose set cannot make a go and a no-go inside the limits: the leaf, or stack of up to three leaves,
   * that is the thickest to enter the gap (ids from GET /api/jobs/:id/feeler-leaves).
   */
  gapLeafIds: z.array(z.string().uuid("Choose leaves of the set.")).min(1, "Choose the leaf or stack that entered.").max(3, "A stack has at most three leaves.").optional(),
  visualResult: z.enum(["serviceable", "reject"]).optional(),
  finding: optionalText(1000),
  /** Quality (or admin) accepting a reading despite an unusable tool, with the reason. */
  override: z.object({ reason: z.string().trim().min(5, "Say why the reading is accepted anyway.").max(500) }).optional(),
});
export type CreateReadingInput = z.input<typeof CreateReadingSchema>;
export type CreateReading = z.output<typeof CreateReadingSchema>;

/** A correction: a new reading for the same item and index that supersedes the old one, with the reason. */
export const SupersedeReadingSchema = CreateReadingSchema.omit({ itemKey: true, index: true }).extend({
  reason: z.string().trim().min(5, "Say why the reading is corrected.").max(500),
});
export type SupersedeReadingInput = z.input<typeof SupersedeReadingSchema>;

const VerdictSchema = z.enum(["within_limits", "outside_limits", "pending"]);
const BandSchema = z.enum(["new", "serviceable", "reject"]);

/** One leaf as used in a check, with the calibrated thickness used (in the table's unit). */
export const LeafUseSchema = z.object({ id: z.string().uuid(), label: z.string(), thickness: z.number() });

/**
 * A go or no-go (or measured gap): one leaf or a stack of up to three. `thickness` is the total; `leaves` the leaves of
 * the stack; `id` and `label` a single leaf's, or the leaves' joined with "+" for a stack.
 */
export const LeafSchema = z.object({ id: z.string(), label: z.string(), thickness: z.number(), leaves: z.array(LeafUseSchema) });
export type LeafView = z.infer<typeof LeafSchema>;

const BeyondSchema = z.object({ side: z.enum(["min", "max"]), limit: z.number(), serviceable: z.boolean(), by: z.number() }).nullable();
const PlaceBase = { itemKey: z.string(), index: z.number().int(), verdict: VerdictSchema, band: BandSchema.nullable(), margin: z.number().nullable(), text: z.string() };
const StackSchema = z.object({ leaves: z.array(LeafUseSchema), thickness: z.number() });

/** A place as judged under the current rules (shared/inspection/judging.ts): what was judged, against what, and why. */
export const PlaceSchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("size"),
    ...PlaceBase,
    /** Every two-point reading, judged (ISO 14405-1 two-point size). */
    directions: z.array(
      z.object({ direction: z.number().int(), raw: z.number(), rawUnit: UnitSchema, inTableUnit: z.number(), value: z.number(), verdict: VerdictSchema, band: BandSchema, beyond: BeyondSchema }),
    ),
    size: z.number(),
    rawSize: z.number(),
    smallest: z.number(),
    largest: z.number(),
    outOfRound: z.number(),
    outOfRoundLimit: z.number().nullable(),
    outOfRoundVerdict: VerdictSchema.nullable(),
    outOfRoundBeyond: z.number().nullable(),
    thermal: z
      .object({
        alphaPerK: z.number(),
        source: z.enum(["item", "table", "reading"]),
        material: MaterialSchema.nullable(),
        partTemperatureC: z.number(),
        toolTemperatureC: z.number(),
        correction: z.number(),
        text: z.string(),
      })
      .nullable(),
  }),
  z.object({
    kind: z.literal("fit"),
    ...PlaceBase,
    basis: z.enum(["diametral", "radial"]),
    loosest: z.object({ value: z.number(), diametral: z.number(), boreValue: z.number(), journalValue: z.number(), verdict: VerdictSchema, band: BandSchema, limit: z.number().nullable(), serviceableLimit: z.number().nullable(), beyond: BeyondSchema, margin: z.number().nullable() }),
    tightest: z.object({ value: z.number(), diametral: z.number(), boreValue: z.number(), journalValue: z.number(), verdict: VerdictSchema, band: BandSchema, limit: z.number().nullable(), serviceableLimit: z.number().nullable(), beyond: BeyondSchema, margin: z.number().nullable() }),
  }),
  z.object({
    kind: z.literal("taper"),
    ...PlaceBase,
    stations: z.tuple([z.string(), z.string()]),
    taper: z.number(),
    limit: z.number().nullable(),
    serviceableLimit: z.number().nullable(),
    directions: z.array(z.object({ direction: z.number().int(), a: z.number(), b: z.number(), difference: z.number() })),
  }),
  z.object({
    kind: z.literal("feeler"),
    ...PlaceBase,
    mode: z.enum(["go_no_go", "measured_gap"]),
    go: StackSchema.nullable(),
    noGo: StackSchema.nullable(),
    goEntered: z.boolean().nullable(),
    noGoEntered: z.boolean().nullable(),
    gap: StackSchema.nullable(),
    gapLow: z.number().nullable(),
    gapHigh: z.number().nullable(),
    why: z.string().nullable(),
  }),
  z.object({ kind: z.literal("visual"), ...PlaceBase }),
  z.object({ kind: z.literal("pending"), ...PlaceBase }),
]);
export type PlaceViewSchema = z.infer<typeof PlaceSchema>;

/** The answer to recording a reading (api.md), with the judgement of its place and of the places it completes. */
export const ReadingResultSchema = z.object({
  id: z.string().uuid(),
  size: z.number().optional(),
  outOfRound: z.number().optional(),
  /** The loosest fit of the clearance this reading completes (radial when the table says radial; see `clearanceBasis`). */
  clearance: z.number().optional(),
  /** The tightest fit of that clearance, in the same terms. */
  tightestClearance: z.number().optional(),
  clearanceBasis: z.enum(["diametral", "radial"]).optional(),
  /** Verdict of each side of that clearance: loosest against the maximum, tightest against the minimum. */
  loosestVerdict: VerdictSchema.optional(),
  tightestVerdict: VerdictSchema.optional(),
  goLeaf: LeafSchema.optional(),
  noGoLeaf: LeafSchema.optional(),
  /** A feeler item whose set cannot make a go and a no-go inside the limits: the thickest leaf or stack that entered. */
  measuredGap: LeafSchema.optional(),
  verdict: VerdictSchema,
  verdictText: z.string(),
  flags: z.array(z.string()),
  /** The reading's place as judged. */
  place: PlaceSchema,
  /** The places this reading completes: clearances it is a side of, tapers it is a station of. */
  completes: z.array(z.object({ label: z.string(), place: PlaceSchema })),
  rulesVersion: z.number().int(),
});
export type ReadingResult = z.infer<typeof ReadingResultSchema>;

export const ReadingToolSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  kind: z.string(),
  unit: UnitSchema,
  /** Status and calibration due date at the instant of the reading. */
  statusAtReading: z.enum(TOOL_STATUSES),
  dueAtReading: z.string().nullable(),
});

const PersonRef = z.object({ id: z.string(), name: z.string() });

export const ReadingViewSchema = z.object({
  id: z.string().uuid(),
  itemKey: z.string(),
  index: z.number().int(),
  /** As typed, in the unit of the tool read (`unit`). */
  values: z.array(z.number()),
  unit: UnitSchema,
  /** In the table's unit. */
  size: z.number().nullable(),
  outOfRound: z.number().nullable(),
  goEntered: z.boolean().nullable(),
  noGoEntered: z.boolean().nullable(),
  goLeaf: LeafSchema.nullable(),
  noGoLeaf: LeafSchema.nullable(),
  /** The feeler check as made (leaves and thicknesses used, or the measured gap, and why); null for other items. */
  feeler: z
    .object({ mode: z.enum(["go_no_go", "measured_gap"]), go: StackSchema.nullable(), noGo: StackSchema.nullable(), goEntered: z.boolean().nullable(), noGoEntered: z.boolean().nullable(), gap: StackSchema.nullable(), why: z.string().nullable() })
    .nullable(),
  visualResult: z.enum(["serviceable", "reject"]).nullable(),
  finding: z.string().nullable(),
  /** The verdict as recorded, under the rules of the day. */
  recordedVerdict: VerdictSchema,
  /** The verdict under the current rules (the place's judgement); may differ from the recorded one. */
  verdict: VerdictSchema,
  verdictText: z.string(),
  /** The place as judged under the current rules. */
  place: PlaceSchema,
  /** When the reading was judged under the current rules (at recording, or by the re-judging job); null until then. */
  judgedAt: InstantSchema.nullable(),
  flags: z.array(z.string()),
  tools: z.array(ReadingToolSchema),
  takenBy: PersonRef.nullable(),
  takenAt: InstantSchema,
  temperatureC: z.number().nullable(),
  toolTemperatureC: z.number().nullable(),
  partMaterial: MaterialSchema.nullable(),
  supersedesId: z.string().nullable(),
  supersedeReason: z.string().nullable(),
  supersededById: z.string().nullable(),
  overrideReason: z.string().nullable(),
  overrideBy: PersonRef.nullable(),
});
export type ReadingView = z.infer<typeof ReadingViewSchema>;

/** Feeler leaves to use for an item, from a set (GET /api/jobs/:id/feeler-leaves). */
export const FeelerLeavesQuerySchema = z.object({ itemKey: z.string().trim().min(1).max(60), setTag: AssetTagSchema });
export const FeelerLeavesSchema = z.object({
  /** go_no_go: try the go and the no-go; measured_gap: the set cannot make both inside the limits — record the thickest leaf or stack that enters. */
  mode: z.enum(["go_no_go", "measured_gap"]),
  goLeaf: LeafSchema.nullable(),
  noGoLeaf: LeafSchema.nullable(),
  /** Why these leaves (or why a measured gap). */
  why: z.string(),
  /** The leaves that may be used (not rejected, calibrated one by one), thinnest first. */
  leaves: z.array(LeafUseSchema),
  unit: UnitSchema,
  min: z.number(),
  max: z.number(),
});
export type FeelerLeaves = z.infer<typeof FeelerLeavesSchema>;
