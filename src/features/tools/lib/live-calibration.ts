// The calibration form's live answer: the SAME shared computation the server
// signs with (computeCalibration → judgePoint, uncertaintyBudget,
// calibrationResult; nextDueAt), fed with what the person has typed so far.
// Nothing here is a second rule set: it only decides what is complete enough to judge.
import { computeCalibration, type ComputedPoint, type ComputeCalibrationInput, type ComputePointInput } from "../../../../shared/calibrations/calibration-compute";
import { DecisionRuleError, type AsFoundStatement, type CalibrationResult } from "../../../../shared/calibrations/decision-rules";
import { nextDueAt } from "../../../../shared/calibrations/due-dates";
import { meanOf } from "../../../../shared/calibrations/uncertainty";

/** One check point as typed in the form (text, so nothing is rounded while typing). */
export interface PointText {
  nominal: string;
  reference: string;
  asFound: string;
  asLeft: string;
  mpe: string;
  uncertainty: string;
  /** Repeated as-found readings, separated by spaces or commas. */
  repeatReadings: string;
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
  overall: { result: CalibrationResult; asFoundInTolerance: boolean; asFoundStatement: AsFoundStatement } | null;
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
  adjustment_unstated: "As left differs from as found: tick “The tool was adjusted”, or record a repeat reading instead.",
};

/** Repeat readings as typed: numbers separated by spaces, commas or semicolons; null while none or any is unfinished. */
export function parseReadings(text: string | null | undefined): number[] | null {
  const parts = (text ?? "").split(/[\s,;]+/).filter(Boolean);
  if (parts.length === 0) return null;
  const values = parts.map(parseNumber);
  return values.every((v): v is number => v != null) ? values : null;
}

/**
 * The as-found indication the form sends: what was typed, or — left blank with repeat readings — their mean, written
 * with one digit more than the resolution (the server accepts a mean rounded no coarser than half the resolution).
 */
export function asFoundOf(p: Pick<PointText, "asFound" | "repeatReadings">, resolution: number): number | null {
  const typed = parseNumber(p.asFound);
  if (typed != null) return typed;
  const readings = parseReadings(p.repeatReadings);
  if (!readings || readings.length < 2) return null;
  const places = (String(resolution).split(".")[1]?.length ?? 0) + 1;
  return Number(meanOf(readings).toFixed(places));
}

/** The as-left reading the form sends: typed, or — on an adjusted record — the as-found reading where the point did not move. */
export function asLeftOf(p: Pick<PointText, "asFound" | "asLeft" | "repeatReadings">, adjusted: boolean, resolution: number): number | null {
  const typed = parseNumber(p.asLeft);
  if (typed != null || !adjusted) return typed;
  return asFoundOf(p, resolution);
}

function toPoint(p: PointText, ctx: { adjusted: boolean; resolution: number }): { point: ComputePointInput } | { problem: string } {
  const nominal = parseNumber(p.nominal);
  const asFound = asFoundOf(p, ctx.resolution);
  if (nominal == null) return { problem: "Enter the nominal size." };
  if (asFound == null) return { problem: "Enter the as-found reading (or two or more repeat readings)." };
  if (p.repeatReadings.trim() && !parseReadings(p.repeatReadings)) return { problem: "Repeat readings: numbers separated by spaces." };
  return {
    point: {
      nominal,
      asFound,
      reference: parseNumber(p.reference),
      asLeft: asLeftOf(p, ctx.adjusted, ctx.resolution),
      mpe: parseNumber(p.mpe),
      uncertainty: parseNumber(p.uncertainty),
      repeatReadings: parseReadings(p.repeatReadings),
    },
  };
}

/** Everything the form shows while the person types: per-point error, verdict, U and TUR; overall result; next due date. */
export function liveCalibration(points: PointText[], ctx: LiveContext): LiveCalibration {
  const { performedAt, intervalDays, timeZone, limitedRange, ...base } = ctx;
  const parsed = points.map((p) => toPoint(p, { adjusted: !!ctx.adjusted, resolution: ctx.resolution }));
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
    overall = { result: all.result, asFoundInTolerance: all.asFoundInTolerance, asFoundStatement: all.asFoundStatement };
  }
  let due: string | null = null;
  if (performedAt && intervalDays && timeZone && !Number.isNaN(Date.parse(performedAt))) {
    due = nextDueAt({ performedAt: new Date(performedAt).toISOString(), intervalDays, timeZone });
  }
  return { points: live, overall, nextDueAt: due, lowTurPoints: live.filter((l) => l.computed?.turAdequate === false).length };
}
