import { describe, expect, it } from "vitest";
import { computeCalibration, roundUncertainty } from "./calibration-compute";
import { DecisionRuleError } from "./decision-rules";

const base = { rule: "simple" as const, unit: "in" as const, resolution: 0.0001, familyMpe: "0.0001" };

describe("computeCalibration", () => {
  it("judges an error on the MPE as a pass under simple acceptance (ILAC-G8:09/2019 §4.2.1) and a fail under guarded acceptance with U > 0 (§4.2.2)", () => {
    const point = { nominal: 0.5, asFound: 0.5001, uncertainty: 0.00002 };
    expect(computeCalibration({ ...base, points: [point] }).points[0].verdict).toBe("pass");
    const guarded = computeCalibration({ ...base, rule: "guarded", points: [point] });
    expect(guarded.points[0]).toMatchObject({ verdict: "fail", acceptanceLimit: 0.00008 });
    expect(guarded.result).toBe("fail");
  });

  it("takes the reference from the standard's certified value at that nominal, converting mm to in exactly (1 in = 25.4 mm, NIST SP 811 App. B)", () => {
    const out = computeCalibration({
      ...base,
      standards: [{ unit: "mm", expandedUncertainty: 0.0001, coverageFactor: 2, certifiedValues: [{ nominal: "25.4", value: "25.40254" }] }],
      points: [{ nominal: 1, asFound: 1.0002 }],
    });
    expect(out.points[0]).toMatchObject({ reference: 1.0001, referenceSource: "certified", errorAsFound: 0.0001 });
  });

  it("uses a check-plan point's own MPE before the family's", () => {
    const out = computeCalibration({ ...base, checkPlan: [{ nominal: "0.9", mpe: "0.0004" }], points: [{ nominal: 0.9, asFound: 0.9003 }, { nominal: 0.1, asFound: 0.1003 }] });
    expect(out.points.map((p) => [p.mpe, p.mpeSource, p.verdict])).toEqual([
      [0.0004, "check_plan", "pass"],
      [0.0001, "family", "fail"],
    ]);
  });

  it("computes U from the budget when none is given: certificate U/k, resolution d/√12, root-sum-square, k = 2 (GUM 4.3.7, F.2.2.1, 5.1.2, 6.2–6.3)", () => {
    const out = computeCalibration({ ...base, standards: [{ unit: "in", expandedUncertainty: 0.000004, coverageFactor: 2 }], points: [{ nominal: 0.5, asFound: 0.5 }] });
    // u = sqrt(0.000002² + (0.0001/√12)²) = 2.8937e-5; U = 5.787e-5, stated with two digits rounded up.
    expect(out.points[0]).toMatchObject({ uncertainty: 0.000058, uncertaintySource: "budget", turAdequate: false });
    expect(out.turWarning).toBe(true);
  });

  it("states U with two significant digits, rounded up (GUM 7.2.6)", () => {
    expect(roundUncertainty(5.7874e-5)).toBe(0.000058);
    expect(roundUncertainty(0.000012)).toBe(0.000012);
  });

  it("a calibration released for part of the range is limited when every point inside passes", () => {
    const out = computeCalibration({ ...base, limitedRange: { min: 0, max: 0.5 }, points: [{ nominal: 0.25, asFound: 0.25 }, { nominal: 0.9, asFound: 0.9004 }] });
    expect(out.result).toBe("limited");
    expect(out.asFoundInTolerance).toBe(false);
  });

  it("refuses a point with no permissible error anywhere", () => {
    expect(() => computeCalibration({ ...base, familyMpe: null, points: [{ nominal: 0.5, asFound: 0.5 }] })).toThrow(DecisionRuleError);
  });
});
