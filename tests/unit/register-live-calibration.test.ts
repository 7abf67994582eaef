import { describe, expect, it } from "vitest";
import { liveCalibration, parseNumber, type LiveContext, type PointText } from "../../src/features/tools/lib/live-calibration";
import { standardForCompute } from "../../shared/calibrations/calibration-compute";

// The calibration form's live answer must be the server's answer: these checks
// drive the form's wrapper with typed text and compare with the published values.
const ctx: LiveContext = {
  rule: "simple",
  unit: "in",
  resolution: 0.0001,
  familyMpe: 0.0001,
  temperatureC: 20,
  standards: [],
  limitedRange: null,
  performedAt: "2026-06-15T15:00:00Z",
  intervalDays: 365,
  timeZone: "America/Chicago",
};
const point = (p: Partial<PointText>): PointText => ({ nominal: "0.5", reference: "", asFound: "0.5", asLeft: "", mpe: "", uncertainty: "", ...p });

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

  it("guarded acceptance refuses an error inside MPE but beyond MPE − U (ILAC-G8:09/2019 §4.2.2)", () => {
    const live = liveCalibration([point({ asFound: "0.50009", uncertainty: "0.00002" })], { ...ctx, rule: "guarded" });
    expect(live.points[0].computed?.verdict).toBe("fail");
    expect(live.overall?.result).toBe("fail");
  });

  it("found out and left in is 'adjusted' (api.md result vocabulary)", () => {
    const live = liveCalibration([point({ asFound: "0.5003", asLeft: "0.5000" })], ctx);
    expect(live.overall).toEqual({ result: "adjusted", asFoundInTolerance: false });
  });

  it("without a typed U the budget from the standard's certificate, resolution and temperature gives U at k = 2 (GUM 5.1.2, F.2.2.1)", () => {
    const live = liveCalibration([point({})], { ...ctx, standards: [{ expandedUncertainty: 0.000004, coverageFactor: 2, unit: "in" }] });
    const p = live.points[0].computed!;
    expect(p.uncertaintySource).toBe("budget");
    // u_std = 0.000002, u_res = 0.0001/(2√3); at 20 °C the temperature term is zero: U = 0.0000579…, stated rounded up to two digits (GUM 7.2.6).
    const expected = 2 * Math.sqrt(0.000002 ** 2 + (0.0001 / (2 * Math.sqrt(3))) ** 2);
    expect(expected).toBeCloseTo(0.0000579, 7);
    expect(p.uncertainty).toBe(0.000058);
  });

  it("a gauge block's certified size is its nominal plus the deviation on its certificate, the same from the server's decimal strings and the form's numbers (arithmetic, no source)", () => {
    const fromRows = standardForCompute({
      standard: { unit: "in", nominal: null },
      certificate: { expandedUncertainty: "0.000004", coverageFactor: "2", certifiedValue: null, elementValues: [{ nominal: "0.5", deviation: "0.000003" }] },
    });
    const fromApi = standardForCompute({
      standard: { unit: "in", nominal: null },
      certificate: { expandedUncertainty: 0.000004, coverageFactor: 2, certifiedValue: null, elementValues: [{ nominal: 0.5, deviation: 0.000003 }] },
    });
    for (const std of [fromRows, fromApi]) {
      expect(std.expandedUncertainty).toBe(0.000004);
      // An as-found of 0.5001 against a block that is really 0.500003 in is 0.000097 in large, not 0.0001.
      const live = liveCalibration([point({ asFound: "0.5001" })], { ...ctx, standards: [std] });
      expect(live.points[0].computed?.referenceSource).toBe("certified");
      expect(live.points[0].computed?.errorAsFound).toBe(0.000097);
    }
    // A setting standard's certified length stands for its nominal.
    const setting = standardForCompute({ standard: { unit: "mm", nominal: 25 }, certificate: { expandedUncertainty: 0.0005, coverageFactor: 2, certifiedValue: 25.0004 } });
    expect(setting.certifiedValues?.map((c) => [Number(c.nominal), Number(c.value)])).toEqual([[25, 25.0004]]);
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
