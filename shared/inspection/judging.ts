// The rules that judge a part, one place (item × index) at a time. Every judged quantity becomes a "check": its exact
// value, the limits it is held to, and how it moves with the error of the tools (or leaves) it rests on. The sheet
// evaluates the checks as read; re-judging evaluates the same checks over a tool's error band — one set of rules for both.
import { Decimal, dec, num, type DecimalLike } from "../common/decimal";
import { convertLength, DEFAULT_DECIMALS, type LengthUnit, type MaterialKey } from "../common/units";
import { at20C, expansionSourceText, thermalBasis, type ExpansionSource, type ThermalBasis } from "./thermal";
import { describeStack, gapBounds, type FeelerEvidence, type LeafStack } from "./feeler";

/**
 * Version of the judging rules. 1: the size of a reading judged alone, the loosest fit only, diametral figures, no form
 * limits, feeler leaves outside the limits, raw lengths. 2: every two-point reading, both fits, radial limits, out-of-round
 * and taper, feeler leaves inside the limits, lengths corrected to 20 °C in the verdict.
 */
export const JUDGING_RULES_VERSION = 2;

export type Verdict = "within_limits" | "outside_limits" | "pending";
export type Band = "new" | "serviceable" | "reject";
export type ItemKind = "visual" | "journal" | "bore" | "clearance" | "feeler" | "taper";

/** What the rules need of a limits-table item. */
export interface ItemRules {
  key: string;
  label: string;
  kind: ItemKind;
  min: number | null;
  max: number | null;
  serviceableMin: number | null;
  serviceableMax: number | null;
  boreKey: string | null;
  journalKey: string | null;
  /** A taper item: the two size items (stations) whose difference it limits. */
  stationKeys: string[] | null;
  /** Clearance limits given as radial (half the diametral clearance). */
  radial: boolean;
  outOfRoundMax: number | null;
  /** The part's linear expansion coefficient per kelvin, when the table gives it for this item. */
  expansionPerK: number | null;
  directions: number;
  /** How many of the item the engine has (per cylinder, per valve…). */
  repeat: number;
}

/** A reading as stored: values as typed, in the unit of the tool that read them. */
export interface ReadingEvidence {
  itemKey: string;
  index: number;
  unit: LengthUnit;
  values: DecimalLike[];
  temperatureC?: DecimalLike | null;
  toolTemperatureC?: DecimalLike | null;
  partMaterial?: MaterialKey | null;
  visualResult?: "serviceable" | "reject" | null;
  finding?: string | null;
  feeler?: FeelerEvidence | null;
}

export interface JudgingContext {
  tableUnit: LengthUnit;
  /** The table's expansion coefficient for its parts, when it gives one for all items. */
  tableExpansionPerK: number | null;
}

/** Key of one place on the sheet: item × index. */
export const slotKey = (itemKey: string, index: number) => `${itemKey}#${index}`;
/** Sensitivity keys: the error of the tools of one reading, or of one leaf. */
export const readingSource = (itemKey: string, index: number) => `reading:${slotKey(itemKey, index)}`;
export const leafSource = (leafId: string) => `leaf:${leafId}`;

/** One judged quantity. value(e) = value + Σ coef·e over the error sources it rests on. */
export interface Check {
  label: string;
  value: Decimal;
  /** New limits, for the band. */
  newMin: Decimal | null;
  newMax: Decimal | null;
  /** The limits that decide acceptance (serviceable where wider). */
  min: Decimal | null;
  max: Decimal | null;
  /** How the value is written: a length, or a clearance ("loose"/"tight"). */
  shown: "length" | "clearance";
  sensitivity: { key: string; coef: Decimal }[];
}

const lowest = (...xs: (Decimal | null)[]) => xs.reduce<Decimal | null>((a, b) => (b == null ? a : a == null || b.lt(a) ? b : a), null);
const highest = (...xs: (Decimal | null)[]) => xs.reduce<Decimal | null>((a, b) => (b == null ? a : a == null || b.gt(a) ? b : a), null);
const opt = (x: DecimalLike | null | undefined) => (x == null ? null : dec(x));

