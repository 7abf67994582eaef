import { z } from "zod";
import { InstantSchema, LengthSchema, UnitSchema, optionalText } from "../common/lists.schemas";
import { TOOL_STATUSES } from "../tools/tool-status";

// Gauge studies (repeatability and reproducibility, crossed design): set-up, blind entry on the bench, results.

export const STUDY_LIMITS = { minParts: 5, maxParts: 10, minAppraisers: 2, maxAppraisers: 3, minTrials: 2, maxTrials: 3 } as const;

const Uuid = (what: string) => z.string().uuid(`Not a ${what} id.`);
const AssetTagSchema = z.string().trim().min(1, "Scan or type the tool's tag.").max(40);

/** Set up a study (quality): the characteristic, the tool or family, the parts, the appraisers, the trials. */
export const CreateStudySchema = z
  .object({
    limitTableId: Uuid("limits table"),
    itemKey: z.string().trim().min(1, "Choose the characteristic (a journal or bore item of the table).").max(60),
    /** The tool family under study; taken from the tool when one tool is named. */
    familyId: Uuid("tool family").optional(),
    /** One particular tool, when the study is of that tool rather than any tool of its family. */
    toolAssetTag: AssetTagSchema.optional(),
    parts: z
      .array(z.object({ label: z.string().trim().min(1, "Label every part.").max(40) }))
      .min(STUDY_LIMITS.minParts, `A study needs at least ${STUDY_LIMITS.minParts} parts.`)
      .max(STUDY_LIMITS.maxParts, `A study takes at most ${STUDY_LIMITS.maxParts} parts.`),
    appraiserIds: z
      .array(Uuid("person"))
      .min(STUDY_LIMITS.minAppraisers, `A study needs at least ${STUDY_LIMITS.minAppraisers} appraisers.`)
      .max(STUDY_LIMITS.maxAppraisers, `A study takes at most ${STUDY_LIMITS.maxAppraisers} appraisers.`),
    trials: z
      .number({ error: "Say how many times each appraiser measures each part (2 or 3 trials)." })
      .int()
      .min(STUDY_LIMITS.minTrials, `At least ${STUDY_LIMITS.minTrials} trials.`)
      .max(STUDY_LIMITS.maxTrials, `At most ${STUDY_LIMITS.maxTrials} trials.`),
    purpose: optionalText(500),
    /** Invented values for the demonstration; shown as demo everywhere. */
    isDemo: z.boolean().default(false),
  })
  .superRefine((s, ctx) => {
    if (!s.familyId && !s.toolAssetTag) ctx.addIssue({ code: "custom", path: ["familyId"], message: "Name the tool family (or one tool) under study." });
    const labels = s.parts.map((p) => p.label.toUpperCase());
    labels.forEach((l, i) => {
      if (labels.indexOf(l) !== i) ctx.addIssue({ code: "custom", path: ["parts", i, "label"], message: `Part label "${s.parts[i].label}" is used twice.` });
    });
    s.appraiserIds.forEach((id, i) => {
      if (s.appraiserIds.indexOf(id) !== i) ctx.addIssue({ code: "custom", path: ["appraiserIds", i], message: "An appraiser is named twice." });
    });
  });
export type CreateStudyInput = z.input<typeof CreateStudySchema>;
export type CreateStudy = z.output<typeof CreateStudySchema>;

/** One value taken on the bench: the prompt it answers (part and trial), the value as read, the tools used. */
export const RecordStudyValueSchema = z.object({
  part: z.number({ error: "Say which part was measured." }).int().min(1).max(STUDY_LIMITS.maxParts),
  trial: z.number({ error: "Say which trial this is." }).int().min(1).max(STUDY_LIMITS.maxTrials),
  value: LengthSchema.refine(Number.isFinite, "Type the value as a number."),
  /** The tool of the family under study, and (for a transfer gauge) the micrometer that read it. */
  toolAssetTags: z.array(AssetTagSchema).min(1, "Name the tool you measured with.").max(2),
});
export type RecordStudyValueInput = z.input<typeof RecordStudyValueSchema>;

/** A correction of one's own value: a new value that supersedes it, with the reason. */
export const SupersedeStudyValueSchema = RecordStudyValueSchema.omit({ part: true, trial: true }).extend({
  reason: z.string().trim().min(5, "Say why the value is corrected.").max(500),
});
export type SupersedeStudyValueInput = z.input<typeof SupersedeStudyValueSchema>;

export const StudyListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  state: z.enum(["in_progress", "complete"]).optional(),
  familyId: z.string().uuid().optional(),
  limitTableId: z.string().uuid().optional(),
  itemKey: z.string().trim().max(60).optional(),
  sort: z.enum(["createdAt", "-createdAt"]).default("-createdAt"),
});
export type StudyListQuery = z.input<typeof StudyListQuerySchema>;

