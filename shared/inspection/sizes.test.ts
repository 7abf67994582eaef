import { describe, expect, it } from "vitest";
import { clearanceOf, formatClearance, judgeAgainstLimits, marginToLimits, resolutionTooCoarse, sizeFromValues } from "./sizes";
import { convertLength } from "../common/units";

describe("size of a journal or bore from readings in several directions", () => {
  it("a journal's size is its smallest reading and a bore's its largest (common practice; FAA-H-8083-32 for two positions 90° apart)", () => {
    expect(sizeFromValues("journal", [1.125, 1.1247])).toEqual({ size: 1.1247, outOfRound: 0.0003 });
    expect(sizeFromValues("bore", [1.1271, 1.1273])).toEqual({ size: 1.1273, outOfRound: 0.0002 });
  });

  it("out-of-round is the largest less the smallest reading, exactly (common practice, handbook examples)", () => {
    expect(sizeFromValues("bore", [25.021, 24.98, 25.0]).outOfRound).toBe(0.041);
  });

  it("a size needs at least one reading", () => {
    expect(() => sizeFromValues("journal", [])).toThrow(RangeError);
  });
});

describe("clearance = bore − journal", () => {
  it("journal 1.1250/1.1247 and bore 1.1271/1.1273 give a clearance of 0.0026 in (common practice)", () => {
    const journal = sizeFromValues("journal", [1.125, 1.1247]).size;
    const bore = sizeFromValues("bore", [1.1271, 1.1273]).size;
    expect(clearanceOf(bore, journal)).toBe(0.0026);
    expect(formatClearance(clearanceOf(bore, journal), "in")).toBe("0.0026 loose");
  });

  it("a journal larger than its bore is an interference, shown as tight", () => {
    expect(clearanceOf(1.0, 1.0015)).toBe(-0.0015);
    expect(formatClearance(-0.0015, "in")).toBe("0.0015 tight");
    expect(formatClearance(0, "mm")).toBe("0.000 line to line");
  });

  it("a bore read in inches and a journal read on a metric micrometer combine after an exact conversion", () => {
    // 28.575 mm is exactly 1.125 in
    const journalIn = convertLength(28.575, "mm", "in");
    expect(clearanceOf(1.1273, journalIn)).toBe(0.0023);
  });
});

// Worked clearance examples: clearance range = hole min − shaft max … hole max − shaft min.
function fitRange(hole: [number, number], shaft: [number, number]) {
  return { min: clearanceOf(hole[0], shaft[1]), max: clearanceOf(hole[1], shaft[0]) };
}

describe("limits and fits as worked clearance examples", () => {
  it("25 H7/g6: hole 25.000–25.021, shaft 24.980–24.993 → 0.007 to 0.041 mm exactly (ISO 286-2)", () => {
    expect(fitRange([25.0, 25.021], [24.98, 24.993])).toEqual({ min: 0.007, max: 0.041 });
  });

  it("the 25 H7 hole is IT7 = 21 µm wide and the g6 shaft IT6 = 13 µm, 18–30 mm (ISO 286-1 Table 1)", () => {
    expect(clearanceOf(25.021, 25.0)).toBe(0.021);
    expect(clearanceOf(24.993, 24.98)).toBe(0.013);
  });

  it("25 H7/f7 → 0.020 to 0.062 mm (ISO 286-2)", () => {
    expect(fitRange([25.0, 25.021], [24.959, 24.98])).toEqual({ min: 0.02, max: 0.062 });
  });

  it("25 H7/h6 → 0.000 to 0.034 mm (ISO 286-2)", () => {
    expect(fitRange([25.0, 25.021], [24.987, 25.0])).toEqual({ min: 0, max: 0.034 });
  });

  it("50 H7/h6 → 0.000 to 0.041 mm (ISO 286-2)", () => {
    expect(fitRange([50.0, 50.025], [49.984, 50.0])).toEqual({ min: 0, max: 0.041 });
  });

  it("10 H7/g6, 10 mm being in the 6–10 range → 0.005 to 0.029 mm (ISO 286-2)", () => {
    expect(fitRange([10.0, 10.015], [9.986, 9.995])).toEqual({ min: 0.005, max: 0.029 });
  });

  it("25 H7/k6 → +0.019 to −0.015 mm, the negative end an interference (ISO 286-2)", () => {
    expect(fitRange([25.0, 25.021], [25.002, 25.015])).toEqual({ min: -0.015, max: 0.019 });
  });

  it("RC4 at 1.000 in: hole 1.0000–1.0012, shaft 0.9984–0.9992 → 0.0008 to 0.0028 in (ANSI B4.1-1967 (R2009) as printed in Machinery's Handbook)", () => {
    expect(fitRange([1.0, 1.0012], [0.9984, 0.9992])).toEqual({ min: 0.0008, max: 0.0028 });
  });

  it("a clearance exactly on the maximum limit of a fit is within limits, where floating point would put it outside", () => {
    const c = clearanceOf(25.021, 24.98);
    expect(judgeAgainstLimits({ value: c, min: 0.007, max: 0.041 })).toMatchObject({ verdict: "within_limits", marginToNearestLimit: 0 });
    expect(25.021 - 24.98 <= 0.041).toBe(false);
  });
});

