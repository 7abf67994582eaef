import { describe, expect, it } from "vitest";
import stdlibBetaQuantile from "@stdlib/stats-base-dists-beta-quantile";
import { clopperPearson, driftTrend, endOfPeriodReliability, recommendInterval, staircaseSuggestion } from "./interval-analysis";

describe("end-of-period reliability", () => {
  it("first calibrations are not end-of-period observations", () => {
    const obs = [
      { asFoundInTolerance: false, isFirst: true },
      ...Array.from({ length: 15 }, () => ({ asFoundInTolerance: true, isFirst: false })),
      ...Array.from({ length: 5 }, () => ({ asFoundInTolerance: false, isFirst: false })),
    ];
    expect(endOfPeriodReliability(obs)).toEqual({ reliability: 0.75, inTolerance: 15, observations: 20 });
  });

  it("a family with only first calibrations has no reliability yet", () => {
    expect(endOfPeriodReliability([{ asFoundInTolerance: true, isFirst: true }]).reliability).toBeNull();
  });
});

describe("Clopper-Pearson interval of the observed rate (binomial arithmetic; reference-values.md)", () => {
  it("9 of 10 at 95 % → [0.555, 0.997]", () => {
    const ci = clopperPearson(9, 10, 0.95);
    expect(ci.lower).toBeCloseTo(0.555, 3);
    expect(ci.upper).toBeCloseTo(0.997, 3);
  });

  it("10 of 10 at 95 % → lower limit 0.692 (= 0.025^(1/10)), upper 1", () => {
    const ci = clopperPearson(10, 10, 0.95);
    expect(ci.lower).toBeCloseTo(0.692, 3);
    expect(ci.lower).toBeCloseTo(0.025 ** (1 / 10), 12);
    expect(ci.upper).toBe(1);
  });

  it("15 of 20 at 95 % → [0.509, 0.913]", () => {
    const ci = clopperPearson(15, 20, 0.95);
    expect(ci.lower).toBeCloseTo(0.509, 3);
    expect(ci.upper).toBeCloseTo(0.913, 3);
  });

  it("the jstat beta quantiles agree with @stdlib", () => {
    for (const [x, n] of [[9, 10], [15, 20], [3, 7], [40, 41]] as const) {
      const ci = clopperPearson(x, n, 0.9);
      expect(ci.lower).toBeCloseTo(stdlibBetaQuantile(0.05, x, n - x + 1), 9);
      expect(ci.upper).toBeCloseTo(stdlibBetaQuantile(0.95, x + 1, n - x), 9);
    }
  });

  it("none in tolerance gives a lower limit of 0; nonsense counts are refused", () => {
    expect(clopperPearson(0, 5).lower).toBe(0);
    expect(() => clopperPearson(6, 5)).toThrow(RangeError);
    expect(() => clopperPearson(1, 5, 1)).toThrow(RangeError);
  });
});

