import { RESULT_LABELS } from "../../../../shared/calibrations/calibrations.schemas";
import type { AsFoundStatement, CalibrationResult } from "../../../../shared/calibrations/decision-rules";
import { AS_FOUND_STATEMENT_LABELS, AS_FOUND_STATEMENT_MEANINGS, MINIMUM_TUR } from "../../../../shared/calibrations/decision-rules";
import { cx } from "../../../components/ui/cx";
import { MarkBadge, type BadgeTone } from "../../../components/ui/status-badge";

const LOOK: Record<CalibrationResult, { tone: BadgeTone; mark: string }> = {
  pass: { tone: "go", mark: "✓" },
  adjusted: { tone: "go", mark: "✓" },
  limited: { tone: "caution", mark: "!" },
  fail: { tone: "stop", mark: "✕" },
};

/** A calibration's release decision in words with a mark. */
export function ResultBadge({ result, className }: { result: CalibrationResult; className?: string }) {
  return (
    <MarkBadge {...LOOK[result]} className={className}>
      {RESULT_LABELS[result]}
    </MarkBadge>
  );
}

const STATEMENT_LOOK: Record<AsFoundStatement, { tone: BadgeTone; mark: string }> = {
  pass: { tone: "go", mark: "✓" },
  conditional_pass: { tone: "caution", mark: "!" },
  conditional_fail: { tone: "stop", mark: "!" },
  fail: { tone: "stop", mark: "✕" },
};

/** The as-found condition (in or out of tolerance) with its ILAC-G8 statement; shown beside the release decision, never merged into it. */
export function AsFoundBadge({ inTolerance, statement, className }: { inTolerance: boolean; statement: AsFoundStatement; className?: string }) {
  return (
    <MarkBadge {...STATEMENT_LOOK[statement]} className={className}>
      <span title={AS_FOUND_STATEMENT_MEANINGS[statement]}>
        {inTolerance ? "In tolerance" : "Out of tolerance"} · {AS_FOUND_STATEMENT_LABELS[statement]}
      </span>
    </MarkBadge>
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