/** Latest studies by family (tool page) or by limits table (its items). */
export const LatestStudiesQuerySchema = z
  .object({ familyId: z.string().uuid().optional(), limitTableId: z.string().uuid().optional() })
  .refine((q) => !!q.familyId !== !!q.limitTableId, "Ask by familyId or by limitTableId.");

export const VERDICTS = ["acceptable", "conditional", "not_acceptable"] as const;
export const VerdictSchema = z.enum(VERDICTS);

const PersonRef = z.object({ id: z.string(), name: z.string() });

export const CharacteristicSchema = z.object({
  limitTableId: z.string(),
  tableName: z.string(),
  engineModel: z.string(),
  tableVersion: z.number().int(),
  itemKey: z.string(),
  label: z.string(),
  kind: z.enum(["journal", "bore"]),
  unit: UnitSchema,
  min: z.number(),
  max: z.number(),
  /** USL − LSL of the new limits, in the table's unit. */
  tolerance: z.number(),
});
export type Characteristic = z.infer<typeof CharacteristicSchema>;

export const StudySummarySchema = z.object({
  id: z.string().uuid(),
  reference: z.string(),
  characteristic: CharacteristicSchema,
  family: z.object({ id: z.string(), name: z.string(), kind: z.string() }),
  tool: z.object({ assetTag: z.string(), description: z.string() }).nullable(),
  parts: z.number().int(),
  appraisers: z.array(PersonRef),
  trials: z.number().int(),
  /** Pooling threshold for the interaction, kept from the shop setting in force at set-up. */
  alpha: z.number(),
  purpose: z.string().nullable(),
  isDemo: z.boolean(),
  createdAt: InstantSchema,
  createdBy: PersonRef.nullable(),
  valuesTaken: z.number().int(),
  valuesNeeded: z.number().int(),
  state: z.enum(["in_progress", "complete"]),
  completedAt: InstantSchema.nullable(),
  verdict: VerdictSchema.nullable(),
  percentGrr: z.number().nullable(),
  ndc: z.number().int().nullable(),
});
export type StudySummary = z.infer<typeof StudySummarySchema>;

const ComponentSchema = z.object({
  key: z.enum(["repeatability", "reproducibility", "appraiser", "interaction", "grr", "part", "total"]),
  variance: z.number(),
  sd: z.number(),
  percentTotalVariation: z.number().nullable(),
  percentContribution: z.number().nullable(),
  percentTolerance: z.number().nullable(),
});
const VerdictResultSchema = z.object({ verdict: VerdictSchema, basis: z.enum(["tolerance", "total_variation"]), percentGrr: z.number().nullable(), reasons: z.array(z.string()) });
const AnovaRowSchema = z.object({ source: z.enum(["part", "appraiser", "interaction", "repeatability", "total"]), df: z.number(), ss: z.number(), ms: z.number().nullable(), f: z.number().nullable(), p: z.number().nullable() });
const ChartPointSchema = z.object({ appraiser: z.number().int(), part: z.number().int(), value: z.number() });

export const StudyAnalysisSchema = z.object({
  unit: UnitSchema,
  tolerance: z.number(),
  anova: z.object({
    method: z.literal("anova"),
    table: z.array(AnovaRowSchema),
    fullTable: z.array(AnovaRowSchema),
    pInteraction: z.number(),
    alpha: z.number(),
    pooled: z.boolean(),
    negativeSetToZero: z.array(z.string()),
    components: z.array(ComponentSchema),
    ndc: z.number().int().nullable(),
    verdict: VerdictResultSchema,
  }),
  averageRange: z.object({
    method: z.literal("average_range"),
    rangeByAppraiser: z.array(z.number()),
    rBarBar: z.number(),
    averageByAppraiser: z.array(z.number()),
    xBarDiff: z.number(),
    partRange: z.number(),
    constants: z.object({ K1: z.number(), K2: z.number(), K3: z.number() }),
    ev: z.number(),
    av: z.number(),
    grr: z.number(),
    pv: z.number(),
    tv: z.number(),
    components: z.array(ComponentSchema),
    ndc: z.number().int().nullable(),
    verdict: VerdictResultSchema,
  }),
  charts: z.object({
    range: z.object({ points: z.array(ChartPointSchema), center: z.number(), ucl: z.number(), lcl: z.number(), beyondLimits: z.array(ChartPointSchema) }),
    average: z.object({ points: z.array(ChartPointSchema), center: z.number(), ucl: z.number(), lcl: z.number(), beyondLimits: z.number().int(), percentBeyond: z.number() }),
    interaction: z.array(z.object({ part: z.number().int(), byAppraiser: z.array(z.number()) })),
  }),
});
export type StudyAnalysis = z.infer<typeof StudyAnalysisSchema>;

