import { describe, expect, it } from "vitest";
import { driftTrend, endOfPeriodReliability, recommendInterval, staircaseSuggestion } from "./interval-analysis";

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

describe("exponential reliability model, I_new = I_old · ln(R*) / ln(R_observed) (NCSL RP-1 (from memory))", () => {
  it("365 days with 15 of 20 found in tolerance and a 95 % target gives 65.1 days (arithmetic on the model)", () => {
    const r = recommendInterval({ currentIntervalDays: 365, observed: 15 / 20, observations: 20 });
    expect(r.recommendedIntervalDays).toBe(65.1);
    expect(r.recommendedWholeDays).toBe(65);
    expect(r.method).toBe("exponential_reliability");
  });

  it("the same with 90 % found in tolerance gives 177.7 days (arithmetic on the model)", () => {
    expect(recommendInterval({ currentIntervalDays: 365, observed: 0.9, observations: 20 }).recommendedIntervalDays).toBe(177.7);
  });

  it("reliability on target keeps the interval", () => {
    expect(recommendInterval({ currentIntervalDays: 365, observed: 0.95, observations: 40 }).recommendedIntervalDays).toBe(365);
  });

  it("fewer than ten end-of-period calibrations give no recommendation, with the reason", () => {
    const r = recommendInterval({ currentIntervalDays: 365, observed: 0.9, observations: 9 });
    expect(r.recommendedIntervalDays).toBeNull();
    expect(r.reason).toContain("at least 10");
  });

  it("every tool found in tolerance lengthens the interval only up to the step cap (common practice, no source)", () => {
    expect(recommendInterval({ currentIntervalDays: 180, observed: 1, observations: 12 }).recommendedIntervalDays).toBe(360);
    expect(recommendInterval({ currentIntervalDays: 180, observed: 1, observations: 12, maxStepFactor: 1.25 }).recommendedIntervalDays).toBe(225);
    expect(recommendInterval({ currentIntervalDays: 180, observed: 0.99, observations: 12 }).reason).toContain("limited");
  });

  it("no tool found in tolerance gives no interval rather than zero days", () => {
    expect(recommendInterval({ currentIntervalDays: 180, observed: 0, observations: 12 }).recommendedIntervalDays).toBeNull();
  });

  it("a reliability outside 0–1 is refused", () => {
    expect(() => recommendInterval({ currentIntervalDays: 180, observed: 1.2, observations: 12 })).toThrow(RangeError);
    expect(() => recommendInterval({ currentIntervalDays: 180, observed: 0.9, target: 1, observations: 12 })).toThrow(RangeError);
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

describe("drift of a tool's errors over time (ordinary least squares)", () => {
  it("errors growing a tenth every 100 days reach a four-tenth MPE 400 days after the first calibration", () => {
    const t = driftTrend(
      [
        { at: "2025-01-01T12:00:00Z", error: 0 },
        { at: "2025-04-11T12:00:00Z", error: 0.0001 },
        { at: "2025-07-20T12:00:00Z", error: 0.0002 },
      ],
      0.0004,
    )!;
    expect(t.slopePerDay).toBeCloseTo(0.000001, 12);
    expect(t.intercept).toBeCloseTo(0, 12);
    expect(t.origin).toBe("2025-01-01");
    expect(t.predictedExceedAt).toBe("2026-02-05"); // 2025-01-01 + 400 days
  });

  it("a scattered series gives the least-squares line, and a falling one reaches −MPE", () => {
    // x = 0, 10, 20, 30; y = 1, 0, -1, -4 → slope −0.16/day, intercept 1.4
    const t = driftTrend(
      [
        { at: "2026-01-01T00:00:00Z", error: 1 },
        { at: "2026-01-11T00:00:00Z", error: 0 },
        { at: "2026-01-21T00:00:00Z", error: -1 },
        { at: "2026-01-31T00:00:00Z", error: -4 },
      ],
      5,
    )!;
    expect(t.slopePerDay).toBeCloseTo(-0.16, 12);
    expect(t.intercept).toBeCloseTo(1.4, 12);
    // 1.4 − 0.16x = −5 → x = 40 days
    expect(t.predictedExceedAt).toBe("2026-02-10");
  });

  it("points given out of order are put in time order first", () => {
    const t = driftTrend(
      [
        { at: "2025-07-20T12:00:00Z", error: 0.0002 },
        { at: "2025-01-01T12:00:00Z", error: 0 },
        { at: "2025-04-11T12:00:00Z", error: 0.0001 },
      ],
      0.0004,
    )!;
    expect(t.slopePerDay).toBeGreaterThan(0);
    expect(t.origin).toBe("2025-01-01");
  });

  it("no drift predicts no date", () => {
    const flat = [0, 100, 200].map((d) => ({ at: new Date(Date.UTC(2025, 0, 1) + d * 86_400_000).toISOString(), error: 0.0001 }));
    expect(driftTrend(flat, 0.0004)!.predictedExceedAt).toBeNull();
  });

  it("fewer than three calibrations give no trend", () => {
    expect(driftTrend([{ at: "2025-01-01T00:00:00Z", error: 0 }, { at: "2025-06-01T00:00:00Z", error: 0.0001 }], 0.0004)).toBeNull();
  });
});
