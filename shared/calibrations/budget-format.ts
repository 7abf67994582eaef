// How a budget reads on a page and in a PDF: the same words and digits in both (display only).
import type { LengthUnit } from "../common/units";
import type { BudgetComponent, UncertaintyBudget } from "./uncertainty";

const SMALL: Record<LengthUnit, { factor: number; symbol: string }> = { mm: { factor: 1000, symbol: "µm" }, in: { factor: 1e6, symbol: "µin" } };

// Only glyphs the report font (Noto Sans, Latin) carries: no Greek, radicals, superscript minus or infinity.

/** Three significant digits; very small or large numbers in e-notation ("1.00e-6"). */
export function sig3(x: number): string {
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(3)));
  return x.toExponential(2);
}

/** A small length in the unit a budget is read in: micrometres for a metric tool, microinches for an inch tool. */
export function budgetLength(x: number, unit: LengthUnit): string {
  const s = SMALL[unit];
  return `${sig3(x * s.factor)} ${s.symbol}`;
}

export const DISTRIBUTION_LABELS: Record<BudgetComponent["distribution"], string> = { normal: "normal", rectangular: "rectangular", t: "t (Type A)" };

/** The stated quantity of a row: a certificate's U, a half-width, a resolution, an experimental s. */
export function budgetQuantity(c: BudgetComponent, unit: LengthUnit): string {
  if (c.quantityUnit === "celsius") return `± ${sig3(c.quantity)} °C`;
  if (c.quantityUnit === "per_kelvin") return `± ${sig3(c.quantity)} /K`;
  const prefix = c.kind === "standard" ? "U = " : c.kind === "resolution" ? "d = " : c.kind === "repeatability" ? "s = " : c.kind === "standard_grade" ? "± " : "";
  return `${prefix}${budgetLength(c.quantity, unit)}`;
}

/** The sensitivity coefficient with its unit: 1 for lengths; the length the thermal terms scale with. */
export function budgetSensitivity(c: BudgetComponent, unit: LengthUnit): string {
  const s = SMALL[unit];
  if (c.quantityUnit === "per_kelvin") return `${sig3(c.sensitivity * s.factor)} ${s.symbol}·K`;
  if (c.quantityUnit === "celsius") return `${sig3(c.sensitivity * s.factor)} ${s.symbol}/K`;
  return "1";
}

/** Degrees of freedom; "infinite" for a Type B estimate taken as exactly known. */
export const dofText = (dof: number | null) => (dof == null ? "infinite" : String(Math.round(dof * 10) / 10));

/** The closing lines of a budget: u_c, ν_eff, k, U. */
export function budgetSummary(b: UncertaintyBudget, stated: number | null): string {
  const p = `${(b.coverageProbability * 100).toFixed(2)} %`;
  return `u_c = ${budgetLength(b.combined, b.unit)} · effective degrees of freedom ${dofText(b.effectiveDof)} (Welch-Satterthwaite) · k = ${b.k.toFixed(2)} (${p}, t-distribution) · U = k·u_c = ${budgetLength(b.expanded, b.unit)}${stated != null ? `, stated ${budgetLength(stated, b.unit)}` : ""}`;
}
