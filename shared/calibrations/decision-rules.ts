import jStat from "jstat";
import { dec, num, type DecimalLike } from "../common/decimal";

/** simple: accept within ± MPE (ILAC-G8 §4.2.1); guarded: accept within ± (MPE − U) (ILAC-G8 §4.2.2, w = U). */
export type DecisionRule = "simple" | "guarded";

export const DECISION_RULES = ["simple", "guarded"] as const satisfies readonly DecisionRule[];

/** The rules in plain trade words, wherever a page or a record names them. */
export const DECISION_RULE_LABELS: Record<DecisionRule, string> = {
  simple: "Simple acceptance: pass when the error is within ± MPE",
  guarded: "Guarded acceptance: pass when the error is within ± (MPE − U)",
};

/** Z540.3 §5.3 b: a TUR of at least 4 where false-accept risk is not computed. */
export const MINIMUM_TUR = 4;

export interface JudgePointInput {
  nominal: DecimalLike;
  /** Value of the standard; defaults to the nominal. */
  reference?: DecimalLike | null;
  asFound: DecimalLike;
  asLeft?: DecimalLike | null;
  /** Maximum permissible error, a positive half-width (± mpe). */
  mpe: DecimalLike;
  /** Expanded uncertainty U (k = 2) of the point; required for the guarded rule. */
  uncertainty: number | null;
  rule: DecisionRule;
}

export interface JudgedPoint {
  nominal: number;
  reference: number;
  mpe: number;
  rule: DecisionRule;
  errorAsFound: number;
  errorAsLeft: number | null;
  asFoundInTolerance: boolean;
  asLeftInTolerance: boolean | null;
  verdict: "pass" | "fail";
  /** The largest |error| accepted under the rule: MPE, or MPE − U when guarded (negative when U exceeds MPE: nothing can pass). */
  acceptanceLimit: number;
  tur: number | null;
  turAdequate: boolean | null;
}

/** Thrown when a rule cannot be applied to the data given. */
export class DecisionRuleError extends Error {
  constructor(
    readonly code: "uncertainty_required" | "no_points" | "invalid_mpe",
    message: string,
  ) {
    super(message);
    this.name = "DecisionRuleError";
  }
}

/** Judge one calibration check point: error = indication − reference, exactly, against the decision rule. */
export function judgePoint(input: JudgePointInput): JudgedPoint {
  const reference = dec(input.reference ?? input.nominal);
  const mpe = dec(input.mpe);
  if (mpe.isNegative() || mpe.isZero()) throw new DecisionRuleError("invalid_mpe", "The permissible error must be greater than zero");
  if (input.rule === "guarded" && input.uncertainty == null) {
    throw new DecisionRuleError("uncertainty_required", "Guarded acceptance needs the point's expanded uncertainty U");
  }
  const U = input.uncertainty == null ? null : dec(Math.abs(input.uncertainty));
  // Guard band w = U narrows the acceptance zone on both sides (ILAC-G8 §4.2.2).
  const acceptance = input.rule === "guarded" ? mpe.minus(U!) : mpe;

  const errorAsFound = dec(input.asFound).minus(reference);
  const errorAsLeft = input.asLeft == null ? null : dec(input.asLeft).minus(reference);
  // Compared as exact decimals: an error on the acceptance limit is accepted.
  const asFoundInTolerance = errorAsFound.abs().lte(acceptance);
  const asLeftInTolerance = errorAsLeft == null ? null : errorAsLeft.abs().lte(acceptance);
  const inTolerance = asLeftInTolerance ?? asFoundInTolerance;

  const ratio = U == null || U.isZero() ? null : mpe.times(2).div(U.times(2));
  return {
    nominal: num(dec(input.nominal)),
    reference: num(reference),
    mpe: num(mpe),
    rule: input.rule,
    errorAsFound: num(errorAsFound),
    errorAsLeft: errorAsLeft == null ? null : num(errorAsLeft),
    asFoundInTolerance,
    asLeftInTolerance,
    verdict: inTolerance ? "pass" : "fail",
    acceptanceLimit: num(acceptance),
    tur: ratio == null ? null : num(ratio),
    turAdequate: ratio == null ? null : ratio.gte(MINIMUM_TUR),
  };
}

/** Test uncertainty ratio: (upper − lower tolerance limit) / (2·U95) (ANSI/NCSL Z540.3-2006 §5.3 b). */
export function tur(lower: DecimalLike, upper: DecimalLike, U95: DecimalLike): number {
  const u = dec(U95);
  if (!u.isPositive() || u.isZero()) throw new RangeError("U95 must be greater than zero");
  return num(dec(upper).minus(dec(lower)).div(u.times(2)));
}

/** Standard normal cumulative distribution Φ(z). */
export function standardNormalCdf(z: number): number {
  return jStat.normal.cdf(z, 0, 1);
}

/** Probability that a quantity with best estimate `value` and standard uncertainty `u` (normal) lies outside [lower, upper] (JCGM 106:2012 §7). */
export function probabilityOutside(args: { value: number; u: number; lower?: number | null; upper?: number | null }): number {
  if (!(args.u > 0)) throw new RangeError("The standard uncertainty must be greater than zero");
  const below = args.lower == null ? 0 : standardNormalCdf((args.lower - args.value) / args.u);
  // The upper tail as Φ(−z) rather than 1 − Φ(z) keeps small tails accurate.
  const above = args.upper == null ? 0 : standardNormalCdf((args.value - args.upper) / args.u);
  return below + above;
}

/** False-accept probability for a reading exactly on a guarded acceptance limit with w = U = k·u: 1 − Φ(k) (ILAC-G8 §4.2.2). */
export function falseAcceptProbabilityAtGuardedLimit(k = 2): number {
  return standardNormalCdf(-k);
}

export type CalibrationResult = "pass" | "adjusted" | "fail" | "limited";

export interface CalibrationResultOptions {
  /** Part of the range the tool is released for; points are placed by nominal. */
  limitedRange?: { min: number; max: number } | null;
}

/** Overall result of a calibration from its judged points (pass, adjusted, fail, or limited to part of the range). */
export function calibrationResult(
  points: JudgedPoint[],
  opts: CalibrationResultOptions = {},
): { result: CalibrationResult; asFoundInTolerance: boolean } {
  if (points.length === 0) throw new DecisionRuleError("no_points", "A calibration needs at least one check point");
  const asFoundInTolerance = points.every((p) => p.asFoundInTolerance);
  const range = opts.limitedRange;
  if (range) {
    const inside = points.filter((p) => dec(p.nominal).gte(dec(range.min)) && dec(p.nominal).lte(dec(range.max)));
    // A range release needs at least one point inside it, and every point there passing.
    const result: CalibrationResult = inside.length > 0 && inside.every((p) => p.verdict === "pass") ? "limited" : "fail";
    return { result, asFoundInTolerance };
  }
  if (points.some((p) => p.verdict === "fail")) return { result: "fail", asFoundInTolerance };
  const adjusted = points.some((p) => p.errorAsLeft != null && !dec(p.errorAsLeft).equals(dec(p.errorAsFound)));
  return { result: asFoundInTolerance && !adjusted ? "pass" : "adjusted", asFoundInTolerance };
}
