import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { DEFAULT_DECIMALS, formatLength, type LengthUnit } from "../common/units";

export type SizeKind = "journal" | "bore";

/**
 * Size from the readings of one diameter taken in several directions (FAA-H-8083-32: at least two positions 90° apart):
 * a journal's size is its smallest reading, a bore's its largest; out-of-round = largest − smallest (common practice).
 */
export function sizeFromValues(kind: SizeKind, values: DecimalLike[]): { size: number; outOfRound: number } {
  if (values.length === 0) throw new RangeError("A size needs at least one reading");
  const ds = values.map(dec);
  const smallest = Decimal.min(...ds);
  const largest = Decimal.max(...ds);
  return { size: num(kind === "journal" ? smallest : largest), outOfRound: num(largest.minus(smallest)) };
}

/** Diametral clearance = bore size − journal size, exact; negative is interference (common practice). */
export function clearanceOf(boreSize: DecimalLike, journalSize: DecimalLike): number {
  return num(dec(boreSize).minus(dec(journalSize)));
}

export interface Limits {
  min?: DecimalLike | null;
  max?: DecimalLike | null;
  serviceableMin?: DecimalLike | null;
  serviceableMax?: DecimalLike | null;
}

export interface LimitJudgement {
  verdict: "within_limits" | "outside_limits";
  band: "new" | "serviceable" | "reject";
  /** Distance to the nearest deciding limit: positive inside, zero on a limit, negative outside. */
  marginToNearestLimit: number;
  /** The limits that decide acceptance: the serviceable limits where given, else the new limits. */
  decidingLimits: { min: number | null; max: number | null };
}

const lowest = (...xs: (Decimal | null)[]) => xs.reduce<Decimal | null>((a, b) => (b == null ? a : a == null || b.lt(a) ? b : a), null);
const highest = (...xs: (Decimal | null)[]) => xs.reduce<Decimal | null>((a, b) => (b == null ? a : a == null || b.gt(a) ? b : a), null);
const opt = (x: DecimalLike | null | undefined) => (x == null ? null : dec(x));

function inside(v: Decimal, lo: Decimal | null, hi: Decimal | null): boolean {
  return (lo == null || v.gte(lo)) && (hi == null || v.lte(hi));
}

function margin(v: Decimal, lo: Decimal | null, hi: Decimal | null): Decimal {
  const toLo = lo == null ? null : v.minus(lo);
  const toHi = hi == null ? null : hi.minus(v);
  return lowest(toLo, toHi)!;
}

/** Exact limit margin of a value against a min/max pair (positive inside, negative outside); null limits are open. */
export function marginToLimits(value: DecimalLike, min: DecimalLike | null, max: DecimalLike | null): number {
  if (min == null && max == null) throw new RangeError("Limits need at least a minimum or a maximum");
  return num(margin(dec(value), opt(min), opt(max)));
}

/** Judge a size or clearance against new limits and, where given, serviceable limits; a value on a limit is within it. */
export function judgeAgainstLimits(args: { value: DecimalLike } & Limits): LimitJudgement {
  const v = dec(args.value);
  const min = opt(args.min);
  const max = opt(args.max);
  const sMin = opt(args.serviceableMin);
  const sMax = opt(args.serviceableMax);
  if (min == null && max == null && sMin == null && sMax == null) throw new RangeError("Limits need at least a minimum or a maximum");
  // Serviceable (wear) limits widen the new limits; taking the wider of each pair keeps a mis-entered table from rejecting new parts.
  const decLo = lowest(min, sMin);
  const decHi = highest(max, sMax);
  const accepted = inside(v, decLo, decHi);
  const asNew = accepted && inside(v, min, max);
  return {
    verdict: accepted ? "within_limits" : "outside_limits",
    band: asNew ? "new" : accepted ? "serviceable" : "reject",
    marginToNearestLimit: num(margin(v, decLo, decHi)),
    decidingLimits: { min: decLo == null ? null : num(decLo), max: decHi == null ? null : num(decHi) },
  };
}

/**
 * True when a tool's resolution is coarser than 1/ratio of the tolerance it checks. The shop sets the ratio; 10:1 is the
 * common rule of thumb ("rule of ten", AIAG MSA; NPL "10 % rule").
 */
export function resolutionTooCoarse(resolution: DecimalLike, tolerance: DecimalLike, ratio: DecimalLike = 10): boolean {
  return dec(resolution).gt(dec(tolerance).abs().div(dec(ratio)));
}

/** Clearance in trade notation: "0.0026 loose", "0.0015 tight", "0.0000 line to line". */
export function formatClearance(value: DecimalLike, unit: LengthUnit, decimals: number = DEFAULT_DECIMALS[unit]): string {
  const v = dec(value);
  const text = formatLength(v.abs(), unit, decimals);
  if (v.isZero()) return `${text} line to line`;
  return `${text} ${v.isNegative() ? "tight" : "loose"}`;
}
