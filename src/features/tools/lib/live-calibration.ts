// The calibration form's live answer: the SAME shared computation the server
// signs with (computeCalibration → judgePoint, uncertaintyBudget,
// calibrationResult; nextDueAt), fed with what the person has typed so far.
// Nothing here is a second rule set: it only decides what is complete enough to judge.
import { computeCalibration, type ComputedPoint, type ComputeCalibrationInput, type ComputePointInput } from "../../../../shared/calibrations/calibration-compute";
import { DecisionRuleError, type CalibrationResult } from "../../../../shared/calibrations/decision-rules";
import { nextDueAt } from "../../../../shared/calibrations/due-dates";

/** One check point as typed in the form (text, so nothing is rounded while typing). */
export interface PointText {
  nominal: string;
  reference: string;
  asFound: string;
  asLeft: string;
  mpe: string;
  uncertainty: string;
}

export interface LiveContext extends Omit<ComputeCalibrationInput, "points" | "limitedRange"> {
  limitedRange: { min: number; max: number } | null;
  performedAt: string | null;
  intervalDays: number | null;
  timeZone: string | null;
}

export interface LivePoint {
  computed: ComputedPoint | null;
  /** Why the point cannot be judged yet, in plain words. */
  problem: string | null;
}

export interface LiveCalibration {
  points: LivePoint[];
  overall: { result: CalibrationResult; asFoundInTolerance: boolean } | null;
  nextDueAt: string | null;
  lowTurPoints: number;
}

/** A typed number, or null while blank or unfinished ("-", "abc"). */
export function parseNumber(text: string | null | undefined): number | null {
  if (text == null) return null;
  const t = text.trim();
  if (t === "" || !/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : null;
}

const PROBLEMS: Record<string, string> = {
  uncertainty_required: "Guarded acceptance needs U: type it, or choose a standard so it can be computed.",
  invalid_mpe: "Enter the permissible error (the family gives none here).",
};

function toPoint(p: PointText): { point: ComputePointInput } | { problem: string } {
  const nominal = parseNumber(p.nominal);
  const asFound = parseNumber(p.asFound);
  if (nominal == null) return { problem: "Enter the nominal size." };
  if (asFound == null) return { problem: "Enter the as-found reading." };
  return { point: { nominal, asFound, reference: parseNumber(p.reference), asLeft: parseNumber(p.asLeft), mpe: parseNumber(p.mpe), uncertainty: parseNumber(p.uncertainty) } };
}

/** Everything the form shows while the person types: per-point error, verdict, U and TUR; overall result; next due date. */
export function liveCalibration(points: PointText[], ctx: LiveContext): LiveCalibration {
  const { performedAt, intervalDays, timeZone, limitedRange, ...base } = ctx;
  const parsed = points.map(toPoint);
  const live: LivePoint[] = parsed.map((p) => {
    if (!("point" in p)) return { computed: null, problem: p.problem };
    try {
      return { computed: computeCalibration({ ...base, limitedRange: null, points: [p.point] }).points[0], problem: null };
    } catch (e) {
      if (e instanceof DecisionRuleError) return { computed: null, problem: PROBLEMS[e.code] ?? e.message };
      throw e;
    }
  });
  let overall: LiveCalibration["overall"] = null;
  if (live.length > 0 && live.every((l) => l.computed)) {
    const all = computeCalibration({ ...base, limitedRange, points: parsed.flatMap((p) => ("point" in p ? [p.point] : [])) });
    overall = { result: all.result, asFoundInTolerance: all.asFoundInTolerance };
  }
  let due: string | null = null;
  if (performedAt && intervalDays && timeZone && !Number.isNaN(Date.parse(performedAt))) {
    due = nextDueAt({ performedAt: new Date(performedAt).toISOString(), intervalDays, timeZone });
  }
  return { points: live, overall, nextDueAt: due, lowTurPoints: live.filter((l) => l.computed?.turAdequate === false).length };
}
