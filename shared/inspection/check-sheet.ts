// The check sheet's arithmetic, shared by the server (which stores and prints it)
// and the tablet (which shows it live as the mechanic types).
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { convertLength, correctionTo20C, thermalExpansion, EXPANSION_COEFFICIENTS, type LengthUnit, type MaterialKey } from "../common/units";
import { sizeFromValues, clearanceOf, judgeAgainstLimits, resolutionTooCoarse, type LimitJudgement } from "./sizes";

export type ReadingVerdict = "within_limits" | "outside_limits" | "pending";

/** The limits part of an item, as tables and the sheet carry it. */
export interface ItemLimits {
  kind: "visual" | "journal" | "bore" | "clearance" | "feeler";
  min: number | null;
  max: number | null;
  serviceableMin: number | null;
  serviceableMax: number | null;
}

const hasServiceable = (l: ItemLimits) => l.serviceableMin != null || l.serviceableMax != null;

/** Values read on a tool in its own unit, brought exactly to the table's unit (1 in = 25.4 mm). */
export function toTableUnit(values: DecimalLike[], from: LengthUnit, to: LengthUnit): Decimal[] {
  return values.map((v) => convertLength(v, from, to));
}

export interface SizeOutcome {
  size: number;
  outOfRound: number;
  judgement: LimitJudgement;
}

/** Size (smallest for a journal, largest for a bore), out-of-round and verdict of one reading, in the table's unit. */
export function judgeSizeReading(item: ItemLimits, valuesInTableUnit: DecimalLike[]): SizeOutcome {
  if (item.kind !== "journal" && item.kind !== "bore") throw new RangeError(`A ${item.kind} item has no size`);
  const { size, outOfRound } = sizeFromValues(item.kind, valuesInTableUnit);
  return { size, outOfRound, judgement: judgeAgainstLimits({ value: size, ...item }) };
}

/** Clearance = bore size − journal size of the same index, judged against the clearance item's limits (exact). */
export function judgeClearanceItem(item: ItemLimits, boreSize: DecimalLike, journalSize: DecimalLike): { clearance: number; judgement: LimitJudgement } {
  const clearance = clearanceOf(boreSize, journalSize);
  return { clearance, judgement: judgeAgainstLimits({ value: clearance, ...item }) };
}

/** Which limits decided, in words: new limits, or the serviceable (wear) limit. */
export function verdictText(item: ItemLimits, judgement: LimitJudgement | null, verdict: ReadingVerdict = judgement?.verdict ?? "pending"): string {
  if (verdict === "pending" || !judgement) return verdict === "pending" ? "Pending" : verdict === "within_limits" ? "Within limits" : "Outside limits";
  if (judgement.band === "new") return "Within new limits";
  if (judgement.band === "serviceable") return "Within serviceable limits (worn beyond new)";
  return hasServiceable(item) ? "Outside serviceable limits" : "Outside new limits";
}

/** The tolerance band a tool checks on an item: new maximum − new minimum. */
export function itemTolerance(item: Pick<ItemLimits, "min" | "max">): Decimal | null {
  if (item.min == null || item.max == null) return null;
  return dec(item.max).minus(dec(item.min));
}

/** True when a tool's resolution (in its unit) is coarser than a tenth of the item's tolerance (in the table's unit). */
export function resolutionFlag(item: ItemLimits, resolution: DecimalLike, toolUnit: LengthUnit, tableUnit: LengthUnit): boolean {
  const tol = itemTolerance(item);
  if (tol == null || tol.lte(0)) return false;
  return resolutionTooCoarse(convertLength(resolution, toolUnit, tableUnit), tol);
}

/** True when every value lies inside a tool's range (both in the tool's unit). */
export function withinToolRange(values: DecimalLike[], rangeMin: DecimalLike, rangeMax: DecimalLike): boolean {
  return values.every((v) => dec(v).gte(dec(rangeMin)) && dec(v).lte(dec(rangeMax)));
}

export interface TemperatureCorrection {
  /** ΔL to add to the raw size for its value at 20 °C. */
  correction: number;
  correctedSize: number;
  partMaterial: MaterialKey;
  temperatureC: number;
  toolTemperatureC: number;
}

/**
 * Correction of a size to the 20 °C reference (ISO 1), shown beside the raw value and never replacing it.
 * Part and steel tool at one temperature: −L·(α_part − α_tool)·(t − 20) (JCGM 100:2008 H.1); at two temperatures
 * each expands on its own: −L·α_part·(t_part − 20) + L·α_tool·(t_tool − 20).
 */
export function temperatureCorrection(args: {
  size: DecimalLike;
  partMaterial: MaterialKey | null | undefined;
  temperatureC: DecimalLike | null | undefined;
  toolTemperatureC?: DecimalLike | null;
  toolMaterial?: MaterialKey;
}): TemperatureCorrection | null {
  if (args.partMaterial == null || args.temperatureC == null) return null;
  const alphaPart = EXPANSION_COEFFICIENTS[args.partMaterial].alphaPerK;
  const alphaTool = EXPANSION_COEFFICIENTS[args.toolMaterial ?? "steel"].alphaPerK;
  const tPart = dec(args.temperatureC);
  const tTool = args.toolTemperatureC == null ? tPart : dec(args.toolTemperatureC);
  const correction = tTool.eq(tPart)
    ? correctionTo20C({ length: args.size, alphaPart, alphaTool, tempC: tPart })
    : thermalExpansion({ length: args.size, alphaPerK: alphaTool, tempC: tTool }).minus(thermalExpansion({ length: args.size, alphaPerK: alphaPart, tempC: tPart }));
  return {
    correction: num(correction),
    correctedSize: num(dec(args.size).plus(correction)),
    partMaterial: args.partMaterial,
    temperatureC: num(tPart),
    toolTemperatureC: num(tTool),
  };
}

/** One saved (or draft) reading, as the sheet needs it for clearances. */
export interface SheetReading {
  itemKey: string;
  index: number;
  size: number | null;
}

export interface ClearanceOutcome {
  clearance: number | null;
  judgement: LimitJudgement | null;
  verdict: ReadingVerdict;
}

/** A clearance item's value at one index, once both its bore and its journal have a size; pending until then. */
export function clearanceAt(
  item: ItemLimits & { boreKey: string | null; journalKey: string | null },
  index: number,
  current: (itemKey: string, index: number) => SheetReading | undefined,
): ClearanceOutcome {
  const bore = item.boreKey ? current(item.boreKey, index) : undefined;
  const journal = item.journalKey ? current(item.journalKey, index) : undefined;
  if (bore?.size == null || journal?.size == null) return { clearance: null, judgement: null, verdict: "pending" };
  const { clearance, judgement } = judgeClearanceItem(item, bore.size, journal.size);
  return { clearance, judgement, verdict: judgement.verdict };
}

/** Key of one place on the sheet: item × index. */
export const slotKey = (itemKey: string, index: number) => `${itemKey}#${index}`;
