// Calibration interval review (ILAC-G24 / OIML D 10 methods; NCSL RP-1 interval test) and drift of a tool's errors.
import jStat from "jstat";
import { addDays } from "../common/dates";
import { coverageFactor, COVERAGE_PROBABILITY } from "../calibrations/uncertainty";

/** End-of-period reliability: share of recalibrations found in tolerance as found; first calibrations are not end-of-period observations. */
export function endOfPeriodReliability(observations: { asFoundInTolerance: boolean; isFirst: boolean }[]): {
  reliability: number | null;
  inTolerance: number;
  observations: number;
} {
  const endOfPeriod = observations.filter((o) => !o.isFirst);
  const inTolerance = endOfPeriod.filter((o) => o.asFoundInTolerance).length;
  return { reliability: endOfPeriod.length === 0 ? null : inTolerance / endOfPeriod.length, inTolerance, observations: endOfPeriod.length };
}

/**
 * Two-sided Clopper-Pearson (exact binomial) confidence interval of a proportion x/n at the given confidence:
 * lower = B(α/2; x, n − x + 1), upper = B(1 − α/2; x + 1, n − x), with 0 and 1 at the ends (beta quantiles from jstat).
 */
export function clopperPearson(x: number, n: number, confidence = 0.95): { lower: number; upper: number } {
  if (!Number.isInteger(x) || !Number.isInteger(n) || n < 1 || x < 0 || x > n) throw new RangeError("x and n must be whole numbers with 0 ≤ x ≤ n and n ≥ 1");
  if (!(confidence > 0 && confidence < 1)) throw new RangeError("The confidence must lie between 0 and 1");
  const alpha = 1 - confidence;
  const lower = x === 0 ? 0 : jStat.beta.inv(alpha / 2, x, n - x + 1);
  const upper = x === n ? 1 : jStat.beta.inv(1 - alpha / 2, x + 1, n - x);
  return { lower, upper };
}

/** Cap on lengthening in one review (common practice, no source); the shop's setting overrides it. */
export const DEFAULT_MAX_STEP_FACTOR = 2;

export type IntervalDecision = "keep" | "shorten" | "lengthen" | "none";

export interface IntervalRecommendation {
  /** keep: the target lies inside the observed rate's interval; shorten/lengthen: it lies outside; none: no basis yet. */
  decision: IntervalDecision;
  /** Recommended interval to 0.1 day; the current interval when kept; null when the history cannot support one. */
  recommendedIntervalDays: number | null;
  /** The recommendation rounded down to whole days, the way an interval is set. */
  recommendedWholeDays: number | null;
  /** The observed rate's Clopper-Pearson interval; null with no observation. */
  confidenceInterval: { lower: number; upper: number } | null;
  confidence: number;
  method: "exponential_reliability";
  reason: string;
}

const pct = (r: number) => `${(r * 100).toFixed(1)} %`;

/**
 * NCSL RP-1 method A3 (from memory): the interval changes only when the target reliability R* lies outside the
 * two-sided Clopper-Pearson interval of the observed end-of-period rate; the change is then sized by the exponential
 * model R(t) = e^(−λt), I_new = I_old · ln(R*) / ln(R_observed) (NCSL RP-1, from memory). Lengthening is capped at
 * maxStepFactor per review and needs at least minObservations recalibrations (common practice, no source);
 * shortening is neither capped nor held back (the safe side).
 */
