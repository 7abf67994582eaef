import { dec, type DecimalLike } from "../common/decimal";
import { DEFAULT_DECIMALS, type LengthUnit } from "../common/units";

/** A length at the unit's customary decimals, or more when the exact value needs them (an error of 0.00013 in is never shown as 0.0001). */
export function formatExactLength(value: DecimalLike, unit: LengthUnit): string {
  const d = dec(value);
  const places = Math.max(DEFAULT_DECIMALS[unit], d.decimalPlaces());
  return d.toFixed(places);
}

/** The same with an explicit sign, for errors and margins: "+0.0003", "-0.0002", "0.0000". */
export function formatSignedLength(value: DecimalLike, unit: LengthUnit): string {
  const d = dec(value);
  return `${d.gt(0) ? "+" : ""}${formatExactLength(d, unit)}`;
}
