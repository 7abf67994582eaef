import { cx } from "../../../components/ui/cx";

/** Whether a reference standard's certificate covers today, in words and a mark. */
export function InCalibrationBadge({ inCalibration, dueAt }: { inCalibration: boolean; dueAt: string | null }) {
  return (
    <span
      className={cx(
        "inline-flex whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold",
        inCalibration ? "border-go/40 bg-go-light text-go" : "border-stop/40 bg-stop-light text-stop",
      )}
    >
      {inCalibration ? "✓ In calibration" : dueAt ? "✕ Certificate ran out" : "✕ No certificate"}
    </span>
  );
}
