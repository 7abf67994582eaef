// Uncertainties are estimates, not limits: plain floating point is adequate here. The expanded U that a decision
// uses is stated as an exact decimal (two significant digits, rounded up) before any limit is compared with it.
import jStat from "jstat";
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { convertLength, EXPANSION_COEFFICIENTS, REFERENCE_TEMPERATURE_C, type LengthUnit } from "../common/units";

const SQRT3 = Math.sqrt(3);

/** Standard uncertainty of a quantity known only to lie within ± halfWidth: a/√3 (GUM 4.3.7). */
export function rectangularStandardUncertainty(halfWidth: number): number {
  return Math.abs(halfWidth) / SQRT3;
}

/** Standard uncertainty from a digital or graduated resolution d: d/(2√3) (GUM F.2.2.1). */
export function resolutionStandardUncertainty(resolution: number): number {
  return rectangularStandardUncertainty(resolution / 2);
}

/** Combined standard uncertainty of uncorrelated components with their sensitivities applied: root sum of squares (GUM 5.1.2). */
export function combineStandardUncertainties(us: number[]): number {
  return Math.sqrt(us.reduce((sum, u) => sum + u * u, 0));
}

/** Expanded uncertainty U = k·u_c (GUM 6.2–6.3). */
export function expandedUncertainty(uc: number, k = 2): number {
  return k * uc;
}

/**
 * Coverage probability of the expanded uncertainty: 95.45 %, the probability for which the coverage factor of a
 * normal distribution is exactly 2 (GUM Table G.2), so that U is "k = 2, about 95 %" whenever the degrees of freedom
 * are many (api.md, NIST TN 1297) and grows with the t-distribution when they are few.
 */
export const COVERAGE_PROBABILITY = 2 * jStat.normal.cdf(2, 0, 1) - 1;

/** Beyond this many degrees of freedom the t-distribution is taken as the normal one. */
const NORMAL_DOF = 1e6;

/**
 * Coverage factor k = t_p(ν) from the t-distribution for coverage probability p (GUM G.3, Table G.2);
 * ν null (infinite) or very large gives the normal quantile.
 */
export function coverageFactor(dof: number | null, p: number = COVERAGE_PROBABILITY): number {
  if (!(p > 0 && p < 1)) throw new RangeError("The coverage probability must lie between 0 and 1");
  const q = (1 + p) / 2;
  if (dof == null || dof >= NORMAL_DOF) return jStat.normal.inv(q, 0, 1);
  if (!(dof >= 1)) throw new RangeError("Degrees of freedom must be at least 1");
  return jStat.studentt.inv(q, dof);
}

/**
 * Effective degrees of freedom by the Welch–Satterthwaite formula ν_eff = u_c⁴ / Σ(u_i⁴/ν_i) (GUM G.4.1), truncated
 * to the next lower integer as GUM G.4.1 advises; null (infinite) when every component has infinite degrees of freedom.
 */
export function effectiveDegreesOfFreedom(parts: { u: number; dof: number | null }[]): number | null {
  const uc = combineStandardUncertainties(parts.map((p) => p.u));
  const denominator = parts.reduce((sum, p) => (p.dof == null || p.u === 0 ? sum : sum + p.u ** 4 / p.dof), 0);
  if (denominator === 0) return null;
  const nu = uc ** 4 / denominator;
  return nu >= NORMAL_DOF ? null : Math.max(1, Math.floor(nu + 1e-9));
}

/** Experimental standard deviation of repeated readings s(q_k), n − 1 in the denominator (GUM 4.2.2). */
export function experimentalStandardDeviation(values: DecimalLike[]): number {
  if (values.length < 2) throw new RangeError("A standard deviation needs at least two readings");
  const xs = values.map(dec);
  const mean = xs.reduce((a, b) => a.plus(b), new Decimal(0)).div(xs.length);
  const ss = xs.reduce((a, x) => a.plus(x.minus(mean).pow(2)), new Decimal(0));
  return Math.sqrt(num(ss.div(xs.length - 1)));
}

/** Arithmetic mean of repeated readings, exact. */
export function meanOf(values: DecimalLike[]): Decimal {
  if (values.length === 0) throw new RangeError("No readings");
  return values.map(dec).reduce((a, b) => a.plus(b), new Decimal(0)).div(values.length);
}

/**
 * Default half-width of the difference in expansion coefficient between a steel tool and steel standards when none is
 * given: ISO 3650 allows steel blocks (11.5 ± 1.0) × 10⁻⁶ /K (from memory), so 1 × 10⁻⁶ /K (common practice, no source).
 */
export const DEFAULT_ALPHA_DIFF_PER_K = 1.0e-6;

/** Expansion coefficient of steel standards, 11.5 × 10⁻⁶ /K (NIST Journal of Research; reference-values.md). */
export const STEEL_ALPHA_PER_K = Number(EXPANSION_COEFFICIENTS.steel.alphaPerK);

export type BudgetComponentKind = "standard" | "standard_grade" | "resolution" | "repeatability" | "temperature_offset" | "temperature_variation" | "other";

