import { dec } from "../common/decimal";

export interface FeelerLeaf {
  id: string;
  nominal: number;
  calibratedThickness?: number | null;
  rejected: boolean;
}

/** A leaf's thickness for go/no-go choice: its calibrated thickness when known, else its nominal. */
export function leafThickness(leaf: FeelerLeaf): number {
  return leaf.calibratedThickness ?? leaf.nominal;
}

/**
 * Pick the go leaf (thickest leaf thinner than the minimum: must enter) and the no-go leaf (thinnest leaf thicker than the
 * maximum: must not enter) from the serviceable leaves of a set (common practice).
 */
export function selectFeelerLeaves<L extends FeelerLeaf>(args: { leaves: L[]; min: number; max: number }): {
  goLeaf: L | null;
  noGoLeaf: L | null;
} {
  const min = dec(args.min);
  const max = dec(args.max);
  let goLeaf: L | null = null;
  let noGoLeaf: L | null = null;
  for (const leaf of args.leaves) {
    if (leaf.rejected) continue;
    const t = dec(leafThickness(leaf));
    if (t.lt(min) && (goLeaf == null || t.gt(dec(leafThickness(goLeaf))))) goLeaf = leaf;
    if (t.gt(max) && (noGoLeaf == null || t.lt(dec(leafThickness(noGoLeaf))))) noGoLeaf = leaf;
  }
  return { goLeaf, noGoLeaf };
}

export interface FeelerJudgement {
  verdict: "within_limits" | "outside_limits";
  finding: "within" | "too_tight" | "too_loose";
  /** Set when the two results contradict each other and the gap should be checked again. */
  note?: string;
}

/** Judge a go/no-go feeler check: the go leaf must enter and the no-go leaf must not (common practice). */
export function judgeFeeler(args: { goEntered: boolean; noGoEntered: boolean }): FeelerJudgement {
  if (!args.goEntered && args.noGoEntered) {
    return {
      verdict: "outside_limits",
      finding: "too_tight",
      note: "The no-go leaf entered but the go leaf did not: clean the gap and the leaves and check again.",
    };
  }
  if (!args.goEntered) return { verdict: "outside_limits", finding: "too_tight" };
  if (args.noGoEntered) return { verdict: "outside_limits", finding: "too_loose" };
  return { verdict: "within_limits", finding: "within" };
}
