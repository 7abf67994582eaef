import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCalibration, makeTool } from "../support/factories";
import { makeDriftingTool, makeRecalibratedFamily } from "../support/factories-quality";
import { calibrations } from "../../server/db/schema";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(() => t.close());

describe("interval analysis of a family", () => {
  it("365 days with 15 of 20 recalibrations in tolerance: the 95 % Clopper-Pearson interval [0.509, 0.913] lies below R* 0.95, so the interval changes, to 65.1 days (NCSL RP-1 method A3 and exponential model (from memory); binomial arithmetic, reference-values.md)", async () => {
    // First calibrations were all found out of tolerance: counting them would drag the rate to 15/40.
    const { family } = await makeRecalibratedFamily(t.db, { intervalDays: 365, inTolerance: 15, outOfTolerance: 5, firstAsFoundInTolerance: false });
    const res = await (await t.agent("quality")).get(`/api/families/${family.id}/interval-analysis`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      calibrations: 20,
      asFoundInToleranceRate: 0.75,
      currentIntervalDays: 365,
      recommendedIntervalDays: 65.1,
      method: "exponential_reliability",
      reliabilityTarget: 0.95,
      decision: "shorten",
      confidence: 0.95,
    });
    expect(res.body.confidenceInterval.lower).toBeCloseTo(0.509, 3);
    expect(res.body.confidenceInterval.upper).toBeCloseTo(0.913, 3);
    expect(res.body.reason).toMatch(/Shorten to 65.1 days: 15 of 20 found in tolerance \(75.0 %\); its 95 % Clopper-Pearson interval is 50.9 % – 91.3 %/);
    expect(res.body.totalCalibrations).toBe(40);
    expect(res.body.observations.filter((o: { endOfPeriod: boolean }) => !o.endOfPeriod)).toHaveLength(20);
  });

  it("a tool's first calibration is not an end-of-period observation: first calibrations alone give no rate", async () => {
    const tool = await makeTool(t.db);
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-01-05T15:00:00Z"), nextDueAt: "2027-01-05", asFoundInTolerance: false, result: "adjusted" });
    const res = await (await t.agent("admin")).get(`/api/families/${tool.familyId}/interval-analysis`);
    expect(res.body.calibrations).toBe(0);
    expect(res.body.asFoundInToleranceRate).toBeNull();
    expect(res.body.recommendedIntervalDays).toBeNull();
  });

  it("9 of 10 in tolerance keeps 365 days: [0.555, 0.997] holds 0.95, so the difference is not significant (NCSL RP-1 method A3 (from memory); binomial arithmetic)", async () => {
    const { family } = await makeRecalibratedFamily(t.db, { inTolerance: 9, outOfTolerance: 1 });
    const res = await (await t.agent("quality")).get(`/api/families/${family.id}/interval-analysis`);
    expect(res.body).toMatchObject({ calibrations: 10, asFoundInToleranceRate: 0.9, decision: "keep", recommendedIntervalDays: 365 });
    expect(res.body.confidenceInterval.lower).toBeCloseTo(0.555, 3);
    expect(res.body.confidenceInterval.upper).toBeCloseTo(0.997, 3);
    expect(res.body.reason).toMatch(/^Keep 365 days/);
    // The staircase (ILAC-G24 method 1) still suggests a step from the latest finding, for comparison.
    expect(res.body.staircase).toMatchObject({ method: "staircase" });
  });

  it("10 of 10 in tolerance keeps 365 days rather than doubling it: the lower limit 0.692 is under 0.95 (NCSL RP-1 method A3 (from memory); binomial arithmetic)", async () => {
    const { family } = await makeRecalibratedFamily(t.db, { inTolerance: 10, outOfTolerance: 0 });
    const res = await (await t.agent("quality")).get(`/api/families/${family.id}/interval-analysis`);
    expect(res.body).toMatchObject({ decision: "keep", recommendedIntervalDays: 365 });
    expect(res.body.confidenceInterval.lower).toBeCloseTo(0.692, 3);
    expect(res.body.confidenceInterval.upper).toBe(1);
  });

  it("a superseded calibration record does not count; its correction does", async () => {
    const { family, tools } = await makeRecalibratedFamily(t.db, { inTolerance: 10, outOfTolerance: 0 });
    const { tool, recal } = tools[0];
    await makeCalibration(t.db, tool.id, {
      performedAt: recal.performedAt,
      nextDueAt: recal.nextDueAt,
      asFoundInTolerance: false,
      result: "adjusted",
      supersedesId: recal.id,
      supersedeReason: "As-found reading copied wrongly",
    });
    const res = await (await t.agent("quality")).get(`/api/families/${family.id}/interval-analysis`);
    expect(res.body.calibrations).toBe(10);
    expect(res.body.inTolerance).toBe(9);
  });

  it("the reliability target and the test's confidence come from the shop's settings", async () => {
    const { family } = await makeRecalibratedFamily(t.db, { inTolerance: 15, outOfTolerance: 5 });
    const quality = await t.agent("quality");
    const admin = await t.agent("admin");
    expect((await admin.patch("/api/settings", { reliabilityTarget: 0.9 })).status).toBe(200);
    try {
      const kept = await quality.get(`/api/families/${family.id}/interval-analysis`);
      // [0.509, 0.913] holds 0.90: keep.
      expect(kept.body).toMatchObject({ reliabilityTarget: 0.9, decision: "keep", recommendedIntervalDays: 365 });
      expect((await admin.patch("/api/settings", { intervalConfidence: 0.8 })).status).toBe(200);
      const changed = await quality.get(`/api/families/${family.id}/interval-analysis`);
      // At 80 % the interval of 15 of 20 ends below 0.90: 365 · ln 0.9 / ln 0.75 = 133.68 → 133.7 d (arithmetic on the model)
      expect(changed.body.confidence).toBe(0.8);
      expect(changed.body.confidenceInterval.upper).toBeLessThan(0.9);
      expect(changed.body).toMatchObject({ decision: "shorten", recommendedIntervalDays: 133.7 });
    } finally {
      await admin.patch("/api/settings", { reliabilityTarget: 0.95, intervalConfidence: 0.95 });
    }
  });

  it("the families list shows each family's observed rate, its interval, the target and whether to keep or change, with the reason", async () => {
    const { family } = await makeRecalibratedFamily(t.db, { inTolerance: 15, outOfTolerance: 5 });
    const res = await (await t.agent("auditor")).get("/api/intervals/families");
    const row = res.body.find((f: { familyId: string }) => f.familyId === family.id);
    expect(row).toMatchObject({ recalibrations: 20, inTolerance: 15, rate: 0.75, reliabilityTarget: 0.95, decision: "shorten", recommendedIntervalDays: 65.1 });
    expect(row.confidenceInterval.upper).toBeCloseTo(0.913, 3);
    expect(row.reason).toMatch(/Shorten to 65.1 days/);
  });

  it("a family id that is not a UUID is bad input, not a server fault", async () => {
    const res = await (await t.agent("quality")).get(`/api/families/not-a-uuid/interval-analysis`);
    expect(res.status).toBe(400);
    const missing = await (await t.agent("quality")).get(`/api/families/00000000-0000-4000-8000-000000000000/interval-analysis`);
    expect(missing.status).toBe(404);
  });
});

