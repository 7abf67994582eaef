import { RESULT_LABELS } from "../../../../shared/calibrations/calibrations.schemas";
import type { CalibrationResult } from "../../../../shared/calibrations/decision-rules";
import { MINIMUM_TUR } from "../../../../shared/calibrations/decision-rules";
import { cx } from "../../../components/ui/cx";

const LOOK: Record<CalibrationResult, { cls: string; mark: string }> = {
  pass: { cls: "border-go/40 bg-go-light text-go", mark: "✓" },
  adjusted: { cls: "border-caution/40 bg-caution-light text-caution", mark: "!" },
  limited: { cls: "border-caution/40 bg-caution-light text-caution", mark: "!" },
  fail: { cls: "border-stop/40 bg-stop-light text-stop", mark: "✕" },
};

/** A calibration's overall result in words with a mark. */
export function ResultBadge({ result, className }: { result: CalibrationResult; className?: string }) {
  const l = LOOK[result];
  return (
    <span className={cx("inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold", l.cls, className)}>
      <span aria-hidden="true">{l.mark}</span>
      {RESULT_LABELS[result]}
    </span>
  );
}

/** The visible Z540.3 warning for a test uncertainty ratio under 4:1. */
export function TurWarning({ className, points }: { className?: string; points?: number }) {
  return (
    <p role="note" className={cx("rounded-md border border-caution/50 bg-caution-light px-3 py-2 text-sm font-semibold text-caution", className)}>
      ! Test uncertainty ratio under {MINIMUM_TUR}:1{points ? ` at ${points} point${points === 1 ? "" : "s"}` : ""} (ANSI/NCSL Z540.3 asks for at least {MINIMUM_TUR}:1 where
      false-accept risk is not computed). Use a better standard, or record how the risk was judged.
    </p>
  );
}