export function recommendInterval(args: {
  /** The interval the observations were made under (I_old). */
  observedIntervalDays: number;
  /** The family's interval now: what "keep" keeps. Defaults to I_old. */
  currentIntervalDays?: number;
  inTolerance: number;
  observations: number;
  target?: number;
  confidence?: number;
  minObservations?: number;
  maxStepFactor?: number;
}): IntervalRecommendation {
  const target = args.target ?? 0.95;
  const confidence = args.confidence ?? 0.95;
  const minObservations = args.minObservations ?? 10;
  const maxStep = args.maxStepFactor ?? DEFAULT_MAX_STEP_FACTOR;
  const iOld = args.observedIntervalDays;
  const current = args.currentIntervalDays ?? iOld;
  const method = "exponential_reliability" as const;
  if (!(target > 0 && target < 1)) throw new RangeError("The reliability target must lie between 0 and 1");
  if (!(iOld > 0) || !(current > 0)) throw new RangeError("The interval must be positive");
  const n = args.observations;
  const x = args.inTolerance;
  if (n === 0) {
    return { decision: "none", recommendedIntervalDays: null, recommendedWholeDays: null, confidenceInterval: null, confidence, method, reason: "No end-of-period calibration on record yet: a tool's first calibration says nothing about how it keeps its tolerance over an interval." };
  }
  const ci = clopperPearson(x, n, confidence);
  const observed = x / n;
  const conf = `${Math.round(confidence * 1000) / 10} %`;
  const stated = `${x} of ${n} found in tolerance (${pct(observed)}); its ${conf} Clopper-Pearson interval is ${pct(ci.lower)} – ${pct(ci.upper)}`;
  const base = { confidenceInterval: ci, confidence, method };

  if (target >= ci.lower && target <= ci.upper) {
    return {
      ...base,
      decision: "keep",
      recommendedIntervalDays: current,
      recommendedWholeDays: Math.floor(current),
      reason: `Keep ${current} days: ${stated}, which holds the target ${pct(target)}, so the history is no significant evidence against the interval (NCSL RP-1 method A3).`,
    };
  }
  if (target > ci.upper) {
    // Found in tolerance significantly less often than the target: shorten by the model, at once and in full.
    if (observed === 0) {
      return { ...base, decision: "shorten", recommendedIntervalDays: null, recommendedWholeDays: null, reason: `Shorten: ${stated}, below the target ${pct(target)}. No tool was found in tolerance, so the model cannot size the interval: review the family and its procedure.` };
    }
    const days = (iOld * Math.log(target)) / Math.log(observed);
    const shown = Math.round(days * 10) / 10;
    return {
      ...base,
      decision: "shorten",
      recommendedIntervalDays: shown,
      recommendedWholeDays: Math.max(1, Math.floor(days)),
      reason: `Shorten to ${shown} days: ${stated}, entirely below the target ${pct(target)} (NCSL RP-1 method A3); I_new = I_old · ln(R*) / ln(R) = ${iOld} · ln ${target} / ln ${Math.round(observed * 1000) / 1000}.`,
    };
  }
  if (n < minObservations) {
    return { ...base, decision: "keep", recommendedIntervalDays: current, recommendedWholeDays: Math.floor(current), reason: `Keep ${current} days for now: ${stated}, above the target ${pct(target)}, but lengthening waits for at least ${minObservations} end-of-period calibrations (shop rule).` };
  }
  const uncapped = observed === 1 ? Infinity : (iOld * Math.log(target)) / Math.log(observed);
  const capped = Math.min(uncapped, current * maxStep);
  const shown = Math.round(capped * 10) / 10;
  return {
    ...base,
    decision: "lengthen",
    recommendedIntervalDays: shown,
    recommendedWholeDays: Math.max(1, Math.floor(capped)),
    reason:
      uncapped > capped
        ? `Lengthen to ${shown} days: ${stated}, entirely above the target ${pct(target)} (NCSL RP-1 method A3); lengthening is limited to ×${maxStep} per review.`
        : `Lengthen to ${shown} days: ${stated}, entirely above the target ${pct(target)} (NCSL RP-1 method A3); I_new = I_old · ln(R*) / ln(R).`,
  };
}

/** Staircase (automatic adjustment, ILAC-G24 method 1): lengthen after an in-tolerance finding, shorten after one out (factors: common practice, no source). */
export function staircaseSuggestion(args: {
  currentIntervalDays: number;
  lastAsFoundInTolerance: boolean;
  lengthenFactor?: number;
  shortenFactor?: number;
}): { suggestedIntervalDays: number; direction: "lengthen" | "shorten"; method: "staircase"; reason: string } {
  const lengthen = args.lengthenFactor ?? 1.1;
  const shorten = args.shortenFactor ?? 0.75;
  const factor = args.lastAsFoundInTolerance ? lengthen : shorten;
  // Rounded down: a shorter interval errs on the safe side.
  const suggested = Math.max(1, Math.floor(args.currentIntervalDays * factor));
  return {
    suggestedIntervalDays: suggested,
    direction: args.lastAsFoundInTolerance ? "lengthen" : "shorten",
    method: "staircase",
    reason: args.lastAsFoundInTolerance
      ? `Found in tolerance at the last calibration: lengthen by ×${lengthen} to ${suggested} days.`
      : `Found out of tolerance at the last calibration: shorten by ×${shorten} to ${suggested} days.`,
  };
}

const MS_PER_DAY = 86_400_000;

/** One calibration of a check point, as drift reads it: its as-found error and, when it was adjusted, its as-left error. */
export interface DriftCalibration {
  at: string;
  errorAsFound: number;
  /** Error as left after an adjustment; null when left as found. */
  errorAsLeft: number | null;
}

/** The drift over one interval: from a calibration's as-left error to the next calibration's as-found error. */
export interface DriftInterval {
  from: string;
  to: string;
  days: number;
  startError: number;
  endError: number;
  ratePerDay: number;
}

