import { Decimal, dec, type DecimalLike } from "./decimal";

export type LengthUnit = "in" | "mm";

/** Both length units, first-class. */
export const LENGTH_UNITS = ["in", "mm"] as const satisfies readonly LengthUnit[];

/** 1 in = 25.4 mm exactly (international yard and pound agreement, 1959). */
export const MM_PER_INCH = new Decimal("25.4");

const Precise = Decimal.clone({ precision: 40 });

/** ISO 1 reference temperature for dimensional measurement, °C. */
export const REFERENCE_TEMPERATURE_C = 20;

/** Display decimals by unit: a tenth (0.0001 in) and a micrometre (0.001 mm). */
export const DEFAULT_DECIMALS: Record<LengthUnit, number> = { in: 4, mm: 3 };

/** Convert a length between inch and millimetre; in→mm is exact, mm→in is exact whenever the result terminates. */
export function convertLength(value: DecimalLike, from: LengthUnit, to: LengthUnit): Decimal {
  const v = dec(value);
  if (from === to) return v;
  if (from === "in") return v.times(MM_PER_INCH);
  // 1/25.4 does not terminate: dividing at 40 significant digits is exact whenever the inch value terminates
  // (28.575 mm is exactly 1.125 in) and otherwise far below any gauge's resolution.
  return new Decimal(new Precise(v.toString()).div(MM_PER_INCH.toString()).toString());
}

/** Length as display text, rounded half-up to the unit's customary decimals (display only, never stored). */
export function formatLength(value: DecimalLike, unit: LengthUnit, decimals: number = DEFAULT_DECIMALS[unit]): string {
  const text = dec(value).toFixed(decimals);
  // A value that rounds to zero shows as zero, never "-0.0000".
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** Length as display text with its unit symbol, e.g. "1.1250 in". */
export function formatLengthWithUnit(value: DecimalLike, unit: LengthUnit, decimals?: number): string {
  return `${formatLength(value, unit, decimals)} ${unit}`;
}

export type MaterialKey = "steel" | "aluminium" | "aluminium_2024" | "aluminium_7075" | "aluminium_356_cast";

export interface ExpansionCoefficient {
  key: MaterialKey;
  label: string;
  /** Linear expansion coefficient per kelvin, as exact decimal text. */
  alphaPerK: string;
  source: string;
}

const CALLISTER = "NIST J. Res.; Callister, Materials Science and Engineering, App. B";

/** Linear thermal expansion coefficients of the materials a shop meets, with their sources. */
export const EXPANSION_COEFFICIENTS: Record<MaterialKey, ExpansionCoefficient> = {
  steel: {
    key: "steel",
    label: "Steel",
    alphaPerK: "11.5e-6",
    source:
      "NIST Journal of Research (dimensional metrology); ISO 3650 requires (11.5 ± 1.0) × 10⁻⁶ /K for steel blocks (from memory)",
  },
  aluminium: { key: "aluminium", label: "Aluminium (pure)", alphaPerK: "23.1e-6", source: CALLISTER },
  aluminium_2024: { key: "aluminium_2024", label: "Aluminium alloy 2024", alphaPerK: "22.9e-6", source: CALLISTER },
  aluminium_7075: { key: "aluminium_7075", label: "Aluminium alloy 7075", alphaPerK: "23.4e-6", source: CALLISTER },
  aluminium_356_cast: { key: "aluminium_356_cast", label: "Aluminium alloy 356.0 (cast)", alphaPerK: "21.5e-6", source: CALLISTER },
};

/** ΔL = L·α·(t − 20): how much longer a part is at tempC than at the ISO 1 reference temperature, in the unit of length. */
export function thermalExpansion(args: { length: DecimalLike; alphaPerK: DecimalLike; tempC: DecimalLike }): Decimal {
  return dec(args.length).times(dec(args.alphaPerK)).times(dec(args.tempC).minus(REFERENCE_TEMPERATURE_C));
}

/**
 * Correction to add to a reading taken at tempC to get the size at 20 °C, when part and tool expand differently:
 * −L·(α_part − α_tool)·(t − 20) (JCGM 100:2008 Annex H.1 model).
 */
export function correctionTo20C(args: {
  length: DecimalLike;
  alphaPart: DecimalLike;
  alphaTool: DecimalLike;
  tempC: DecimalLike;
}): Decimal {
  const alphaDiff = dec(args.alphaPart).minus(dec(args.alphaTool));
  return dec(args.length).times(alphaDiff).times(dec(args.tempC).minus(REFERENCE_TEMPERATURE_C)).negated();
}
