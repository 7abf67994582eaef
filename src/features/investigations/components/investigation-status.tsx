import { cx } from "../../../components/ui/cx";

/** Open or closed, in words and a mark (never colour alone). */
export function InvestigationStatus({ status }: { status: "open" | "closed" }) {
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold",
        status === "open" ? "border-caution/40 bg-caution-light text-caution" : "border-paper-line bg-paper-sunk text-ink-soft",
      )}
    >
      <span aria-hidden="true">{status === "open" ? "!" : "✓"}</span>
      {status === "open" ? "Open" : "Closed"}
    </span>
  );
}
