import jStat from "jstat";
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";

/**
 * How the release decision is made (ILAC-G8:09/2019 §4.2): simple acceptance (guard band w = 0, §4.2.1),
 * guarded acceptance with w = U (§4.2.2), or guarded acceptance with w = r·U where the shop sets r.
 * Whichever is chosen, whether the tool WAS in tolerance as found is the error against the tolerance (simple acceptance).
 */
export type DecisionRule = "simple" | "guarded" | "guarded_scaled";

export const DECISION_RULES = ["simple", "guarded", "guarded_scaled"] as const satisfies readonly DecisionRule[];

/** The rules in plain trade words, wherever a page or a record names them. */
export const DECISION_RULE_LABELS: Record<DecisionRule, string> = {
  simple: "Simple acceptance: released when the error is within ± MPE (w = 0)",
  guarded: "Guarded acceptance: released when the error is within ± (MPE − U) (w = U)",
  guarded_scaled: "Guarded acceptance, shop multiplier: released when the error is within ± (MPE − r·U) (w = r·U)",
};

/** ILAC-G8 non-binary statement of one as-found point (ILAC-G8:09/2019 §4.2.3, from memory). */
export type AsFoundStatement = "pass" | "conditional_pass" | "conditional_fail" | "fail";
export const AS_FOUND_STATEMENTS = ["pass", "conditional_pass", "conditional_fail", "fail"] as const satisfies readonly AsFoundStatement[];

export const AS_FOUND_STATEMENT_LABELS: Record<AsFoundStatement, string> = {
  pass: "Pass",
  conditional_pass: "Conditional pass",
  conditional_fail: "Conditional fail",
  fail: "Fail",
};

/** What each statement says, for the record and its certificate. */
export const AS_FOUND_STATEMENT_MEANINGS: Record<AsFoundStatement, string> = {
  pass: "in tolerance, and still so allowing for U",
  conditional_pass: "in tolerance, but within U of a limit",
  conditional_fail: "out of tolerance, but within U of a limit",
  fail: "out of tolerance, even allowing for U",
};

/** Z540.3 §5.3 b: a TUR of at least 4 where false-accept risk is not computed. */
export const MINIMUM_TUR = 4;

/** Thrown when a rule cannot be applied to the data given; the message names the point when one is at fault. */
export class DecisionRuleError extends Error {
  constructor(
    readonly code: "uncertainty_required" | "no_points" | "invalid_mpe" | "as_left_required" | "adjustment_unstated" | "invalid_limits" | "invalid_guard_band" | "readings_mismatch",
    message: string,
  ) {
    super(message);
    this.name = "DecisionRuleError";
  }
}

/** A finite decimal, or null when missing; anything else (NaN, "abc") is refused with the point named. */
function decimalOf(x: DecimalLike | null | undefined, what: string, code: DecisionRuleError["code"]): Decimal | null {
  if (x === null || x === undefined) return null;
  try {
    return dec(x);
  } catch {
    throw new DecisionRuleError(code, `${what} is not a number`);
  }
}

/**
 * The guard band w: 0 (simple), U (guarded) or r·U (guarded, shop multiplier r), computed in exact decimals
 * (ILAC-G8:09/2019 §4.2.2). Null U under a guarded rule is refused: the rule cannot be applied without it.
 */
export function guardBand(rule: DecisionRule, U: DecimalLike | null, multiplier: DecimalLike = 1, where = "The point"): Decimal {
  if (rule === "simple") return new Decimal(0);
  if (U == null) throw new DecisionRuleError("uncertainty_required", `${where}: guarded acceptance needs the expanded uncertainty U`);
  const u = dec(U).abs();
  if (rule === "guarded") return u;
  const r = dec(multiplier);
  if (!r.isFinite() || r.isNegative()) throw new DecisionRuleError("invalid_guard_band", "The shop's guard-band multiplier r must be zero or more");
  return u.times(r);
}

