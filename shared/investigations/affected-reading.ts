// Re-judging one affected reading of an investigation with every judgement it fed: its own size limits and
// each clearance it is a side of (product.md, capability 5). Builds on rejudgeReading.
import { dec, num } from "../common/decimal";
import { convertLength, type LengthUnit } from "../common/units";
import { clearanceOf } from "../inspection/sizes";
import { rejudgeReading, type RejudgeResult } from "./rejudge";

/** The error found at one check point of the tool (indication − reference), in the tool's unit. */
export interface ToolErrorPoint {
  nominal: number;
  error: number;
  /** Expanded uncertainty U (k = 2) of that point, when known. */
  uncertainty: number | null;
  /** The set element (feeler leaf, gauge block) the point was taken on. */
  elementId?: string | null;
}

/** What is known of the tool's error over the window: its points, or null when unknown (lost, damaged). */
export interface ToolErrors {
  unit: LengthUnit;
  points: ToolErrorPoint[] | null;
}

type LimitValues = { min: number | null; max: number | null; serviceableMin: number | null; serviceableMax: number | null };

export interface ReadingUnderReview {
  unit: LengthUnit;
  /** The size as judged (journal: smallest value; bore: largest); null for feeler and visual items. */
  size: number | null;
  kind: "journal" | "bore" | "clearance" | "feeler" | "visual";
  itemLabel: string;
  /** The reading's own size limits, when its item has any. */
  sizeLimits: LimitValues | null;
  /** Each clearance this reading is a side of, with the other side's size as read (null when not yet read). */
  clearances: { label: string; side: "bore" | "journal"; otherSize: number | null; limits: LimitValues }[];
  /** A feeler go/no-go reading: the leaves used and what happened. */
  feeler?: {
    goLeaf: { id: string; nominal: number } | null;
    noGoLeaf: { id: string; nominal: number } | null;
    goEntered: boolean | null;
    noGoEntered: boolean | null;
    limits: LimitValues;
  };
  /** The verdict the reading was given. */
  verdict: "within_limits" | "outside_limits" | "pending";
}

export interface AffectedReadingJudgement {
  verdictCouldChange: boolean;
  /** The judged quantity (size or clearance) of the deciding judgement. */
  measuredValue: number | null;
  correctedValue: number | null;
  marginBefore: number | null;
  marginAfter: number | null;
  basis: string;
}

const hasLimits = (l: LimitValues | null): l is LimitValues => !!l && [l.min, l.max, l.serviceableMin, l.serviceableMax].some((x) => x != null);

function signed(n: number): string {
  const d = dec(n);
  return d.gt(0) ? `+${d.toString()}` : d.toString();
}

/** Points converted into the reading's unit (1 in = 25.4 mm exactly). */
function pointsIn(errors: ToolErrors, unit: LengthUnit): ToolErrorPoint[] | null {
  if (!errors.points) return null;
  if (errors.unit === unit) return errors.points;
  const c = (x: number) => num(convertLength(x, errors.unit, unit));
  return errors.points.map((p) => ({ ...p, nominal: c(p.nominal), error: c(p.error), uncertainty: p.uncertainty == null ? null : c(p.uncertainty) }));
}

/** The point nearest a size (ties go to the larger error, as errorAtNearestPoint does). */
export function nearestPoint(points: ToolErrorPoint[], size: number): ToolErrorPoint | null {
  let best: ToolErrorPoint | null = null;
  let bestDistance = dec(0);
  for (const p of points) {
    const d = dec(p.nominal).minus(dec(size)).abs();
    if (best == null || d.lt(bestDistance) || (d.equals(bestDistance) && Math.abs(p.error) > Math.abs(best.error))) {
      best = p;
      bestDistance = d;
    }
  }
  return best;
}

/** The point with the largest |error| (sign kept): the conservative bound. */
export function largestPoint(points: ToolErrorPoint[]): ToolErrorPoint | null {
  let worst: ToolErrorPoint | null = null;
  for (const p of points) if (worst == null || Math.abs(p.error) > Math.abs(worst.error)) worst = p;
  return worst;
}

interface Judgement {
  label: string;
  measured: number;
  limits: LimitValues;
  effect: 1 | -1;
  /** The size the tool itself read: it picks the nearest check point. */
  toolSize: number;
}

interface Judged {
  j: Judgement;
  near: RejudgeResult;
  couldChange: boolean;
  text: string;
}

function judge(j: Judgement, points: ToolErrorPoint[] | null, unit: LengthUnit): Judged {
  if (!points || points.length === 0) {
    const near = rejudgeReading({ measured: j.measured, limits: j.limits, errorFound: null, effect: j.effect });
    return { j, near, couldChange: true, text: `${j.label}: ${near.basis}` };
  }
  const p = nearestPoint(points, j.toolSize)!;
  const worst = largestPoint(points)!;
  const near = rejudgeReading({ measured: j.measured, limits: j.limits, errorFound: p.error, uncertainty: p.uncertainty ?? 0, effect: j.effect });
  const u = (x: number | null) => (x ? ` (U ${dec(x).toString()} ${unit})` : "");
  let text = `${j.label}: error used ${signed(p.error)} ${unit}${u(p.uncertainty)}, at the check point nearest the size (${dec(p.nominal).toString()} ${unit}). ${near.basis}`;
  let couldChange = near.verdictCouldChange;
  if (worst === p || dec(worst.error).equals(dec(p.error))) {
    text += " That is also the largest error found.";
  } else {
    const bound = rejudgeReading({ measured: j.measured, limits: j.limits, errorFound: worst.error, uncertainty: worst.uncertainty ?? 0, effect: j.effect });
    couldChange ||= bound.verdictCouldChange;
    text +=
      ` Conservative bound with the largest error found (${signed(worst.error)} ${unit} at ${dec(worst.nominal).toString()} ${unit}): ` +
      (bound.verdictCouldChange ? "the verdict could have been different." : "the verdict holds.");
  }
  return { j, near, couldChange, text };
}

