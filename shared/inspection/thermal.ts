// Correction of lengths to the 20 °C reference temperature (ISO 1), used in the verdict when a part temperature and
// the part's expansion coefficient are known.
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { EXPANSION_COEFFICIENTS, REFERENCE_TEMPERATURE_C, type MaterialKey } from "../common/units";

/** Where the part's expansion coefficient came from: the limits-table item, the table, or the material named on the reading. */
export type ExpansionSource = "item" | "table" | "reading";

export interface ThermalBasis {
  /** Part's linear expansion coefficient per kelvin, exact decimal text. */
  alphaPerK: string;
  source: ExpansionSource;
  /** Set when the coefficient is the one of a material named on the reading. */
  material: MaterialKey | null;
  partTemperatureC: number;
  toolTemperatureC: number;
  /**
   * Length at 20 °C = length read × factor. A steel tool and the part each expand on their own:
   * factor = 1 + α_tool·(t_tool − 20) − α_part·(t_part − 20); at one temperature this is the JCGM 100:2008 H.1 model
   * 1 − (α_part − α_tool)·(t − 20).
   */
  factor: Decimal;
}

const STEEL = dec(EXPANSION_COEFFICIENTS.steel.alphaPerK);

/**
 * The correction basis of a reading, or null when it cannot be corrected (no part temperature, or no coefficient
 * known). The table's coefficient (item, then table) comes before a material named on the reading: limits and
 * materials come from the manufacturer's data.
 */
export function thermalBasis(args: {
  itemExpansionPerK?: DecimalLike | null;
  tableExpansionPerK?: DecimalLike | null;
  partMaterial?: MaterialKey | null;
  temperatureC?: DecimalLike | null;
  toolTemperatureC?: DecimalLike | null;
}): ThermalBasis | null {
  if (args.temperatureC == null) return null;
  let alpha: Decimal | null = null;
  let source: ExpansionSource | null = null;
  let material: MaterialKey | null = null;
  if (args.itemExpansionPerK != null) [alpha, source] = [dec(args.itemExpansionPerK), "item"];
  else if (args.tableExpansionPerK != null) [alpha, source] = [dec(args.tableExpansionPerK), "table"];
  else if (args.partMaterial != null && EXPANSION_COEFFICIENTS[args.partMaterial]) {
    [alpha, source, material] = [dec(EXPANSION_COEFFICIENTS[args.partMaterial].alphaPerK), "reading", args.partMaterial];
  }
  if (alpha == null || source == null) return null;
  const tPart = dec(args.temperatureC);
  const tTool = args.toolTemperatureC == null ? tPart : dec(args.toolTemperatureC);
  const factor = new Decimal(1).plus(STEEL.times(tTool.minus(REFERENCE_TEMPERATURE_C))).minus(alpha.times(tPart.minus(REFERENCE_TEMPERATURE_C)));
  return { alphaPerK: alpha.toString(), source, material, partTemperatureC: num(tPart), toolTemperatureC: num(tTool), factor };
}

/** A length read at the reading's temperatures, brought to 20 °C (exact decimal). */
export function at20C(length: DecimalLike, basis: ThermalBasis | null): Decimal {
  return basis ? dec(length).times(basis.factor) : dec(length);
}

/** Words for where the coefficient came from, for sheets and reports. */
export function expansionSourceText(b: ThermalBasis): string {
  // µm per metre per kelvin: the same number as "× 10⁻⁶ /K", in characters every report font prints.
  const alpha = `expansion ${dec(b.alphaPerK).times(1e6).toString()} µm/(m·K)`;
  if (b.source === "item") return `${alpha} from the limits table's item`;
  if (b.source === "table") return `${alpha} from the limits table`;
  return `${alpha} of ${EXPANSION_COEFFICIENTS[b.material!].label.toLowerCase()} named on the reading`;
}
