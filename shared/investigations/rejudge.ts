// Re-judging over a tool's error band (product.md, capability 5): the checks of a place (judging.ts) are evaluated for
// every error the tool may have had, and the verdict "could change" when any error in the band gives the other verdict.
import { Decimal, dec } from "../common/decimal";
import { convertLength, type LengthUnit } from "../common/units";
import { checkWithin, judgeChecks, type Check, type Verdict } from "../inspection/judging";

/** The error found at one check point of the tool (indication − reference), in the tool's unit. */
export interface ToolErrorPoint {
  nominal: number;
  error: number;
  /** Expanded uncertainty U (k = 2) of that point, when known. */
  uncertainty: number | null;
  /** The set element (feeler leaf, gauge block) the point was taken on. */
  elementId?: string | null;
}

/** What is known of the tool's error over the window: its points (null when unknown: lost, damaged), in its unit. */
export interface ToolErrors {
  unit: LengthUnit;
  points: ToolErrorPoint[] | null;
  /** The tool's measuring range: the check points in it bound the error of any reading it took. */
  range?: { min: number; max: number } | null;
}

/** The point nearest a size (ties go to the larger error). */
export function nearestPoint<P extends { nominal: number; error: number }>(points: P[], size: number): P | null {
  let best: P | null = null;
  let bestDistance = new Decimal(0);
  for (const p of points) {
    const d = dec(p.nominal).minus(dec(size)).abs();
    if (best == null || d.lt(bestDistance) || (d.equals(bestDistance) && Math.abs(p.error) > Math.abs(best.error))) {
      best = p;
      bestDistance = d;
    }
  }
  return best;
}

/**
 * Half-width of the error band of a tool: the largest |error| found at any check point in its range, plus that
 * point's U — applied with both signs, since the error between check points is not known (conservative; common
 * practice). Null when the error is unknown.
 */
export function errorBand(errors: ToolErrors): { halfWidth: Decimal; worst: ToolErrorPoint } | null {
  if (!errors.points || errors.points.length === 0) return null;
  const inRange = errors.range
    ? errors.points.filter((p) => dec(p.nominal).gte(dec(errors.range!.min)) && dec(p.nominal).lte(dec(errors.range!.max)))
    : errors.points;
  const pts = inRange.length ? inRange : errors.points;
  let worst: ToolErrorPoint | null = null;
  let width = new Decimal(0);
  for (const p of pts) {
    const w = dec(p.error).abs().plus(dec(p.uncertainty ?? 0).abs());
    if (worst == null || w.gt(width)) [worst, width] = [p, w];
  }
  return { halfWidth: width, worst: worst! };
}

/** One unknown error the checks may rest on: a tool's (in its unit) or a leaf's (in the table's unit). */
export interface ErrorVariable {
  id: string;
  halfWidth: Decimal;
  /** The most likely error (at the check point nearest the size, or a leaf's own finding); null when none. */
  likely: Decimal | null;
}

/** Which variable moves a source (a reading's values or a leaf), and by how much per unit of that variable. */
export type SourceMap = Map<string, { variable: string; factor: Decimal }>;

/** Coefficient of each variable in a check: Σ coef × factor over its sources. */
export function coefficients(c: Check, sources: SourceMap): Map<string, Decimal> {
  const out = new Map<string, Decimal>();
  for (const s of c.sensitivity) {
    const m = sources.get(s.key);
    if (!m) continue;
    out.set(m.variable, (out.get(m.variable) ?? new Decimal(0)).plus(s.coef.times(m.factor)));
  }
  return out;
}

/** The span a check's value can take over the band, and its most likely value. */
export function spanOf(c: Check, vars: Map<string, ErrorVariable>, sources: SourceMap): { low: Decimal; high: Decimal; likely: Decimal; moves: boolean } {
  let reach = new Decimal(0);
  let likely = c.value;
  let moves = false;
  for (const [id, a] of coefficients(c, sources)) {
    const v = vars.get(id);
    if (!v || a.isZero()) continue;
    moves = true;
    reach = reach.plus(a.abs().times(v.halfWidth));
    if (v.likely) likely = likely.plus(a.times(v.likely));
  }
  return { low: c.value.minus(reach), high: c.value.plus(reach), likely, moves };
}

