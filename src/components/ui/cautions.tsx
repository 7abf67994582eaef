import { cx } from "./cx";
import { CAUTIONS } from "../../../shared/common/cautions";

/**
 * The cautions shown wherever Tenthwise judges a part or a tool: limits come
 * from the manufacturer's current data; airworthiness and return to service
 * belong to certificated persons; local rules and approved procedures govern.
 */
export function Cautions({ className, compact }: { className?: string; compact?: boolean }) {
  return (
    <aside aria-label="Cautions" className={cx("rounded-md border border-brass/40 bg-brass-light/50 px-3 py-2 text-sm text-ink-soft", className)}>
      <strong className="font-semibold text-ink">Cautions. </strong>
      {compact ? (
        <>Limits come from the manufacturer's current data; return to service is decided by certificated persons; local regulations and the shop's approved procedures govern.</>
      ) : (
        CAUTIONS.join(" ")
      )}
    </aside>
  );
}

/** Marks invented demo values (limits tables especially). */
export function DemoNotice({ what = "values" }: { what?: string }) {
  return (
    <p role="note" className="rounded-md border border-hold/40 bg-hold-light px-3 py-1.5 text-sm font-semibold text-hold">
      Demo {what} — invented for the demonstration; use the manufacturer's current manual.
    </p>
  );
}
