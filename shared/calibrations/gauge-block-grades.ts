// Limit deviations of length of gauge blocks from their nominal length, by grade (ISO 3650:1998 Table 5).
import type { LengthUnit } from "../common/units";
import { convertLength } from "../common/units";
import { dec, type DecimalLike } from "../common/decimal";

export const GAUGE_BLOCK_GRADES = ["K", "0", "1", "2"] as const;
export type GaugeBlockGrade = (typeof GAUGE_BLOCK_GRADES)[number];

/**
 * ± te in micrometres for nominal lengths "above … up to and including …" (ISO 3650:1998; reference-values.md).
 * Grade K values are from memory. Only the rows Tenthwise needs (0.5 mm to 100 mm) are encoded.
 */
const ROWS: { above: number; upTo: number; te: Record<GaugeBlockGrade, string> }[] = [
  { above: 0.5, upTo: 10, te: { K: "0.20", "0": "0.12", "1": "0.20", "2": "0.45" } },
  { above: 10, upTo: 25, te: { K: "0.30", "0": "0.14", "1": "0.30", "2": "0.60" } },
  { above: 25, upTo: 50, te: { K: "0.40", "0": "0.20", "1": "0.40", "2": "0.80" } },
  { above: 50, upTo: 75, te: { K: "0.50", "0": "0.25", "1": "0.50", "2": "1.00" } },
  { above: 75, upTo: 100, te: { K: "0.60", "0": "0.30", "1": "0.60", "2": "1.20" } },
];

/** The grade as written on a standard ("0", "grade 1", "K"), or null when it is not an ISO 3650 grade. */
export function gaugeBlockGrade(text: string | null | undefined): GaugeBlockGrade | null {
  const t = (text ?? "").trim().toUpperCase().replace(/^GRADE\s*/, "");
  return (GAUGE_BLOCK_GRADES as readonly string[]).includes(t) ? (t as GaugeBlockGrade) : null;
}

/**
 * ± te of a block of the given nominal length and grade, in `unit` (the length is placed in its row in millimetres,
 * exactly: 1 in = 25.4 mm). Null outside the encoded rows. The first row includes 0.5 mm itself.
 */
export function gaugeBlockTolerance(nominal: DecimalLike, unit: LengthUnit, grade: GaugeBlockGrade): number | null {
  const mm = convertLength(nominal, unit, "mm");
  const row = ROWS.find((r, i) => (i === 0 ? mm.gte(r.above) : mm.gt(r.above)) && mm.lte(r.upTo));
  if (!row) return null;
  const teMm = dec(row.te[grade]).div(1000);
  return convertLength(teMm, "mm", unit).toNumber();
}