export type DriftOutlook = "insufficient" | "already_out" | "no_trend" | "beyond_two_intervals" | "may_have_left" | "predicted";

export interface DriftTrend {
  intervals: DriftInterval[];
  /** Drift rate per day: least squares through the origin of each interval's change against its length. */
  ratePerDay: number | null;
  /** Standard uncertainty of the rate (from the scatter of the intervals; needs two or more). */
  rateUncertaintyPerDay: number | null;
  /** k = t(ν = intervals − 1) for about 95 % (GUM G.3), applied to the rate's uncertainty. */
  k: number | null;
  /** The last calibration and the error it left the tool with: where the prediction starts. */
  startAt: string | null;
  startError: number | null;
  /** Two intervals after the last calibration: how far ahead a prediction is made. */
  horizonAt: string | null;
  /** Calendar date the fitted line reaches ± MPE; the earliest such date allowing for the rate's uncertainty. */
  predictedExceedAt: string | null;
  earliestExceedAt: string | null;
  outlook: DriftOutlook;
}

/**
 * Drift of one check point: measured from each as-left error to the next as-found error (the drift over one interval),
 * never across an adjustment; the rate is fitted through the origin, its uncertainty taken from the intervals' scatter,
 * and the prediction starts from the last as-left error. A date is given only within two intervals of the last calibration.
 * Dates are calendar dates in UTC, from instants.
 */
export function driftTrend(calibrations: DriftCalibration[], mpe: number, intervalDays: number, now: Date | string): DriftTrend {
  const sorted = [...calibrations].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
  const intervals: DriftInterval[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const prev = sorted[i - 1];
    const days = (Date.parse(sorted[i].at) - Date.parse(prev.at)) / MS_PER_DAY;
    if (days <= 0) continue;
    const startError = prev.errorAsLeft ?? prev.errorAsFound;
    intervals.push({ from: prev.at, to: sorted[i].at, days, startError, endError: sorted[i].errorAsFound, ratePerDay: (sorted[i].errorAsFound - startError) / days });
  }
  const last = sorted[sorted.length - 1];
  const empty: DriftTrend = { intervals, ratePerDay: null, rateUncertaintyPerDay: null, k: null, startAt: last?.at ?? null, startError: last ? (last.errorAsLeft ?? last.errorAsFound) : null, horizonAt: null, predictedExceedAt: null, earliestExceedAt: null, outlook: "insufficient" };
  if (intervals.length < 2) return empty;

  const sxx = intervals.reduce((a, iv) => a + iv.days ** 2, 0);
  const sxy = intervals.reduce((a, iv) => a + iv.days * (iv.endError - iv.startError), 0);
  const rate = sxy / sxx;
  const residual = intervals.reduce((a, iv) => a + (iv.endError - iv.startError - rate * iv.days) ** 2, 0);
  const dof = intervals.length - 1;
  const uRate = Math.sqrt(residual / dof / sxx);
  const k = coverageFactor(dof, COVERAGE_PROBABILITY);
  const start = empty.startError!;
  const startDay = last.at.slice(0, 10);
  const horizonDays = 2 * intervalDays;
  const horizonAt = addDays(startDay, horizonDays);
  const limit = Math.abs(mpe);
  const base = { ...empty, ratePerDay: rate, rateUncertaintyPerDay: uRate, k, horizonAt };
  if (Math.abs(start) > limit) return { ...base, outlook: "already_out" };

  // Days from the last calibration until a line from the last as-left error at this rate reaches ± MPE.
  const daysToLimit = (r: number) => (r === 0 ? Infinity : ((r > 0 ? limit : -limit) - start) / r);
  const central = daysToLimit(rate);
  // Allowing for the rate's uncertainty, the steepest credible drift in either direction.
  const steep = [rate + k * uRate, rate - k * uRate].map(daysToLimit);
  const earliest = Math.min(...steep, central);
  const toDate = (d: number) => addDays(startDay, Math.ceil(d - 1e-9));
  const predictedExceedAt = central <= horizonDays ? toDate(central) : null;
  const earliestExceedAt = earliest <= horizonDays ? toDate(earliest) : null;
  // The outlook follows the fitted rate; the earliest date allowing for its uncertainty is told beside it, never instead of it.
  if (!predictedExceedAt) return { ...base, earliestExceedAt, outlook: rate === 0 && uRate === 0 ? "no_trend" : "beyond_two_intervals" };
  const today = (typeof now === "string" ? new Date(now) : now).toISOString().slice(0, 10);
  const outlook: DriftOutlook = predictedExceedAt <= today ? "may_have_left" : "predicted";
  return { ...base, predictedExceedAt, earliestExceedAt, outlook };
}
