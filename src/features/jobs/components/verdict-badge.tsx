import { cx } from "../../../components/ui/cx";

const LOOK = {
  within_limits: { cls: "bg-go-light text-go border-go/40", mark: "✓" },
  outside_limits: { cls: "bg-stop-light text-stop border-stop/40", mark: "✕" },
  pending: { cls: "bg-paper-sunk text-ink-soft border-paper-line", mark: "…" },
} as const;

/** A verdict with its words (which limits decided) and a mark; colour never carries the meaning alone. */
export function VerdictBadge({ verdict, text }: { verdict: string; text: string }) {
  const look = LOOK[verdict as keyof typeof LOOK] ?? LOOK.pending;
  return (
    <span className={cx("inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-sm font-semibold", look.cls)}>
      <span aria-hidden="true">{look.mark}</span>
      {text}
    </span>
  );
}
