import { describe, expect, it } from "vitest";
import stdlibNormalCdf from "@stdlib/stats-base-dists-normal-cdf";
import {
  DecisionRuleError,
  calibrationResult,
  falseAcceptProbabilityAtGuardedLimit,
  guardBand,
  judgePoint,
  nonBinaryStatement,
  probabilityOutside,
  standardNormalCdf,
  tur,
  worstStatement,
} from "./decision-rules";
import { convertLength } from "../common/units";

// Demo micrometer 0–1 in with MPE ± 0.0001 in (ASME B89.1.13 (secondary source)).
const MIC = { mpe: 0.0001, uncertainty: 0.00002 } as const;

describe("simple acceptance (ILAC-G8:09/2019 §4.2.1)", () => {
  it("an error exactly on the permissible error passes: a value on the limit is judged on the limit", () => {
    const p = judgePoint({ nominal: 0.5, asFound: 0.5001, ...MIC, rule: "simple" });
    expect(p.errorAsFound).toBe(0.0001);
    expect(p.asFoundInTolerance).toBe(true);
    expect(p.verdict).toBe("pass");
    expect(p.acceptanceLimit).toBe(0.0001);
    expect(p.guardBand).toBe(0);
  });

  it("an error one step beyond the permissible error fails", () => {
    const p = judgePoint({ nominal: 0.5, asFound: 0.49989, ...MIC, rule: "simple" });
    expect(p.errorAsFound).toBe(-0.00011);
    expect(p.asFoundInTolerance).toBe(false);
    expect(p.verdict).toBe("fail");
  });

  it("a metric error on the limit is exact even where binary floating point is not: 25.021 read against 25.019 with MPE 0.002 (reference-values.md, binary floating point)", () => {
    const p = judgePoint({ nominal: 25, reference: 25.019, asFound: 25.021, mpe: 0.002, uncertainty: null, rule: "simple" });
    expect(p.errorAsFound).toBe(0.002);
    expect(p.verdict).toBe("pass");
    expect(p.tur).toBeNull();
    expect(p.turAdequate).toBeNull();
  });

  it("the error is taken from the standard's certified value when one is given, not from the nominal", () => {
    const p = judgePoint({ nominal: 0.5, reference: 0.50002, asFound: 0.5001, ...MIC, rule: "simple" });
    expect(p.reference).toBe(0.50002);
    expect(p.errorAsFound).toBe(0.00008);
  });
});

