// Re-judging one affected reading of an investigation with the same rules as the check sheet (judging.ts): its own
// place and every place it feeds (clearances it is a side of, tapers it is a station of), over the error band of the
// tool found out of tolerance (product.md, capability 5). Pure: one reading, the tool's errors and its sibling readings
// (the other readings of the same job and index), so a streaming pass can call it reading by reading.
import { Decimal, dec, num } from "../common/decimal";
import { convertLength, type LengthUnit } from "../common/units";
import {
  dependentItems,
  judgeReading,
  judgeRow,
  lengthText,
  clearanceText,
  leafSource,
  readingSource,
  type ItemRules,
  type JudgingContext,
  type Judged,
  type PlaceView,
  type ReadingEvidence,
  type Verdict,
} from "../inspection/judging";
import type { LeafStack } from "../inspection/feeler";
import { errorBand, judgeOverBand, nearestPoint, pointsIn, type ErrorVariable, type SourceMap, type ToolErrorPoint, type ToolErrors } from "./rejudge";

export { nearestPoint, type ToolErrorPoint, type ToolErrors } from "./rejudge";

/** A stored reading under review: its evidence, the tools that took it and the verdict it was recorded with. */
export interface ReviewedReading extends ReadingEvidence {
  id: string;
  toolIds: string[];
  recordedVerdict: Verdict;
}

/** One place re-judged, for the investigation page and report. */
export interface PlaceRejudgement {
  itemKey: string;
  label: string;
  kind: PlaceView["kind"];
  /** The quantity judged there, in words ("diameter", "loosest fit", …), its value as read and its span over the band. */
  quantity: string;
  value: number | null;
  low: number | null;
  high: number | null;
  verdictNow: Verdict;
  couldChange: boolean;
  text: string;
}

export interface AffectedReadingJudgement {
  verdictCouldChange: boolean;
  /** What the reading measured: "diameter", "bore diameter", "gap", "visual". */
  quantity: string;
  /** That quantity as judged (at 20 °C when corrected); a clearance is never shown here. */
  measuredValue: number | null;
  /** With the error at the check point nearest its size (or the leaf's own finding): the most likely value. */
  correctedValue: number | null;
  /** The span it may have had over the error band. */
  bandLow: number | null;
  bandHigh: number | null;
  /** The reading's own place: least margin to a limit as read, and at the worst end of the band. */
  marginBefore: number | null;
  marginAfter: number | null;
  verdictNow: Verdict;
  places: PlaceRejudgement[];
  basis: string;
}

const QUANTITY: Record<string, string> = { journal: "diameter", bore: "bore diameter", feeler: "gap", visual: "visual finding" };
const WORDS: Record<Verdict, string> = { within_limits: "within limits", outside_limits: "outside limits", pending: "pending" };
const signed = (d: Decimal) => (d.gt(0) ? `+${d.toString()}` : d.toString());

/** A leaf's error band: its own finding (or the gap between the thickness used and the thickness found), plus U. */
function leafVariable(leaf: { id: string; thickness: number }, points: ToolErrorPoint[], setBand: Decimal): ErrorVariable {
  const p = points.find((x) => x.elementId === leaf.id);
  if (!p) return { id: leafSource(leaf.id), halfWidth: setBand, likely: null };
  const found = dec(p.nominal).plus(dec(p.error));
  const drift = found.minus(dec(leaf.thickness));
  const half = Decimal.max(dec(p.error).abs(), drift.abs()).plus(dec(p.uncertainty ?? 0).abs());
  return { id: leafSource(leaf.id), halfWidth: half, likely: drift };
}

/**
 * Re-judges one reading over the error band of one tool it named. The band is the largest |error| (plus U) found at
 * any check point in the tool's range, applied with both signs; where the same tool read both sides of a clearance (or
 * both stations of a taper) one error moves both sides. A verdict could change when any error in the band gives the
 * other verdict — an "outside" that could have been "within" included — or when the current rules already judge the
 * reading differently from how it was recorded.
 */
