import { describe, expect, it } from "vitest";
import { computeCalibration, standardForCompute, type ComputeStandard } from "./calibration-compute";
import { DecisionRuleError } from "./decision-rules";
import { gaugeBlockGrade, gaugeBlockTolerance } from "./gauge-block-grades";

const base = { rule: "simple" as const, unit: "in" as const, resolution: 0.0001, familyMpe: "0.0001" };

const inchBlocks: ComputeStandard = {
  assetTag: "GBS-T",
  kind: "gauge_block_set",
  unit: "in",
  grade: "0",
  certificateNumber: "C-1",
  expandedUncertainty: 0.000004,
  coverageFactor: 2,
  degreesOfFreedom: null,
  nominal: null,
  certifiedValue: null,
  elements: [
    { label: "0.500", nominal: "0.5", deviation: "0.000002" },
    { label: "0.105", nominal: "0.105", deviation: "-0.000001" },
  ],
};

/** A metric set with certified 5 mm and 2.7 mm blocks and an uncertified 1.2 mm block (demo values). */
const metricBlocks: ComputeStandard = {
  assetTag: "GBS-M",
  kind: "gauge_block_set",
  unit: "mm",
  grade: "0",
  certificateNumber: "C-2",
  expandedUncertainty: 0.0001,
  coverageFactor: 2,
  degreesOfFreedom: null,
  nominal: null,
  certifiedValue: null,
  elements: [
    { label: "5", nominal: "5", deviation: "0.00006" },
    { label: "2.7", nominal: "2.7", deviation: "-0.00002" },
    { label: "1.2", nominal: "1.2", deviation: null },
    { label: "6.5", nominal: "6.5", deviation: null },
    { label: "10", nominal: "10", deviation: "0.00005" },
  ],
};
const metric = { rule: "simple" as const, unit: "mm" as const, resolution: 0.001, familyMpe: "0.002" };