/** Inside the deciding limits (a value on a limit is within it). */
export function checkWithin(c: Check, value: Decimal = c.value): boolean {
  return (c.min == null || value.gte(c.min)) && (c.max == null || value.lte(c.max));
}

export function checkBand(c: Check, value: Decimal = c.value): Band {
  if (!checkWithin(c, value)) return "reject";
  return (c.newMin == null || value.gte(c.newMin)) && (c.newMax == null || value.lte(c.newMax)) ? "new" : "serviceable";
}

/** Distance to the nearest deciding limit: positive inside, zero on it, negative outside; null when the check has no limit. */
export function checkMargin(c: Check, value: Decimal = c.value): Decimal | null {
  return lowest(c.min == null ? null : value.minus(c.min), c.max == null ? null : c.max.minus(value));
}

/** The verdict of a set of checks: outside when any is outside; the band is the worst; the margin the least. */
export function judgeChecks(checks: Check[], at: (c: Check) => Decimal = (c) => c.value): { verdict: Verdict; band: Band; margin: Decimal | null } {
  let band: Band = "new";
  let margin: Decimal | null = null;
  for (const c of checks) {
    const v = at(c);
    const b = checkBand(c, v);
    if (b === "reject" || (b === "serviceable" && band === "new")) band = b;
    margin = lowest(margin, checkMargin(c, v));
  }
  return { verdict: band === "reject" ? "outside_limits" : "within_limits", band, margin };
}

