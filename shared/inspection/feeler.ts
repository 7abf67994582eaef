// Choosing the leaves of a feeler set for a go/no-go check, and what a check proves about the gap.
import { Decimal, dec, num } from "../common/decimal";

/** One leaf of a set as the register knows it; thicknesses in the unit of the check. */
export interface FeelerLeaf {
  id: string;
  label: string;
  nominal: number;
  /** Thickness found at the set's calibration that counts; null when the leaf was not calibrated on its own. */
  calibratedThickness: number | null;
  rejected: boolean;
}

/** A leaf as used in a check: its calibrated thickness. */
export interface LeafUse {
  id: string;
  label: string;
  thickness: number;
}

/** One leaf or a stack of leaves used together; `thickness` is the total. */
export interface LeafStack {
  leaves: LeafUse[];
  thickness: number;
}

/** Stacks of more leaves trap air and dirt between them; three is the most the shop stacks (common practice). */
export const MAX_STACK = 3;

/** Leaves that may be used: not rejected, and calibrated one by one (a marking is not a thickness). */
export function usableLeaves(leaves: FeelerLeaf[]): LeafUse[] {
  return leaves
    .filter((l) => !l.rejected && l.calibratedThickness != null)
    .map((l) => ({ id: l.id, label: l.label, thickness: l.calibratedThickness! }))
    .sort((a, b) => dec(a.thickness).comparedTo(dec(b.thickness)) || a.label.localeCompare(b.label));
}

/** Every leaf and every stack of up to `maxLeaves` different leaves, with its exact total thickness. */
export function stacksOf(leaves: LeafUse[], maxLeaves = MAX_STACK): { leaves: LeafUse[]; total: Decimal }[] {
  const out: { leaves: LeafUse[]; total: Decimal }[] = [];
  const walk = (start: number, picked: LeafUse[], total: Decimal) => {
    for (let i = start; i < leaves.length; i++) {
      const next = [...picked, leaves[i]];
      const sum = total.plus(dec(leaves[i].thickness));
      out.push({ leaves: next, total: sum });
      if (next.length < maxLeaves) walk(i + 1, next, sum);
    }
  };
  walk(0, [], new Decimal(0));
  return out;
}

const asStack = (s: { leaves: LeafUse[]; total: Decimal }): LeafStack => ({ leaves: s.leaves, thickness: num(s.total) });
const stackLabel = (s: LeafStack) => s.leaves.map((l) => l.label).join(" + ");

/** A go, no-go or measured gap as the API carries it: a single leaf's id and label, or the leaves' joined with "+". */
export function stackAsLeaf(s: LeafStack): { id: string; label: string; thickness: number; leaves: LeafUse[] } {
  return { id: s.leaves.map((l) => l.id).join("+"), label: s.leaves.map((l) => l.label).join(" + "), thickness: s.thickness, leaves: s.leaves };
}

/** "0.005" for one leaf, "0.002 + 0.003 (stack)" for several. */
export function describeStack(s: LeafStack): string {
  return s.leaves.length > 1 ? `${stackLabel(s)} (stack)` : stackLabel(s);
}

export type FeelerChoice =
  | { mode: "go_no_go"; go: LeafStack; noGo: LeafStack; why: string }
  | { mode: "measured_gap"; go: LeafStack | null; noGo: LeafStack | null; why: string };

/**
 * The go and no-go of a feeler check, inside the limits (limit gauges sit inside the work tolerance: ISO 1938-1
 * principle, from memory; common practice): the go is the thinnest leaf or stack of up to three whose calibrated
 * thickness is at or above the minimum, the no-go the thickest at or below the maximum. Rejected leaves and leaves
 * without a calibrated thickness are never used. When no go and no-go fit inside the limits (with the go thinner than
 * the no-go), the check is a measured gap instead.
 */
