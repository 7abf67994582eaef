// Calibration interval review (ILAC-G24 / OIML D 10 methods).
import { addDays } from "../common/dates";

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

/** Cap on lengthening in one review when every tool was found in tolerance (common practice, no source). */
export const DEFAULT_MAX_STEP_FACTOR = 2;

export interface IntervalRecommendation {
  /** Recommended interval to 0.1 day; null when the history cannot support one. */
  recommendedIntervalDays: number | null;
  /** The recommendation rounded down to whole days, the way an interval is set. */
  recommendedWholeDays: number | null;
  method: "exponential_reliability";
  reason: string;
}

/**
 * Interval for a reliability target from the exponential model R(t) = e^(−λt): I_new = I_old · ln(R*) / ln(R_observed)
 * (NCSL RP-1, from memory). Lengthening is capped at maxStepFactor; shortening is not capped.
 */
export function recommendInterval(args: {
  currentIntervalDays: number;
  observed: number;
  target?: number;
  observations: number;
  minObservations?: number;
  maxStepFactor?: number;
}): IntervalRecommendation {
  const target = args.target ?? 0.95;
  const minObservations = args.minObservations ?? 10;
  const maxStep = args.maxStepFactor ?? DEFAULT_MAX_STEP_FACTOR;
  const method = "exponential_reliability" as const;
  const none = (reason: string): IntervalRecommendation => ({ recommendedIntervalDays: null, recommendedWholeDays: null, method, reason });
  if (!(target > 0 && target < 1)) throw new RangeError("The reliability target must lie between 0 and 1");
  if (!(args.observed >= 0 && args.observed <= 1)) throw new RangeError("The observed reliability must lie between 0 and 1");
  if (!(args.currentIntervalDays > 0)) throw new RangeError("The current interval must be positive");

  if (args.observations < minObservations) {
    return none(`Only ${args.observations} end-of-period calibrations on record; at least ${minObservations} are needed before recommending an interval.`);
  }
  if (args.observed === 0) {
    return none("No tool was found in tolerance at the end of its interval; the model cannot set an interval. Review the family and its procedure.");
  }
  const pct = (r: number) => `${(r * 100).toFixed(1)} %`;
  const uncapped = args.observed === 1 ? Infinity : (args.currentIntervalDays * Math.log(target)) / Math.log(args.observed);
  const capped = Math.min(uncapped, args.currentIntervalDays * maxStep);
  const days = Math.round(capped * 10) / 10;
  const reason =
    uncapped > capped
      ? `${pct(args.observed)} found in tolerance (target ${pct(target)}); lengthening is limited to ×${maxStep} per review.`
      : `${pct(args.observed)} found in tolerance against a target of ${pct(target)}: I_new = I_old · ln(R*) / ln(R).`;
  return { recommendedIntervalDays: days, recommendedWholeDays: Math.max(1, Math.floor(capped)), method, reason };
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

/**
 * Straight-line drift of a tool's errors over time (ordinary least squares, x in days from the first point) and the date
 * the line reaches ± MPE; null with fewer than 3 points or all on one instant.
 */
export function driftTrend(
  points: { at: string; error: number }[],
  mpe: number,
): { slopePerDay: number; intercept: number; origin: string; predictedExceedAt: string | null } | null {
  if (points.length < 3) return null;
  const sorted = [...points].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
  const t0 = Date.parse(sorted[0].at);
  const xs = sorted.map((p) => (Date.parse(p.at) - t0) / MS_PER_DAY);
  const ys = sorted.map((p) => p.error);
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  if (sxx === 0) return null;
  const slopePerDay = sxy / sxx;
  const intercept = my - slopePerDay * mx;
  const origin = new Date(t0).toISOString().slice(0, 10);
  let predictedExceedAt: string | null = null;
  if (slopePerDay !== 0) {
    const bound = slopePerDay > 0 ? Math.abs(mpe) : -Math.abs(mpe);
    const x = (bound - intercept) / slopePerDay;
    // Counted in whole calendar days from the first calibration's UTC date; a drift too slow to matter within a century of use predicts nothing.
    if (Number.isFinite(x) && Math.abs(x) <= 36_525) predictedExceedAt = addDays(origin, Math.ceil(x - 1e-9));
  }
  return { slopePerDay, intercept, origin, predictedExceedAt };
}