/** A length for a sheet: the unit's customary decimals, or up to two more when the exact value needs them. */
export function lengthText(value: DecimalLike, unit: LengthUnit): string {
  const d = dec(value);
  const places = Math.min(Math.max(DEFAULT_DECIMALS[unit], d.decimalPlaces()), DEFAULT_DECIMALS[unit] + 2);
  const text = d.toDecimalPlaces(places, Decimal.ROUND_HALF_UP).toFixed(places);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** A clearance for a sheet: "0.0026 loose", "0.0015 tight", "0.0000 line to line". */
export function clearanceText(value: DecimalLike, unit: LengthUnit): string {
  const d = dec(value);
  const text = lengthText(d.abs(), unit);
  return d.isZero() ? `${text} line to line` : `${text} ${d.isNegative() ? "tight" : "loose"}`;
}

const shown = (c: Check, v: Decimal, unit: LengthUnit) => (c.shown === "clearance" ? clearanceText(v, unit) : lengthText(v, unit));

/** How far a value lies beyond the limit it fails, or null inside. */
export function beyondOf(c: Check, value: Decimal = c.value): { side: "min" | "max"; limit: Decimal; serviceable: boolean; by: Decimal } | null {
  if (c.min != null && value.lt(c.min)) return { side: "min", limit: c.min, serviceable: c.newMin == null || !c.min.eq(c.newMin), by: c.min.minus(value) };
  if (c.max != null && value.gt(c.max)) return { side: "max", limit: c.max, serviceable: c.newMax == null || !c.max.eq(c.newMax), by: value.minus(c.max) };
  return null;
}

/** "direction 1 1.1252 is 0.0002 over the maximum 1.1250" */
export function failureText(c: Check, unit: LengthUnit, value: Decimal = c.value): string | null {
  const b = beyondOf(c, value);
  if (!b) return null;
  const limitWords = `${b.serviceable ? "serviceable " : ""}${b.side === "max" ? "maximum" : "minimum"}`;
  return `${c.label} ${shown(c, value, unit)} is ${lengthText(b.by, unit)} ${b.side === "max" ? "over" : "under"} the ${limitWords} ${shown(c, b.limit, unit)}`;
}

/** The verdict in words: which limits decided, and for an outside place which quantity failed and by how much. */
export function verdictWords(checks: Check[], unit: LengthUnit, hasServiceable: boolean): string {
  const j = judgeChecks(checks);
  if (j.band === "new") return "Within new limits";
  if (j.band === "serviceable") return "Within serviceable limits (worn beyond new)";
  const failing = checks.filter((c) => !checkWithin(c));
  return `${outsideWords(failing.some((c) => beyondOf(c)?.serviceable), hasServiceable)}: ${failing.map((c) => failureText(c, unit)).join("; ")}`;
}

/** "Outside serviceable limits" when a serviceable limit failed; "Outside new limits" on a table with new limits only. */
function outsideWords(serviceableFailed: boolean | undefined, hasServiceable: boolean): string {
  return serviceableFailed ? "Outside serviceable limits" : hasServiceable ? "Outside limits" : "Outside new limits";
}

const hasServiceable = (i: Pick<ItemRules, "serviceableMin" | "serviceableMax">) => i.serviceableMin != null || i.serviceableMax != null;

/** The limits of a check from an item's new and serviceable limits; serviceable limits widen the new ones. */
function limitsOf(i: Pick<ItemRules, "min" | "max" | "serviceableMin" | "serviceableMax">, sides: { lower: boolean; upper: boolean }) {
  const newMin = sides.lower ? opt(i.min) : null;
  const newMax = sides.upper ? opt(i.max) : null;
  return { newMin, newMax, min: sides.lower ? lowest(newMin, opt(i.serviceableMin)) : null, max: sides.upper ? highest(newMax, opt(i.serviceableMax)) : null };
}

// ——— Views (what the API and the screens carry) ———

export interface BeyondView {
  side: "min" | "max";
  limit: number;
  serviceable: boolean;
  by: number;
}

const beyondView = (c: Check, v?: Decimal): BeyondView | null => {
  const b = beyondOf(c, v);
  return b && { side: b.side, limit: num(b.limit), serviceable: b.serviceable, by: num(b.by) };
};

export interface ThermalView {
  alphaPerK: number;
  source: ExpansionSource;
  material: MaterialKey | null;
  partTemperatureC: number;
  toolTemperatureC: number;
  /** Correction added to the size as read for its length at 20 °C (ISO 1). */
  correction: number;
  text: string;
}

export interface DirectionView {
  direction: number;
  /** As typed, in the unit of the tool that read it. */
  raw: number;
  rawUnit: LengthUnit;
  /** In the table's unit, as read. */
  inTableUnit: number;
  /** As judged: in the table's unit, at 20 °C when corrected. */
  value: number;
  verdict: Verdict;
  band: Band;
  beyond: BeyondView | null;
}

interface PlaceBase {
  itemKey: string;
  index: number;
  verdict: Verdict;
  band: Band | null;
  margin: number | null;
  /** The verdict in words: which limits decided; when outside, what failed and by how much. */
  text: string;
}

export interface SizePlace extends PlaceBase {
  kind: "size";
  directions: DirectionView[];
  /** Smallest journal or largest bore reading, as judged (at 20 °C when corrected). */
  size: number;
  /** The same, as read (table unit, uncorrected). */
  rawSize: number;
  smallest: number;
  largest: number;
  outOfRound: number;
  outOfRoundLimit: number | null;
  outOfRoundVerdict: Verdict | null;
  outOfRoundBeyond: number | null;
  thermal: ThermalView | null;
}

export interface FitSideView {
  /** In the table's terms: radial when the table says radial, else diametral. */
  value: number;
  diametral: number;
  boreValue: number;
  journalValue: number;
  verdict: Verdict;
  band: Band;
  /** The new and serviceable limits this side is judged against (maximum for the loosest, minimum for the tightest). */
  limit: number | null;
  serviceableLimit: number | null;
  beyond: BeyondView | null;
  margin: number | null;
}

export interface FitPlace extends PlaceBase {
  kind: "fit";
  basis: "diametral" | "radial";
  /** Largest bore − smallest journal, judged against the maximum and serviceable maximum. */
  loosest: FitSideView;
  /** Smallest bore − largest journal, judged against the minimum. */
  tightest: FitSideView;
}

export interface TaperPlace extends PlaceBase {
  kind: "taper";
  stations: [string, string];
  /** Largest difference between the two stations read in the same direction. */
  taper: number;
  limit: number | null;
  serviceableLimit: number | null;
  directions: { direction: number; a: number; b: number; difference: number }[];
}

export interface FeelerPlace extends PlaceBase {
  kind: "feeler";
  mode: "go_no_go" | "measured_gap";
  go: LeafStack | null;
  noGo: LeafStack | null;
  goEntered: boolean | null;
  noGoEntered: boolean | null;
  gap: LeafStack | null;
  /** What the check proves: the gap is at least gapLow and less than gapHigh (null: unbounded on that side). */
  gapLow: number | null;
  gapHigh: number | null;
  why: string | null;
}

export interface VisualPlace extends PlaceBase {
  kind: "visual";
}

export interface PendingPlace extends PlaceBase {
  kind: "pending";
}

export type PlaceView = SizePlace | FitPlace | TaperPlace | FeelerPlace | VisualPlace | PendingPlace;

/** A judged place with what re-judging needs; `view` is what the API and screens carry. */
export interface Judged<V extends PlaceView = PlaceView> {
  view: V;
  checks: Check[];
  /** Size places: judged value = scale × value as typed (unit conversion and 20 °C correction), for re-judging. */
  scale?: Decimal;
}

const pending = (itemKey: string, index: number, text: string): Judged<PendingPlace> => ({
  view: { kind: "pending", itemKey, index, verdict: "pending", band: null, margin: null, text },
  checks: [],
});

// ——— Size: every two-point reading, out-of-round, 20 °C ———

/**
 * A journal or bore reading: every value (one per direction) is judged against the size limits — one reading outside
 * puts the place outside (ISO 14405-1 default two-point size; ISO 8015, from memory). The size (smallest journal,
 * largest bore) is kept for clearances and wear; out-of-round (largest − smallest) is judged when the item limits it.
 * With a part temperature and an expansion coefficient, every value is judged at 20 °C (ISO 1).
 */
export function judgeSize(item: ItemRules, ev: ReadingEvidence, ctx: JudgingContext): Judged<SizePlace> | Judged<PendingPlace> {
  if (item.kind !== "journal" && item.kind !== "bore") throw new RangeError(`A ${item.kind} item has no size`);
  if (ev.values.length === 0) return pending(item.key, ev.index, "Pending");
  const unit = ctx.tableUnit;
  const basis = thermalBasis({
    itemExpansionPerK: item.expansionPerK,
    tableExpansionPerK: ctx.tableExpansionPerK,
    partMaterial: ev.partMaterial,
    temperatureC: ev.temperatureC,
    toolTemperatureC: ev.toolTemperatureC,
  });
  const toTable = convertLength(1, ev.unit, unit);
  const scale = basis ? toTable.times(basis.factor) : toTable;
  const src = readingSource(item.key, ev.index);
  const limits = limitsOf(item, { lower: true, upper: true });
  const raws = ev.values.map(dec);
  const inTable = raws.map((v) => convertLength(v, ev.unit, unit));
  const judged = inTable.map((v) => at20C(v, basis));
  const checks: Check[] = judged.map((v, i) => ({
    label: `direction ${i + 1}`,
    value: v,
    ...limits,
    shown: "length",
    sensitivity: [{ key: src, coef: scale.negated() }],
  }));
  const smallest = Decimal.min(...judged);
  const largest = Decimal.max(...judged);
  const oor = largest.minus(smallest);
  let oorCheck: Check | null = null;
  if (item.outOfRoundMax != null) {
    // One tool reads every direction, so its error moves them together: out-of-round does not move with it.
    oorCheck = { label: "out-of-round", value: oor, newMin: null, newMax: dec(item.outOfRoundMax), min: null, max: dec(item.outOfRoundMax), shown: "length", sensitivity: [] };
    checks.push(oorCheck);
  }
  const j = judgeChecks(checks);
  const rawSize = item.kind === "journal" ? Decimal.min(...inTable) : Decimal.max(...inTable);
  const size = item.kind === "journal" ? smallest : largest;
  const directions: DirectionView[] = judged.map((v, i) => ({
    direction: i + 1,
    raw: num(raws[i]),
    rawUnit: ev.unit,
    inTableUnit: num(inTable[i]),
    value: num(v),
    verdict: checkWithin(checks[i]) ? "within_limits" : "outside_limits",
    band: checkBand(checks[i]),
    beyond: beyondView(checks[i]),
  }));
  let text = verdictWords(checks, unit, hasServiceable(item));
  if (basis) text += ` (at 20 °C)`;
  return {
    view: {
      kind: "size",
      itemKey: item.key,
      index: ev.index,
      verdict: j.verdict,
      band: j.band,
      margin: j.margin == null ? null : num(j.margin),
      text,
      directions,
      size: num(size),
      rawSize: num(rawSize),
      smallest: num(smallest),
      largest: num(largest),
      outOfRound: num(oor),
      outOfRoundLimit: item.outOfRoundMax,
      outOfRoundVerdict: oorCheck ? (checkWithin(oorCheck) ? "within_limits" : "outside_limits") : null,
      outOfRoundBeyond: oorCheck ? (beyondOf(oorCheck) ? num(beyondOf(oorCheck)!.by) : null) : null,
      thermal: basis ? thermalView(basis, rawSize) : null,
    },
    checks,
    scale,
  };
}

function thermalView(b: ThermalBasis, rawSize: Decimal): ThermalView {
  return {
    alphaPerK: Number(b.alphaPerK),
    source: b.source,
    material: b.material,
    partTemperatureC: b.partTemperatureC,
    toolTemperatureC: b.toolTemperatureC,
    correction: num(at20C(rawSize, b).minus(rawSize)),
    text: `Corrected to 20 °C (ISO 1): part at ${b.partTemperatureC} °C${b.toolTemperatureC !== b.partTemperatureC ? `, steel tool at ${b.toolTemperatureC} °C` : " with a steel tool"}; ${expansionSourceText(b)}.`,
  };
}

// ——— Clearance: both fits, diametral or radial ———

/**
 * A clearance from its bore and journal readings of the same index. Clearance = bore − journal (negative is
 * interference). The loosest fit (largest bore − smallest journal) is judged against the maximum and serviceable
 * maximum, the tightest (smallest bore − largest journal) against the minimum (common practice). Where the table says
 * radial, both are half the diametral clearance (common practice).
 */
export function judgeFit(item: ItemRules, bore: Judged<SizePlace>, journal: Judged<SizePlace>, ctx: JudgingContext, index: number): Judged<FitPlace> {
  const unit = ctx.tableUnit;
  const half = item.radial ? new Decimal("0.5") : new Decimal(1);
  const b = bore.view;
  const jn = journal.view;
  const bSrc = readingSource(b.itemKey, b.index);
  const jSrc = readingSource(jn.itemKey, jn.index);
  // A side known only by its stored view (shown, never re-judged) moves nothing.
  const sens = bore.scale && journal.scale
    ? [
        { key: bSrc, coef: bore.scale.negated().times(half) },
        { key: jSrc, coef: journal.scale.times(half) },
      ]
    : [];
  const basisWord = item.radial ? "radial" : "";
  const loosestD = dec(b.largest).minus(dec(jn.smallest));
  const tightestD = dec(b.smallest).minus(dec(jn.largest));
  const loose: Check = { label: `loosest fit${basisWord ? " (radial)" : ""}`, value: loosestD.times(half), ...limitsOf(item, { lower: false, upper: true }), shown: "clearance", sensitivity: sens };
  const tight: Check = { label: `tightest fit${basisWord ? " (radial)" : ""}`, value: tightestD.times(half), ...limitsOf(item, { lower: true, upper: false }), shown: "clearance", sensitivity: sens };
  const side = (c: Check, diametral: Decimal, bv: number, jv: number, upper: boolean): FitSideView => ({
    value: num(c.value),
    diametral: num(diametral),
    boreValue: bv,
    journalValue: jv,
    verdict: checkWithin(c) ? "within_limits" : "outside_limits",
    band: checkBand(c),
    limit: upper ? item.max : item.min,
    serviceableLimit: upper ? item.serviceableMax : item.serviceableMin,
    beyond: beyondView(c),
    margin: checkMargin(c) == null ? null : num(checkMargin(c)!),
  });
  const checks = [loose, tight];
  const j = judgeChecks(checks);
  return {
    view: {
      kind: "fit",
      itemKey: item.key,
      index,
      basis: item.radial ? "radial" : "diametral",
      verdict: j.verdict,
      band: j.band,
      margin: j.margin == null ? null : num(j.margin),
      text: verdictWords(checks, unit, hasServiceable(item)),
      loosest: side(loose, loosestD, b.largest, jn.smallest, true),
      tightest: side(tight, tightestD, b.smallest, jn.largest, false),
    },
    checks,
  };
}

// ——— Taper between two stations ———

/**
 * Taper between two stations (e.g. top and bottom of ring travel): the difference of the two stations read in the same
 * direction, the largest of them judged against the item's maximum (common practice).
 */
export function judgeTaper(item: ItemRules, a: Judged<SizePlace>, b: Judged<SizePlace>, ctx: JudgingContext, index: number, labels: [string, string]): Judged<TaperPlace> {
  const unit = ctx.tableUnit;
  const lim = limitsOf(item, { lower: false, upper: true });
  const aSrc = readingSource(a.view.itemKey, a.view.index);
  const bSrc = readingSource(b.view.itemKey, b.view.index);
  const n = Math.min(a.view.directions.length, b.view.directions.length);
  const checks: Check[] = [];
  const directions: TaperPlace["directions"] = [];
  let largest = new Decimal(0);
  for (let i = 0; i < n; i++) {
    const av = dec(a.view.directions[i].value);
    const bv = dec(b.view.directions[i].value);
    const d = av.minus(bv);
    directions.push({ direction: i + 1, a: num(av), b: num(bv), difference: num(d) });
    if (d.abs().gt(largest)) largest = d.abs();
    // |a − b| ≤ limit, written as two linear sides so re-judging can move it.
    checks.push({
      label: `taper, direction ${i + 1}`,
      value: d,
      newMin: lim.newMax?.negated() ?? null,
      newMax: lim.newMax,
      min: lim.max?.negated() ?? null,
      max: lim.max,
      shown: "length",
      sensitivity: a.scale && b.scale
        ? [
            { key: aSrc, coef: a.scale.negated() },
            { key: bSrc, coef: b.scale },
          ]
        : [],
    });
  }
  const j = judgeChecks(checks);
  // Words on the magnitude: a taper either way is a taper.
  const failing = checks.filter((c) => !checkWithin(c)).map((c) => {
    const limit = c.max!;
    return `${c.label} ${lengthText(c.value.abs(), unit)} is ${lengthText(c.value.abs().minus(limit), unit)} over the ${c.newMax && !limit.eq(c.newMax) ? "serviceable " : ""}maximum ${lengthText(limit, unit)}`;
  });
  const serviceableFailed = checks.some((c) => !checkWithin(c) && c.newMax != null && c.max != null && !c.max.eq(c.newMax));
  const text =
    j.band === "new" ? "Within new limits" : j.band === "serviceable" ? "Within serviceable limits (worn beyond new)" : `${outsideWords(serviceableFailed, hasServiceable(item))}: ${failing.join("; ")}`;
  return {
    view: {
      kind: "taper",
      itemKey: item.key,
      index,
      stations: labels,
      verdict: j.verdict,
      band: j.band,
      margin: j.margin == null ? null : num(j.margin),
      text,
      taper: num(largest),
      limit: item.max,
      serviceableLimit: item.serviceableMax,
      directions,
    },
    checks,
  };
}

// ——— Feeler ———

/**
 * A feeler check proves the gap at least as wide as the thickest leaf or stack that entered and narrower than the
 * thinnest that did not. It is within limits only when that span lies inside the limits (limit-gauge principle: the go
 * at or above the minimum must enter, the no-go at or below the maximum must not; ISO 1938-1 principle, from memory).
 * A measured gap (the thickest leaf or stack that enters) is judged as a value against the limits.
 */
export function judgeFeelerCheck(item: ItemRules, ev: ReadingEvidence, ctx: JudgingContext): Judged<FeelerPlace> | Judged<PendingPlace> {
  const f = ev.feeler;
  if (!f) return pending(item.key, ev.index, "Pending");
  const unit = ctx.tableUnit;
  const sens = (s: LeafStack) => s.leaves.map((l) => ({ key: leafSource(l.id), coef: new Decimal(1) }));
  const checks: Check[] = [];
  const { low, high, contradiction } = gapBounds(f);
  let text: string;
  if (f.mode === "measured_gap") {
    if (!f.gap) return pending(item.key, ev.index, "Pending");
    checks.push({ label: `measured gap (${describeStack(f.gap)})`, value: dec(f.gap.thickness), ...limitsOf(item, { lower: true, upper: true }), shown: "length", sensitivity: sens(f.gap) });
    text = verdictWords(checks, unit, hasServiceable(item));
  } else {
    if (f.goEntered == null || f.noGoEntered == null) return pending(item.key, ev.index, "Pending");
    const lo = limitsOf(item, { lower: true, upper: false });
    const hi = limitsOf(item, { lower: false, upper: true });
    // A side the check does not bound cannot be shown inside: it is judged as failing, on the limit it could not prove.
    const lowCheck: Check = low
      ? { label: `the gap (at least ${describeStack(low)})`, value: dec(low.thickness), ...lo, shown: "length", sensitivity: sens(low) }
      : { label: "the gap (nothing entered)", value: new Decimal(-Infinity), ...lo, shown: "length", sensitivity: [] };
    const highCheck: Check = high
      ? { label: `the gap (less than ${describeStack(high)})`, value: dec(high.thickness), ...hi, shown: "length", sensitivity: sens(high) }
      : { label: "the gap (everything entered)", value: new Decimal(Infinity), ...hi, shown: "length", sensitivity: [] };
    if (lowCheck.min != null) checks.push(lowCheck);
    if (highCheck.max != null) checks.push(highCheck);
    const j = judgeChecks(checks);
    if (contradiction) {
      text = "Outside limits: a thinner leaf did not enter but a thicker one did — clean the gap and the leaves and check again.";
    } else if (j.verdict === "within_limits") {
      text = j.band === "new" ? "Within new limits (go entered, no-go did not)" : "Within serviceable limits (go entered, no-go did not)";
    } else {
      const parts: string[] = [];
      if (!low) parts.push(`the go ${f.go ? describeStack(f.go) : ""} did not enter: the gap is too tight`.replace("  ", " "));
      else if (!checkWithin(lowCheck)) parts.push(`the thickest leaf that entered (${describeStack(low)}: ${lengthText(low.thickness, unit)} thick) is under the minimum ${lengthText(lowCheck.min!, unit)}, so the gap is not shown to reach it`);
      if (!high) parts.push(`the no-go ${f.noGo ? describeStack(f.noGo) : ""} entered: the gap is too loose`.replace("  ", " "));
      else if (!checkWithin(highCheck)) parts.push(`the thinnest leaf that refused (${describeStack(high)}: ${lengthText(high.thickness, unit)} thick) is over the maximum ${lengthText(highCheck.max!, unit)}, so the gap is not shown to stay under it`);
      text = `Outside limits: ${parts.join("; ")}`;
    }
    if (contradiction) {
      // The results cannot both be true: nothing is proven until the gap is checked again.
      checks.push({ label: "the two results (they contradict each other)", value: new Decimal(-1), newMin: new Decimal(0), newMax: null, min: new Decimal(0), max: null, shown: "length", sensitivity: [] });
    }
  }
  const j = judgeChecks(checks);
  const margin = j.margin != null && j.margin.isFinite() ? num(j.margin) : null;
  return {
    view: {
      kind: "feeler",
      itemKey: item.key,
      index: ev.index,
      verdict: j.verdict,
      band: j.band,
      margin,
      text,
      mode: f.mode,
      go: f.go,
      noGo: f.noGo,
      goEntered: f.goEntered,
      noGoEntered: f.noGoEntered,
      gap: f.gap,
      gapLow: low ? low.thickness : null,
      gapHigh: high ? high.thickness : null,
      why: f.why,
    },
    checks,
  };
}

// ——— One row of the sheet ———

/** A reading of its own place (size, feeler or visual), judged. */
export function judgeReading(item: ItemRules, ev: ReadingEvidence, ctx: JudgingContext): Judged {
  if (item.kind === "journal" || item.kind === "bore") return judgeSize(item, ev, ctx);
  if (item.kind === "feeler") return judgeFeelerCheck(item, ev, ctx);
  if (item.kind === "visual") {
    if (!ev.visualResult) return pending(item.key, ev.index, "Pending");
    const ok = ev.visualResult === "serviceable";
    return { view: { kind: "visual", itemKey: item.key, index: ev.index, verdict: ok ? "within_limits" : "outside_limits", band: ok ? "new" : "reject", margin: null, text: ok ? "Serviceable" : "Reject" }, checks: [] };
  }
  throw new RangeError(`A ${item.kind} is worked out from other readings, not read`);
}

/**
 * A place already judged under the current rules (a stored judgement's view, or one judged moments ago), so a sheet
 * does not judge a reading twice. Such a place carries no checks: it is for showing, never for re-judging.
 */
export type JudgedAt = (itemKey: string, index: number) => Judged | undefined;

/** A stored view of a place as a judged place for showing (no checks, no sensitivity). */
export const shownOnly = (view: PlaceView): Judged => ({ view, checks: [] });

/**
 * One place of the sheet (item × index), judged from the readings at hand — the one function the sheet, the PDF and a
 * keyboard grid call per row. `evidenceAt` gives the current reading (saved, or typed and not yet saved) of a place;
 * `judgedAt`, when given, answers first with a place already judged under the current rules (a saved reading's stored
 * judgement), so a sheet of a thousand readings judges each once — at recording — and only works out the fits and tapers.
 */
export function judgeRow(
  items: ItemRules[],
  item: ItemRules,
  index: number,
  evidenceAt: (itemKey: string, index: number) => ReadingEvidence | undefined,
  ctx: JudgingContext,
  judgedAt?: JudgedAt,
): Judged {
  const byKey = (k: string | null | undefined) => (k ? items.find((i) => i.key === k) : undefined);
  const sized = (k: string | null | undefined): Judged<SizePlace> | null => {
    const it = byKey(k);
    if (!it || (it.kind !== "journal" && it.kind !== "bore")) return null;
    const pre = judgedAt?.(it.key, index);
    if (pre) return pre.view.kind === "size" ? (pre as Judged<SizePlace>) : null;
    const ev = evidenceAt(it.key, index);
    if (!ev) return null;
    const j = judgeSize(it, ev, ctx);
    return j.view.kind === "size" ? (j as Judged<SizePlace>) : null;
  };
  if (item.kind === "clearance") {
    const bore = sized(item.boreKey);
    const journal = sized(item.journalKey);
    if (!bore || !journal) return pending(item.key, index, "Waiting for both sizes");
    return judgeFit(item, bore, journal, ctx, index);
  }
  if (item.kind === "taper") {
    const [ka, kb] = item.stationKeys ?? [];
    const a = sized(ka);
    const b = sized(kb);
    if (!a || !b) return pending(item.key, index, "Waiting for both stations");
    return judgeTaper(item, a, b, ctx, index, [byKey(ka)!.label, byKey(kb)!.label]);
  }
  const pre = judgedAt?.(item.key, index);
  if (pre) return pre;
  const ev = evidenceAt(item.key, index);
  if (!ev) return pending(item.key, index, "Pending");
  return judgeReading(item, ev, ctx);
}

/** The places a reading of `item` completes or feeds besides its own: clearances it is a side of, tapers it is a station of. */
export function dependentItems<T extends ItemRules>(items: T[], itemKey: string): T[] {
  return items.filter(
    (i) => (i.kind === "clearance" && (i.boreKey === itemKey || i.journalKey === itemKey)) || (i.kind === "taper" && (i.stationKeys ?? []).includes(itemKey)),
  );
}