/**
 * ILAC-G8 non-binary statement of a measured error against ± MPE with expanded uncertainty U (guard band w = U):
 * pass when |e| ≤ MPE − U; conditional pass when MPE − U < |e| ≤ MPE; conditional fail when MPE < |e| ≤ MPE + U;
 * fail beyond (ILAC-G8:09/2019 §4.2.3, from memory). Without a U the statement is binary (simple acceptance).
 */
export function nonBinaryStatement(error: DecimalLike, mpe: DecimalLike, U: DecimalLike | null): AsFoundStatement {
  const e = dec(error).abs();
  const limit = dec(mpe);
  const u = U == null ? new Decimal(0) : dec(U).abs();
  if (e.lte(limit)) return e.lte(limit.minus(u)) ? "pass" : "conditional_pass";
  return e.lte(limit.plus(u)) ? "conditional_fail" : "fail";
}

/** The worst of several statements (fail over conditional fail over conditional pass over pass). */
export function worstStatement(statements: AsFoundStatement[]): AsFoundStatement {
  return statements.reduce<AsFoundStatement>((worst, s) => (AS_FOUND_STATEMENTS.indexOf(s) > AS_FOUND_STATEMENTS.indexOf(worst) ? s : worst), "pass");
}

export interface JudgePointInput {
  nominal: DecimalLike;
  /** Value of the standard; defaults to the nominal. */
  reference?: DecimalLike | null;
  asFound: DecimalLike;
  asLeft?: DecimalLike | null;
  /** The record says the tool was adjusted: the release decision is made on the as-left reading, which is then required. */
  adjusted?: boolean;
  /** Maximum permissible error, a positive half-width (± mpe). */
  mpe: DecimalLike | null | undefined;
  /** Expanded uncertainty U (about 95 %) of the point; required for a guarded rule. */
  uncertainty: DecimalLike | null;
  rule: DecisionRule;
  /** r of the rule guarded_scaled (w = r·U). */
  guardBandMultiplier?: DecimalLike;
  /** How messages name the point, e.g. "Point 3 (0.315 in)". */
  label?: string;
}

export interface JudgedPoint {
  nominal: number;
  reference: number;
  mpe: number;
  rule: DecisionRule;
  errorAsFound: number;
  errorAsLeft: number | null;
  /** As-found condition: the error against ± MPE (ILAC-G8 simple acceptance), whatever the release rule. */
  asFoundInTolerance: boolean;
  /** ILAC-G8 non-binary statement of the as-found error with the point's U. */
  asFoundStatement: AsFoundStatement;
  /** As-left error against ± MPE (simple acceptance); null when no as-left reading. */
  asLeftInTolerance: boolean | null;
  /** The reading the release decision was made on: as-left when the record says it was adjusted, else as-found. */
  releasedOn: "as_found" | "as_left";
  /** Release decision under the chosen rule. */
  verdict: "pass" | "fail";
  /** The guard band w used (0, U or r·U). */
  guardBand: number;
  /** The largest |error| released under the rule: MPE − w (negative when w exceeds MPE: nothing can be released). */
  acceptanceLimit: number;
  tur: number | null;
  turAdequate: boolean | null;
}