describe("interval test, NCSL RP-1 method A3 (from memory), sized by the exponential model I_new = I_old · ln(R*) / ln(R) (NCSL RP-1 (from memory))", () => {
  it("9 of 10 in tolerance holds the 0.95 target inside [0.555, 0.997]: keep 365 days, not cut to 178", () => {
    const r = recommendInterval({ observedIntervalDays: 365, inTolerance: 9, observations: 10 });
    expect(r.decision).toBe("keep");
    expect(r.recommendedIntervalDays).toBe(365);
    expect(r.reason).toMatch(/Keep 365 days: 9 of 10 found in tolerance \(90.0 %\); its 95 % Clopper-Pearson interval is 55.5 % – 99.7 %, which holds the target 95.0 %/);
  });

  it("10 of 10 has a lower limit of 0.692, under the target: keep, not double to 730", () => {
    const r = recommendInterval({ observedIntervalDays: 365, inTolerance: 10, observations: 10 });
    expect(r.decision).toBe("keep");
    expect(r.recommendedIntervalDays).toBe(365);
  });

  it("15 of 20 lies entirely below the target ([0.509, 0.913]): shorten 365 days to 65.1 days (arithmetic on the model)", () => {
    const r = recommendInterval({ observedIntervalDays: 365, inTolerance: 15, observations: 20 });
    expect(r.decision).toBe("shorten");
    expect(r.recommendedIntervalDays).toBe(65.1);
    expect(r.recommendedWholeDays).toBe(65);
    expect(r.confidenceInterval!.upper).toBeCloseTo(0.913, 3);
    expect(r.reason).toMatch(/Shorten to 65.1 days/);
  });

  it("90 % found in tolerance out of 200 is significant and gives 177.7 days (arithmetic on the model)", () => {
    const r = recommendInterval({ observedIntervalDays: 365, inTolerance: 180, observations: 200 });
    expect(r.confidenceInterval!.upper).toBeLessThan(0.95);
    expect(r.recommendedIntervalDays).toBe(177.7);
  });

  it("the confidence is the shop's: 15 of 20 at 99 % reaches up to 0.94, still below 0.95", () => {
    const r = recommendInterval({ observedIntervalDays: 365, inTolerance: 15, observations: 20, confidence: 0.99 });
    expect(r.confidence).toBe(0.99);
    expect(r.decision).toBe("shorten");
    expect(recommendInterval({ observedIntervalDays: 365, inTolerance: 16, observations: 20, confidence: 0.99 }).decision).toBe("keep");
  });

  it("keep means the family's current interval, even when the history was observed under another", () => {
    expect(recommendInterval({ observedIntervalDays: 365, currentIntervalDays: 300, inTolerance: 9, observations: 10 }).recommendedIntervalDays).toBe(300);
  });

  it("a rate significantly above the target lengthens, capped at the step factor (common practice, no source): 80 of 80 → 0.025^(1/80) = 0.955 > 0.95", () => {
    const r = recommendInterval({ observedIntervalDays: 180, inTolerance: 80, observations: 80 });
    expect(r.confidenceInterval!.lower).toBeGreaterThan(0.95);
    expect(r).toMatchObject({ decision: "lengthen", recommendedIntervalDays: 360 });
    expect(r.reason).toContain("limited to ×2");
    expect(recommendInterval({ observedIntervalDays: 180, inTolerance: 80, observations: 80, maxStepFactor: 1.25 }).recommendedIntervalDays).toBe(225);
  });

  it("lengthening waits for the shop's minimum number of recalibrations; shortening does not (the safe side)", () => {
    const high = recommendInterval({ observedIntervalDays: 180, inTolerance: 80, observations: 80, minObservations: 100 });
    expect(high.decision).toBe("keep");
    expect(high.reason).toContain("at least 100");
    const low = recommendInterval({ observedIntervalDays: 365, inTolerance: 1, observations: 5 });
    expect(low.decision).toBe("shorten");
  });

  it("no tool found in tolerance gives no interval rather than zero days; no observations give no decision", () => {
    expect(recommendInterval({ observedIntervalDays: 180, inTolerance: 0, observations: 12 })).toMatchObject({ decision: "shorten", recommendedIntervalDays: null });
    expect(recommendInterval({ observedIntervalDays: 180, inTolerance: 0, observations: 0 })).toMatchObject({ decision: "none", recommendedIntervalDays: null, confidenceInterval: null });
  });

  it("a target outside 0–1 is refused", () => {
    expect(() => recommendInterval({ observedIntervalDays: 180, inTolerance: 9, observations: 12, target: 1 })).toThrow(RangeError);
  });
});

describe("staircase adjustment (ILAC-G24 method 1, automatic adjustment; factors common practice, no source)", () => {
  it("found in tolerance: lengthen by 10 %, rounded down", () => {
    expect(staircaseSuggestion({ currentIntervalDays: 365, lastAsFoundInTolerance: true })).toMatchObject({ suggestedIntervalDays: 401, direction: "lengthen" });
  });

  it("found out of tolerance: shorten by a quarter, rounded down", () => {
    expect(staircaseSuggestion({ currentIntervalDays: 365, lastAsFoundInTolerance: false })).toMatchObject({ suggestedIntervalDays: 273, direction: "shorten" });
  });

  it("an interval never shortens below one day", () => {
    expect(staircaseSuggestion({ currentIntervalDays: 1, lastAsFoundInTolerance: false }).suggestedIntervalDays).toBe(1);
  });
});