/** One row of an uncertainty budget, as a calibration record keeps and shows it. */
export interface BudgetComponent {
  kind: BudgetComponentKind;
  /** What the row is, in words (the standard and its certificate, the resolution of the tool…). */
  source: string;
  /** GUM 4.2 (Type A, statistics of repeated readings) or 4.3 (Type B, other information). */
  type: "A" | "B";
  distribution: "normal" | "rectangular" | "t";
  /** The stated quantity: a certificate's U, a half-width a, a resolution d, an experimental s, in `quantityUnit`. */
  quantity: number;
  quantityUnit: "length" | "celsius" | "per_kelvin";
  /** What the quantity is divided by for its standard uncertainty: k, sqrt(3), sqrt(12), sqrt(n) — written with the glyphs the report font has. */
  divisor: number;
  divisorLabel: string;
  /** u(x_i), in `quantityUnit`. */
  standardUncertainty: number;
  /** c_i: 1 for lengths; length per kelvin or per (1/K) for the thermal terms, in the budget's unit. */
  sensitivity: number;
  /** |c_i|·u(x_i), in the budget's unit. */
  contribution: number;
  /** ν_i; null = infinite. */
  dof: number | null;
}

export interface UncertaintyBudget {
  unit: LengthUnit;
  components: BudgetComponent[];
  /** u_c, root sum of squares of the contributions (GUM 5.1.2). */
  combined: number;
  /** ν_eff by Welch–Satterthwaite (GUM G.4.1); null = infinite. */
  effectiveDof: number | null;
  coverageProbability: number;
  /** k = t_p(ν_eff). */
  k: number;
  /** U = k·u_c, unrounded. */
  expanded: number;
  /** Terms the budget could not evaluate and why, in words. */
  notes: string[];
}

/** Combines a budget's rows: u_c by root-sum-square, ν_eff by Welch–Satterthwaite, k from the t-distribution, U = k·u_c. */
export function combineBudget(unit: LengthUnit, components: BudgetComponent[], notes: string[] = [], p: number = COVERAGE_PROBABILITY): UncertaintyBudget {
  const combined = combineStandardUncertainties(components.map((c) => c.contribution));
  const effectiveDof = effectiveDegreesOfFreedom(components.map((c) => ({ u: c.contribution, dof: c.dof })));
  const k = coverageFactor(effectiveDof, p);
  return { unit, components, combined, effectiveDof, coverageProbability: p, k, expanded: k * combined, notes };
}

/** What one reference standard (or one block of a stack) contributes at a point, already in the budget's unit. */
export type StandardContribution =
  | { kind: "certificate"; source: string; expandedUncertainty: number; coverageFactor: number; dof: number | null }
  | { kind: "grade"; source: string; halfWidth: number };

export interface PointBudgetInput {
  unit: LengthUnit;
  /** Every standard (or block) the point's reference was built from. */
  standards: StandardContribution[];
  /** Resolution of the tool under test, in `unit`. */
  resolution: number;
  /** Repeated as-found readings at the point (Type A, standard deviation of the mean). */
  repeatReadings?: DecimalLike[] | null;
  /** Nominal length measured, in millimetres (thermal terms are worked in mm, then converted to `unit`). */
  lengthMm: number;
  /** Mean temperature during calibration, °C. */
  temperatureC?: number | null;
  /** Stated ± variation of temperature between tool and standard during the calibration, °C (δθ of JCGM 100 H.1). */
  temperatureVariationC?: number | null;
  /** Half-width of |α_tool − α_standard|, per kelvin; default DEFAULT_ALPHA_DIFF_PER_K. */
  alphaDiffHalfWidthPerK?: number | null;
  /** α of the standard, per kelvin; default steel. */
  alphaPerK?: number | null;
  /** Further contributions stated by the person (standard uncertainty in `unit`, with ν; null = infinite). */
  others?: { source: string; u: number; dof?: number | null }[];
}

const mmTo = (valueMm: number, unit: LengthUnit) => (unit === "mm" ? valueMm : convertLength(valueMm, "mm", unit).toNumber());

/**
 * The uncertainty budget of one calibration point: every standard used (certificate U/k; a grade tolerance as a
 * rectangular distribution when no certified value exists), the tool's resolution d/√12, repeatability from repeated
 * readings s/√n (Type A), the departure from 20 °C through the difference in expansion Δα, and the stated temperature
 * variation between tool and standard; combined, with ν_eff and k for about 95 % (the JCGM 100 H.1 model, first order).
 */