function feelerJudgement(r: ReadingUnderReview, points: ToolErrorPoint[] | null, unit: LengthUnit): AffectedReadingJudgement {
  const f = r.feeler!;
  const leafError = (leaf: { id: string; nominal: number } | null) => {
    if (!leaf || !points) return null;
    return points.find((p) => p.elementId === leaf.id) ?? nearestPoint(points, leaf.nominal);
  };
  if (!points) {
    return { verdictCouldChange: true, measuredValue: null, correctedValue: null, marginBefore: null, marginAfter: null, basis: `${r.itemLabel}: the leaves' errors are unknown, so the go/no-go result could have been different.` };
  }
  const go = leafError(f.goLeaf);
  const noGo = leafError(f.noGoLeaf);
  // Common practice: the go leaf (one size below the minimum) must enter and the no-go leaf (one size above the
  // maximum) must not. A go leaf that is really thinner, or a no-go leaf that is really thicker, proves less
  // than the check assumed.
  const goWeak = !!go && f.goEntered === true && go.error - (go.uncertainty ?? 0) < 0;
  const noGoWeak = !!noGo && f.noGoEntered === false && noGo.error + (noGo.uncertainty ?? 0) > 0;
  const parts: string[] = [];
  if (go && f.goLeaf) parts.push(`go leaf ${dec(f.goLeaf.nominal).toString()} ${unit} was off by ${signed(go.error)}`);
  if (noGo && f.noGoLeaf) parts.push(`no-go leaf ${dec(f.noGoLeaf.nominal).toString()} ${unit} was off by ${signed(noGo.error)}`);
  const couldChange = goWeak || noGoWeak;
  return {
    verdictCouldChange: couldChange,
    measuredValue: null,
    correctedValue: null,
    marginBefore: null,
    marginAfter: null,
    basis:
      `${r.itemLabel}: ${parts.join("; ") || "no leaf of the check was examined"}. ` +
      (couldChange ? "A leaf proves less than the check assumed, so the go/no-go verdict could have been different." : "The errors only strengthen the go/no-go result; the verdict holds."),
  };
}

/**
 * Re-judges one reading with its tool's error: its own size against the item's limits (the error moves it
 * directly), and every clearance it is a side of, recomputed from the other side's reading (the error moves the
 * bore side up and the journal side's clearance down). Both the error at the nearest check point and the largest
 * error found are applied; the verdict could change when either could change it.
 */
export function rejudgeAffectedReading(r: ReadingUnderReview, errors: ToolErrors): AffectedReadingJudgement {
  const points = pointsIn(errors, r.unit);
  const unit = r.unit;
  if (r.kind === "feeler" && r.feeler) return feelerJudgement(r, points, unit);

  const judgements: Judgement[] = [];
  if (r.size != null && hasLimits(r.sizeLimits)) {
    judgements.push({ label: `${r.itemLabel} (size ${dec(r.size).toString()} ${unit})`, measured: r.size, limits: r.sizeLimits, effect: 1, toolSize: r.size });
  }
  if (r.size != null) {
    for (const c of r.clearances) {
      if (c.otherSize == null || !hasLimits(c.limits)) continue;
      const clearance = c.side === "bore" ? clearanceOf(r.size, c.otherSize) : clearanceOf(c.otherSize, r.size);
      judgements.push({
        label: `${c.label} (clearance ${dec(clearance).toString()} ${unit}, this reading is the ${c.side} side)`,
        measured: clearance,
        limits: c.limits,
        effect: c.side === "bore" ? 1 : -1,
        toolSize: r.size,
      });
    }
  }
  if (judgements.length === 0) {
    return {
      verdictCouldChange: false,
      measuredValue: r.size,
      correctedValue: null,
      marginBefore: null,
      marginAfter: null,
      basis: `${r.itemLabel}: no verdict rests on this reading yet (no limits apply, or the other side of its clearance is not read).`,
    };
  }
  const judged = judgements.map((j) => judge(j, points, unit));
  // The judgement that decides the item: one that could change, else the one left with the least margin.
  const deciding =
    judged.find((x) => x.couldChange) ??
    judged.reduce((a, b) => ((b.near.marginAfter ?? Infinity) < (a.near.marginAfter ?? Infinity) ? b : a));
  return {
    verdictCouldChange: judged.some((x) => x.couldChange),
    measuredValue: deciding.j.measured,
    correctedValue: deciding.near.correctedValue,
    marginBefore: deciding.near.marginBefore,
    marginAfter: deciding.near.marginAfter,
    basis: judged.map((x) => x.text).join(" "),
  };
}
