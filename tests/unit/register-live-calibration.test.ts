import { describe, expect, it } from "vitest";
import { asFoundOf, asLeftOf, liveCalibration, parseNumber, parseReadings, type LiveContext, type PointText } from "../../src/features/tools/lib/live-calibration";
import { standardForCompute, type ComputeStandard } from "../../shared/calibrations/calibration-compute";

// The calibration form's live answer must be the server's answer: these checks
// drive the form's wrapper with typed text and compare with the published values.
const ctx: LiveContext = {
  rule: "simple",
  unit: "in",
  resolution: 0.0001,
  familyMpe: 0.0001,
  temperatureC: 20,
  adjusted: false,
  standards: [],
  limitedRange: null,
  performedAt: "2026-06-15T15:00:00Z",
  intervalDays: 365,
  timeZone: "America/Chicago",
};
const point = (p: Partial<PointText>): PointText => ({ nominal: "0.5", reference: "", asFound: "0.5", asLeft: "", mpe: "", uncertainty: "", repeatReadings: "", ...p });
const blocks = (over: Partial<ComputeStandard> = {}): ComputeStandard => ({
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
  elements: [],
  ...over,
});

describe("the calibration form's live verdicts", () => {
  it("an error exactly on the permissible error passes under simple acceptance (ILAC-G8:09/2019 §4.2.1)", () => {
    const live = liveCalibration([point({ asFound: "0.5001" })], ctx);
    expect(live.points[0].computed?.errorAsFound).toBe(0.0001);
    expect(live.points[0].computed?.verdict).toBe("pass");
    expect(live.overall?.result).toBe("pass");
  });

  it("a ± 0.0001 in tolerance checked with U95 = 0.60 µm gives a TUR of 4.23, no warning (arithmetic on ANSI/NCSL Z540.3-2006 §5.3 b)", () => {
    const U = String(0.6 / 25400); // 0.60 µm in inches
    const live = liveCalibration([point({ uncertainty: U })], ctx);
    expect(live.points[0].computed?.tur).toBeCloseTo(4.23, 2);
    expect(live.lowTurPoints).toBe(0);
  });

  it("a TUR under 4:1 is flagged for the warning (ANSI/NCSL Z540.3-2006 §5.3 b)", () => {
    const live = liveCalibration([point({ uncertainty: "0.00003" })], ctx);
    expect(live.points[0].computed?.turAdequate).toBe(false);
    expect(live.lowTurPoints).toBe(1);
  });

  it("guarded acceptance refuses release of an error inside MPE but beyond MPE − U (ILAC-G8:09/2019 §4.2.2), while the tool was found in tolerance (§4.2.1) and stated a conditional pass", () => {
    const live = liveCalibration([point({ asFound: "0.50009", uncertainty: "0.00002" })], { ...ctx, rule: "guarded" });
    expect(live.points[0].computed?.verdict).toBe("fail");
    expect(live.overall).toEqual({ result: "fail", asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
  });

  it("found out, adjusted and left in is 'adjusted' (api.md result vocabulary), but only when the form says it was adjusted", () => {
    const live = liveCalibration([point({ asFound: "0.5003", asLeft: "0.5000" })], { ...ctx, adjusted: true });
    expect(live.overall).toEqual({ result: "adjusted", asFoundInTolerance: false, asFoundStatement: "fail" });
    expect(liveCalibration([point({ asFound: "0.5003", asLeft: "0.5000" })], ctx).overall?.result).toBe("fail");
  });

  it("on an adjusted record a blank as-left is the as-found reading (the point did not move); repeat readings give the as-found mean", () => {
    expect(asLeftOf(point({ asFound: "0.5001" }), true, 0.0001)).toBe(0.5001);
    expect(asLeftOf(point({ asFound: "0.5001" }), false, 0.0001)).toBeNull();
    expect(parseReadings("0.5000 0.5001, 0.5001")).toEqual([0.5, 0.5001, 0.5001]);
    expect(parseReadings("0.5000 0.50x")).toBeNull();
    // mean 0.500066… written with one digit past the 0.0001 in resolution
    expect(asFoundOf(point({ asFound: "", repeatReadings: "0.5000 0.5001 0.5001" }), 0.0001)).toBe(0.50007);
    const live = liveCalibration([point({ asFound: "", repeatReadings: "0.5000 0.5001 0.5001" })], { ...ctx, standards: [blocks()] });
    expect(live.points[0].computed?.budget?.components.some((c) => c.kind === "repeatability")).toBe(true);
  });

  it("without a typed U the budget from the standard's certificate, resolution and temperature gives U at k = 2 (GUM 5.1.2, F.2.2.1)", () => {
    const live = liveCalibration([point({})], { ...ctx, standards: [blocks()] });
    const p = live.points[0].computed!;
    expect(p.uncertaintySource).toBe("budget");
    // u_std = 0.000002, u_res = 0.0001/(2√3); at 20 °C the temperature term is zero: U = 0.0000579…, stated rounded up to two digits (GUM 7.2.6).
    const expected = 2 * Math.sqrt(0.000002 ** 2 + (0.0001 / (2 * Math.sqrt(3))) ** 2);
    expect(expected).toBeCloseTo(0.0000579, 7);
    expect(p.uncertainty).toBe(0.000058);
  });

  it("a gauge block's certified size is its nominal plus the deviation on its certificate, the same from the server's decimal strings and the form's numbers (arithmetic, no source)", () => {
    const fromRows = standardForCompute({
      standard: { assetTag: "G", kind: "gauge_block_set", unit: "in", nominal: null },
      certificate: { number: "C", expandedUncertainty: "0.000004", coverageFactor: "2", certifiedValue: null, elementValues: [{ label: "0.500", nominal: "0.5", deviation: "0.000003" }] },
    });
    const fromApi = standardForCompute({
      standard: { assetTag: "G", kind: "gauge_block_set", unit: "in", nominal: null },
      certificate: { number: "C", expandedUncertainty: 0.000004, coverageFactor: 2, certifiedValue: null, elementValues: [{ label: "0.500", nominal: 0.5, deviation: 0.000003 }] },
    });
    for (const std of [fromRows, fromApi]) {
      expect(std.expandedUncertainty).toBe(0.000004);
      // An as-found of 0.5001 against a block that is really 0.500003 in is 0.000097 in large, not 0.0001.
      const live = liveCalibration([point({ asFound: "0.5001" })], { ...ctx, standards: [std] });
      expect(live.points[0].computed?.referenceSource).toBe("certified");
      expect(live.points[0].computed?.errorAsFound).toBe(0.000097);
    }
    // A setting standard's certified length stands for its nominal.
    const setting = standardForCompute({ standard: { assetTag: "S", kind: "setting_standard", unit: "mm", nominal: 25 }, certificate: { number: "C", expandedUncertainty: 0.0005, coverageFactor: 2, certifiedValue: 25.0004 } });
    const live = liveCalibration([point({ nominal: "25", asFound: "25.001" })], { ...ctx, unit: "mm", resolution: 0.001, familyMpe: 0.002, standards: [setting] });
    expect(live.points[0].computed?.reference).toBe(25.0004);
  });

  it("the next due date is the calendar date of the calibration in the shop's zone plus the interval (api.md, no grace period)", () => {
    // 2026-01-01T03:00Z is still 31 December in Chicago.
    const live = liveCalibration([point({})], { ...ctx, performedAt: "2026-01-01T03:00:00Z", intervalDays: 30 });
    expect(live.nextDueAt).toBe("2026-01-30");
  });

  it("an unfinished number is not judged yet (common practice, no source)", () => {
    expect(parseNumber("0.")).toBe(0);
    expect(parseNumber("-")).toBeNull();
    expect(liveCalibration([point({ asFound: "" })], ctx).points[0].problem).toMatch(/as-found/);
  });
});
