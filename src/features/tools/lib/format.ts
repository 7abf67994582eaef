// Display only: lengths rounded for reading, never for storage or judging.
import { formatLength, type LengthUnit } from "../../../../shared/common/units";

/** Decimals to show for a tool: one more than its resolution needs, at least the unit's custom. */
export function decimalsFor(unit: LengthUnit, resolution?: number | null): number {
  const base = unit === "in" ? 4 : 3;
  if (!resolution || resolution <= 0) return base;
  const text = String(resolution);
  const places = text.includes("e-") ? Number(text.split("e-")[1]) : (text.split(".")[1]?.length ?? 0);
  return Math.max(base, places);
}

/** Decimal places a number was written with (0.10505 → 5). */
function placesOf(value: number): number {
  const text = String(value);
  if (text.includes("e-")) return Number(text.split("e-")[1]) + (text.split("e")[0].split(".")[1]?.length ?? 0);
  return text.split(".")[1]?.length ?? 0;
}

/** A length with its unit ("0.5000 in"), or a dash; never shows fewer digits than the value was recorded with. */
export function len(value: number | null | undefined, unit: LengthUnit, decimals?: number): string {
  if (value == null) return "—";
  return `${formatLength(value, unit, Math.min(10, Math.max(decimals ?? decimalsFor(unit), placesOf(value))))} ${unit}`;
}

/** A signed length for errors ("+0.00005"), without the unit. */
export function signedLen(value: number | null | undefined, unit: LengthUnit, decimals?: number): string {
  if (value == null) return "—";
  const text = formatLength(value, unit, Math.min(10, Math.max((decimals ?? decimalsFor(unit)) + 1, placesOf(value))));
  return value > 0 && !/^0\.?0*$/.test(text) ? `+${text}` : text;
}

/** Calendar date, YYYY-MM-DD (the one client formatter). */
export { formatDate as day } from "../../../lib/format";

/** An instant as a short local date and time. */
export { formatDateTime as when } from "../../../lib/format";