describe("judging against the limits table", () => {
  it("a clearance of three thousandths against 0.0010–0.0045 in is within limits (common practice; demo limits)", () => {
    const j = judgeAgainstLimits({ value: 0.003, min: 0.001, max: 0.0045 });
    expect(j).toEqual({
      verdict: "within_limits",
      band: "new",
      marginToNearestLimit: 0.0015,
      decidingLimits: { min: 0.001, max: 0.0045 },
    });
  });

  it("a clearance on the minimum limit is within limits and one a tenth under it is outside", () => {
    expect(judgeAgainstLimits({ value: 0.001, min: 0.001, max: 0.0045 }).verdict).toBe("within_limits");
    const under = judgeAgainstLimits({ value: 0.0009, min: 0.001, max: 0.0045 });
    expect(under).toMatchObject({ verdict: "outside_limits", band: "reject", marginToNearestLimit: -0.0001 });
  });

  it("a worn clearance past the new maximum but inside the serviceable limit is within limits in the serviceable band (demo limits)", () => {
    const j = judgeAgainstLimits({ value: 0.005, min: 0.001, max: 0.0045, serviceableMax: 0.006 });
    expect(j).toEqual({ verdict: "within_limits", band: "serviceable", marginToNearestLimit: 0.001, decidingLimits: { min: 0.001, max: 0.006 } });
  });

  it("a clearance on the serviceable limit is within limits, and past it is rejected", () => {
    expect(judgeAgainstLimits({ value: 0.006, min: 0.001, max: 0.0045, serviceableMax: 0.006 }).band).toBe("serviceable");
    expect(judgeAgainstLimits({ value: 0.0061, min: 0.001, max: 0.0045, serviceableMax: 0.006 })).toMatchObject({
      verdict: "outside_limits",
      band: "reject",
      marginToNearestLimit: -0.0001,
    });
  });

  it("a worn journal under its new minimum but above the serviceable minimum is serviceable (demo limits)", () => {
    expect(judgeAgainstLimits({ value: 1.124, min: 1.1245, max: 1.125, serviceableMin: 1.1235 })).toMatchObject({
      verdict: "within_limits",
      band: "serviceable",
      marginToNearestLimit: 0.0005,
    });
  });

  it("a one-sided limit, such as a maximum out-of-round, judges only its own side", () => {
    expect(judgeAgainstLimits({ value: 0.0003, max: 0.0005 })).toMatchObject({ verdict: "within_limits", decidingLimits: { min: null, max: 0.0005 } });
    expect(marginToLimits(0.0007, null, 0.0005)).toBe(-0.0002);
  });

  it("a table item without any limit cannot be judged", () => {
    expect(() => judgeAgainstLimits({ value: 1 })).toThrow(RangeError);
  });
});

describe("resolution against tolerance", () => {
  it("tolerance 0.02 mm needs a resolution of 0.002 mm or finer (\"rule of ten\", AIAG MSA; NPL \"10 % rule\")", () => {
    expect(resolutionTooCoarse(0.002, 0.02)).toBe(false);
    expect(resolutionTooCoarse(0.0021, 0.02)).toBe(true);
    expect(resolutionTooCoarse(0.01, 0.02)).toBe(true);
  });

  it("a tenth-reading micrometer suits a 0.0035 in clearance band, a thousandth-reading one does not", () => {
    expect(resolutionTooCoarse(0.0001, 0.0035)).toBe(false);
    expect(resolutionTooCoarse(0.001, 0.0035)).toBe(true);
  });

  it("at a shop ratio of 4:1 a 0.0001 in micrometer suits a 0.0004 in band but not a 0.0003 in one (shop setting; common practice, no source)", () => {
    expect(resolutionTooCoarse(0.0001, 0.0004, 4)).toBe(false);
    expect(resolutionTooCoarse(0.0001, 0.0003, 4)).toBe(true);
    // The same micrometer on the 0.0004 band fails the default 10:1.
    expect(resolutionTooCoarse(0.0001, 0.0004)).toBe(true);
  });
});