export function chooseFeelerLeaves(args: { leaves: FeelerLeaf[]; min: number; max: number; fmt?: (n: number) => string }): FeelerChoice {
  const fmt = args.fmt ?? ((n: number) => dec(n).toString());
  const min = dec(args.min);
  const max = dec(args.max);
  const stacks = stacksOf(usableLeaves(args.leaves));
  // Thinnest at or above the minimum; of equal thickness, the fewest leaves.
  let go: (typeof stacks)[number] | null = null;
  let noGo: (typeof stacks)[number] | null = null;
  for (const s of stacks) {
    if (s.total.gte(min) && (go == null || s.total.lt(go.total) || (s.total.eq(go.total) && s.leaves.length < go.leaves.length))) go = s;
    if (s.total.lte(max) && (noGo == null || s.total.gt(noGo.total) || (s.total.eq(noGo.total) && s.leaves.length < noGo.leaves.length))) noGo = s;
  }
  const goInside = go != null && go.total.lte(max) ? asStack(go) : null;
  const noGoInside = noGo != null && noGo.total.gte(min) ? asStack(noGo) : null;
  const limits = `${fmt(args.min)}–${fmt(args.max)}`;
  if (stacks.length === 0) return { mode: "measured_gap", go: null, noGo: null, why: "The set has no calibrated, serviceable leaf." };
  if (goInside && noGoInside && dec(goInside.thickness).lt(dec(noGoInside.thickness))) {
    return {
      mode: "go_no_go",
      go: goInside,
      noGo: noGoInside,
      why:
        `Go ${describeStack(goInside)}, ${fmt(goInside.thickness)} calibrated: the thinnest leaf or stack at or above the minimum ${fmt(args.min)} — it must enter. ` +
        `No-go ${describeStack(noGoInside)}, ${fmt(noGoInside.thickness)} calibrated: the thickest at or below the maximum ${fmt(args.max)} — it must not enter. ` +
        `Both sit inside the limits ${limits}, so a pass proves the gap is inside them.`,
    };
  }
  const why = !goInside
    ? `No leaf or stack of up to ${MAX_STACK} lies between the minimum and the maximum (${limits}) to serve as a go.`
    : !noGoInside
      ? `No leaf or stack of up to ${MAX_STACK} lies between the minimum and the maximum (${limits}) to serve as a no-go.`
      : `The only go and no-go inside the limits ${limits} are equally thick (${fmt(goInside.thickness)}); they cannot both be tried.`;
  return { mode: "measured_gap", go: goInside, noGo: noGoInside, why: `${why} Record the thickest leaf or stack that enters instead (a measured gap).` };
}

/** A stack from leaves named by id, in the given order; null when a leaf is not usable. */
export function stackFrom(usable: LeafUse[], ids: string[]): LeafStack | null {
  const leaves: LeafUse[] = [];
  for (const id of ids) {
    const leaf = usable.find((l) => l.id === id);
    if (!leaf) return null;
    leaves.push(leaf);
  }
  if (leaves.length === 0) return null;
  return { leaves, thickness: num(leaves.reduce((t, l) => t.plus(dec(l.thickness)), new Decimal(0))) };
}

/** What a feeler reading records: the leaves tried and what happened, or the measured gap. */
export interface FeelerEvidence {
  mode: "go_no_go" | "measured_gap";
  go: LeafStack | null;
  noGo: LeafStack | null;
  goEntered: boolean | null;
  noGoEntered: boolean | null;
  /** Measured gap: the thickest leaf or stack that entered. */
  gap: LeafStack | null;
  /** Why the leaves were chosen (or why the check is a measured gap). */
  why: string | null;
}

/**
 * What a check proves about the gap: it is at least as wide as the thickest leaf or stack that entered and narrower
 * than the thinnest that did not (common practice). `low`/`high` are null when nothing bounds that side;
 * `contradiction` when a thinner one refused and a thicker one entered.
 */
export function gapBounds(ev: FeelerEvidence): { low: LeafStack | null; high: LeafStack | null; contradiction: boolean } {
  if (ev.mode === "measured_gap") return { low: ev.gap, high: null, contradiction: false };
  const entered = [ev.goEntered ? ev.go : null, ev.noGoEntered ? ev.noGo : null].filter((s): s is LeafStack => !!s);
  const refused = [ev.goEntered === false ? ev.go : null, ev.noGoEntered === false ? ev.noGo : null].filter((s): s is LeafStack => !!s);
  const low = entered.reduce<LeafStack | null>((a, s) => (a == null || dec(s.thickness).gt(dec(a.thickness)) ? s : a), null);
  const high = refused.reduce<LeafStack | null>((a, s) => (a == null || dec(s.thickness).lt(dec(a.thickness)) ? s : a), null);
  return { low, high, contradiction: !!low && !!high && dec(low.thickness).gte(dec(high.thickness)) };
}