describe("drift over each interval, from as-left to the next as-found (least squares through the origin; common practice, no source)", () => {
  const cal = (at: string, errorAsFound: number, errorAsLeft: number | null = null) => ({ at: `${at}T12:00:00Z`, errorAsFound, errorAsLeft });

  it("errors that grow 0.00002 in per 100 days from a re-set zero predict the date the last as-left error reaches the MPE, counted from the last calibration", () => {
    // Each year the tool is found 0.000073 in large and re-set to zero: the drift is the same in every interval.
    const t = driftTrend([cal("2024-01-01", 0, 0), cal("2024-12-31", 0.000073, 0), cal("2025-12-31", 0.000073, 0)], 0.0001, 365, "2026-01-05T00:00:00Z");
    expect(t.intervals.map((i) => [i.startError, i.endError])).toEqual([[0, 0.000073], [0, 0.000073]]);
    expect(t.ratePerDay).toBeCloseTo(0.000073 / 365, 15);
    expect(t.rateUncertaintyPerDay).toBeCloseTo(0, 15);
    // From 0 at 2025-12-31 at 0.0000002 in/day: 0.0001 in after 500 days → 2027-05-15, within two intervals (2027-12-31)
    expect(t.predictedExceedAt).toBe("2027-05-15");
    expect(t.outlook).toBe("predicted");
    expect(t.horizonAt).toBe("2027-12-31");
  });

  it("never fits across an adjustment: a tool re-set each year shows its drift per interval, not a line through the as-found errors", () => {
    // As-found errors alone (0.00008, 0.00008, 0.00008) would show no trend at all; the tool really drifts 0.00008 in a year.
    const t = driftTrend([cal("2023-06-01", 0.00008, 0), cal("2024-05-31", 0.00008, 0), cal("2025-05-31", 0.00008, 0)], 0.0001, 365, "2025-06-10T00:00:00Z");
    expect(t.ratePerDay).toBeGreaterThan(0);
    expect(t.predictedExceedAt! > "2025-06-10").toBe(true);
  });

  it("a tool left as found continues from its as-found error", () => {
    const t = driftTrend([cal("2024-01-01", 0), cal("2024-12-31", 0.00002), cal("2025-12-31", 0.00004)], 0.0001, 365, "2026-01-01T00:00:00Z");
    expect(t.intervals.map((i) => i.startError)).toEqual([0, 0.00002]);
    expect(t.startError).toBe(0.00004);
  });

  it("a slow drift is 'not expected to leave tolerance within two intervals', never a date in the past", () => {
    const t = driftTrend([cal("2023-01-01", 0, 0), cal("2024-01-01", 0.00001, 0), cal("2025-01-01", 0.000012, 0)], 0.0001, 365, "2026-06-01T00:00:00Z");
    expect(t.outlook).toBe("beyond_two_intervals");
    expect(t.predictedExceedAt).toBeNull();
  });

  it("the fit's uncertainty from the scatter of the intervals gives an earlier date to allow for (GUM G.3: k = t(ν = intervals − 1))", () => {
    const t = driftTrend([cal("2023-01-01", 0, 0), cal("2024-01-01", 0.00006, 0), cal("2025-01-01", 0.00008, 0), cal("2026-01-01", 0.00007, 0)], 0.0001, 365, "2026-01-02T00:00:00Z");
    expect(t.rateUncertaintyPerDay).toBeGreaterThan(0);
    expect(t.k).toBeGreaterThan(2);
    expect(t.earliestExceedAt! < t.predictedExceedAt!).toBe(true);
  });

  it("a predicted date already passed says the tool may have left tolerance", () => {
    const t = driftTrend([cal("2023-01-01", 0, 0), cal("2024-01-01", 0.00008, 0), cal("2025-01-01", 0.00008, 0)], 0.0001, 365, "2026-06-01T00:00:00Z");
    expect(t.outlook).toBe("may_have_left");
  });

  it("left out of tolerance at the last calibration: already out", () => {
    expect(driftTrend([cal("2023-01-01", 0), cal("2024-01-01", 0.00008), cal("2025-01-01", 0.00012)], 0.0001, 365, "2025-02-01T00:00:00Z").outlook).toBe("already_out");
  });

  it("fewer than two intervals give no trend", () => {
    const t = driftTrend([cal("2025-01-01", 0), cal("2025-06-01", 0.0001)], 0.0004, 365, "2025-07-01T00:00:00Z");
    expect(t.outlook).toBe("insufficient");
    expect(t.ratePerDay).toBeNull();
  });
});
