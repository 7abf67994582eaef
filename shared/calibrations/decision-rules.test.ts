import { describe, expect, it } from "vitest";
import stdlibNormalCdf from "@stdlib/stats-base-dists-normal-cdf";
import {
  DecisionRuleError,
  calibrationResult,
  falseAcceptProbabilityAtGuardedLimit,
  judgePoint,
  probabilityOutside,
  standardNormalCdf,
  tur,
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
  });

  it("an error one step beyond the permissible error fails", () => {
    const p = judgePoint({ nominal: 0.5, asFound: 0.49989, ...MIC, rule: "simple" });
    expect(p.errorAsFound).toBe(-0.00011);
    expect(p.verdict).toBe("fail");
  });

  it("a metric error on the limit is exact even where binary floating point is not: 25.021 read against 25.019 with MPE 0.002", () => {
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

describe("guarded acceptance, w = U (ILAC-G8:09/2019 §4.2.2)", () => {
  it("an error on MPE − U passes and one beyond it fails", () => {
    const onLimit = judgePoint({ nominal: 0.5, asFound: 0.50008, ...MIC, rule: "guarded" });
    expect(onLimit.acceptanceLimit).toBe(0.00008);
    expect(onLimit.verdict).toBe("pass");
    const inGuardBand = judgePoint({ nominal: 0.5, asFound: 0.50009, ...MIC, rule: "guarded" });
    expect(inGuardBand.verdict).toBe("fail");
  });

  it("guarded acceptance cannot be applied without the point's uncertainty", () => {
    expect(() => judgePoint({ nominal: 0.5, asFound: 0.5, mpe: 0.0001, uncertainty: null, rule: "guarded" })).toThrow(DecisionRuleError);
  });

  it("at the guarded limit the false-accept probability is 1 − Φ(2) = 2.275 % (ILAC-G8:09/2019 §4.2.2; normal CDF from jstat, cross-checked with @stdlib)", () => {
    expect(falseAcceptProbabilityAtGuardedLimit()).toBeCloseTo(0.02275, 5);
    expect(falseAcceptProbabilityAtGuardedLimit()).toBeCloseTo(1 - stdlibNormalCdf(2, 0, 1), 12);
  });
});

describe("as-found and as-left", () => {
  it("a point adjusted back into tolerance passes on its as-left reading though it was found out", () => {
    const p = judgePoint({ nominal: 1, asFound: 1.0003, asLeft: 1.0000, ...MIC, rule: "simple" });
    expect(p.asFoundInTolerance).toBe(false);
    expect(p.asLeftInTolerance).toBe(true);
    expect(p.errorAsLeft).toBe(0);
    expect(p.verdict).toBe("pass");
  });

  it("a point left out of tolerance fails even though it was found in", () => {
    const p = judgePoint({ nominal: 1, asFound: 1.0001, asLeft: 1.0002, ...MIC, rule: "simple" });
    expect(p.asFoundInTolerance).toBe(true);
    expect(p.verdict).toBe("fail");
  });

  it("a permissible error of zero or less is refused", () => {
    expect(() => judgePoint({ nominal: 1, asFound: 1, mpe: 0, uncertainty: null, rule: "simple" })).toThrow(DecisionRuleError);
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

describe("overall calibration result", () => {
  const pass = (nominal: number, asFound: number, asLeft?: number) =>
    judgePoint({ nominal, asFound, asLeft, mpe: 0.0001, uncertainty: 0.00002, rule: "simple" });

  it("all points found in tolerance and left alone: pass", () => {
    expect(calibrationResult([pass(0.1, 0.1), pass(0.5, 0.5001), pass(1, 0.9999)])).toEqual({ result: "pass", asFoundInTolerance: true });
  });

  it("a point found out but left in tolerance after adjustment: adjusted, and the as-found failure is kept", () => {
    expect(calibrationResult([pass(0.1, 0.1), pass(1, 1.0003, 1.0)])).toEqual({ result: "adjusted", asFoundInTolerance: false });
  });

  it("a tool found in tolerance but adjusted anyway: adjusted", () => {
    expect(calibrationResult([pass(0.5, 0.5001, 0.5)]).result).toBe("adjusted");
  });

  it("a point left (or found, with no adjustment) out of tolerance: fail", () => {
    expect(calibrationResult([pass(0.1, 0.1), pass(1, 1.0003)]).result).toBe("fail");
    expect(calibrationResult([pass(1, 1.0003, 1.0002)]).result).toBe("fail");
  });

  it("released for part of its range: limited when every point inside the range passes, though points outside fail", () => {
    const points = [pass(0.1, 0.1), pass(0.5, 0.5), pass(0.9, 0.9004)];
    expect(calibrationResult(points, { limitedRange: { min: 0, max: 0.6 } })).toEqual({ result: "limited", asFoundInTolerance: false });
  });

  it("a limited release fails when a point inside the range fails, or when no point lies inside it", () => {
    const points = [pass(0.1, 0.1003), pass(0.9, 0.9)];
    expect(calibrationResult(points, { limitedRange: { min: 0, max: 0.6 } }).result).toBe("fail");
    expect(calibrationResult([pass(0.9, 0.9)], { limitedRange: { min: 0, max: 0.6 } }).result).toBe("fail");
  });

  it("a calibration without check points is refused", () => {
    expect(() => calibrationResult([])).toThrow(DecisionRuleError);
  });
});
