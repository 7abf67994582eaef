// The check sheet's arithmetic, shared by the server (which stores and prints it) and the tablet (which shows it live
// as the mechanic types). The rules themselves are in judging.ts; this file carries what the sheet adds around them.
import { Decimal, dec, type DecimalLike } from "../common/decimal";
import { convertLength, type LengthUnit, type MaterialKey } from "../common/units";
import { resolutionTooCoarse } from "./sizes";
import type { FeelerEvidence } from "./feeler";
import type { ItemRules, ReadingEvidence } from "./judging";

export { slotKey, judgeRow, judgeReading, dependentItems, JUDGING_RULES_VERSION } from "./judging";
export type { PlaceView, Verdict } from "./judging";

export type ReadingVerdict = "within_limits" | "outside_limits" | "pending";

/** Values read on a tool in its own unit, brought exactly to the table's unit (1 in = 25.4 mm). */
export function toTableUnit(values: DecimalLike[], from: LengthUnit, to: LengthUnit): Decimal[] {
  return values.map((v) => convertLength(v, from, to));
}

/** The tolerance band a tool checks on an item: new maximum − new minimum. */
export function itemTolerance(item: Pick<ItemRules, "min" | "max">): Decimal | null {
  if (item.min == null || item.max == null) return null;
  return dec(item.max).minus(dec(item.min));
}

/**
 * True when a tool's resolution (in its unit) is coarser than 1/ratio of the item's tolerance (in the table's unit);
 * the ratio is the shop's setting (10:1 by default, the common rule of thumb).
 */
export function resolutionFlag(item: Pick<ItemRules, "min" | "max">, resolution: DecimalLike, toolUnit: LengthUnit, tableUnit: LengthUnit, ratio: DecimalLike = 10): boolean {
  const tol = itemTolerance(item);
  if (tol == null || tol.lte(0)) return false;
  return resolutionTooCoarse(convertLength(resolution, toolUnit, tableUnit), tol, ratio);
}

/** True when every value lies inside a tool's range (both in the tool's unit). */
export function withinToolRange(values: DecimalLike[], rangeMin: DecimalLike, rangeMax: DecimalLike): boolean {
  return values.every((v) => dec(v).gte(dec(rangeMin)) && dec(v).lte(dec(rangeMax)));
}

/** What a saved reading (as the API shows it) holds as evidence for judging. */
export interface ReadingLike {
  itemKey: string;
  index: number;
  unit: LengthUnit;
  values: number[];
  temperatureC: number | null;
  toolTemperatureC: number | null;
  partMaterial: MaterialKey | null;
  visualResult: "serviceable" | "reject" | null;
  finding: string | null;
  feeler: FeelerEvidence | null;
}

/** A saved reading as judging evidence. */
export function evidenceOf(r: ReadingLike): ReadingEvidence {
  return {
    itemKey: r.itemKey,
    index: r.index,
    unit: r.unit,
    values: r.values,
    temperatureC: r.temperatureC,
    toolTemperatureC: r.toolTemperatureC,
    partMaterial: r.partMaterial,
    visualResult: r.visualResult,
    finding: r.finding,
    feeler: r.feeler,
  };
}
