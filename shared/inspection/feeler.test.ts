import { describe, expect, it } from "vitest";
import { chooseFeelerLeaves, gapBounds, stacksOf, usableLeaves, type FeelerEvidence, type FeelerLeaf } from "./feeler";
import { judgeFeelerCheck, type ItemRules } from "./judging";

// Limit gauges sit inside the work tolerance: a go at or just above the minimum must enter, a no-go at or just below
// the maximum must not (ISO 1938-1 principle — from memory; common practice). Stacks of up to three leaves and the
// choice by calibrated thickness are common practice. Limits and leaves are demo values.
const leaf = (label: string, over: Partial<FeelerLeaf> = {}): FeelerLeaf => ({ id: `leaf-${label}`, label, nominal: Number(label), calibratedThickness: Number(label), rejected: false, ...over });
const SET = ["0.0015", "0.002", "0.003", "0.004", "0.005", "0.006", "0.007", "0.008", "0.010", "0.015", "0.020", "0.025"].map((l) => leaf(l));

const IN = { tableUnit: "in" as const, tableExpansionPerK: null };
const ringSide: ItemRules = { key: "ring", label: "Ring side clearance", kind: "feeler", min: 0.0045, max: 0.006, serviceableMin: null, serviceableMax: null, boreKey: null, journalKey: null, stationKeys: null, radial: false, outOfRoundMax: null, expansionPerK: null, directions: 1, repeat: 1 };
const judge = (f: FeelerEvidence) => judgeFeelerCheck(ringSide, { itemKey: "ring", index: 1, unit: "in", values: [], feeler: f }, IN).view as Extract<ReturnType<typeof judgeFeelerCheck>["view"], { kind: "feeler" }>;

describe("choosing the go and the no-go inside the limits", () => {
  it("limits 0.0045–0.0060: the go is the stack 0.0015 + 0.003 = 0.0045 (the thinnest at or above the minimum), the no-go the 0.006 leaf", () => {
    const c = chooseFeelerLeaves({ leaves: SET, min: 0.0045, max: 0.006 });
    expect(c.mode).toBe("go_no_go");
    if (c.mode !== "go_no_go") return;
    expect(c.go).toMatchObject({ thickness: 0.0045, leaves: [{ label: "0.0015" }, { label: "0.003" }] });
    // 0.002 + 0.004 is as thick as the 0.006 leaf: the single leaf is taken.
    expect(c.noGo).toMatchObject({ thickness: 0.006, leaves: [{ label: "0.006" }] });
    expect(c.why).toContain("thinnest leaf or stack at or above the minimum");
  });

  it("never the leaf under the minimum nor over the maximum: the earlier go 0.004 and no-go 0.007 are not chosen", () => {
    const c = chooseFeelerLeaves({ leaves: SET, min: 0.0045, max: 0.006 });
    if (c.mode !== "go_no_go") throw new Error("expected go/no-go");
    expect(c.go.thickness).toBeGreaterThanOrEqual(0.0045);
    expect(c.noGo.thickness).toBeLessThanOrEqual(0.006);
  });

  it("by calibrated thickness, not the marking: a 0.005 leaf measured 0.0046 becomes the go on its own", () => {
    const leaves = SET.map((l) => (l.label === "0.005" ? { ...l, calibratedThickness: 0.0046 } : l.label === "0.0015" ? { ...l, calibratedThickness: 0.0016 } : l));
    const c = chooseFeelerLeaves({ leaves, min: 0.0045, max: 0.006 });
    if (c.mode !== "go_no_go") throw new Error("expected go/no-go");
    // 0.0016 + 0.003 = 0.0046 ties the single 0.005 leaf at 0.0046: the single leaf wins the tie.
    expect(c.go.leaves.map((l) => l.label)).toEqual(["0.005"]);
    expect(c.go.thickness).toBe(0.0046);
  });

  it("rejected leaves and leaves with no calibrated thickness are never used", () => {
    const leaves = SET.map((l) => (l.label === "0.006" ? { ...l, rejected: true } : l.label === "0.0015" ? { ...l, calibratedThickness: null } : l));
    expect(usableLeaves(leaves).map((l) => l.label)).not.toContain("0.006");
    const c = chooseFeelerLeaves({ leaves, min: 0.0045, max: 0.006 });
    if (c.mode !== "go_no_go") throw new Error("expected go/no-go");
    expect(c.noGo.leaves.map((l) => l.label)).toEqual(["0.002", "0.004"]);
    expect(c.go.leaves.map((l) => l.label)).toEqual(["0.005"]);
  });

  it("stacks are of up to three different leaves", () => {
    const s = stacksOf(usableLeaves(SET.slice(0, 4)));
    // 4 single + 6 pairs + 4 triples
    expect(s).toHaveLength(14);
    expect(Math.max(...s.map((x) => x.leaves.length))).toBe(3);
  });

  it("when the set cannot make a go and a no-go inside the limits, it says so: 0.0030–0.0034 leaves only the 0.003 leaf for both", () => {
    const c = chooseFeelerLeaves({ leaves: SET, min: 0.003, max: 0.0034 });
    expect(c.mode).toBe("measured_gap");
    expect(c.why).toContain("equally thick");
    expect(c.why).toContain("Record the thickest leaf or stack that enters");
    expect(chooseFeelerLeaves({ leaves: SET, min: 0.1, max: 0.2 }).why).toContain("to serve as a go");
  });
});

