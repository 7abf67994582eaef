import { describe, expect, it } from "vitest";
import { errorAtNearestPoint, largestError, rejudgeReading } from "./rejudge";

// Demo clearance limits 0.0010–0.0045 in (common practice; demo limits).
const CLEARANCE = { min: 0.001, max: 0.0045 };

describe("re-judging a reading with the error found on its tool", () => {
  it("a micrometer that read 0.0003 large on a journal made the clearance read 0.0003 tight: the true clearance is larger", () => {
    const r = rejudgeReading({ measured: 0.0026, limits: CLEARANCE, errorFound: 0.0003, effect: -1 });
    expect(r.correctedValue).toBe(0.0029);
    expect(r.correctedVerdict).toBe("within_limits");
    expect(r.verdictCouldChange).toBe(false);
    expect(r.marginBefore).toBe(0.0016);
    expect(r.marginAfter).toBe(0.0016);
  });

  it("a bore gauge that read 0.0003 large made the clearance read large: the true clearance is smaller", () => {
    const r = rejudgeReading({ measured: 0.0026, limits: CLEARANCE, errorFound: 0.0003, effect: 1 });
    expect(r.correctedValue).toBe(0.0023);
  });

  it("a clearance near the maximum that the corrected value pushes over it could have been rejected", () => {
    const r = rejudgeReading({ measured: 0.0044, limits: CLEARANCE, errorFound: -0.0002, effect: 1 });
    expect(r.originalVerdict).toBe("within_limits");
    expect(r.correctedValue).toBe(0.0046);
    expect(r.correctedVerdict).toBe("outside_limits");
    expect(r.marginAfter).toBe(-0.0001);
    expect(r.verdictCouldChange).toBe(true);
    expect(r.basis).toContain("could have been different");
  });

  it("a corrected value exactly on the limit keeps the verdict; the uncertainty of the finding then decides", () => {
    const onLimit = rejudgeReading({ measured: 0.0043, limits: CLEARANCE, errorFound: -0.0002, effect: 1 });
    expect(onLimit.correctedValue).toBe(0.0045);
    expect(onLimit.verdictCouldChange).toBe(false);
    const withU = rejudgeReading({ measured: 0.0043, limits: CLEARANCE, errorFound: -0.0002, uncertainty: 0.00005, effect: 1 });
    expect(withU.correctedRange).toEqual({ low: 0.00445, high: 0.00455 });
    expect(withU.verdictCouldChange).toBe(true);
  });

  it("a rejected reading could have been acceptable when the corrected span reaches back inside the limits", () => {
    const r = rejudgeReading({ measured: 0.0047, limits: CLEARANCE, errorFound: 0.0001, uncertainty: 0.0001, effect: 1 });
    expect(r.originalVerdict).toBe("outside_limits");
    expect(r.correctedVerdict).toBe("outside_limits");
    expect(r.verdictCouldChange).toBe(true);
  });

  it("a rejected reading stays rejected when the corrected span stays outside", () => {
    const r = rejudgeReading({ measured: 0.006, limits: CLEARANCE, errorFound: 0.0001, uncertainty: 0.0001, effect: 1 });
    expect(r.verdictCouldChange).toBe(false);
    expect(r.basis).toContain("holds");
  });

  it("a span wider than the whole tolerance could change an outside verdict even though both its ends are outside", () => {
    const r = rejudgeReading({ measured: 0.0005, limits: { min: 0.001, max: 0.0012 }, errorFound: -0.0006, uncertainty: 0.001, effect: 1 });
    expect(r.correctedRange).toEqual({ low: 0.0001, high: 0.0021 });
    expect(r.verdictCouldChange).toBe(true);
  });

  it("serviceable limits count when re-judging a worn size", () => {
    const r = rejudgeReading({ measured: 1.1238, limits: { min: 1.1245, max: 1.125, serviceableMin: 1.1235 }, errorFound: 0.0004, effect: 1 });
    expect(r.originalBand).toBe("serviceable");
    expect(r.correctedValue).toBe(1.1234);
    expect(r.correctedBand).toBe("reject");
    expect(r.verdictCouldChange).toBe(true);
  });

  it("a lost tool's error is unknown: every reading it took could have been judged differently", () => {
    const r = rejudgeReading({ measured: 0.0026, limits: CLEARANCE, errorFound: null, effect: 1 });
    expect(r).toMatchObject({ correctedValue: null, correctedVerdict: null, marginAfter: null, verdictCouldChange: true });
    expect(r.basis).toContain("unknown");
  });

  it("metric windows are exact: 0.041 corrected by −0.002 is exactly on 0.039", () => {
    const r = rejudgeReading({ measured: 0.041, limits: { min: 0.007, max: 0.039 }, errorFound: 0.002, effect: 1 });
    expect(r.correctedValue).toBe(0.039);
    expect(r.marginAfter).toBe(0);
    expect(r.correctedVerdict).toBe("within_limits");
  });
});

describe("which error applies to a reading", () => {
  const points = [
    { nominal: 0.1, errorAsFound: 0.0001 },
    { nominal: 0.5, errorAsFound: -0.0002 },
    { nominal: 1.0, errorAsFound: 0.0004 },
  ];

  it("the error at the check point nearest to the size read", () => {
    expect(errorAtNearestPoint(points, 0.45)).toEqual({ error: -0.0002, nominal: 0.5 });
    expect(errorAtNearestPoint(points, 0.9)).toEqual({ error: 0.0004, nominal: 1.0 });
  });

  it("halfway between two points the larger error is taken, to be safe", () => {
    expect(errorAtNearestPoint(points, 0.75)).toEqual({ error: 0.0004, nominal: 1.0 });
  });

  it("the largest error by size keeps its sign, as a conservative bound", () => {
    expect(largestError(points)).toBe(0.0004);
    expect(largestError([{ errorAsFound: 0.0001 }, { errorAsFound: -0.0003 }])).toBe(-0.0003);
  });

  it("without check points there is no error to apply", () => {
    expect(errorAtNearestPoint([], 1)).toBeNull();
    expect(largestError([])).toBeNull();
  });
});
