import { STATUS_LABELS, type ToolStatus } from "../../../shared/tools/tool-status";
import { cx } from "./cx";

// Colour never carries the meaning alone: every badge has its words and a mark
// (✓ usable, ! usable with a notice, ✕ do not use).
const LOOK: Record<ToolStatus, { cls: string; mark: string }> = {
  in_calibration: { cls: "bg-go-light text-go border-go/40", mark: "✓" },
  due_soon: { cls: "bg-caution-light text-caution border-caution/40", mark: "!" },
  limited: { cls: "bg-caution-light text-caution border-caution/40", mark: "!" },
  reference_only: { cls: "bg-paper-sunk text-ink-soft border-paper-line", mark: "i" },
  overdue: { cls: "bg-stop-light text-stop border-stop/40", mark: "✕" },
  out_of_tolerance: { cls: "bg-stop-light text-stop border-stop/40", mark: "✕" },
  quarantined: { cls: "bg-hold-light text-hold border-hold/40", mark: "✕" },
  at_calibration: { cls: "bg-paper-sunk text-ink-soft border-paper-line", mark: "✕" },
  never_calibrated: { cls: "bg-stop-light text-stop border-stop/40", mark: "✕" },
  inactive: { cls: "bg-paper-sunk text-ink-soft border-paper-line", mark: "✕" },
  lost: { cls: "bg-stop-light text-stop border-stop/40", mark: "✕" },
  retired: { cls: "bg-paper-sunk text-ink-faint border-paper-line", mark: "✕" },
};

/** A tool's derived status as a small badge with words and a mark. */
export function StatusBadge({ status, className }: { status: ToolStatus; className?: string }) {
  const look = LOOK[status];
  return (
    <span className={cx("inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold", look.cls, className)}>
      <span aria-hidden="true">{look.mark}</span>
      {STATUS_LABELS[status]}
    </span>
  );
}

export function statusLook(status: ToolStatus) {
  return LOOK[status];
}