/** Judge one calibration check point: error = indication − reference, exactly; as-found condition, non-binary statement, release decision. */
export function judgePoint(input: JudgePointInput): JudgedPoint {
  const where = input.label ?? "The point";
  const mpe = decimalOf(input.mpe, `${where}: the permissible error`, "invalid_mpe");
  if (mpe == null) throw new DecisionRuleError("invalid_mpe", `${where} has no permissible error (MPE); give one, or set it on the family`);
  if (!mpe.isPositive() || mpe.isZero()) {
    throw new DecisionRuleError("invalid_limits", `${where}: the permissible error must be greater than zero (± ${mpe.toString()} puts the lower limit above the upper)`);
  }
  const reference = dec(input.reference ?? input.nominal);
  const U = decimalOf(input.uncertainty, `${where}: the uncertainty U`, "uncertainty_required")?.abs() ?? null;
  const w = guardBand(input.rule, U, input.guardBandMultiplier ?? 1, where);
  const acceptance = mpe.minus(w);

  const errorAsFound = dec(input.asFound).minus(reference);
  const errorAsLeft = input.asLeft == null ? null : dec(input.asLeft).minus(reference);
  if (input.adjusted && errorAsLeft == null) {
    throw new DecisionRuleError("as_left_required", `${where}: the record says the tool was adjusted, so the as-left reading is needed at every point`);
  }
  const releasedOn = input.adjusted ? "as_left" : "as_found";
  const releaseError = releasedOn === "as_left" ? errorAsLeft! : errorAsFound;
  // Every comparison on exact decimals: an error on a limit is on the limit.
  const ratio = U == null || U.isZero() ? null : dec(tur(mpe.negated(), mpe, U));
  return {
    nominal: num(dec(input.nominal)),
    reference: num(reference),
    mpe: num(mpe),
    rule: input.rule,
    errorAsFound: num(errorAsFound),
    errorAsLeft: errorAsLeft == null ? null : num(errorAsLeft),
    asFoundInTolerance: errorAsFound.abs().lte(mpe),
    asFoundStatement: nonBinaryStatement(errorAsFound, mpe, U),
    asLeftInTolerance: errorAsLeft == null ? null : errorAsLeft.abs().lte(mpe),
    releasedOn,
    verdict: releaseError.abs().lte(acceptance) ? "pass" : "fail",
    guardBand: num(w),
    acceptanceLimit: num(acceptance),
    tur: ratio == null ? null : num(ratio),
    turAdequate: ratio == null ? null : ratio.gte(MINIMUM_TUR),
  };
}

/**
 * Test uncertainty ratio: (upper − lower tolerance limit) / (2·U95) (ANSI/NCSL Z540.3-2006 §5.3 b), in exact decimals.
 * Reversed or equal limits and a U that is not positive are refused.
 */
export function tur(lower: DecimalLike, upper: DecimalLike, U95: DecimalLike): number {
  const u = dec(U95);
  const lo = dec(lower);
  const hi = dec(upper);
  if (!u.isPositive() || u.isZero()) throw new RangeError("U95 must be greater than zero");
  if (!hi.gt(lo)) throw new DecisionRuleError("invalid_limits", `The upper tolerance limit (${hi.toString()}) must be above the lower (${lo.toString()})`);
  return num(hi.minus(lo).div(u.times(2)));
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
  /** The record says an adjustment was made. */
  adjusted?: boolean;
}

export interface CalibrationOutcome {
  /** Release decision: pass (released as found), adjusted (adjusted and released), fail (not released), limited (released for part of the range). */
  result: CalibrationResult;
  /** As-found condition of the whole tool: every point's error within ± MPE. */
  asFoundInTolerance: boolean;
  /** The worst as-found statement over the points. */
  asFoundStatement: AsFoundStatement;
}

/** Overall result of a calibration from its judged points. */
export function calibrationResult(points: JudgedPoint[], opts: CalibrationResultOptions = {}): CalibrationOutcome {
  if (points.length === 0) throw new DecisionRuleError("no_points", "A calibration needs at least one check point");
  const asFoundInTolerance = points.every((p) => p.asFoundInTolerance);
  const asFoundStatement = worstStatement(points.map((p) => p.asFoundStatement));
  const range = opts.limitedRange;
  if (range) {
    const inside = points.filter((p) => dec(p.nominal).gte(dec(range.min)) && dec(p.nominal).lte(dec(range.max)));
    // A range release needs at least one point inside it, and every point there released.
    const result: CalibrationResult = inside.length > 0 && inside.every((p) => p.verdict === "pass") ? "limited" : "fail";
    return { result, asFoundInTolerance, asFoundStatement };
  }
  if (points.some((p) => p.verdict === "fail")) return { result: "fail", asFoundInTolerance, asFoundStatement };
  return { result: opts.adjusted ? "adjusted" : "pass", asFoundInTolerance, asFoundStatement };
}