export function pointBudget(input: PointBudgetInput): UncertaintyBudget {
  const { unit } = input;
  const rows: BudgetComponent[] = [];
  const notes: string[] = [];

  for (const s of input.standards) {
    if (s.kind === "certificate") {
      if (!(s.coverageFactor > 0)) throw new RangeError(`${s.source}: the certificate's coverage factor must be positive`);
      const u = Math.abs(s.expandedUncertainty) / s.coverageFactor;
      rows.push({ kind: "standard", source: s.source, type: "B", distribution: "normal", quantity: Math.abs(s.expandedUncertainty), quantityUnit: "length", divisor: s.coverageFactor, divisorLabel: `k = ${s.coverageFactor}`, standardUncertainty: u, sensitivity: 1, contribution: u, dof: s.dof });
    } else {
      const u = rectangularStandardUncertainty(s.halfWidth);
      rows.push({ kind: "standard_grade", source: s.source, type: "B", distribution: "rectangular", quantity: Math.abs(s.halfWidth), quantityUnit: "length", divisor: SQRT3, divisorLabel: "sqrt(3)", standardUncertainty: u, sensitivity: 1, contribution: u, dof: null });
    }
  }
  if (input.standards.length === 0) notes.push("No reference standard contributes: the budget holds the tool's own terms only.");

  const d = Math.abs(input.resolution);
  const uRes = resolutionStandardUncertainty(d);
  rows.push({ kind: "resolution", source: "Resolution of the tool under test", type: "B", distribution: "rectangular", quantity: d, quantityUnit: "length", divisor: 2 * SQRT3, divisorLabel: "sqrt(12)", standardUncertainty: uRes, sensitivity: 1, contribution: uRes, dof: null });

  const readings = input.repeatReadings ?? [];
  if (readings.length >= 2) {
    const s = experimentalStandardDeviation(readings);
    const n = readings.length;
    const u = s / Math.sqrt(n);
    // GUM 4.2.3: the mean of n readings is reported, so its standard deviation s/√n counts, with n − 1 degrees of freedom.
    rows.push({ kind: "repeatability", source: `Repeatability, ${n} repeated readings (standard deviation of the mean)`, type: "A", distribution: "t", quantity: s, quantityUnit: "length", divisor: Math.sqrt(n), divisorLabel: `sqrt(${n})`, standardUncertainty: u, sensitivity: 1, contribution: u, dof: n - 1 });
  } else {
    notes.push("No repeated readings at this point: repeatability is not evaluated (record two or more readings to include it).");
  }

  const L = Math.abs(input.lengthMm);
  const alphaDiff = Math.abs(input.alphaDiffHalfWidthPerK ?? DEFAULT_ALPHA_DIFF_PER_K);
  if (input.temperatureC != null) {
    // JCGM 100 H.1: c(δα) = −l·θ with θ = t − 20 °C; a tool and standard expanding differently read apart by L·δα·θ.
    const theta = Math.abs(input.temperatureC - REFERENCE_TEMPERATURE_C);
    const uAlpha = rectangularStandardUncertainty(alphaDiff);
    const c = mmTo(L * theta, unit);
    rows.push({ kind: "temperature_offset", source: `Difference in expansion of tool and standard at ${input.temperatureC} °C (|t − 20 °C| = ${round(theta, 3)} K)`, type: "B", distribution: "rectangular", quantity: alphaDiff, quantityUnit: "per_kelvin", divisor: SQRT3, divisorLabel: "sqrt(3)", standardUncertainty: uAlpha, sensitivity: c, contribution: Math.abs(c) * uAlpha, dof: null });
  } else {
    notes.push("No temperature recorded: the departure from 20 °C is not evaluated.");
  }
  if (input.temperatureVariationC != null && input.temperatureVariationC !== 0) {
    // JCGM 100 H.1: c(δθ) = −l·α_s; the tool and the standard not at the same temperature read apart by L·α·δθ.
    const a = Math.abs(input.temperatureVariationC);
    const uTheta = rectangularStandardUncertainty(a);
    const alpha = Math.abs(input.alphaPerK ?? STEEL_ALPHA_PER_K);
    const c = mmTo(L * alpha, unit);
    rows.push({ kind: "temperature_variation", source: `Temperature variation between tool and standard (± ${a} °C stated)`, type: "B", distribution: "rectangular", quantity: a, quantityUnit: "celsius", divisor: SQRT3, divisorLabel: "sqrt(3)", standardUncertainty: uTheta, sensitivity: c, contribution: Math.abs(c) * uTheta, dof: null });
  } else if (input.temperatureC != null) {
    notes.push("No temperature variation stated: a difference in temperature between tool and standard is not evaluated.");
  }

  for (const o of input.others ?? []) {
    const u = Math.abs(o.u);
    rows.push({ kind: "other", source: o.source, type: "B", distribution: "normal", quantity: u, quantityUnit: "length", divisor: 1, divisorLabel: "1", standardUncertainty: u, sensitivity: 1, contribution: u, dof: o.dof ?? null });
  }
  return combineBudget(unit, rows, notes);
}

function round(x: number, places: number): number {
  return Number(x.toFixed(places));
}

/** U rounded up to two significant digits, as results are usually stated (GUM 7.2.6); rounding up keeps it conservative. */
export function roundUncertainty(u: number): number {
  if (!(u > 0)) return 0;
  // Binary noise first (2.0000000000000002e-5 is 0.00002), then two digits rounded up.
  return num(new Decimal(u).toSignificantDigits(12, Decimal.ROUND_HALF_EVEN).toSignificantDigits(2, Decimal.ROUND_UP));
}