export const StudyValueToolSchema = z.object({ assetTag: z.string(), description: z.string(), statusAtReading: z.enum(TOOL_STATUSES), dueAtReading: z.string().nullable() });

export const StudyValueSchema = z.object({
  id: z.string().uuid(),
  appraiser: PersonRef,
  part: z.number().int(),
  partLabel: z.string(),
  trial: z.number().int(),
  position: z.number().int(),
  /** As typed, in the unit of the tool read. */
  value: z.number(),
  unit: UnitSchema,
  tools: z.array(StudyValueToolSchema),
  takenAt: InstantSchema,
  supersedesId: z.string().nullable(),
  supersedeReason: z.string().nullable(),
  supersededById: z.string().nullable(),
});
export type StudyValue = z.infer<typeof StudyValueSchema>;

export const StudyDetailSchema = StudySummarySchema.extend({
  partLabels: z.array(z.string()),
  /** order[appraiser][trial] = part numbers in the order measured. */
  runOrder: z.array(z.array(z.array(z.number().int()))),
  /** Every value, superseded ones too (evidence). */
  values: z.array(StudyValueSchema),
  progress: z.array(z.object({ appraiser: PersonRef, taken: z.number().int(), needed: z.number().int() })),
  analysis: StudyAnalysisSchema.nullable(),
});
export type StudyDetail = z.infer<typeof StudyDetailSchema>;

/** What an appraiser sees on the bench: the next prompt only, never an earlier value (blind). */
export const StudySessionSchema = z.object({
  id: z.string().uuid(),
  reference: z.string(),
  characteristic: CharacteristicSchema,
  family: z.object({ id: z.string(), name: z.string(), kind: z.string() }),
  tool: z.object({ assetTag: z.string(), description: z.string() }).nullable(),
  isDemo: z.boolean(),
  taken: z.number().int(),
  needed: z.number().int(),
  prompt: z.object({ position: z.number().int(), trial: z.number().int(), part: z.number().int(), partLabel: z.string() }).nullable(),
  /** The value just entered, so a typing slip can be corrected at once (its own value, just seen; nothing older). */
  last: z.object({ id: z.string().uuid(), value: z.number(), unit: UnitSchema, partLabel: z.string(), trial: z.number().int(), toolAssetTags: z.array(z.string()) }).nullable(),
  /** The tools used for the last value, offered again. */
  lastToolAssetTags: z.array(z.string()),
});
export type StudySession = z.infer<typeof StudySessionSchema>;

export const RecordStudyValueResultSchema = z.object({ id: z.string().uuid(), taken: z.number().int(), needed: z.number().int(), studyComplete: z.boolean() });
export type RecordStudyValueResult = z.infer<typeof RecordStudyValueResultSchema>;

export const MyStudySchema = z.object({ id: z.string().uuid(), reference: z.string(), characteristicLabel: z.string(), engineModel: z.string(), familyName: z.string(), isDemo: z.boolean(), taken: z.number().int(), needed: z.number().int() });
export type MyStudy = z.infer<typeof MyStudySchema>;

/** The latest finished study of one characteristic with one tool family (the one that counts), and any in progress. */
export const LatestStudySchema = z.object({
  characteristic: z.object({ limitTableId: z.string(), itemKey: z.string(), label: z.string(), engineModel: z.string() }),
  family: z.object({ id: z.string(), name: z.string() }),
  latest: z
    .object({ id: z.string(), reference: z.string(), completedAt: InstantSchema, verdict: VerdictSchema, percentGrr: z.number().nullable(), ndc: z.number().int().nullable(), isDemo: z.boolean() })
    .nullable(),
  inProgress: z.object({ id: z.string(), reference: z.string() }).nullable(),
});
export type LatestStudy = z.infer<typeof LatestStudySchema>;

/** A characteristic of a current limits table with no finished study, or whose latest study is not acceptable. */
export const StudyGapSchema = z.object({
  limitTableId: z.string(),
  tableName: z.string(),
  engineModel: z.string(),
  itemKey: z.string(),
  label: z.string(),
  isDemo: z.boolean(),
  reason: z.enum(["no_study", "not_acceptable"]),
  latest: z.object({ id: z.string(), reference: z.string(), familyName: z.string(), verdict: VerdictSchema, percentGrr: z.number().nullable() }).nullable(),
});
export const StudyGapsSchema = z.object({ items: z.array(StudyGapSchema), total: z.number().int(), noStudy: z.number().int(), notAcceptable: z.number().int() });
export type StudyGaps = z.infer<typeof StudyGapsSchema>;

/** The reading flag a characteristic carries when read with a tool family whose latest study is not acceptable. */
export const STUDY_READING_FLAG = "gauge_study_not_acceptable" as const;

export { VERDICT_LABELS, COMPONENT_LABELS } from "./study-labels";