export interface BandJudgement {
  verdictNow: Verdict;
  couldChange: boolean;
  /** Least margin to a limit at the worst end of the band (negative: the band reaches outside). */
  worstMargin: Decimal | null;
  spans: { check: Check; low: Decimal; high: Decimal; likely: Decimal; moves: boolean }[];
}

/**
 * Could any error in the band give this place the other verdict? A place judged within could change when any check
 * can leave its limits; a place judged outside could change when some error brings every check inside at once
 * (exact for one variable; with several — the leaves of a stack — each check is taken on its own, which can only
 * flag more, never fewer).
 */
export function judgeOverBand(checks: Check[], vars: Map<string, ErrorVariable>, sources: SourceMap): BandJudgement {
  const now = judgeChecks(checks);
  const spans = checks.map((c) => ({ check: c, ...spanOf(c, vars, sources) }));
  let worstMargin: Decimal | null = null;
  for (const s of spans) {
    const m = [s.check.min == null ? null : s.low.minus(s.check.min), s.check.max == null ? null : s.check.max.minus(s.high)].filter((x): x is Decimal => x != null && x.isFinite());
    for (const x of m) worstMargin = worstMargin == null || x.lt(worstMargin) ? x : worstMargin;
  }
  let couldChange: boolean;
  if (now.verdict === "within_limits") {
    couldChange = spans.some((s) => (s.check.min != null && s.low.lt(s.check.min)) || (s.check.max != null && s.high.gt(s.check.max)));
  } else {
    const used = new Set<string>();
    for (const c of checks) for (const [id, a] of coefficients(c, sources)) if (!a.isZero() && vars.has(id)) used.add(id);
    if (used.size === 0) couldChange = false;
    else if (used.size === 1) couldChange = feasibleOneVariable(checks, vars.get([...used][0])!, sources);
    else couldChange = spans.every((s) => (s.check.min == null || s.high.gte(s.check.min)) && (s.check.max == null || s.low.lte(s.check.max)) && s.low.isFinite() && s.high.isFinite());
  }
  return { verdictNow: now.verdict, couldChange, worstMargin, spans };
}

/** Is there one error e in [−E, E] for which every check is within? Each check allows an interval of e. */
function feasibleOneVariable(checks: Check[], v: ErrorVariable, sources: SourceMap): boolean {
  let lo = v.halfWidth.negated();
  let hi = v.halfWidth;
  for (const c of checks) {
    const a = coefficients(c, sources).get(v.id) ?? new Decimal(0);
    if (a.isZero()) {
      if (!checkWithin(c)) return false;
      continue;
    }
    // min ≤ value + a·e ≤ max
    const bounds = [c.min == null ? null : c.min.minus(c.value).div(a), c.max == null ? null : c.max.minus(c.value).div(a)];
    const [fromMin, fromMax] = bounds;
    if (a.gt(0)) {
      if (fromMin) lo = Decimal.max(lo, fromMin);
      if (fromMax) hi = Decimal.min(hi, fromMax);
    } else {
      if (fromMin) hi = Decimal.min(hi, fromMin);
      if (fromMax) lo = Decimal.max(lo, fromMax);
    }
    if (lo.gt(hi)) return false;
  }
  return lo.lte(hi);
}

/** Points converted into another unit (1 in = 25.4 mm exactly). */
export function pointsIn(errors: ToolErrors, unit: LengthUnit): ToolErrorPoint[] | null {
  if (!errors.points) return null;
  if (errors.unit === unit) return errors.points;
  const c = (x: number) => convertLength(x, errors.unit, unit).toNumber();
  return errors.points.map((p) => ({ ...p, nominal: c(p.nominal), error: c(p.error), uncertainty: p.uncertainty == null ? null : c(p.uncertainty) }));
}
