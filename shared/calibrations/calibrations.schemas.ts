import { z } from "zod";
import { CalendarDateSchema, InstantSchema, LengthSchema, PageQuerySchema, UnitSchema, optionalText } from "../common/lists.schemas";
import { AS_FOUND_STATEMENTS, DECISION_RULES } from "./decision-rules";
import { LabSchema } from "../labs/labs.schemas";

export const DecisionRuleSchema = z.enum(DECISION_RULES);
export const CALIBRATION_RESULTS = ["pass", "adjusted", "fail", "limited"] as const;
export const CalibrationResultSchema = z.enum(CALIBRATION_RESULTS);
export const CALIBRATION_SOURCES = ["in_house", "outside_lab"] as const;
export const CalibrationSourceSchema = z.enum(CALIBRATION_SOURCES);

export const AsFoundStatementSchema = z.enum(AS_FOUND_STATEMENTS);

/**
 * The release decision in words. They say only whether and how the tool was released, never how it was found:
 * the as-found condition is stated beside them, so the two can never contradict each other.
 */
export const RESULT_LABELS: Record<(typeof CALIBRATION_RESULTS)[number], string> = {
  pass: "Released as found",
  adjusted: "Adjusted, then released",
  fail: "Not released",
  limited: "Released for part of its range",
};

/** One check point as entered: api.md fields, plus the set element it belongs to (a feeler leaf, a gauge block). */
export const CalibrationPointInputSchema = z.object({
  nominal: LengthSchema,
  /** Value of the standard; defaults to the nominal (or the standard's certified value where known). */
  reference: LengthSchema.nullish(),
  asFound: LengthSchema,
  /** Indication after adjustment; only when adjusted. */
  asLeft: LengthSchema.nullish(),
  /** ± permissible error; defaults to the check plan's point or the family's. Zero or less is refused, naming the point. */
  mpe: LengthSchema.nullish(),
  /** Expanded uncertainty U (about 95 %, k = 2 for many degrees of freedom); computed from the budget when absent. */
  uncertainty: LengthSchema.nonnegative().nullish(),
  elementId: z.string().uuid().nullish(),
  /** Repeated as-found readings at the point (two or more): their spread is the Type A repeatability, and as-found is their mean. */
  repeatReadings: z.array(LengthSchema).min(2, "Repeat readings need at least two readings.").max(50).nullish(),
});
export type CalibrationPointInput = z.input<typeof CalibrationPointInputSchema>;

export const LimitedRangeInputSchema = z
  .object({ min: LengthSchema, max: LengthSchema, note: optionalText(300) })
  .refine((r) => r.max >= r.min, { message: "The top of the range is below the bottom.", path: ["max"] });

/** A further contribution to every point's uncertainty budget, stated by the person (e.g. flatness of the faces). */
export const OtherUncertaintySchema = z.object({
  source: z.string().trim().min(1, "Say what the contribution is.").max(120),
  /** Standard uncertainty in the tool's unit. */
  standardUncertainty: LengthSchema.nonnegative(),
  /** Degrees of freedom; absent = infinite. */
  degreesOfFreedom: z.number().positive().nullish(),
});
export type OtherUncertainty = z.infer<typeof OtherUncertaintySchema>;

