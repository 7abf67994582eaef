// Uncertainties are estimates, not limits: plain floating point is adequate here (lengths judged against limits use Decimal).
import { convertLength, REFERENCE_TEMPERATURE_C, type LengthUnit } from "../common/units";

const SQRT3 = Math.sqrt(3);

/** Standard uncertainty of a quantity known only to lie within ± halfWidth: a/√3 (GUM 4.3.7). */
export function rectangularStandardUncertainty(halfWidth: number): number {
  return Math.abs(halfWidth) / SQRT3;
}

/** Standard uncertainty from a digital or graduated resolution d: d/(2√3) (GUM F.2.2.1). */
export function resolutionStandardUncertainty(resolution: number): number {
  return rectangularStandardUncertainty(resolution / 2);
}

/** Combined standard uncertainty of uncorrelated components with unit sensitivity: root sum of squares (GUM 5.1.2). */
export function combineStandardUncertainties(us: number[]): number {
  return Math.sqrt(us.reduce((sum, u) => sum + u * u, 0));
}

/** Expanded uncertainty U = k·u_c; k = 2 gives about 95 % coverage (GUM 6.2–6.3). */
export function expandedUncertainty(uc: number, k = 2): number {
  return k * uc;
}

/**
 * Default difference in expansion coefficient between a steel tool and steel standards when none is given:
 * ISO 3650 allows steel blocks (11.5 ± 1.0) × 10⁻⁶ /K (from memory), so 1 × 10⁻⁶ /K is a shop default (common practice, no source).
 */
export const DEFAULT_ALPHA_DIFF_PER_K = 1.0e-6;

export interface UncertaintyBudgetInput {
  /** Expanded uncertainty of the reference standard from its certificate, in `unit`. */
  standardU: number;
  /** Coverage factor stated on the certificate. */
  standardK: number;
  /** Resolution of the tool under test, in `unit`. */
  resolution: number;
  /** Nominal length measured, in millimetres (the temperature term is worked in mm, then converted to `unit`). */
  lengthMm?: number | null;
  /** Temperature during calibration, °C. */
  tempC?: number | null;
  /** |α_tool − α_standard| per kelvin; defaults to DEFAULT_ALPHA_DIFF_PER_K when a temperature is given. */
  alphaDiffPerK?: number | null;
  /** Half-width of the temperature's own uncertainty, °C; when given it replaces |t − 20| as the temperature span. */
  tempHalfWidthC?: number | null;
  /** Unit of standardU, resolution and the results; default "mm". */
  unit?: LengthUnit;
}

export interface UncertaintyComponent {
  name: string;
  u: number;
}

export interface UncertaintyBudget {
  components: UncertaintyComponent[];
  combined: number;
  expanded: number;
  k: 2;
}

/** Uncertainty budget of one calibration point: reference standard, resolution of the tool, and temperature; U at k = 2. */
export function uncertaintyBudget(input: UncertaintyBudgetInput): UncertaintyBudget {
  if (!(input.standardK > 0)) throw new RangeError("The certificate's coverage factor must be positive");
  const unit = input.unit ?? "mm";
  const components: UncertaintyComponent[] = [
    { name: "Reference standard (certificate U/k)", u: Math.abs(input.standardU) / input.standardK },
    { name: "Resolution of the tool under test", u: resolutionStandardUncertainty(input.resolution) },
  ];
  const hasTemperature = input.tempHalfWidthC != null || input.tempC != null;
  if (input.lengthMm != null && hasTemperature) {
    const alphaDiff = Math.abs(input.alphaDiffPerK ?? DEFAULT_ALPHA_DIFF_PER_K);
    const span = input.tempHalfWidthC != null ? Math.abs(input.tempHalfWidthC) : Math.abs(input.tempC! - REFERENCE_TEMPERATURE_C);
    const halfWidthMm = Math.abs(input.lengthMm) * alphaDiff * span;
    const halfWidth = unit === "mm" ? halfWidthMm : convertLength(halfWidthMm, "mm", unit).toNumber();
    components.push({ name: "Temperature (difference in expansion of tool and standard)", u: rectangularStandardUncertainty(halfWidth) });
  }
  const combined = combineStandardUncertainties(components.map((c) => c.u));
  return { components, combined, expanded: expandedUncertainty(combined, 2), k: 2 };
}