describe("applying an interval decision", () => {
  it("changes the family's and its tools' interval for calibrations from then on, keeps existing due dates, and is recorded with its data", async () => {
    const { family, tools } = await makeRecalibratedFamily(t.db, { inTolerance: 15, outOfTolerance: 5 });
    const quality = await t.agent("quality");
    const res = await quality.post(`/api/families/${family.id}/interval-decisions`, { newIntervalDays: 65, rationale: "Five of twenty found out of tolerance; shorten per the reliability model." });
    expect(res.status).toBe(201);
    expect(res.body.toolsChanged).toBe(20);
    expect(res.body.decision).toMatchObject({ previousIntervalDays: 365, newIntervalDays: 65, method: "exponential_reliability", decidedBy: t.people.quality.id });

    const after = await quality.get(`/api/families/${family.id}/interval-analysis`);
    expect(after.body.currentIntervalDays).toBe(65);
    // The history was observed on 365 days: it still recommends 65.1 days, not a rescaled 11.6.
    expect(after.body.observedIntervalDays).toBe(365);
    expect(after.body.recommendedIntervalDays).toBe(65.1);
    expect(after.body.decisions[0]).toMatchObject({ newIntervalDays: 65, decidedByName: t.people.quality.name });

    // The register export shows the new interval on every tool of the family…
    const reg = await quality.get("/api/exports/register.csv");
    const line = reg.text.split("\r\n").find((l) => l.startsWith(tools[0].tool.assetTag + ","))!;
    expect(line.split(",")[10]).toBe("65");
    // …while the due date already recorded stays as evidence.
    const [stored] = await t.db.select().from(calibrations).where(eq(calibrations.id, tools[0].recal.id));
    expect(stored.nextDueAt).toBe(tools[0].recal.nextDueAt);

    const audit = await quality.get(`/api/audit?entityType=family&entityId=${family.id}`);
    expect(audit.body.items[0]).toMatchObject({ action: "family.interval_change", actorId: t.people.quality.id, before: { defaultIntervalDays: 365 } });
  });

  it("one review may not lengthen an interval beyond the administrator's step limit", async () => {
    const { family } = await makeRecalibratedFamily(t.db, { inTolerance: 20, outOfTolerance: 0 });
    const res = await (await t.agent("admin")).post(`/api/families/${family.id}/interval-decisions`, { newIntervalDays: 1000, rationale: "Every tool found in tolerance for years." });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("interval_step_too_large");
  });

  it("a decision without a rationale is refused and nothing changes", async () => {
    const { family } = await makeRecalibratedFamily(t.db, { inTolerance: 15, outOfTolerance: 5 });
    const quality = await t.agent("quality");
    const res = await quality.post(`/api/families/${family.id}/interval-decisions`, { newIntervalDays: 65 });
    expect(res.status).toBe(400);
    expect((await quality.get(`/api/families/${family.id}/interval-analysis`)).body.currentIntervalDays).toBe(365);
  });
});

