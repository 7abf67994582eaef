import { z } from "zod";
import { CalendarDateSchema } from "../common/lists.schemas";

/** One calibration as an interval-review observation. */
export const IntervalObservationSchema = z.object({
  calibrationId: z.string(),
  assetTag: z.string(),
  performedAt: z.string(),
  asFoundInTolerance: z.boolean(),
  /** A tool's first calibration (or an imported history record) is not an end-of-period observation. */
  endOfPeriod: z.boolean(),
  intervalDays: z.number().int(),
  imported: z.boolean(),
});
export type IntervalObservation = z.infer<typeof IntervalObservationSchema>;

export const StaircaseSchema = z.object({
  suggestedIntervalDays: z.number().int(),
  direction: z.enum(["lengthen", "shorten"]),
  method: z.literal("staircase"),
  reason: z.string(),
});

export const IntervalDecisionSchema = z.object({
  id: z.string(),
  decidedAt: z.string(),
  decidedBy: z.string(),
  decidedByName: z.string(),
  previousIntervalDays: z.number().int(),
  newIntervalDays: z.number().int(),
  method: z.string(),
  rationale: z.string(),
});
export type IntervalDecision = z.infer<typeof IntervalDecisionSchema>;

/**
 * GET /api/families/:id/interval-analysis (api.md fields first). `calibrations` is the number of end-of-period
 * calibrations the rate rests on; `asFoundInToleranceRate` is null with none.
 */
export const IntervalDecisionKindSchema = z.enum(["keep", "shorten", "lengthen", "none"]);

export const IntervalAnalysisSchema = z.object({
  calibrations: z.number().int(),
  asFoundInToleranceRate: z.number().nullable(),
  currentIntervalDays: z.number().int(),
  /** The current interval when the test keeps it; the model's interval when it changes; null with no basis. */
  recommendedIntervalDays: z.number().nullable(),
  method: z.literal("exponential_reliability"),
  reliabilityTarget: z.number(),
  /** NCSL RP-1 method A3: keep unless the target lies outside the observed rate's Clopper-Pearson interval. */
  decision: IntervalDecisionKindSchema,
  /** Two-sided Clopper-Pearson interval of the observed rate at `confidence`; null with no observation. */
  confidenceInterval: z.object({ lower: z.number(), upper: z.number() }).nullable(),
  confidence: z.number(),
  familyId: z.string(),
  familyName: z.string(),
  /** The interval the end-of-period observations were made under (I_old of the model; their mean when tools differed). */
  observedIntervalDays: z.number(),
  inTolerance: z.number().int(),
  totalCalibrations: z.number().int(),
  recommendedWholeDays: z.number().int().nullable(),
  reason: z.string(),
  minObservations: z.number().int(),
  maxStepFactor: z.number(),
  staircase: StaircaseSchema.nullable(),
  observations: z.array(IntervalObservationSchema),
  decisions: z.array(IntervalDecisionSchema),
});
export type IntervalAnalysis = z.infer<typeof IntervalAnalysisSchema>;

export const INTERVAL_METHODS = ["exponential_reliability", "staircase", "engineering_judgement"] as const;

/** POST /api/families/:id/interval-decisions: the interval chosen and why. */
export const ApplyIntervalSchema = z.object({
  newIntervalDays: z.number().int("An interval is a whole number of days.").min(1, "An interval is at least one day.").max(3650, "An interval longer than ten years is not credible."),
  rationale: z.string().trim().min(10, "Say in a sentence why the interval changes (at least 10 characters).").max(2000),
  method: z.enum(INTERVAL_METHODS).optional(),
});
export type ApplyIntervalInput = z.infer<typeof ApplyIntervalSchema>;

export const ApplyIntervalResultSchema = z.object({
  decision: IntervalDecisionSchema,
  familyId: z.string(),
  toolsChanged: z.number().int(),
});

/** A family in the interval review list. */
export const IntervalFamilySchema = z.object({
  familyId: z.string(),
  name: z.string(),
  kind: z.string(),
  currentIntervalDays: z.number().int(),
  tools: z.number().int(),
  recalibrations: z.number().int(),
  inTolerance: z.number().int(),
  rate: z.number().nullable(),
  /** The rate's Clopper-Pearson interval at the shop's confidence. */
  confidenceInterval: z.object({ lower: z.number(), upper: z.number() }).nullable(),
  reliabilityTarget: z.number(),
  decision: IntervalDecisionKindSchema,
  recommendedIntervalDays: z.number().nullable(),
  reason: z.string(),
  lastDecisionAt: z.string().nullable(),
});
export type IntervalFamily = z.infer<typeof IntervalFamilySchema>;

export const DriftPointSchema = z.object({
  calibrationId: z.string(),
  performedAt: z.string(),
  errorAsFound: z.number(),
  /** Error as left after an adjustment; null when the tool was left as found. */
  errorAsLeft: z.number().nullable(),
  adjusted: z.boolean(),
  mpe: z.number(),
  asFoundInTolerance: z.boolean(),
});

/** The drift over one interval: from a calibration's as-left error to the next as-found error. */
export const DriftIntervalSchema = z.object({ from: z.string(), to: z.string(), days: z.number(), startError: z.number(), endError: z.number(), ratePerDay: z.number() });

export const DriftSeriesSchema = z.object({
  key: z.string(),
  nominal: z.number(),
  element: z.string().nullable(),
  mpe: z.number(),
  points: z.array(DriftPointSchema),
  intervals: z.array(DriftIntervalSchema),
  trend: z
    .object({
      ratePerDay: z.number(),
      /** Standard uncertainty of the rate; the band on the chart is ± k of it. */
      rateUncertaintyPerDay: z.number(),
      k: z.number(),
      startAt: z.string(),
      startError: z.number(),
      horizonAt: CalendarDateSchema,
      predictedExceedAt: CalendarDateSchema.nullable(),
      earliestExceedAt: CalendarDateSchema.nullable(),
    })
    .nullable(),
  outlook: z.enum(["insufficient", "already_out", "no_trend", "beyond_two_intervals", "may_have_left", "predicted"]),
  /** True when the point may leave tolerance on or before the tool's next due date (or already may have). */
  flagged: z.boolean(),
  message: z.string(),
});
export type DriftSeries = z.infer<typeof DriftSeriesSchema>;

/** GET /api/tools/:assetTag/drift. */
export const DriftSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  unit: z.enum(["in", "mm"]),
  dueAt: CalendarDateSchema.nullable(),
  series: z.array(DriftSeriesSchema),
  flagged: z.boolean(),
});
export type Drift = z.infer<typeof DriftSchema>;
