// The calibration form's live answer: the SAME shared computations the server
// signs with (judgePoint, calibrationResult, uncertaintyBudget, nextDueAt), fed
// with what the person has typed so far. Nothing here is a second rule set.
import { calibrationResult, DecisionRuleError, judgePoint, type CalibrationResult, type DecisionRule, type JudgedPoint } from "../../../../shared/calibrations/decision-rules";
import { uncertaintyBudget, type UncertaintyBudget } from "../../../../shared/calibrations/uncertainty";
import { nextDueAt } from "../../../../shared/calibrations/due-dates";
import { convertLength, type LengthUnit } from "../../../../shared/common/units";

/** One check point as typed in the form (text, so nothing is rounded while typing). */
export interface PointText {
  nominal: string;
  reference: string;
  asFound: string;
  asLeft: string;
  mpe: string;
  uncertainty: string;
}

/** The certificate of a reference standard as far as the budget needs it. */
export interface StandardCertForBudget {
  expandedUncertainty: number;
  coverageFactor: number;
  unit: LengthUnit;
}

export interface LiveContext {
  rule: DecisionRule;
  unit: LengthUnit;
  resolution: number | null;
  /** The family's permissible error, used where a point leaves MPE blank. */
  defaultMpe: number | null;
  temperatureC: number | null;
  /** Certificates of the standards chosen; the budget takes the largest U/k (the conservative choice). */
  standards: StandardCertForBudget[];
  limitedRange: { min: number; max: number } | null;
  performedAt: string | null;
  intervalDays: number | null;
  timeZone: string | null;
}

export interface LivePoint {
  judged: JudgedPoint | null;
  /** U used for the point: typed, or from the budget. */
  uncertainty: number | null;
  uncertaintySource: "given" | "budget" | null;
  budget: UncertaintyBudget | null;
  /** Why the point cannot be judged yet, in plain words. */
  problem: string | null;
}

export interface LiveCalibration {
  points: LivePoint[];
  overall: { result: CalibrationResult; asFoundInTolerance: boolean } | null;
  nextDueAt: string | null;
  lowTurPoints: number;
}

/** A typed number, or null while blank or unfinished ("0.", "-"). */
export function parseNumber(text: string | null | undefined): number | null {
  if (text == null) return null;
  const t = text.trim();
  if (t === "" || !/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : null;
}

/** The budget the server uses when a point gives no U: certificate U/k, resolution, temperature; k = 2. */
export function pointBudget(nominal: number, ctx: LiveContext): UncertaintyBudget | null {
  if (ctx.resolution == null || ctx.standards.length === 0) return null;
  const inToolUnit = ctx.standards.map((s) => ({
    u: convertLength(s.expandedUncertainty, s.unit, ctx.unit).toNumber() / s.coverageFactor,
    s,
  }));
  const worst = inToolUnit.reduce((a, b) => (b.u > a.u ? b : a));
  return uncertaintyBudget({
    standardU: convertLength(worst.s.expandedUncertainty, worst.s.unit, ctx.unit).toNumber(),
    standardK: worst.s.coverageFactor,
    resolution: ctx.resolution,
    lengthMm: convertLength(nominal, ctx.unit, "mm").toNumber(),
    tempC: ctx.temperatureC,
    unit: ctx.unit,
  });
}

function livePoint(p: PointText, ctx: LiveContext): LivePoint {
  const empty = (problem: string): LivePoint => ({ judged: null, uncertainty: null, uncertaintySource: null, budget: null, problem });
  const nominal = parseNumber(p.nominal);
  const asFound = parseNumber(p.asFound);
  if (nominal == null) return empty("Enter the nominal size.");
  if (asFound == null) return empty("Enter the as-found reading.");
  const mpe = parseNumber(p.mpe) ?? ctx.defaultMpe;
  if (mpe == null) return empty("Enter the permissible error (the family gives none).");
  const given = parseNumber(p.uncertainty);
  const budget = given == null ? pointBudget(nominal, ctx) : null;
  const U = given ?? budget?.expanded ?? null;
  try {
    const judged = judgePoint({
      nominal,
      reference: parseNumber(p.reference),
      asFound,
      asLeft: parseNumber(p.asLeft),
      mpe,
      uncertainty: U,
      rule: ctx.rule,
    });
    return { judged, uncertainty: U, uncertaintySource: given != null ? "given" : budget ? "budget" : null, budget, problem: null };
  } catch (e) {
    if (e instanceof DecisionRuleError) {
      return empty(
        e.code === "uncertainty_required"
          ? "Guarded acceptance needs U: type it, or choose a standard so it can be computed."
          : "The permissible error must be greater than zero.",
      );
    }
    throw e;
  }
}

/** Everything the form shows while the person types: per-point error, verdict, U and TUR; overall result; next due date. */
export function liveCalibration(points: PointText[], ctx: LiveContext): LiveCalibration {
  const live = points.map((p) => livePoint(p, ctx));
  const judged = live.map((l) => l.judged);
  const complete = judged.length > 0 && judged.every((j): j is JudgedPoint => j != null);
  let overall: LiveCalibration["overall"] = null;
  if (complete) overall = calibrationResult(judged as JudgedPoint[], { limitedRange: ctx.limitedRange });
  let due: string | null = null;
  if (ctx.performedAt && ctx.intervalDays && ctx.timeZone && !Number.isNaN(Date.parse(ctx.performedAt))) {
    try {
      due = nextDueAt({ performedAt: new Date(ctx.performedAt).toISOString(), intervalDays: ctx.intervalDays, timeZone: ctx.timeZone });
    } catch {
      due = null;
    }
  }
  return { points: live, overall, nextDueAt: due, lowTurPoints: live.filter((l) => l.judged?.turAdequate === false).length };
}
