import type { ReactNode } from "react";
import { STATUS_LABELS, type ToolStatus } from "../../../shared/tools/status-labels";
import { cx } from "./cx";

const TONES = {
  go: "bg-go-light text-go border-go/40",
  caution: "bg-caution-light text-caution border-caution/40",
  stop: "bg-stop-light text-stop border-stop/40",
  hold: "bg-hold-light text-hold border-hold/40",
  neutral: "bg-paper-sunk text-ink-soft border-paper-line",
  faint: "bg-paper-sunk text-ink-faint border-paper-line",
} as const;
export type BadgeTone = keyof typeof TONES;

/**
 * A small badge in words with a mark. Colour never carries the meaning alone: every badge has its
 * words and a mark (✓ usable, ! usable with a notice, ✕ do not use).
 */
export function MarkBadge({ tone, mark, className, children }: { tone: BadgeTone; mark: string; className?: string; children: ReactNode }) {
  return (
    <span className={cx("inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold", TONES[tone], className)}>
      <span aria-hidden="true">{mark}</span>
      {children}
    </span>
  );
}

const LOOK: Record<ToolStatus, { tone: BadgeTone; mark: string }> = {
  in_calibration: { tone: "go", mark: "✓" },
  due_soon: { tone: "caution", mark: "!" },
  limited: { tone: "caution", mark: "!" },
  reference_only: { tone: "neutral", mark: "i" },
  overdue: { tone: "stop", mark: "✕" },
  out_of_tolerance: { tone: "stop", mark: "✕" },
  quarantined: { tone: "hold", mark: "✕" },
  at_calibration: { tone: "neutral", mark: "✕" },
  never_calibrated: { tone: "stop", mark: "✕" },
  inactive: { tone: "neutral", mark: "✕" },
  lost: { tone: "stop", mark: "✕" },
  retired: { tone: "faint", mark: "✕" },
};

/** A tool's derived status as a small badge with words and a mark. */
export function StatusBadge({ status, className }: { status: ToolStatus; className?: string }) {
  return (
    <MarkBadge {...LOOK[status]} className={className}>
      {STATUS_LABELS[status]}
    </MarkBadge>
  );
}