describe("what a feeler check proves", () => {
  const go = { leaves: [{ id: "a", label: "0.0015", thickness: 0.0015 }, { id: "b", label: "0.003", thickness: 0.003 }], thickness: 0.0045 };
  const noGo = { leaves: [{ id: "c", label: "0.006", thickness: 0.006 }], thickness: 0.006 };
  const check = (goEntered: boolean, noGoEntered: boolean): FeelerEvidence => ({ mode: "go_no_go", go, noGo, goEntered, noGoEntered, gap: null, why: null });

  it("go entered and no-go did not: the gap is at least 0.0045 and under 0.006, inside the limits", () => {
    expect(gapBounds(check(true, false))).toMatchObject({ low: { thickness: 0.0045 }, high: { thickness: 0.006 }, contradiction: false });
    expect(judge(check(true, false))).toMatchObject({ verdict: "within_limits", gapLow: 0.0045, gapHigh: 0.006, text: "Within new limits (go entered, no-go did not)" });
  });

  it("a gap of 0.0041 refuses the go: outside (too tight); a gap of 0.0065 takes the no-go: outside (too loose)", () => {
    expect(judge(check(false, false))).toMatchObject({ verdict: "outside_limits" });
    expect(judge(check(false, false)).text).toContain("did not enter: the gap is too tight");
    expect(judge(check(true, true)).text).toContain("entered: the gap is too loose");
  });

  it("a thinner go that refuses with a thicker no-go that enters contradicts itself: check again", () => {
    expect(judge(check(false, true))).toMatchObject({ verdict: "outside_limits" });
    expect(judge(check(false, true)).text).toContain("check again");
  });

  it("leaves outside the limits prove nothing: a go of 0.004 under the 0.0045 minimum that enters does not show the gap reaches it", () => {
    const old: FeelerEvidence = { mode: "go_no_go", go: { leaves: [{ id: "g", label: "0.004", thickness: 0.004 }], thickness: 0.004 }, noGo: { leaves: [{ id: "n", label: "0.007", thickness: 0.007 }], thickness: 0.007 }, goEntered: true, noGoEntered: false, gap: null, why: null };
    const j = judge(old);
    expect(j.verdict).toBe("outside_limits");
    expect(j.text).toContain("is under the minimum 0.0045, so the gap is not shown to reach it");
    expect(j.text).toContain("is over the maximum 0.0060, so the gap is not shown to stay under it");
  });

  it("a measured gap (the thickest leaf or stack that enters) is judged as a value against the limits", () => {
    const gap = (t: number): FeelerEvidence => ({ mode: "measured_gap", go: null, noGo: null, goEntered: null, noGoEntered: null, gap: { leaves: [{ id: "x", label: String(t), thickness: t }], thickness: t }, why: "narrow band" });
    expect(judge(gap(0.005))).toMatchObject({ verdict: "within_limits", mode: "measured_gap", gapLow: 0.005 });
    expect(judge(gap(0.0044)).verdict).toBe("outside_limits");
    expect(judge(gap(0.006)).verdict).toBe("within_limits");
  });
});