describe("guarded acceptance decides release, not the as-found condition (ILAC-G8:09/2019 §4.2.2)", () => {
  it("an error on MPE − U is released and one in the guard band is not — but both were found in tolerance (ILAC-G8:09/2019 §4.2.1)", () => {
    const onLimit = judgePoint({ nominal: 0.5, asFound: 0.50008, ...MIC, rule: "guarded" });
    expect(onLimit).toMatchObject({ acceptanceLimit: 0.00008, guardBand: 0.00002, verdict: "pass", asFoundInTolerance: true });
    const inGuardBand = judgePoint({ nominal: 0.5, asFound: 0.50009, ...MIC, rule: "guarded" });
    expect(inGuardBand).toMatchObject({ verdict: "fail", asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
  });

  it("the guard band w = r·U uses the shop's multiplier r, in exact decimals (ILAC-G8:09/2019 §4.2.2; r: shop setting)", () => {
    const p = judgePoint({ nominal: 0.5, asFound: 0.50009, ...MIC, rule: "guarded_scaled", guardBandMultiplier: 0.5 });
    expect(p).toMatchObject({ guardBand: 0.00001, acceptanceLimit: 0.00009, verdict: "pass" });
    expect(guardBand("guarded_scaled", "0.00003", "0.1").toString()).toBe("0.000003");
  });

  it("the guarded limit is MPE − U computed exactly: 0.3 − 0.1 is 0.2, and an error of 0.2 is released (binary floating point gives 0.19999999999999998)", () => {
    expect(0.3 - 0.1).not.toBe(0.2);
    const p = judgePoint({ nominal: 10, asFound: 10.2, mpe: 0.3, uncertainty: 0.1, rule: "guarded" });
    expect(p.acceptanceLimit).toBe(0.2);
    expect(p.verdict).toBe("pass");
  });

  it("guarded acceptance cannot be applied without the point's uncertainty, and the message names the point", () => {
    expect(() => judgePoint({ nominal: 0.5, asFound: 0.5, mpe: 0.0001, uncertainty: null, rule: "guarded", label: "Point 2 (0.5 in)" })).toThrow(/Point 2 \(0.5 in\).*uncertainty/);
  });

  it("at the guarded limit the false-accept probability is 1 − Φ(2) = 2.275 % (ILAC-G8:09/2019 §4.2.2; normal CDF from jstat, cross-checked with @stdlib)", () => {
    expect(falseAcceptProbabilityAtGuardedLimit()).toBeCloseTo(0.02275, 5);
    expect(falseAcceptProbabilityAtGuardedLimit()).toBeCloseTo(1 - stdlibNormalCdf(2, 0, 1), 12);
  });
});

describe("ILAC-G8 non-binary statement of the as-found error (ILAC-G8:09/2019 §4.2.3, from memory)", () => {
  it("pass within MPE − U, conditional pass up to MPE, conditional fail up to MPE + U, fail beyond; each boundary belongs to the better side", () => {
    const s = (e: string) => nonBinaryStatement(e, "0.0001", "0.00002");
    expect(s("0.00008")).toBe("pass");
    expect(s("-0.00008")).toBe("pass");
    expect(s("0.00009")).toBe("conditional_pass");
    expect(s("-0.0001")).toBe("conditional_pass");
    expect(s("0.00011")).toBe("conditional_fail");
    expect(s("0.00012")).toBe("conditional_fail");
    expect(s("-0.00013")).toBe("fail");
  });

  it("without a U the statement is binary, as simple acceptance", () => {
    expect(nonBinaryStatement("0.0001", "0.0001", null)).toBe("pass");
    expect(nonBinaryStatement("0.00011", "0.0001", null)).toBe("fail");
  });

  it("the worst statement of several stands for the record", () => {
    expect(worstStatement(["pass", "conditional_pass", "pass"])).toBe("conditional_pass");
    expect(worstStatement(["conditional_pass", "fail", "conditional_fail"])).toBe("fail");
    expect(worstStatement([])).toBe("pass");
  });
});

describe("as-found and as-left", () => {
  it("a point adjusted back into tolerance is released on its as-left reading, though it was found out", () => {
    const p = judgePoint({ nominal: 1, asFound: 1.0003, asLeft: 1.0, adjusted: true, ...MIC, rule: "simple" });
    expect(p).toMatchObject({ asFoundInTolerance: false, asFoundStatement: "fail", asLeftInTolerance: true, errorAsLeft: 0, releasedOn: "as_left", verdict: "pass" });
  });

  it("a point left out of tolerance after an adjustment is not released though it was found in", () => {
    const p = judgePoint({ nominal: 1, asFound: 1.0001, asLeft: 1.0002, adjusted: true, ...MIC, rule: "simple" });
    expect(p.asFoundInTolerance).toBe(true);
    expect(p.verdict).toBe("fail");
  });

  it("with no adjustment the release is decided on the as-found reading; an as-left repeat reading does not change it", () => {
    const p = judgePoint({ nominal: 1, asFound: 1.0003, asLeft: 1.0, adjusted: false, ...MIC, rule: "simple" });
    expect(p).toMatchObject({ releasedOn: "as_found", verdict: "fail" });
  });

  it("an adjusted point without an as-left reading is refused, naming the point", () => {
    expect(() => judgePoint({ nominal: 1, asFound: 1.0003, adjusted: true, ...MIC, rule: "simple", label: "Point 7 (1 in)" })).toThrow(/Point 7 \(1 in\).*as-left/);
  });

  it("a permissible error of zero or less, or none at all, is refused with a DecisionRuleError naming the point, never a TypeError", () => {
    expect(() => judgePoint({ nominal: 1, asFound: 1, mpe: 0, uncertainty: null, rule: "simple", label: "Point 1 (1 in)" })).toThrow(/Point 1 \(1 in\).*greater than zero/);
    expect(() => judgePoint({ nominal: 1, asFound: 1, mpe: -0.0001, uncertainty: null, rule: "simple" })).toThrow(DecisionRuleError);
    expect(() => judgePoint({ nominal: 1, asFound: 1, mpe: undefined, uncertainty: null, rule: "simple", label: "Point 3 (1 in)" })).toThrow(/Point 3 \(1 in\) has no permissible error/);
  });
});

describe("test uncertainty ratio (ANSI/NCSL Z540.3-2006 §5.3 b)", () => {
  it("± 0.0001 in checked with U95 = 0.60 µm gives TUR 4.23 (arithmetic)", () => {
    const U = convertLength("0.00060", "mm", "in");
    expect(tur(-0.0001, 0.0001, U)).toBeCloseTo(4.23, 2);
    const p = judgePoint({ nominal: 0.5, asFound: 0.5, mpe: 0.0001, uncertainty: U.toNumber(), rule: "simple" });
    expect(p.tur).toBeCloseTo(4.23, 2);
    expect(p.turAdequate).toBe(true);
  });

  it("a ratio of exactly 4 is adequate and one below it is not", () => {
    expect(judgePoint({ nominal: 1, asFound: 1, mpe: 0.0001, uncertainty: 0.000025, rule: "simple" }).turAdequate).toBe(true);
    expect(tur(-0.0001, 0.0001, 0.000025)).toBe(4);
    expect(judgePoint({ nominal: 1, asFound: 1, mpe: 0.0001, uncertainty: 0.00003, rule: "simple" }).turAdequate).toBe(false);
  });

  it("reversed or equal tolerance limits are refused rather than giving a negative ratio", () => {
    expect(() => tur(0.0001, -0.0001, 0.000025)).toThrow(DecisionRuleError);
    expect(() => tur(0.0001, 0.0001, 0.000025)).toThrow(/must be above/);
    expect(() => tur(-0.0001, 0.0001, 0)).toThrow(RangeError);
  });
});

describe("probability of lying outside a tolerance interval", () => {
  it("y = 9.8 with u = 0.1 lies outside [9, 10] with probability 0.022750 (JCGM 106:2012 §7)", () => {
    const p = probabilityOutside({ value: 9.8, u: 0.1, lower: 9, upper: 10 });
    expect(p).toBeCloseTo(0.02275, 6);
    const reference = stdlibNormalCdf(9, 9.8, 0.1) + (1 - stdlibNormalCdf(10, 9.8, 0.1));
    expect(p).toBeCloseTo(reference, 12);
  });

  it("the jstat normal CDF agrees with @stdlib across the range used", () => {
    for (const z of [-4, -2.5, -1, 0, 0.5, 1.96, 3]) expect(standardNormalCdf(z)).toBeCloseTo(stdlibNormalCdf(z, 0, 1), 12);
  });

  it("a one-sided limit counts only its own tail", () => {
    expect(probabilityOutside({ value: 0, u: 1, upper: 2 })).toBeCloseTo(0.02275, 5);
    expect(() => probabilityOutside({ value: 0, u: 0, upper: 2 })).toThrow(RangeError);
  });
});

describe("overall calibration result: the release decision, beside the as-found condition", () => {
  const pt = (nominal: number, asFound: number, asLeft?: number, adjusted = asLeft != null, rule: "simple" | "guarded" = "simple") =>
    judgePoint({ nominal, asFound, asLeft, adjusted, mpe: 0.0001, uncertainty: 0.00002, rule });

  it("all points found in tolerance and not adjusted: pass", () => {
    expect(calibrationResult([pt(0.1, 0.1), pt(0.5, 0.5001), pt(1, 0.9999)])).toEqual({ result: "pass", asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
  });

  it("found out, adjusted and left in tolerance: adjusted, and the as-found failure is kept", () => {
    expect(calibrationResult([pt(0.1, 0.1, 0.1), pt(1, 1.0003, 1.0)], { adjusted: true })).toEqual({ result: "adjusted", asFoundInTolerance: false, asFoundStatement: "fail" });
  });

  it("'adjusted' only when the record says an adjustment was made: a repeat reading that differs is not an adjustment", () => {
    const points = [pt(0.5, 0.5001, 0.5, false)];
    expect(calibrationResult(points, { adjusted: false }).result).toBe("pass");
    expect(calibrationResult([pt(0.5, 0.5001, 0.5, true)], { adjusted: true }).result).toBe("adjusted");
  });

  it("found in tolerance but inside the guard band, not adjusted: not released (fail) while the as-found condition stays in tolerance (ILAC-G8:09/2019 §4.2.2)", () => {
    expect(calibrationResult([pt(0.5, 0.50009, undefined, false, "guarded")])).toEqual({ result: "fail", asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
  });

  it("a point left (or found, with no adjustment) out of tolerance: fail", () => {
    expect(calibrationResult([pt(0.1, 0.1), pt(1, 1.0003)]).result).toBe("fail");
    expect(calibrationResult([pt(1, 1.0003, 1.0002)], { adjusted: true }).result).toBe("fail");
  });

  it("released for part of its range: limited when every point inside the range passes, though points outside fail", () => {
    const points = [pt(0.1, 0.1), pt(0.5, 0.5), pt(0.9, 0.9004)];
    expect(calibrationResult(points, { limitedRange: { min: 0, max: 0.6 } })).toMatchObject({ result: "limited", asFoundInTolerance: false });
  });

  it("a limited release fails when a point inside the range fails, or when no point lies inside it", () => {
    const points = [pt(0.1, 0.1003), pt(0.9, 0.9)];
    expect(calibrationResult(points, { limitedRange: { min: 0, max: 0.6 } }).result).toBe("fail");
    expect(calibrationResult([pt(0.9, 0.9)], { limitedRange: { min: 0, max: 0.6 } }).result).toBe("fail");
  });

  it("a calibration without check points is refused", () => {
    expect(() => calibrationResult([])).toThrow(DecisionRuleError);
  });
});