describe("drift of a tool's errors", () => {
  // As-found error +0, +20, +40 µin at 0, 180 and 360 days: a straight line of 1/9 µin per day reaches the 100 µin MPE at day 900.
  const series = [
    { date: "2025-01-01", asFound: "0.50000" },
    { date: "2025-06-30", asFound: "0.50002" },
    { date: "2025-12-27", asFound: "0.50004" },
  ];

  it("predicts, from the last calibration, the date the error would reach the permissible error, measuring the drift over each interval (least squares on a constructed series)", async () => {
    const tool = await makeDriftingTool(t.db, series, 365);
    const res = await (await t.agent("mechanic")).get(`/api/tools/${tool.assetTag}/drift`);
    expect(res.status).toBe(200);
    const s = res.body.series[0];
    expect(s.points.map((p: { errorAsFound: number }) => p.errorAsFound)).toEqual([0, 0.00002, 0.00004]);
    expect(s.intervals.map((i: { startError: number; endError: number }) => [i.startError, i.endError])).toEqual([[0, 0.00002], [0.00002, 0.00004]]);
    expect(s.mpe).toBe(0.0001);
    // From 0.00004 in on 2025-12-27 at 0.00002 in per 180 days: 0.0001 in after 540 days.
    expect(s.trend.predictedExceedAt).toBe("2027-06-20");
    expect(s.trend.horizonAt).toBe("2027-12-27");
    // Next due 2026-12-27 comes first: no flag.
    expect(res.body.dueAt).toBe("2026-12-27");
    expect(s.flagged).toBe(false);
    expect(s.outlook).toBe("predicted");
    expect(s.message).toContain("Expected to reach the permissible error around 2027-06-20");
  });

  it("never measures across an adjustment: a tool found +0.00008 in and re-set to zero every year drifts 0.00008 in a year, though its as-found errors alone show no trend", async () => {
    const tool = await makeTool(t.db, { intervalDays: 365 });
    for (const [date, next] of [["2023-06-01", "2024-05-31"], ["2024-05-31", "2025-05-31"], ["2025-05-31", "2026-05-31"]]) {
      await makeCalibration(t.db, tool.id, { performedAt: new Date(`${date}T12:00:00Z`), nextDueAt: next, adjusted: true, result: "adjusted" }, [{ nominal: "0.500", asFound: "0.50008", asLeft: "0.50000" }]);
    }
    const res = await (await t.agent("quality")).get(`/api/tools/${tool.assetTag}/drift`);
    const s = res.body.series[0];
    expect(s.intervals.map((i: { startError: number; endError: number }) => [i.startError, i.endError])).toEqual([[0, 0.00008], [0, 0.00008]]);
    expect(s.trend.ratePerDay * 365).toBeCloseTo(0.00008, 7);
    // From 0 on 2025-05-31 at 0.00008 in a year, 0.0001 in is reached after 456.25 days: 2026-08-31, still ahead of 2026-06-15.
    expect(s.trend.predictedExceedAt).toBe("2026-08-31");
    expect(s.outlook).toBe("predicted");
  });

  it("a slow drift is not expected to leave tolerance within two intervals, and no date in the past is ever predicted", async () => {
    const tool = await makeDriftingTool(t.db, [{ date: "2024-01-01", asFound: "0.50000" }, { date: "2025-01-01", asFound: "0.50001" }, { date: "2026-01-01", asFound: "0.50002" }], 365);
    const s = (await (await t.agent("quality")).get(`/api/tools/${tool.assetTag}/drift`)).body.series[0];
    expect(s.outlook).toBe("beyond_two_intervals");
    expect(s.trend.predictedExceedAt).toBeNull();
    expect(s.message).toBe("Not expected to leave tolerance within two intervals (by 2028-01-01).");
  });

  it("is flagged when the tool is predicted to leave tolerance before its next due date", async () => {
    const tool = await makeDriftingTool(t.db, series, 730);
    const res = await (await t.agent("auditor")).get(`/api/tools/${tool.assetTag}/drift`);
    expect(res.body.dueAt).toBe("2027-12-27");
    expect(res.body.flagged).toBe(true);
    expect(res.body.series[0].message).toMatch(/before the next due date/);
  });

  it("with fewer than three calibrations it shows the points and predicts nothing", async () => {
    const tool = await makeDriftingTool(t.db, series.slice(0, 2));
    const res = await (await t.agent("crib")).get(`/api/tools/${tool.assetTag}/drift`);
    expect(res.body.series[0].points).toHaveLength(2);
    expect(res.body.series[0].trend).toBeNull();
    expect(res.body.flagged).toBe(false);
  });

  it("an unknown asset tag is a 404", async () => {
    const res = await (await t.agent("quality")).get(`/api/tools/NO-SUCH-TAG/drift`);
    expect(res.status).toBe(404);
  });
});
