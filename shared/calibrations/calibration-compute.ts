// One calibration worked out from what was entered: used live by the calibration form and, identically, by the server before it signs.
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { convertLength, type LengthUnit } from "../common/units";
import { calibrationResult, DecisionRuleError, judgePoint, type CalibrationResult, type DecisionRule, type JudgedPoint } from "./decision-rules";
import { uncertaintyBudget } from "./uncertainty";

export interface ComputePointInput {
  nominal: number;
  reference?: number | null;
  asFound: number;
  asLeft?: number | null;
  mpe?: number | null;
  uncertainty?: number | null;
  elementId?: string | null;
}

/** The first standard's certificate, for the uncertainty budget and certified values. */
export interface ComputeStandard {
  unit: LengthUnit;
  expandedUncertainty: number;
  coverageFactor: number;
  /** Certified values known for nominal sizes (a setting standard's length, a gauge block's nominal + deviation), in the standard's unit. */
  certifiedValues?: { nominal: DecimalLike; value: DecimalLike }[];
}

/** A reference standard and the certificate covering the day, as the server's rows (decimal strings) or the API (numbers) give them. */
export interface StandardWithCertificate {
  standard: { unit: LengthUnit; nominal: DecimalLike | null };
  certificate: {
    expandedUncertainty: DecimalLike;
    coverageFactor: DecimalLike;
    certifiedValue?: DecimalLike | null;
    elementValues?: { nominal: DecimalLike; deviation: DecimalLike }[] | null;
  };
}

/**
 * The one mapping from a standard's certificate to what the computation takes: U and k, and the
 * certified values (a single standard's certified length; each block's nominal + its deviation).
 * Used by the server before it signs and by the form while the person types.
 */
export function standardForCompute({ standard, certificate: c }: StandardWithCertificate): ComputeStandard {
  const certifiedValues: NonNullable<ComputeStandard["certifiedValues"]> = [];
  if (standard.nominal != null && c.certifiedValue != null) certifiedValues.push({ nominal: standard.nominal, value: c.certifiedValue });
  for (const e of c.elementValues ?? []) certifiedValues.push({ nominal: e.nominal, value: dec(e.nominal).plus(dec(e.deviation)) });
  return { unit: standard.unit, expandedUncertainty: num(dec(c.expandedUncertainty)), coverageFactor: num(dec(c.coverageFactor)), certifiedValues };
}

export interface ComputeCalibrationInput {
  rule: DecisionRule;
  /** Unit and resolution of the tool under test. */
  unit: LengthUnit;
  resolution: number;
  temperatureC?: number | null;
  /** Family's ± MPE, the default for every point. */
  familyMpe?: DecimalLike | null;
  /** Family's check plan, for per-point MPEs. */
  checkPlan?: { nominal: DecimalLike; mpe?: DecimalLike | null }[];
  /** Standards used, first one first; each may supply certified values. */
  standards?: ComputeStandard[];
  limitedRange?: { min: number; max: number } | null;
  points: ComputePointInput[];
}

export interface ComputedPoint extends JudgedPoint {
  seq: number;
  elementId: string | null;
  asFound: number;
  asLeft: number | null;
  uncertainty: number | null;
  /** Where U came from: entered, or the budget (certificate U/k, resolution, temperature). */
  uncertaintySource: "given" | "budget" | "none";
  referenceSource: "given" | "certified" | "nominal";
  mpeSource: "given" | "check_plan" | "family";
}

export interface ComputedCalibration {
  points: ComputedPoint[];
  result: CalibrationResult;
  asFoundInTolerance: boolean;
  /** Some point's TUR is under 4:1 (ANSI/NCSL Z540.3). */
  turWarning: boolean;
}

/** U rounded up to two significant digits, as results are usually stated (GUM 7.2.6); rounding up keeps it conservative. */
export function roundUncertainty(u: number): number {
  if (!(u > 0)) return 0;
  const d = new Decimal(u);
  return num(d.toSignificantDigits(2, Decimal.ROUND_UP));
}

function sameLength(a: DecimalLike, b: DecimalLike) {
  return dec(a).equals(dec(b));
}

/**
 * Works out every point (reference, MPE and U defaults, errors, verdicts, TUR) and the overall result.
 * Throws DecisionRuleError when a point has no permissible error or the guarded rule has no U.
 */
export function computeCalibration(input: ComputeCalibrationInput): ComputedCalibration {
  if (input.points.length === 0) throw new DecisionRuleError("no_points", "A calibration needs at least one check point");
  const first = input.standards?.[0] ?? null;
  const certified = (input.standards ?? []).flatMap((s) =>
    (s.certifiedValues ?? []).map((c) => ({ nominal: convertLength(c.nominal, s.unit, input.unit), value: convertLength(c.value, s.unit, input.unit) })),
  );

  const points = input.points.map((p, i): ComputedPoint => {
    const certifiedRef = p.reference == null ? certified.find((c) => sameLength(c.nominal, p.nominal)) : undefined;
    const reference: Decimal = p.reference != null ? dec(p.reference) : certifiedRef ? certifiedRef.value : dec(p.nominal);
    const planMpe = input.checkPlan?.find((c) => c.mpe != null && sameLength(c.nominal, p.nominal))?.mpe;
    const mpe = p.mpe ?? planMpe ?? input.familyMpe ?? null;
    if (mpe == null) throw new DecisionRuleError("invalid_mpe", `Point ${i + 1} (${p.nominal}) has no permissible error, and the family sets none`);

    let uncertainty: number | null = p.uncertainty ?? null;
    let uncertaintySource: ComputedPoint["uncertaintySource"] = uncertainty == null ? "none" : "given";
    if (uncertainty == null && first) {
      const budget = uncertaintyBudget({
        standardU: convertLength(first.expandedUncertainty, first.unit, input.unit).toNumber(),
        standardK: first.coverageFactor,
        resolution: input.resolution,
        lengthMm: convertLength(p.nominal, input.unit, "mm").toNumber(),
        tempC: input.temperatureC ?? null,
        unit: input.unit,
      });
      uncertainty = roundUncertainty(budget.expanded);
      uncertaintySource = "budget";
    }

    const judged = judgePoint({ nominal: p.nominal, reference, asFound: p.asFound, asLeft: p.asLeft ?? null, mpe, uncertainty, rule: input.rule });
    return {
      ...judged,
      seq: i + 1,
      elementId: p.elementId ?? null,
      asFound: p.asFound,
      asLeft: p.asLeft ?? null,
      uncertainty,
      uncertaintySource,
      referenceSource: p.reference != null ? "given" : certifiedRef ? "certified" : "nominal",
      mpeSource: p.mpe != null ? "given" : planMpe != null ? "check_plan" : "family",
    };
  });

  const { result, asFoundInTolerance } = calibrationResult(points, { limitedRange: input.limitedRange ?? null });
  return { points, result, asFoundInTolerance, turWarning: points.some((p) => p.turAdequate === false) };
}