export function rejudgeAffectedReading(args: {
  reading: ReviewedReading;
  toolId: string;
  errors: ToolErrors;
  siblings: ReviewedReading[];
  items: ItemRules[];
  ctx: JudgingContext;
  /** The place's name as the sheet shows it ("Valve stem dia. no. 8"). */
  label?: (item: ItemRules, index: number) => string;
}): AffectedReadingJudgement {
  const { reading: r, ctx, items } = args;
  const unit = ctx.tableUnit;
  const label = args.label ?? ((i: ItemRules, n: number) => `${i.label} no. ${n}`);
  const item = items.find((i) => i.key === r.itemKey);
  const none = (basis: string): AffectedReadingJudgement => ({
    verdictCouldChange: false,
    quantity: "—",
    measuredValue: null,
    correctedValue: null,
    bandLow: null,
    bandHigh: null,
    marginBefore: null,
    marginAfter: null,
    verdictNow: "pending",
    places: [],
    basis,
  });
  if (!item || item.kind === "clearance" || item.kind === "taper") return none(`${r.itemKey}: the item is not on the job's limits table; nothing rests on this reading.`);

  const all = [r, ...args.siblings.filter((s) => s.id !== r.id)];
  const evidenceAt = (k: string, i: number) => all.find((x) => x.itemKey === k && x.index === i);
  const own = judgeReading(item, r, ctx);
  const fed = dependentItems(items, item.key)
    .map((d) => ({ d, j: judgeRow(items, d, r.index, evidenceAt, ctx) }))
    .filter((x) => x.j.view.kind !== "pending");
  const places: { item: ItemRules; j: Judged }[] = [{ item, j: own }, ...fed.map((x) => ({ item: x.d, j: x.j }))];

  // The variables: the tool's error (one for every reading it took), or each leaf's.
  const vars = new Map<string, ErrorVariable>();
  const sources: SourceMap = new Map();
  const band = errorBand(args.errors);
  const unknown = args.errors.points == null || args.errors.points.length === 0;
  let header: string;
  const ownSizeRaw = own.view.kind === "size" ? (item.kind === "journal" ? Decimal.min(...r.values.map(dec)) : Decimal.max(...r.values.map(dec))) : null;
  if (unknown) {
    header = "The tool's error is unknown (lost, or damaged with no calibration since), so no verdict resting on it can be trusted.";
  } else if (item.kind === "feeler" && r.feeler) {
    const pts = pointsIn(args.errors, unit)!;
    const setBand = errorBand({ unit, points: pts })!.halfWidth;
    const leaves = new Map<string, { id: string; label: string; thickness: number }>();
    for (const s of [r.feeler.go, r.feeler.noGo, r.feeler.gap]) for (const l of (s as LeafStack | null)?.leaves ?? []) leaves.set(l.id, l);
    const parts: string[] = [];
    for (const l of leaves.values()) {
      const v = leafVariable(l, pts, setBand);
      vars.set(v.id, v);
      sources.set(v.id, { variable: v.id, factor: new Decimal(1) });
      parts.push(`leaf ${l.label} (${lengthText(l.thickness, unit)} used) ±${lengthText(v.halfWidth, unit)}${v.likely ? `, found ${signed(v.likely)} from the thickness used` : " (no point of its own: the set's largest)"}`);
    }
    header = `Each leaf's error band is its own finding (or the change from the thickness used to the thickness found), with its U: ${parts.join("; ")}.`;
  } else {
    const near = ownSizeRaw ? nearestPoint(args.errors.points!, num(convertLength(ownSizeRaw, r.unit, args.errors.unit))) : null;
    vars.set("tool", { id: "tool", halfWidth: band!.halfWidth, likely: near ? dec(near.error) : null });
    for (const x of all) {
      if (!x.toolIds.includes(args.toolId)) continue;
      sources.set(readingSource(x.itemKey, x.index), { variable: "tool", factor: convertLength(1, args.errors.unit, x.unit) });
    }
    const w = band!.worst;
    header =
      `Error band ±${band!.halfWidth.toString()} ${args.errors.unit}: the largest |error| found at any check point in the tool's range ` +
      `(${signed(dec(w.error))} ${args.errors.unit} at ${dec(w.nominal).toString()} ${args.errors.unit}${w.uncertainty ? `, U ${dec(w.uncertainty).toString()}` : ""}), applied with both signs.` +
      (near ? ` Most likely error, at the check point nearest the size: ${signed(dec(near.error))} ${args.errors.unit} at ${dec(near.nominal).toString()} ${args.errors.unit}.` : "");
  }

  const judged = places.map(({ item: it, j }) => {
    const name = label(it, r.index);
    if (unknown) {
      const moves = j.checks.length > 0 && it.kind !== "visual";
      return { it, j, name, over: null, couldChange: moves, text: `${name}: ${WORDS[j.view.verdict]} as read; with the error unknown it could have been judged differently.` };
    }
    const over = judgeOverBand(j.checks, vars, sources);
    const moving = over.spans.filter((s) => s.moves);
    const fmt = (c: (typeof moving)[number]["check"], v: Decimal) => (c.shown === "clearance" ? clearanceText(v, unit) : lengthText(v, unit));
    const sameTool =
      j.view.kind === "fit" || j.view.kind === "taper"
        ? over.spans.every((s) => !s.moves) && j.checks.some((c) => c.sensitivity.filter((x) => sources.has(x.key)).length > 1)
        : false;
    const spanText = moving.length
      ? moving.map((s) => `${s.check.label} ${fmt(s.check, s.check.value)} could be ${fmt(s.check, s.low)} to ${fmt(s.check, s.high)}`).join("; ")
      : sameTool
        ? "the same tool read both sides, so its error moves them together and this does not move"
        : "nothing here rests on this tool";
    const text = `${name}: ${WORDS[over.verdictNow]} as read; ${spanText}${over.couldChange ? " — that crosses a limit, so the verdict could change." : " — the verdict holds over the whole band."}`;
    return { it, j, name, over, couldChange: over.couldChange, text };
  });

  // The reading's own quantity: the size it read (never a clearance), or the gap its leaves proved.
  const ownJ = judged[0];
  const ownView = own.view;
  let measured: Decimal | null = null;
  let span: { low: Decimal; high: Decimal; likely: Decimal } | null = null;
  if (ownView.kind === "size") {
    measured = dec(ownView.size);
    const sizeCheck = own.checks.find((c) => c.value.eq(measured!) && c.label.startsWith("direction"));
    const s = sizeCheck && ownJ.over ? ownJ.over.spans.find((x) => x.check === sizeCheck) : null;
    if (s) span = s;
  } else if (ownView.kind === "feeler") {
    const lowCheck = own.checks.find((c) => c.value.isFinite() && c.sensitivity.length > 0);
    if (lowCheck) {
      measured = lowCheck.value;
      const s = ownJ.over?.spans.find((x) => x.check === lowCheck);
      if (s) span = s;
    }
  }
  const recordedDiffers = r.recordedVerdict !== "pending" && own.view.verdict !== "pending" && r.recordedVerdict !== own.view.verdict;
  const notes: string[] = [];
  if (recordedDiffers) notes.push(`Under the current rules this reading is judged ${WORDS[own.view.verdict]}; it was recorded ${WORDS[r.recordedVerdict]}. ${own.view.text}.`);
  const couldChange = recordedDiffers || judged.some((x) => x.couldChange);
  // Each place is shown by the quantity that comes nearest a limit over the band (the one that decides it).
  const worstOf = (spans: NonNullable<(typeof judged)[number]["over"]>["spans"]) => {
    let best: (typeof spans)[number] | null = null;
    let bestMargin: Decimal | null = null;
    for (const sp of spans.filter((x) => x.low.isFinite() && x.high.isFinite())) {
      const m = [sp.check.min == null ? null : sp.low.minus(sp.check.min), sp.check.max == null ? null : sp.check.max.minus(sp.high)].filter((v): v is Decimal => v != null);
      const least = m.length ? Decimal.min(...m) : null;
      if (best == null || (least != null && (bestMargin == null || least.lt(bestMargin)))) [best, bestMargin] = [sp, least];
    }
    return best;
  };
  const placeViews: PlaceRejudgement[] = judged.map((x) => {
    const first = x.over ? (worstOf(x.over.spans.filter((s) => s.moves)) ?? worstOf(x.over.spans)) : null;
    return {
      itemKey: x.it.key,
      label: x.name,
      kind: x.j.view.kind,
      quantity: first ? first.check.label : QUANTITY[x.it.kind] ?? x.it.kind,
      value: first && first.check.value.isFinite() ? num(first.check.value) : null,
      low: first && first.low.isFinite() ? num(first.low) : null,
      high: first && first.high.isFinite() ? num(first.high) : null,
      verdictNow: x.j.view.verdict,
      couldChange: x.couldChange,
      text: x.text,
    };
  });
  return {
    verdictCouldChange: couldChange,
    quantity: QUANTITY[item.kind] ?? item.kind,
    measuredValue: measured ? num(measured) : null,
    correctedValue: span && !unknown && vars.size ? num(span.likely) : null,
    bandLow: span && !unknown ? num(span.low) : null,
    bandHigh: span && !unknown ? num(span.high) : null,
    marginBefore: own.view.margin,
    marginAfter: ownJ.over?.worstMargin != null ? num(ownJ.over.worstMargin) : null,
    verdictNow: own.view.verdict,
    places: placeViews,
    basis: [header, ...notes, ...judged.map((x) => x.text)].join(" "),
  };
}
