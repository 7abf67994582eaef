// Re-judging readings taken with a tool later found out of tolerance (product.md, capability 5).
import { Decimal, dec, num } from "../common/decimal";
import { judgeAgainstLimits, type LimitJudgement, type Limits } from "../inspection/sizes";

type Verdict = LimitJudgement["verdict"];

export interface RejudgeInput {
  /** The size or clearance as it was judged. */
  measured: number;
  limits: { min?: number | null; max?: number | null; serviceableMin?: number | null; serviceableMax?: number | null };
  /** Indication − reference of the tool at the relevant point; null when unknown (a lost tool). */
  errorFound: number | null;
  /** Expanded uncertainty U of the finding; default 0. */
  uncertainty?: number;
  /** +1 when the tool measured the quantity directly (a size, or the bore side of a clearance); −1 for the journal side of a clearance. */
  effect: 1 | -1;
}

export interface RejudgeResult {
  originalVerdict: Verdict;
  originalBand: LimitJudgement["band"];
  correctedValue: number | null;
  correctedVerdict: Verdict | null;
  correctedBand: LimitJudgement["band"] | null;
  /** The span the true value lies in, corrected value ± U; null when the error is unknown. */
  correctedRange: { low: number; high: number } | null;
  marginBefore: number;
  marginAfter: number | null;
  verdictCouldChange: boolean;
  basis: string;
}

/** Re-judge one reading with the error found on its tool: true value ≈ measured − effect·error, examined over ± U. */
export function rejudgeReading(input: RejudgeInput): RejudgeResult {
  const limits: Limits = input.limits;
  const original = judgeAgainstLimits({ value: input.measured, ...limits });
  const measured = dec(input.measured);
  if (input.errorFound == null) {
    return {
      originalVerdict: original.verdict,
      originalBand: original.band,
      correctedValue: null,
      correctedVerdict: null,
      correctedBand: null,
      correctedRange: null,
      marginBefore: original.marginToNearestLimit,
      marginAfter: null,
      verdictCouldChange: true,
      basis: `The tool's error is unknown, so the reading of ${measured.toString()} cannot be corrected; its verdict could have been different.`,
    };
  }
  const error = dec(input.errorFound);
  const U = dec(Math.abs(input.uncertainty ?? 0));
  // A tool reading large makes a size (or the bore side of a clearance) read large, and the journal side read a clearance small.
  const corrected = measured.minus(error.times(input.effect));
  const judged = judgeAgainstLimits({ value: corrected, ...limits });
  const low = corrected.minus(U);
  const high = corrected.plus(U);
  const couldChange = spanReachesOtherVerdict(original.verdict, low, high, original.decidingLimits);

  const side = input.effect === 1 ? "the measured value" : "the clearance (the tool measured the journal side)";
  const span = U.isZero() ? `${corrected.toString()}` : `${low.toString()} to ${high.toString()} (${corrected.toString()} ± ${U.toString()})`;
  const basis =
    `The tool's error was ${signed(error)}, so ${side} was off by ${signed(error.times(input.effect))}: ` +
    `the true value is about ${span}. ` +
    (couldChange
      ? `That crosses a limit, so the verdict "${words(original.verdict)}" could have been different.`
      : `The verdict "${words(original.verdict)}" holds over that whole span.`);

  return {
    originalVerdict: original.verdict,
    originalBand: original.band,
    correctedValue: num(corrected),
    correctedVerdict: judged.verdict,
    correctedBand: judged.band,
    correctedRange: { low: num(low), high: num(high) },
    marginBefore: original.marginToNearestLimit,
    marginAfter: judged.marginToNearestLimit,
    verdictCouldChange: couldChange,
    basis,
  };
}

function spanReachesOtherVerdict(original: Verdict, low: Decimal, high: Decimal, lim: { min: number | null; max: number | null }): boolean {
  const min = lim.min == null ? null : dec(lim.min);
  const max = lim.max == null ? null : dec(lim.max);
  // The accepted zone is one interval: a "within" verdict could change when either end leaves it,
  // an "outside" verdict when any part of the span overlaps it (the span may straddle the whole zone).
  if (original === "within_limits") return (min != null && low.lt(min)) || (max != null && high.gt(max));
  return (max == null || low.lte(max)) && (min == null || high.gte(min));
}

function signed(d: Decimal): string {
  return d.isPositive() && !d.isZero() ? `+${d.toString()}` : d.toString();
}

function words(v: Verdict): string {
  return v === "within_limits" ? "within limits" : "outside limits";
}

/** The error found at the check point nearest to a size (ties go to the larger error); null without points. */
export function errorAtNearestPoint(points: { nominal: number; errorAsFound: number }[], size: number): { error: number; nominal: number } | null {
  let best: { nominal: number; errorAsFound: number; distance: Decimal } | null = null;
  for (const p of points) {
    const distance = dec(p.nominal).minus(dec(size)).abs();
    const closer = best == null || distance.lt(best.distance);
    const tieButWorse = best != null && distance.equals(best.distance) && Math.abs(p.errorAsFound) > Math.abs(best.errorAsFound);
    if (closer || tieButWorse) best = { ...p, distance };
  }
  return best && { error: best.errorAsFound, nominal: best.nominal };
}

/** The largest error found at any point, by absolute value with its sign kept: a conservative bound; null without points. */
export function largestError(points: { nominal?: number; errorAsFound: number }[]): number | null {
  let worst: number | null = null;
  for (const p of points) if (worst == null || Math.abs(p.errorAsFound) > Math.abs(worst)) worst = p.errorAsFound;
  return worst;
}
