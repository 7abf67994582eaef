// The cascade of a reference standard found out of tolerance: every calibration performed with it in the window
// is re-judged with the standard's error (product.md, capability 5).
import { dec, num } from "../common/decimal";
import { judgePoint, type DecisionRule } from "../calibrations/decision-rules";
import { nearestPoint, type ToolErrorPoint } from "./affected-reading";

/** One check point of a calibration performed with the standard, in the tool's unit. */
export interface CalibrationPointRecord {
  nominal: number;
  reference: number;
  asFound: number;
  asLeft: number | null;
  mpe: number;
  uncertainty: number | null;
}

/** Error of the standard at a nominal: its actual value − the value it was used as (positive: larger than assumed). */
export interface StandardError {
  nominal: number;
  error: number;
  uncertainty: number | null;
}

export interface CalibrationRejudgement {
  verdictCouldChange: boolean;
  /** As-found error at the deciding point, as recorded and as corrected. */
  measuredValue: number;
  correctedValue: number;
  /** Acceptance limit − |error|, before and after the correction (positive inside). */
  marginBefore: number;
  marginAfter: number;
  basis: string;
  /** The tool's error as it was really left (recorded error − the standard's error): for re-judging its readings. */
  toolErrorsAsLeft: ToolErrorPoint[];
}

function signed(n: number): string {
  const d = dec(n);
  return d.gt(0) ? `+${d.toString()}` : d.toString();
}

/**
 * Re-judges a calibration's points with the standard's error: the true reference was reference + e, so every
 * error recorded against it was e too large. Examined at e and e ± U of the finding; the verdict could change
 * when the as-found or the final verdict of any point differs.
 */
export function rejudgeCalibration(points: CalibrationPointRecord[], standardErrors: StandardError[], rule: DecisionRule, unit: string): CalibrationRejudgement {
  if (points.length === 0) throw new RangeError("A calibration needs at least one point to re-judge");
  const errs = standardErrors.map((s) => ({ nominal: s.nominal, error: s.error, uncertainty: s.uncertainty }));
  const judged = points.map((p) => {
    const s = nearestPoint(errs, p.nominal)!;
    // The guarded rule needs U; a point recorded without one is judged simply (as it could only have been).
    const pointRule: DecisionRule = rule === "guarded" && p.uncertainty == null ? "simple" : rule;
    const base = { nominal: p.nominal, asFound: p.asFound, asLeft: p.asLeft, mpe: p.mpe, uncertainty: p.uncertainty, rule: pointRule };
    const original = judgePoint({ ...base, reference: p.reference });
    const Us = dec(s.uncertainty ?? 0);
    const offsets = Us.isZero() ? [dec(s.error)] : [dec(s.error).minus(Us), dec(s.error), dec(s.error).plus(Us)];
    const variants = offsets.map((o) => judgePoint({ ...base, reference: num(dec(p.reference).plus(o)) }));
    const central = variants[Us.isZero() ? 0 : 1];
    const couldChange = variants.some((v) => v.asFoundInTolerance !== original.asFoundInTolerance || v.verdict !== original.verdict);
    const limit = dec(original.acceptanceLimit);
    const marginBefore = num(limit.minus(dec(original.errorAsFound).abs()));
    const marginAfter = num(limit.minus(dec(central.errorAsFound).abs()));
    const leftError = dec(original.errorAsLeft ?? original.errorAsFound).minus(dec(s.error));
    // Expanded uncertainties of the point and of the finding combine root-sum-square (GUM 5.1.2, same k).
    const U = dec(p.uncertainty ?? 0).pow(2).plus(Us.pow(2)).sqrt();
    return { p, s, original, central, couldChange, marginBefore, marginAfter, leftError, U };
  });
  const deciding = judged.find((x) => x.couldChange) ?? judged.reduce((a, b) => (b.marginAfter < a.marginAfter ? b : a));
  const lines = judged.map(
    (x) =>
      `At ${dec(x.p.nominal).toString()} ${unit} the standard was off by ${signed(x.s.error)}${x.s.uncertainty ? ` (U ${dec(x.s.uncertainty).toString()})` : ""}: ` +
      `as-found error ${signed(x.original.errorAsFound)} becomes ${signed(x.central.errorAsFound)} against ±${dec(x.original.acceptanceLimit).toString()} ` +
      `(${x.original.asFoundInTolerance ? "in" : "out of"} tolerance as recorded; ${x.central.asFoundInTolerance ? "in" : "out of"} tolerance corrected)` +
      (x.couldChange ? " — the verdict could have been different." : "."),
  );
  return {
    verdictCouldChange: judged.some((x) => x.couldChange),
    measuredValue: deciding.original.errorAsFound,
    correctedValue: deciding.central.errorAsFound,
    marginBefore: deciding.marginBefore,
    marginAfter: deciding.marginAfter,
    basis: lines.join(" "),
    toolErrorsAsLeft: judged.map((x) => ({ nominal: x.p.nominal, error: num(x.leftError), uncertainty: x.U.isZero() ? null : num(x.U) })),
  };
}
