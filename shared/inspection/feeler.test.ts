import { describe, expect, it } from "vitest";
import { judgeFeeler, leafThickness, selectFeelerLeaves, type FeelerLeaf } from "./feeler";

// A demo feeler set in inches.
const leaf = (id: string, nominal: number, extra: Partial<FeelerLeaf> = {}): FeelerLeaf => ({ id, nominal, rejected: false, ...extra });
const SET = [
  leaf("015", 0.0015),
  leaf("002", 0.002),
  leaf("003", 0.003),
  leaf("004", 0.004),
  leaf("005", 0.005),
  leaf("006", 0.006),
  leaf("008", 0.008),
];

describe("choosing go and no-go leaves (common practice)", () => {
  it("for limits 0.003–0.005 the go leaf is the one size below the minimum and the no-go the one size above the maximum", () => {
    const { goLeaf, noGoLeaf } = selectFeelerLeaves({ leaves: SET, min: 0.003, max: 0.005 });
    expect(goLeaf?.id).toBe("002");
    expect(noGoLeaf?.id).toBe("006");
  });

  it("a leaf exactly on a limit is neither go nor no-go", () => {
    const { goLeaf, noGoLeaf } = selectFeelerLeaves({ leaves: SET, min: 0.004, max: 0.004 });
    expect(goLeaf?.id).toBe("003");
    expect(noGoLeaf?.id).toBe("005");
  });

  it("a rejected leaf is never chosen", () => {
    const leaves = SET.map((l) => (l.id === "006" ? { ...l, rejected: true } : l));
    expect(selectFeelerLeaves({ leaves, min: 0.003, max: 0.005 }).noGoLeaf?.id).toBe("008");
  });

  it("a leaf's calibrated thickness decides over its marking", () => {
    // Worn 0.003 leaf measures thinner than the 0.002 leaf would suggest: it becomes the go leaf below 0.003.
    const leaves = SET.map((l) => (l.id === "003" ? { ...l, calibratedThickness: 0.0028 } : l));
    expect(leafThickness(leaves[2])).toBe(0.0028);
    expect(selectFeelerLeaves({ leaves, min: 0.003, max: 0.005 }).goLeaf?.id).toBe("003");
  });

  it("no leaf thin or thick enough in the set gives no go or no no-go leaf", () => {
    expect(selectFeelerLeaves({ leaves: SET, min: 0.0015, max: 0.008 })).toEqual({ goLeaf: null, noGoLeaf: null });
  });
});

describe("judging a feeler check (common practice)", () => {
  it("go entered and no-go did not: within limits", () => {
    expect(judgeFeeler({ goEntered: true, noGoEntered: false })).toEqual({ verdict: "within_limits", finding: "within" });
  });

  it("the no-go leaf entered: the gap is too loose", () => {
    expect(judgeFeeler({ goEntered: true, noGoEntered: true })).toEqual({ verdict: "outside_limits", finding: "too_loose" });
  });

  it("the go leaf did not enter: the gap is too tight", () => {
    expect(judgeFeeler({ goEntered: false, noGoEntered: false })).toEqual({ verdict: "outside_limits", finding: "too_tight" });
  });

  it("contradictory results are outside limits and ask for a recheck", () => {
    const j = judgeFeeler({ goEntered: false, noGoEntered: true });
    expect(j.verdict).toBe("outside_limits");
    expect(j.note).toContain("check again");
  });
});