/** POST /api/tools/:assetTag/calibrations (api.md fields plus source, lab, certificate, limited range, supersession, budget inputs). */
export const CreateCalibrationSchema = z
  .object({
    performedAt: InstantSchema,
    temperatureC: z.number().min(-20).max(60).nullish(),
    /** ± variation of temperature between tool and standard during the calibration, °C (δθ of JCGM 100 H.1). */
    temperatureVariationC: z.number().min(0).max(20).nullish(),
    humidityPct: z.number().min(0).max(100).nullish(),
    standardIds: z.array(z.string().uuid()).max(20).default([]),
    decisionRule: DecisionRuleSchema,
    /** The tool was adjusted: release is then decided on the as-left readings, required at every point. Unstated is refused when an as-left reading differs from its as-found. */
    adjusted: z.boolean().optional(),
    otherUncertainties: z.array(OtherUncertaintySchema).max(10).optional(),
    points: z
      .array(CalibrationPointInputSchema)
      .min(1, "Record at least one check point.")
      .max(200)
      .superRefine((points, ctx) => {
        // ± MPE of zero or less would put the lower limit on or above the upper one.
        points.forEach((p, i) => {
          if (p.mpe != null && !(p.mpe > 0)) {
            ctx.addIssue({ code: "custom", path: [i, "mpe"], message: `Point ${i + 1} (${p.nominal}): the permissible error must be greater than zero (± ${p.mpe} reverses the limits).` });
          }
        });
      }),
    notes: optionalText(2000),
    source: CalibrationSourceSchema.default("in_house"),
    /** The outside lab (source outside_lab). */
    labId: z.string().uuid().nullish(),
    certificateNumber: optionalText(80),
    /** Key answered by POST /api/calibrations/certificate-files (upload the certificate first, then sign the record with it). */
    certificateFileKey: z
      .string()
      .max(300)
      .regex(/^calibration-certificates\//, "Upload the certificate file first.")
      .nullish(),
    /** Name of the person who performed it when not the signed-in user (e.g. the lab's technician). */
    performedByName: optionalText(120),
    /** Released only within this part of the range (result limited). */
    limitedRange: LimitedRangeInputSchema.nullish(),
    /** The record this one corrects; the old record stays, marked superseded. */
    supersedesId: z.string().uuid().nullish(),
    supersedeReason: optionalText(500),
  })
  .refine((c) => !c.supersedesId || !!c.supersedeReason, { message: "Say why the earlier record is corrected.", path: ["supersedeReason"] })
  .refine((c) => c.source === "outside_lab" || c.standardIds.length > 0, {
    message: "Name the reference standards used.",
    path: ["standardIds"],
  })
  .refine((c) => c.source !== "outside_lab" || !!c.labId, { message: "Choose the outside lab.", path: ["labId"] });
export type CreateCalibrationInput = z.input<typeof CreateCalibrationSchema>;
export type CreateCalibration = z.infer<typeof CreateCalibrationSchema>;

/** One row of a point's uncertainty budget, as signed. */
export const BudgetComponentSchema = z.object({
  kind: z.enum(["standard", "standard_grade", "resolution", "repeatability", "temperature_offset", "temperature_variation", "other"]),
  source: z.string(),
  type: z.enum(["A", "B"]),
  distribution: z.enum(["normal", "rectangular", "t"]),
  quantity: z.number(),
  quantityUnit: z.enum(["length", "celsius", "per_kelvin"]),
  divisor: z.number(),
  divisorLabel: z.string(),
  standardUncertainty: z.number(),
  sensitivity: z.number(),
  /** |c_i|·u(x_i) in the tool's unit. */
  contribution: z.number(),
  /** null = infinite. */
  dof: z.number().nullable(),
});

/** A point's uncertainty budget (JCGM 100): rows, u_c, ν_eff, k, U. */
export const UncertaintyBudgetSchema = z.object({
  unit: UnitSchema,
  components: z.array(BudgetComponentSchema),
  combined: z.number(),
  effectiveDof: z.number().nullable(),
  coverageProbability: z.number(),
  k: z.number(),
  /** U = k·u_c before it is stated with two significant digits. */
  expanded: z.number(),
  notes: z.array(z.string()),
});
export type UncertaintyBudgetView = z.infer<typeof UncertaintyBudgetSchema>;

export const ReferencePartSchema = z.object({ standard: z.string(), element: z.string().nullable(), nominal: z.number(), value: z.number(), certified: z.boolean() });

export const CalibrationPointSchema = z.object({
  id: z.string(),
  seq: z.number().int(),
  elementId: z.string().nullable(),
  elementLabel: z.string().nullable(),
  nominal: z.number(),
  reference: z.number(),
  asFound: z.number(),
  asLeft: z.number().nullable(),
  repeatReadings: z.array(z.number()).nullable(),
  errorAsFound: z.number(),
  errorAsLeft: z.number().nullable(),
  mpe: z.number(),
  /** Expanded uncertainty U (about 95 %). */
  uncertainty: z.number().nullable(),
  /** Guard band w of the release rule: 0, U or r·U. */
  guardBand: z.number(),
  /** Largest |error| released: MPE − w. */
  acceptanceLimit: z.number(),
  tur: z.number().nullable(),
  /** TUR at least 4:1 (ANSI/NCSL Z540.3); null when no U. */
  turAdequate: z.boolean().nullable(),
  /** As-found condition: |error as found| ≤ MPE (ILAC-G8 simple acceptance), whatever the release rule. */
  asFoundInTolerance: z.boolean(),
  /** ILAC-G8 non-binary statement of the as-found error with U. */
  asFoundStatement: AsFoundStatementSchema,
  /** Which reading the release verdict was made on. */
  releasedOn: z.enum(["as_found", "as_left"]),
  /** Release verdict under the decision rule. */
  verdict: z.enum(["pass", "fail"]),
  /** The standards (and blocks) the reference was made of. */
  referenceParts: z.array(ReferencePartSchema),
  /** The budget U came from; null when U was entered or the record predates budgets. */
  budget: UncertaintyBudgetSchema.nullable(),
});
export type CalibrationPoint = z.infer<typeof CalibrationPointSchema>;

export const CalibrationReviewSchema = z.object({
  id: z.string(),
  reviewedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  reviewedAt: z.string(),
  accepted: z.boolean(),
  findings: z.string(),
});

export const CalibrationSchema = z.object({
  id: z.string(),
  toolId: z.string(),
  assetTag: z.string(),
  unit: UnitSchema,
  performedAt: z.string(),
  performedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  performedByName: z.string().nullable(),
  source: CalibrationSourceSchema,
  lab: z.object({ id: z.string(), name: z.string() }).nullable(),
  certificateNumber: z.string().nullable(),
  hasCertificateFile: z.boolean(),
  /** GET this path for the certificate file when hasCertificateFile. */
  certificateFileUrl: z.string().nullable(),
  temperatureC: z.number().nullable(),
  humidityPct: z.number().nullable(),
  temperatureVariationC: z.number().nullable(),
  decisionRule: DecisionRuleSchema,
  /** r of the rule guarded_scaled, as it was when signed; 1 for guarded, 0 for simple. */
  guardBandMultiplier: z.number(),
  /** The record says an adjustment was made. */
  adjusted: z.boolean(),
  /** Release decision (api.md): pass, adjusted, fail (not released: do not use), limited. */
  result: CalibrationResultSchema,
  /** As-found condition (ILAC-G8 simple acceptance): what opens an investigation and what interval analysis counts. */
  asFoundInTolerance: z.boolean(),
  /** The worst ILAC-G8 non-binary statement over the as-found points. */
  asFoundStatement: AsFoundStatementSchema,
  otherUncertainties: z.array(OtherUncertaintySchema),
  intervalDays: z.number().int(),
  nextDueAt: CalendarDateSchema,
  limitedRange: z.object({ min: z.number(), max: z.number(), note: z.string().nullable() }).nullable(),
  notes: z.string().nullable(),
  supersedesId: z.string().nullable(),
  supersedeReason: z.string().nullable(),
  /** The record that corrects this one; a superseded record no longer counts. */
  supersededById: z.string().nullable(),
  standards: z.array(z.object({ id: z.string(), assetTag: z.string(), name: z.string() })),
  points: z.array(CalibrationPointSchema),
  /** Any point with a TUR under 4:1 (ANSI/NCSL Z540.3). */
  turWarning: z.boolean(),
  /** Outside-lab record: the certificate review, once recorded. */
  review: CalibrationReviewSchema.nullable(),
  /** Outside-lab record still awaiting its certificate review (does not count yet). */
  awaitingReview: z.boolean(),
  /** Investigation opened by an as-found failure in this record, when one was. */
  investigationId: z.string().nullable().optional(),
  createdAt: z.string(),
});
export type Calibration = z.infer<typeof CalibrationSchema>;

/** Answer of POST /api/calibrations/certificate-files. */
export const UploadedFileSchema = z.object({ fileKey: z.string(), fileName: z.string(), contentType: z.string(), size: z.number().int() });
export type UploadedFile = z.infer<typeof UploadedFileSchema>;

export const CalibrationListQuerySchema = PageQuerySchema.extend({
  includeSuperseded: z.enum(["true", "false"]).transform((v) => v === "true").default(true),
});
export type CalibrationListQuery = z.infer<typeof CalibrationListQuerySchema>;

/** POST /api/calibrations/:id/review: the certificate review of an outside-lab record. */
export const CertificateReviewSchema = z.object({
  accepted: z.boolean(),
  findings: z.string().trim().min(3, "Write what the review found.").max(2000),
});
export type CertificateReview = z.infer<typeof CertificateReviewSchema>;

/** POST /api/tools/:assetTag/checks (api.md): an intermediate (pre-use) check against a check block or setting standard. */
export const CreateCheckSchema = z.object({
  nominal: LengthSchema,
  reading: LengthSchema,
  standardId: z.string().uuid().nullish(),
  note: optionalText(500),
});
export type CreateCheckInput = z.input<typeof CreateCheckSchema>;
export type CreateCheck = z.infer<typeof CreateCheckSchema>;

export const CheckSchema = z.object({
  id: z.string(),
  performedAt: z.string(),
  performedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  standard: z.object({ id: z.string(), assetTag: z.string(), name: z.string() }).nullable(),
  nominal: z.number(),
  reading: z.number(),
  /** reading − nominal, exactly. */
  deviation: z.number(),
  /** ± check tolerance of the family (its MPE when none is set). */
  tolerance: z.number(),
  passed: z.boolean(),
  context: z.enum(["pre_use", "return_zero_check", "found_check"]),
  note: z.string().nullable(),
});
export type Check = z.infer<typeof CheckSchema>;

/** Answer of POST …/checks: api.md's { passed, deviation } with the record and the tool's status afterwards. */
export const CheckResultSchema = CheckSchema.extend({
  toolStatus: z.string(),
  usable: z.boolean(),
  investigationId: z.string().nullable(),
});
export type CheckResult = z.infer<typeof CheckResultSchema>;

/** GET /api/tools/:assetTag/chain: tool → calibration → standards → certificates → lab and accreditation → national institute. */
export const ChainLabSchema = LabSchema.omit({ contact: true, createdAt: true });
export const ChainSchema = z.object({
  tool: z.object({ assetTag: z.string(), description: z.string(), serialNumber: z.string(), unit: UnitSchema }),
  /** The calibration that counts now (null when none). */
  calibration: z
    .object({
      id: z.string(),
      performedAt: z.string(),
      result: CalibrationResultSchema,
      source: CalibrationSourceSchema,
      certificateNumber: z.string().nullable(),
      nextDueAt: CalendarDateSchema,
      lab: ChainLabSchema.nullable(),
      hasCertificateFile: z.boolean(),
      certificateFileUrl: z.string().nullable(),
    })
    .nullable(),
  standards: z.array(
    z.object({
      id: z.string(),
      assetTag: z.string(),
      name: z.string(),
      kind: z.string(),
      /** The standard's unit: its certificate's U is stated in it. */
      unit: UnitSchema,
      /** The certificate that covered the calibration date, when one did. */
      certificate: z
        .object({
          id: z.string(),
          number: z.string(),
          labName: z.string(),
          issuedAt: CalendarDateSchema,
          dueAt: CalendarDateSchema,
          expandedUncertainty: z.number(),
          coverageFactor: z.number(),
          accreditationBody: z.string().nullable(),
          scope: z.string().nullable(),
          nationalInstitute: z.string().nullable(),
          hasFile: z.boolean(),
          fileUrl: z.string().nullable(),
          lab: ChainLabSchema.nullable(),
        })
        .nullable(),
    }),
  ),
  /** Links missing from the chain, in words (e.g. "GBS-01's certificate names no national measurement institute"). */
  gaps: z.array(z.string()),
});
export type Chain = z.infer<typeof ChainSchema>;

/** GET /api/tools/:assetTag/chain?calibrationId=: the chain of one calibration (default: the one that counts now). */
export const ChainQuerySchema = z.object({ calibrationId: z.string().uuid().optional() });

export const CheckListQuerySchema = PageQuerySchema;

/** GET /api/calibrations/conditional-results: as-found points within U of a limit, listed for the quality manager's review (ILAC-G8 non-binary statements). */
export const ConditionalResultsQuerySchema = PageQuerySchema.extend({
  statement: z.enum(["conditional_pass", "conditional_fail"]).optional(),
  toolAssetTag: optionalText(80),
  /** Only each tool's latest calibration (default), or every record that still counts. */
  current: z.enum(["true", "false"]).transform((v) => v === "true").default(true),
});
export type ConditionalResultsQuery = z.infer<typeof ConditionalResultsQuerySchema>;

export const ConditionalResultSchema = z.object({
  calibrationId: z.string(),
  pointId: z.string(),
  assetTag: z.string(),
  toolDescription: z.string(),
  unit: UnitSchema,
  performedAt: z.string(),
  seq: z.number().int(),
  nominal: z.number(),
  elementLabel: z.string().nullable(),
  errorAsFound: z.number(),
  mpe: z.number(),
  uncertainty: z.number().nullable(),
  asFoundStatement: AsFoundStatementSchema,
  result: CalibrationResultSchema,
});
export type ConditionalResult = z.infer<typeof ConditionalResultSchema>;