describe("computeCalibration", () => {
  it("judges an error on the MPE as released under simple acceptance (ILAC-G8:09/2019 §4.2.1) and refused under guarded acceptance with U > 0 (§4.2.2), found in tolerance either way", () => {
    const point = { nominal: 0.5, asFound: 0.5001, uncertainty: 0.00002 };
    expect(computeCalibration({ ...base, points: [point] }).points[0].verdict).toBe("pass");
    const guarded = computeCalibration({ ...base, rule: "guarded", points: [point] });
    expect(guarded.points[0]).toMatchObject({ verdict: "fail", acceptanceLimit: 0.00008, asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
    expect(guarded).toMatchObject({ result: "fail", asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
  });

  it("takes the reference from a block's certified value at that nominal, converting mm to in exactly (1 in = 25.4 mm, NIST SP 811 App. B)", () => {
    const setting: ComputeStandard = { ...inchBlocks, assetTag: "SET-T", kind: "setting_standard", unit: "mm", elements: [], nominal: "25.4", certifiedValue: "25.40254" };
    const out = computeCalibration({ ...base, standards: [setting], points: [{ nominal: 1, asFound: 1.0002 }] });
    expect(out.points[0]).toMatchObject({ reference: 1.0001, referenceSource: "certified", errorAsFound: 0.0001 });
    expect(out.points[0].referenceParts).toEqual([{ standard: "SET-T", element: null, nominal: 1, value: 1.0001, certified: true }]);
  });

  it("builds a 7.7 mm size from the certified 5 mm and 2.7 mm blocks, each with its certified value and its own row in the budget (common practice of stacking blocks)", () => {
    const out = computeCalibration({ ...metric, standards: [metricBlocks], temperatureC: 20, points: [{ nominal: 7.7, asFound: 7.701 }] });
    const p = out.points[0];
    expect(p.referenceParts.map((r) => r.element)).toEqual(["5", "2.7"]);
    expect(p.reference).toBe(7.70004);
    expect(p.referenceSource).toBe("certified");
    expect(p.errorAsFound).toBe(0.00096);
    const standardRows = p.budget!.components.filter((c) => c.kind === "standard");
    expect(standardRows.map((r) => r.source)).toEqual([expect.stringMatching(/GBS-M block 5:/), expect.stringMatching(/GBS-M block 2.7:/)]);
    expect(standardRows.every((r) => r.contribution === 0.00005)).toBe(true);
  });

  it("a block the certificate gives no value for is used at its nominal and counts its ISO 3650 grade tolerance as rectangular (GUM 4.3.7; ISO 3650:1998 grade 0, 0.5–10 mm: ± 0.12 µm)", () => {
    const out = computeCalibration({ ...metric, standards: [metricBlocks], points: [{ nominal: 11.2, asFound: 11.2 }] });
    const p = out.points[0];
    expect(p.referenceParts.map((r) => [r.element, r.certified])).toEqual([["1.2", false], ["10", true]]);
    expect(p.referenceSource).toBe("partly_certified");
    expect(p.reference).toBe(11.20005);
    const grade = p.budget!.components.find((c) => c.kind === "standard_grade")!;
    expect(grade.quantity).toBeCloseTo(0.00012, 12);
    expect(grade.contribution).toBeCloseTo(0.00012 / Math.sqrt(3), 12);
  });

  it("prefers the stack with more certified blocks among stacks of the same size", () => {
    // 7.7 = 5 + 2.7 (both certified) or 1.2 + 6.5 (neither): the certified pair is chosen.
    const out = computeCalibration({ ...metric, standards: [metricBlocks], points: [{ nominal: 7.7, asFound: 7.7 }] });
    expect(out.points[0].referenceParts.map((r) => r.element)).toEqual(["5", "2.7"]);
  });

  it("uses every standard named on the record when none matches the size (the safe side)", () => {
    const out = computeCalibration({ ...metric, standards: [metricBlocks, { ...metricBlocks, assetTag: "GBS-N", elements: [] }], points: [{ nominal: 3.3, asFound: 3.3 }] });
    const p = out.points[0];
    expect(p.referenceSource).toBe("nominal");
    expect(p.budget!.components.filter((c) => c.kind === "standard").map((c) => c.source)).toEqual([expect.stringMatching(/^GBS-M.*not matched/), expect.stringMatching(/^GBS-N.*not matched/)]);
  });

  it("uses a check-plan point's own MPE before the family's", () => {
    const out = computeCalibration({ ...base, checkPlan: [{ nominal: "0.9", mpe: "0.0004" }], points: [{ nominal: 0.9, asFound: 0.9003 }, { nominal: 0.1, asFound: 0.1003 }] });
    expect(out.points.map((p) => [p.mpe, p.mpeSource, p.verdict])).toEqual([
      [0.0004, "check_plan", "pass"],
      [0.0001, "family", "fail"],
    ]);
  });

  it("computes U from the budget when none is given: certificate U/k, resolution d/√12, root-sum-square, k from ν_eff (infinite here: k = 2) (GUM 4.3.7, F.2.2.1, 5.1.2, G.4.1)", () => {
    const out = computeCalibration({ ...base, standards: [inchBlocks], points: [{ nominal: 0.5, asFound: 0.5 }] });
    // u = sqrt(0.000002² + (0.0001/√12)²) = 2.8937e-5; U = 5.787e-5, stated with two digits rounded up.
    expect(out.points[0]).toMatchObject({ uncertainty: 0.000058, uncertaintySource: "budget", turAdequate: false });
    expect(out.points[0].budget!.k).toBeCloseTo(2, 10);
    expect(out.turWarning).toBe(true);
  });

  it("repeated readings add a Type A term and lower ν_eff, so k rises above 2 (GUM 4.2.3, G.4.1)", () => {
    const out = computeCalibration({ ...base, standards: [inchBlocks], points: [{ nominal: 0.5, asFound: 0.50003, repeatReadings: [0.5, 0.5001, 0.5] }] });
    const b = out.points[0].budget!;
    expect(b.components.find((c) => c.kind === "repeatability")).toMatchObject({ type: "A", dof: 2 });
    expect(b.effectiveDof).not.toBeNull();
    expect(b.k).toBeGreaterThan(2);
  });

  it("an as-found reading that is not the mean of the repeated readings is refused, naming the point", () => {
    expect(() => computeCalibration({ ...base, points: [{ nominal: 0.5, asFound: 0.5002, repeatReadings: [0.5, 0.5001, 0.5] }] })).toThrow(/Point 1 \(0.5 in\).*mean of the repeated readings/);
  });

  it("an as-left reading that differs with no word on an adjustment is refused: the record must say whether the tool was adjusted", () => {
    const points = [{ nominal: 0.5, asFound: 0.5003, asLeft: 0.5 }];
    expect(() => computeCalibration({ ...base, points })).toThrow(/Point 1 \(0.5 in\).*say whether the tool was adjusted/);
    expect(computeCalibration({ ...base, adjusted: true, points })).toMatchObject({ result: "adjusted", adjusted: true, asFoundInTolerance: false });
    expect(computeCalibration({ ...base, adjusted: false, points })).toMatchObject({ result: "fail", adjusted: false });
    // An as-left equal to the as-found says nothing was moved.
    expect(computeCalibration({ ...base, points: [{ nominal: 0.5, asFound: 0.5, asLeft: 0.5 }] })).toMatchObject({ result: "pass", adjusted: false });
  });

  it("an adjusted record needs the as-left reading at every point", () => {
    expect(() => computeCalibration({ ...base, adjusted: true, points: [{ nominal: 0.5, asFound: 0.5003, asLeft: 0.5 }, { nominal: 1, asFound: 1 }] })).toThrow(/Point 2 \(1 in\).*as-left/);
  });

  it("a calibration released for part of the range is limited when every point inside passes", () => {
    const out = computeCalibration({ ...base, limitedRange: { min: 0, max: 0.5 }, points: [{ nominal: 0.25, asFound: 0.25 }, { nominal: 0.9, asFound: 0.9004 }] });
    expect(out.result).toBe("limited");
    expect(out.asFoundInTolerance).toBe(false);
  });

  it("refuses a point with no permissible error anywhere, naming it", () => {
    expect(() => computeCalibration({ ...base, familyMpe: null, points: [{ nominal: 0.5, asFound: 0.5 }] })).toThrow(DecisionRuleError);
    expect(() => computeCalibration({ ...base, familyMpe: null, points: [{ nominal: 0.5, asFound: 0.5, mpe: 0.0001 }, { nominal: 0.7, asFound: 0.7 }] })).toThrow(/Point 2 \(0.7 in\)/);
  });

  it("maps a certificate from the server's decimal strings and from the API's numbers alike", () => {
    const fromRows = standardForCompute({ standard: { assetTag: "G", kind: "gauge_block_set", unit: "in", nominal: null, grade: "0" }, certificate: { number: "C", expandedUncertainty: "0.000004", coverageFactor: "2", elementValues: [{ label: "0.5", nominal: "0.5", deviation: "0.000003" }] } });
    const fromApi = standardForCompute({ standard: { assetTag: "G", kind: "gauge_block_set", unit: "in", nominal: null, grade: "0" }, certificate: { number: "C", expandedUncertainty: 0.000004, coverageFactor: 2, elementValues: [{ label: "0.5", nominal: 0.5, deviation: 0.000003 }] } });
    for (const std of [fromRows, fromApi]) {
      const out = computeCalibration({ ...base, standards: [std], points: [{ nominal: 0.5, asFound: 0.5001 }] });
      expect(out.points[0].errorAsFound).toBe(0.000097);
    }
  });
});

describe("gauge block limit deviations (ISO 3650:1998; reference-values.md)", () => {
  it("grade 0: 0.12 µm up to 10 mm, 0.14 µm above 10 up to 25 mm, 0.20 µm above 25 up to 50 mm; a 10 mm block is in the first row and a 25 mm block in the second", () => {
    expect(gaugeBlockTolerance(10, "mm", "0")).toBeCloseTo(0.00012, 12);
    expect(gaugeBlockTolerance(10.5, "mm", "0")).toBeCloseTo(0.00014, 12);
    expect(gaugeBlockTolerance(25, "mm", "0")).toBeCloseTo(0.00014, 12);
    expect(gaugeBlockTolerance(50, "mm", "2")).toBeCloseTo(0.0008, 12);
    expect(gaugeBlockTolerance(100, "mm", "1")).toBeCloseTo(0.0006, 12);
    expect(gaugeBlockTolerance(150, "mm", "1")).toBeNull();
  });

  it("an inch block is placed by its length in millimetres, exactly (1 in = 25.4 mm): 1 in is in the 25–50 mm row, grade 1 ± 0.40 µm", () => {
    expect(gaugeBlockTolerance(1, "in", "1")! * 25.4).toBeCloseTo(0.0004, 12);
  });

  it("reads the grade as written on a standard", () => {
    expect(gaugeBlockGrade("0")).toBe("0");
    expect(gaugeBlockGrade("grade 2")).toBe("2");
    expect(gaugeBlockGrade("k")).toBe("K");
    expect(gaugeBlockGrade("AS-1")).toBeNull();
  });
});
