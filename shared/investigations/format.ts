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

/** A length with its unit for reports and screens ("0.5003 in"); a dash when there is none, the bare number when the unit is unknown. */
export const lengthWithUnit = (v: number | null | undefined, unit: LengthUnit | null | undefined) => (v == null ? "—" : unit ? `${formatExactLength(v, unit)} ${unit}` : String(v));

/** The same signed, for errors and margins ("+0.0003 in"). */
export const signedLengthWithUnit = (v: number | null | undefined, unit: LengthUnit | null | undefined) => (v == null ? "—" : unit ? `${formatSignedLength(v, unit)} ${unit}` : String(v));
