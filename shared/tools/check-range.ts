import { dec, type DecimalLike } from "../common/decimal";

/** What a check needs to know of its tool: the range it reads. */
export interface CheckRangeTool {
  assetTag: string;
  unit: string;
  rangeMin: DecimalLike;
  rangeMax: DecimalLike;
}

/**
 * The refusal of a check point the tool cannot read (nominal 0 on a 1–2 in micrometer, 500 on a 0–1 in one),
 * or null when the point lies inside the tool's range. A zero check, an intermediate check and the forms that
 * make them all ask this one question (common practice, no source: a check is made on a point the tool measures).
 */
export function checkPointOutsideRange(nominal: DecimalLike, tool: CheckRangeTool): string | null {
  const n = dec(nominal);
  if (n.gte(dec(tool.rangeMin)) && n.lte(dec(tool.rangeMax))) return null;
  const lo = dec(tool.rangeMin).toString();
  const hi = dec(tool.rangeMax).toString();
  const zero = n.isZero() ? ` It does not close to zero: check it on a setting standard of ${lo} ${tool.unit} or more.` : "";
  return `The check point ${n.toString()} ${tool.unit} is outside the range of ${tool.assetTag} (${lo}–${hi} ${tool.unit}).${zero}`;
}
