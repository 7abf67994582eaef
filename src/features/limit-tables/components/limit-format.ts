import { formatClearance } from "../../../../shared/inspection/sizes";
import { formatLength, type LengthUnit } from "../../../../shared/common/units";
import type { LimitItemView } from "../../../../shared/limit-tables/limit-tables.schemas";

const clearanceKinds = new Set(["clearance", "feeler"]);

/** One limit as the trade writes it: sizes plain, clearances "0.0020 loose" / "0.0010 tight" (radial where the table says so). */
export function formatLimit(item: Pick<LimitItemView, "kind"> & { radial?: boolean }, value: number | null, unit: LengthUnit): string {
  if (value == null) return "—";
  return clearanceKinds.has(item.kind) ? `${formatClearance(value, unit)}${item.radial ? " radial" : ""}` : formatLength(value, unit);
}

/** "min … to max …" of an item's new limits. */
export function formatRange(item: Pick<LimitItemView, "kind">, min: number | null, max: number | null, unit: LengthUnit): string {
  if (min == null && max == null) return "—";
  if (min == null) return `max ${formatLimit(item, max, unit)}`;
  if (max == null) return `min ${formatLimit(item, min, unit)}`;
  return `${formatLimit(item, min, unit)} to ${formatLimit(item, max, unit)}`;
}
