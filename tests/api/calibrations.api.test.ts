import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeFamily, makeLab, makeStandard, makeTool, makeCalibration } from "../support/factories";
import { calibrationBody, micrometerBench } from "../support/factories-register";
import { standardCertificates } from "../../server/db/schema";
import { roundUncertainty } from "../../shared/calibrations/uncertainty";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => t.close());

const ALL = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
const PDF = Buffer.from("%PDF-1.4\n% demo certificate (invented)\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n");

async function statusOf(tag: string, at?: string) {
  const a = await t.agent("mechanic");
  return (await a.get(`/api/tools/${tag}/status${at ? `?at=${encodeURIComponent(at)}` : ""}`)).body;
}
async function calibrationCount(toolId: string) {
  const r = await t.db.execute(sql`select count(*)::int as n from calibrations where tool_id = ${toolId}`);
  return Number((r.rows[0] as { n: number }).n);
}

describe("signing a calibration", () => {
  it("quality signs an in-house calibration: each point's error is computed exactly, the result is pass, and the tool is in calibration until the calendar date plus the interval (api.md)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const res = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], {}, { "0.5": 0.5001, "0.21": 0.2099 }));
    expect(res.status).toBe(201);
    expect(res.body.result).toBe("pass");
    expect(res.body.asFoundInTolerance).toBe(true);
    expect(res.body.nextDueAt).toBe("2027-06-15");
    const p05 = res.body.points.find((p: { nominal: number }) => p.nominal === 0.5);
    expect(p05).toMatchObject({ reference: 0.5, asFound: 0.5001, errorAsFound: 0.0001, mpe: 0.0001, verdict: "pass" });
    expect(res.body.points.find((p: { nominal: number }) => p.nominal === 0.21).errorAsFound).toBe(-0.0001);
    expect(res.body.standards[0].assetTag).toBe(standard.assetTag);
    expect(res.body.performedBy.id).toBe(t.people.quality.id);

    const status = await statusOf(tool.assetTag);
    expect(status).toMatchObject({ status: "in_calibration", usable: true, dueAt: "2027-06-15" });
    const list = await q.get(`/api/tools/${tool.assetTag}/calibrations`);
    expect(list.body.total).toBe(1);
    expect(list.body.items[0].id).toBe(res.body.id);
  });

  it("a reading exactly on the permissible error passes under simple acceptance (ILAC-G8:09/2019 §4.2.1); under guarded acceptance it is not released (ILAC-G8:09/2019 §4.2.2), yet it was found in tolerance", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const point = { nominal: 0.5, asFound: 0.5001, uncertainty: 0.00002 };
    const simple = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [point] }));
    expect(simple.status).toBe(201);
    expect(simple.body.points[0]).toMatchObject({ errorAsFound: 0.0001, acceptanceLimit: 0.0001, guardBand: 0, verdict: "pass", asFoundStatement: "conditional_pass" });
    expect(simple.body.result).toBe("pass");

    const guarded = await q.post(
      `/api/tools/${tool.assetTag}/calibrations`,
      calibrationBody([standard.id], { decisionRule: "guarded", points: [point], supersedesId: simple.body.id, supersedeReason: "Procedure calls for guarded acceptance" }),
    );
    expect(guarded.status).toBe(201);
    expect(guarded.body.points[0]).toMatchObject({ errorAsFound: 0.0001, acceptanceLimit: 0.00008, guardBand: 0.00002, verdict: "fail", asFoundInTolerance: true });
    expect(guarded.body).toMatchObject({ result: "fail", asFoundInTolerance: true, asFoundStatement: "conditional_pass" });
    expect((await statusOf(tool.assetTag)).status).toBe("out_of_tolerance");
  });

  it("a guarded calibration with |e| inside the MPE but beyond MPE − U is refused release and opens no investigation; the conditional statement is listed for the quality manager instead (ILAC-G8:09/2019 §4.2.2; §4.2.3 from memory)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    // 0.00009 in on ± 0.0001 in with U = 0.00002 in: inside the tolerance, outside MPE − U.
    const res = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { decisionRule: "guarded", points: [{ nominal: 0.5, asFound: 0.50009, uncertainty: 0.00002 }] }));
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ result: "fail", asFoundInTolerance: true, asFoundStatement: "conditional_pass", investigationId: null });
    expect(res.body.points[0]).toMatchObject({ asFoundInTolerance: true, asFoundStatement: "conditional_pass", verdict: "fail", releasedOn: "as_found" });
    const investigations = await q.get(`/api/investigations?toolAssetTag=${tool.assetTag}`);
    expect(investigations.body).toEqual([]);
    const review = await q.get(`/api/calibrations/conditional-results?toolAssetTag=${tool.assetTag}`);
    expect(review.status).toBe(200);
    expect(review.body.total).toBe(1);
    expect(review.body.items[0]).toMatchObject({ calibrationId: res.body.id, assetTag: tool.assetTag, nominal: 0.5, errorAsFound: 0.00009, mpe: 0.0001, uncertainty: 0.00002, asFoundStatement: "conditional_pass", result: "fail" });
  });

  it("an as-found error beyond the MPE but within U of it is a conditional fail: out of tolerance, so it opens an investigation, and it is listed for review too (ILAC-G8:09/2019 §4.2.1; §4.2.3 from memory)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const res = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { adjusted: true, points: [{ nominal: 0.5, asFound: 0.50011, asLeft: 0.5, uncertainty: 0.00002 }] }));
    expect(res.body).toMatchObject({ result: "adjusted", asFoundInTolerance: false, asFoundStatement: "conditional_fail" });
    expect(res.body.investigationId).toEqual(expect.any(String));
    const review = await q.get(`/api/calibrations/conditional-results?toolAssetTag=${tool.assetTag}&statement=conditional_fail`);
    expect(review.body.items.map((i: { calibrationId: string }) => i.calibrationId)).toEqual([res.body.id]);
  });

  it("guarded acceptance with the shop's multiplier uses w = r·U, with r as it stood when the record was signed (ILAC-G8:09/2019 §4.2.2; r: shop setting)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const admin = await t.agent("admin");
    expect((await admin.patch("/api/settings", { guardBandMultiplier: 0.5 })).status).toBe(200);
    try {
      const res = await (await t.agent("quality")).post(
        `/api/tools/${tool.assetTag}/calibrations`,
        calibrationBody([standard.id], { decisionRule: "guarded_scaled", points: [{ nominal: 0.5, asFound: 0.50009, uncertainty: 0.00002 }] }),
      );
      expect(res.body).toMatchObject({ decisionRule: "guarded_scaled", guardBandMultiplier: 0.5, result: "pass" });
      expect(res.body.points[0]).toMatchObject({ guardBand: 0.00001, acceptanceLimit: 0.00009, verdict: "pass" });
    } finally {
      await admin.patch("/api/settings", { guardBandMultiplier: 1 });
    }
  });

  it("the guarded limit MPE − U is computed in exact decimals: an error of 0.2 mm against ± 0.3 mm with U = 0.1 mm sits on the limit and is released (0.3 − 0.1 in binary floating point is 0.19999999999999998)", async () => {
    const family = await makeFamily(t.db, { name: "Coarse mm gauge (test)", unit: "mm", mpe: "0.3", resolution: "0.1", checkPoints: [] });
    const tool = await makeTool(t.db, { familyId: family.id, unit: "mm", rangeMin: "0", rangeMax: "100", resolution: "0.1" });
    const { standard } = await makeStandard(t.db, { unit: "mm" }, { expandedUncertainty: "0.001" });
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { decisionRule: "guarded", points: [{ nominal: 10, asFound: 10.2, uncertainty: 0.1 }] }));
    expect(res.body.points[0]).toMatchObject({ acceptanceLimit: 0.2, errorAsFound: 0.2, verdict: "pass" });
  });

  it("without a given U, the point's U comes from the budget (certificate U/k, resolution d/√12, temperature; root-sum-square, k = 2, GUM 5.1.2 and 6.2) and a TUR under 4:1 is flagged (ANSI/NCSL Z540.3-2006 §5.3 b)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const res = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.5, asFound: 0.5 }] }));
    expect(res.status).toBe(201);
    // u = sqrt((0.000004/2)² + (0.0001/√12)² + (12.7 mm · 1e-6/K · 0.2 K / 25.4 /√3)²) = 2.894e-5 in; U = 5.79e-5 → stated 0.000058 (two digits, rounded up)
    expect(res.body.points[0].uncertainty).toBe(0.000058);
    expect(res.body.points[0].tur).toBeCloseTo(0.0001 / 0.000058, 3);
    expect(res.body.points[0].turAdequate).toBe(false);
    expect(res.body.turWarning).toBe(true);
  });

  it("the reference defaults to the standard's certified value where the certificate gives one (api.md)", async () => {
    const family = await makeFamily(t.db, { name: "Outside micrometer 1-2 in (test)", checkPoints: [] });
    const tool = await makeTool(t.db, { familyId: family.id, rangeMin: "1", rangeMax: "2" });
    const { standard } = await makeStandard(t.db, { name: "1 in setting standard", kind: "setting_standard", nominal: "1.0000" }, { certifiedValue: "1.00002" });
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 1, asFound: 1.0001 }, { nominal: 1.5, asFound: 1.5 }] }));
    expect(res.status).toBe(201);
    expect(res.body.points[0]).toMatchObject({ reference: 1.00002, errorAsFound: 0.00008 });
    expect(res.body.points[1]).toMatchObject({ reference: 1.5, errorAsFound: 0 });
  });

  it("a per-point permissible error from the family's check plan applies where the point gives none", async () => {
    const family = await makeFamily(t.db, { name: "Dial indicator plan (test)", kind: "dial_indicator", mpe: "0.0002", checkPoints: [{ nominal: "0.1" }, { nominal: "0.9", mpe: "0.0004" }] });
    const tool = await makeTool(t.db, { familyId: family.id });
    const { standard } = await makeStandard(t.db);
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.1, asFound: 0.1003 }, { nominal: 0.9, asFound: 0.9003 }] }));
    expect(res.body.points.map((p: { mpe: number; verdict: string }) => [p.mpe, p.verdict])).toEqual([
      [0.0002, "fail"],
      [0.0004, "pass"],
    ]);
  });

  it("the next due date counts from the shop's calendar date, not the UTC date: a calibration at 23:30 in Chicago is due a year from that day, usable through it and overdue the next morning (api.md)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const res = await (await t.agent("quality")).post(
      `/api/tools/${tool.assetTag}/calibrations`,
      calibrationBody([standard.id], { performedAt: "2026-06-15T04:30:00Z" }), // 23:30 CDT on 14 June
    );
    expect(res.body.nextDueAt).toBe("2027-06-14");
    const lastEvening = await statusOf(tool.assetTag, "2027-06-15T04:30:00Z"); // 23:30 CDT on the due date
    expect(lastEvening).toMatchObject({ usable: true, dueAt: "2027-06-14" });
    const nextMorning = await statusOf(tool.assetTag, "2027-06-15T05:30:00Z"); // 00:30 CDT the day after
    expect(nextMorning).toMatchObject({ status: "overdue", usable: false });
  });

  it("an as-found reading out of tolerance that is adjusted back in gives the result adjusted, and the tool returns to calibration", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const body = calibrationBody([standard.id], { adjusted: true });
    body.points = body.points.map((p) => (p.nominal === 0.5 ? { ...p, asFound: 0.5003, asLeft: 0.5 } : { ...p, asLeft: p.asFound }));
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, body);
    expect(res.status).toBe(201);
    expect(res.body.result).toBe("adjusted");
    expect(res.body.asFoundInTolerance).toBe(false);
    const p = res.body.points.find((x: { nominal: number }) => x.nominal === 0.5);
    expect(p).toMatchObject({ errorAsFound: 0.0003, errorAsLeft: 0, asFoundInTolerance: false, asFoundStatement: "fail", releasedOn: "as_left", verdict: "pass" });
    expect(res.body.adjusted).toBe(true);
    expect((await statusOf(tool.assetTag)).status).toBe("in_calibration");
  });

  it("'adjusted' only when the record says so: an as-left reading that differs with no word on an adjustment is refused naming the point, and with adjusted: false it is a repeat reading and release is decided as found", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const points = [{ nominal: 0.5, asFound: 0.5001, asLeft: 0.5 }];
    const unstated = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points }));
    expect(unstated.status).toBe(400);
    expect(unstated.body.error).toMatchObject({ code: "adjustment_unstated", message: expect.stringMatching(/Point 1 \(0.5 in\)/) });
    const repeat = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { adjusted: false, points }));
    expect(repeat.status).toBe(201);
    expect(repeat.body).toMatchObject({ adjusted: false, result: "pass" });
    expect(repeat.body.points[0].releasedOn).toBe("as_found");
    const missing = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { adjusted: true, points: [{ nominal: 0.5, asFound: 0.5003, asLeft: 0.5 }, { nominal: 1, asFound: 1 }] }));
    expect(missing.status).toBe(400);
    expect(missing.body.error).toMatchObject({ code: "as_left_required", message: expect.stringMatching(/Point 2 \(1 in\)/) });
    expect(await calibrationCount(tool.id)).toBe(1);
  });

  it("an as-found failure left unadjusted fails the calibration and takes the tool out of use", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], {}, { "0.815": 0.8154 }));
    expect(res.body.result).toBe("fail");
    const s = await statusOf(tool.assetTag);
    expect(s).toMatchObject({ status: "out_of_tolerance", usable: false });
    expect(s.reasons[0]).toMatch(/out of tolerance at calibration/);
  });

  it("a calibration released for part of the range only gives the result limited, and the tool is limited to that range", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const res = await (await t.agent("quality")).post(
      `/api/tools/${tool.assetTag}/calibrations`,
      calibrationBody([standard.id], { limitedRange: { min: 0, max: 0.5, note: "Worn spindle above 0.5 in (demo)" } }, { "0.71": 0.7104, "0.92": 0.9205 }),
    );
    expect(res.body.result).toBe("limited");
    expect(res.body.limitedRange).toEqual({ min: 0, max: 0.5, note: "Worn spindle above 0.5 in (demo)" });
    const s = await statusOf(tool.assetTag);
    expect(s.status).toBe("limited");
    expect(s.reasons[0]).toMatch(/0.*0\.5 in/);
  });
});

describe("the uncertainty budget of each point", () => {
  it("reproduces JCGM 100 H.1 through the API: a 50 mm end gauge against a standard certified at 50.000 623 mm (U = 0.075 µm, k = 3, ν = 18), comparator terms, 19.9 °C and ± 0.05 °C between gauge and standard → l = 50.000 838 mm, u_c = 32 nm (JCGM 100:2008 H.1)", async () => {
    const family = await makeFamily(t.db, { name: "End gauges 50 mm (test)", kind: "gauge_block_set", unit: "mm", mpe: "0.0005", resolution: "0.000001", checkPoints: [] });
    const tool = await makeTool(t.db, { familyId: family.id, unit: "mm", rangeMin: "50", rangeMax: "50", resolution: "0.000001" });
    const { standard } = await makeStandard(t.db, { kind: "setting_standard", unit: "mm", nominal: "50" }, { expandedUncertainty: "0.000075", coverageFactor: "3", degreesOfFreedom: "18", certifiedValue: "50.000623" });
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, {
      performedAt: "2026-06-15T14:00:00Z",
      temperatureC: 19.9,
      temperatureVariationC: 0.05,
      standardIds: [standard.id],
      decisionRule: "simple",
      otherUncertainties: [
        { source: "Repeated observations of the comparator", standardUncertainty: 0.0000058, degreesOfFreedom: 24 },
        { source: "Random effects of the comparator", standardUncertainty: 0.0000039, degreesOfFreedom: 5 },
        { source: "Systematic effects of the comparator", standardUncertainty: 0.0000067, degreesOfFreedom: 8 },
      ],
      points: [{ nominal: 50, asFound: 50.000838 }],
    });
    expect(res.status).toBe(201);
    const p = res.body.points[0];
    expect(p).toMatchObject({ reference: 50.000623, errorAsFound: 0.000215 });
    expect(p.referenceParts).toEqual([{ standard: standard.assetTag, element: null, nominal: 50, value: 50.000623, certified: true }]);
    expect(Math.round(p.budget.combined * 1e6)).toBe(32);
    const row = (kind: string) => p.budget.components.find((c: { kind: string }) => c.kind === kind);
    expect(row("standard")).toMatchObject({ dof: 18, divisorLabel: "k = 3" });
    expect(row("standard").contribution * 1e6).toBeCloseTo(25, 6);
    expect(row("temperature_variation").contribution * 1e6).toBeCloseTo(16.6, 1);
    expect(row("temperature_offset").contribution * 1e6).toBeCloseTo(2.9, 1);
    // The thermal terms count here with infinite ν, so ν_eff is larger than H.1's 16 and k is taken from it (GUM G.4.1).
    expect(p.budget.effectiveDof).toBeGreaterThan(16);
    // U = k·u_c stated with two significant digits, rounded up (GUM 7.2.6).
    expect(p.uncertainty).toBe(roundUncertainty(p.budget.k * p.budget.combined));
  });

  it("a 7.7 mm point is built from the 5 mm and 2.7 mm blocks with their certified values, each block its own row; a block with no certified value counts its ISO 3650 grade tolerance as rectangular (GUM 4.3.7; ISO 3650:1998)", async () => {
    const family = await makeFamily(t.db, { name: "Outside micrometer 0-25 mm (test)", unit: "mm", mpe: "0.002", resolution: "0.001", checkPoints: [] });
    const tool = await makeTool(t.db, { familyId: family.id, unit: "mm", rangeMin: "0", rangeMax: "25", resolution: "0.001" });
    const { standard } = await makeStandard(
      t.db,
      { unit: "mm", grade: "0" },
      {
        expandedUncertainty: "0.0001",
        elementValues: [
          { label: "5", nominal: "5", deviation: "0.00006" },
          { label: "2.7", nominal: "2.7", deviation: "-0.00002" },
          { label: "1.2", nominal: "1.2", deviation: null },
          { label: "10", nominal: "10", deviation: "0.00005" },
        ],
      },
    );
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, {
      performedAt: "2026-06-15T14:00:00Z",
      temperatureC: 20.5,
      temperatureVariationC: 0.5,
      standardIds: [standard.id],
      decisionRule: "simple",
      points: [
        { nominal: 7.7, asFound: 7.701, repeatReadings: [7.701, 7.701, 7.702, 7.700] },
        { nominal: 11.2, asFound: 11.2 },
      ],
    });
    expect(res.status).toBe(201);
    const [p77, p112] = res.body.points;
    expect(p77).toMatchObject({ reference: 7.70004, errorAsFound: 0.00096, repeatReadings: [7.701, 7.701, 7.702, 7.7] });
    expect(p77.budget.components.map((c: { kind: string }) => c.kind)).toEqual(["standard", "standard", "resolution", "repeatability", "temperature_offset", "temperature_variation"]);
    expect(p77.budget.components.find((c: { kind: string }) => c.kind === "repeatability")).toMatchObject({ type: "A", dof: 3 });
    expect(p77.budget.effectiveDof).toEqual(expect.any(Number));
    expect(p112.referenceParts.map((r: { element: string; certified: boolean }) => [r.element, r.certified])).toEqual([["1.2", false], ["10", true]]);
    const grade = p112.budget.components.find((c: { kind: string }) => c.kind === "standard_grade");
    expect(grade.quantity).toBeCloseTo(0.00012, 12);
    expect(grade.source).toMatch(/grade 0/);

    // The same budget prints in the record's PDF.
    const pdf = await (await t.agent("auditor")).get(`/api/calibrations/${res.body.id}/record.pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on("data", (c: Buffer) => chunks.push(c));
      r.on("end", () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.status).toBe(200);
    expect(pdf.headers["content-type"]).toBe("application/pdf");
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe("%PDF-");
  });

  it("a certificate's degrees of freedom are kept with it", async () => {
    const { standard } = await makeStandard(t.db, {}, { degreesOfFreedom: "12" });
    const [cert] = await t.db.select().from(standardCertificates).where(sql`${standardCertificates.standardId} = ${standard.id}`);
    expect(cert.degreesOfFreedom).toBe("12");
    const detail = await (await t.agent("auditor")).get(`/api/standards/${standard.id}`);
    expect(detail.body.certificates[0].degreesOfFreedom).toBe(12);
  });
});

describe("standards must be in calibration", () => {
  it("a calibration with a standard whose certificate ran out before the calibration date is refused with standard_not_in_calibration, and nothing is written", async () => {
    const { tool } = await micrometerBench(t.db);
    const { standard: lapsed } = await makeStandard(t.db, { assetTag: "GBS-LAPSED" }, { issuedAt: "2025-06-01", dueAt: "2026-06-14" });
    const q = await t.agent("quality");
    const res = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([lapsed.id]));
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("standard_not_in_calibration");
    expect(res.body.error.message).toMatch(/GBS-LAPSED/);
    expect(await calibrationCount(tool.id)).toBe(0);
    expect((await statusOf(tool.assetTag)).status).toBe("never_calibrated");
  });

  it("a certificate that ran out is named with the day it ran out; a calibration dated before a standard's first certificate says no certificate covers that day", async () => {
    const { tool } = await micrometerBench(t.db);
    const { standard: lapsed } = await makeStandard(t.db, { assetTag: "GBS-RANOUT" }, { issuedAt: "2025-06-01", dueAt: "2026-06-14" });
    const q = await t.agent("quality");
    const ranOut = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([lapsed.id]));
    expect(ranOut.status).toBe(409);
    expect(ranOut.body.error.message).toMatch(/certificate of GBS-RANOUT ran out 2026-06-14/);
    expect(ranOut.body.error.details).toEqual([{ assetTag: "GBS-RANOUT", reason: "certificate_ran_out", dueAt: "2026-06-14" }]);

    const { standard: later } = await makeStandard(t.db, { assetTag: "GBS-LATER" }, { issuedAt: "2026-01-10", dueAt: "2027-01-10" });
    const early = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([later.id], { performedAt: "2025-01-03T15:00:00Z" }));
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe("standard_not_in_calibration");
    expect(early.body.error.message).toMatch(/no certificate of GBS-LATER covers 2025-01-03/i);
    expect(early.body.error.message).not.toMatch(/ran out/);
    expect(early.body.error.details).toEqual([{ assetTag: "GBS-LATER", reason: "no_certificate_covers", dueAt: null }]);
    expect(await calibrationCount(tool.id)).toBe(0);
  });

  it("a standard is in calibration through its certificate's due date (the date is the shop's calendar date)", async () => {
    const { tool } = await micrometerBench(t.db);
    const { standard } = await makeStandard(t.db, {}, { issuedAt: "2025-06-15", dueAt: "2026-06-15" });
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id]));
    expect(res.status).toBe(201);
  });
});

describe("evidence is append-only", () => {
  it("a correction is a new record that supersedes the old one with a reason; the old one stays, marked, and no longer counts", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const first = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-06-10T14:00:00Z" }, { "0.815": 0.8154 }));
    expect(first.body.result).toBe("fail");

    const noReason = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-06-10T14:00:00Z", supersedesId: first.body.id }));
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details[0].path).toEqual(["supersedeReason"]);

    const fix = await q.post(
      `/api/tools/${tool.assetTag}/calibrations`,
      calibrationBody([standard.id], { performedAt: "2026-06-10T14:00:00Z", supersedesId: first.body.id, supersedeReason: "0.815 reading was copied wrong; the sheet says 0.8151" }, { "0.815": 0.8151 }),
    );
    expect(fix.status).toBe(201);
    expect(fix.body).toMatchObject({ supersedesId: first.body.id, result: "pass" });
    const old = await q.get(`/api/calibrations/${first.body.id}`);
    expect(old.body).toMatchObject({ result: "fail", supersededById: fix.body.id });
    expect((await statusOf(tool.assetTag)).status).toBe("in_calibration");
    expect((await q.get(`/api/tools/${tool.assetTag}/calibrations`)).body.total).toBe(2);

    // History, newest first: the correction repeats the corrected record's date and time, and leads it.
    const history = (await q.get(`/api/tools/${tool.assetTag}/calibrations`)).body.items.map((c: { id: string }) => c.id);
    expect(history).toEqual([fix.body.id, first.body.id]);

    const again = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { supersedesId: first.body.id, supersedeReason: "second try" }));
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("already_superseded");
  });

  it("the calibration history lists the latest calibration first, even when an older calibration is entered afterwards", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const june14 = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-06-14T14:00:00Z" }));
    const june12 = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-06-12T14:00:00Z" }));
    const history = (await q.get(`/api/tools/${tool.assetTag}/calibrations`)).body.items.map((c: { id: string }) => c.id);
    expect(history).toEqual([june14.body.id, june12.body.id]);
  });

  it("a signed calibration cannot be edited or deleted through the API (409 record_signed), nor in the database itself", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const cal = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id]));
    const edit = await q.patch(`/api/calibrations/${cal.body.id}`, { result: "pass" });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe("record_signed");
    const del = await q.delete(`/api/calibrations/${cal.body.id}`);
    expect(del.status).toBe(409);
    expect(del.body.error.code).toBe("record_signed");
    const refusal = (p: Promise<unknown>) => p.then(() => "changed", (e: { cause?: Error; message: string }) => e.cause?.message ?? e.message);
    expect(await refusal(t.db.execute(sql`update calibration_points set as_found = '0.6' where calibration_id = ${cal.body.id}`))).toMatch(/record_signed/);
    expect(await refusal(t.db.execute(sql`delete from calibrations where id = ${cal.body.id}`))).toMatch(/record_signed/);
    expect((await q.get(`/api/calibrations/${cal.body.id}`)).body.points.find((p: { nominal: number }) => p.nominal === 0.5).asFound).toBe(0.5);
  });

  it("every signed calibration lands in the audit trail with who signed it", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const cal = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id]));
    const r = await t.db.execute(sql`select actor_id, action from audit_events where entity_id = ${cal.body.id}`);
    expect(r.rows).toEqual([{ actor_id: t.people.quality.id, action: "calibration.create" }]);
  });
});

describe("outside-lab certificates", () => {
  it("an outside lab's record does not count until its certificate review is recorded; the review says who, when and what was found", async () => {
    const family = await makeFamily(t.db, { kind: "dial_indicator", name: "Dial indicator 0-1 in (test)", mpe: "0.0002", checkPoints: [] });
    const tool = await makeTool(t.db, { familyId: family.id });
    const lab = await makeLab(t.db, { name: "Meridian Dimensional Lab (test)" });
    const q = await t.agent("quality");
    const upload = await q.upload("/api/calibrations/certificate-files", "file", PDF, "lab-cert.pdf");
    expect(upload.status).toBe(201);
    const cal = await q.post(`/api/tools/${tool.assetTag}/calibrations`, {
      performedAt: "2026-06-12T15:00:00Z",
      source: "outside_lab",
      labId: lab.id,
      certificateNumber: "MDL-DEMO-2231",
      certificateFileKey: upload.body.fileKey,
      decisionRule: "simple",
      points: [{ nominal: 0.5, asFound: 0.5001, uncertainty: 0.00003 }],
    });
    expect(cal.status).toBe(201);
    expect(cal.body).toMatchObject({ awaitingReview: true, review: null, hasCertificateFile: true, lab: { name: "Meridian Dimensional Lab (test)" } });
    const pending = await statusOf(tool.assetTag);
    expect(pending.status).toBe("never_calibrated");
    expect(pending.reasons.join(" ")).toMatch(/awaiting review/);

    const file = await q.get(cal.body.certificateFileUrl);
    expect(file.status).toBe(200);
    expect(file.headers["content-type"]).toBe("application/pdf");

    const reviewed = await q.post(`/api/calibrations/${cal.body.id}/review`, { accepted: true, findings: "Certificate complete; results within limits; lab accreditation in scope." });
    expect(reviewed.status).toBe(201);
    expect(reviewed.body.review).toMatchObject({ accepted: true, reviewedBy: { id: t.people.quality.id }, reviewedAt: "2026-06-15T15:00:00.000Z" });
    expect((await statusOf(tool.assetTag)).status).toBe("in_calibration");
    const twice = await q.post(`/api/calibrations/${cal.body.id}/review`, { accepted: true, findings: "again" });
    expect(twice.body.error.code).toBe("already_reviewed");
  });

  it("an in-house record has no certificate review (409 not_outside_lab)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const cal = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id]));
    const res = await q.post(`/api/calibrations/${cal.body.id}/review`, { accepted: true, findings: "n/a" });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("not_outside_lab");
  });

  it("a file that is neither a PDF nor an image is refused", async () => {
    const res = await (await t.agent("quality")).upload("/api/calibrations/certificate-files", "file", Buffer.from("MZ not a certificate"), "cert.exe");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("unsupported_file_type");
  });
});

describe("intermediate checks", () => {
  it("a check on the tolerance passes; a failed intermediate check puts the tool out of tolerance at once", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-06-01T14:00:00Z"), nextDueAt: "2027-06-01" }, undefined, [standard.id]);
    const m = await t.agent("mechanic");
    const ok = await m.post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0.5, reading: 0.5001, standardId: standard.id });
    expect(ok.status).toBe(201);
    expect(ok.body).toMatchObject({ passed: true, deviation: 0.0001, tolerance: 0.0001, toolStatus: "in_calibration" });

    const bad = await m.post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0.5, reading: 0.5003, note: "Zero drifted after a knock (demo)" });
    expect(bad.body).toMatchObject({ passed: false, deviation: 0.0003, toolStatus: "out_of_tolerance", usable: false });
    const s = await statusOf(tool.assetTag);
    expect(s.status).toBe("out_of_tolerance");
    expect(s.reasons[0]).toMatch(/Failed an intermediate check/);
    const list = await m.get(`/api/tools/${tool.assetTag}/checks`);
    expect(list.body.total).toBe(2);
    expect(list.body.items[0].passed).toBe(false);
  });

  it("the check tolerance is the family's own, falling back to its permissible error", async () => {
    const family = await makeFamily(t.db, { name: "Loose check family (test)", mpe: "0.0001", checkTolerance: "0.0002" });
    const tool = await makeTool(t.db, { familyId: family.id });
    const res = await (await t.agent("crib")).post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0.5, reading: 0.4998 });
    expect(res.body).toMatchObject({ passed: true, deviation: -0.0002, tolerance: 0.0002 });
  });

  it("a recorded check cannot be changed (409 record_signed)", async () => {
    const { tool } = await micrometerBench(t.db);
    const m = await t.agent("quality");
    const c = await m.post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0.5, reading: 0.5 });
    expect((await m.patch(`/api/checks/${c.body.id}`, { reading: 0.6 })).body.error.code).toBe("record_signed");
  });
});

describe("quarantine and release", () => {
  it("a dropped tool is quarantined and unusable; release with a reason puts it back in use", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-06-01T14:00:00Z"), nextDueAt: "2027-06-01" }, undefined, [standard.id]);
    const crib = await t.agent("crib");
    const held = await crib.post(`/api/tools/${tool.assetTag}/quarantine`, { reason: "Dropped on the floor at bench 3" });
    expect(held.status).toBe(200);
    expect(held.body).toMatchObject({ status: "quarantined", usable: false });
    expect((await crib.post(`/api/tools/${tool.assetTag}/quarantine`, { reason: "again" })).body.error.code).toBe("already_quarantined");
    const released = await crib.post(`/api/tools/${tool.assetTag}/release`, { reason: "Checked against CHK block, reads true" });
    expect(released.body).toMatchObject({ status: "in_calibration", usable: true });
    expect((await crib.post(`/api/tools/${tool.assetTag}/release`, { reason: "again" })).body.error.code).toBe("not_quarantined");
  });

  it("a quarantined tool that failed a check since its calibration is not released until a passing calibration (409 calibration_required)", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-06-01T14:00:00Z"), nextDueAt: "2027-06-01" }, undefined, [standard.id]);
    const q = await t.agent("quality");
    await q.post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0.5, reading: 0.5004 });
    await q.post(`/api/tools/${tool.assetTag}/quarantine`, { reason: "Failed its pre-use check" });
    const refused = await q.post(`/api/tools/${tool.assetTag}/release`, { reason: "Looks fine" });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("calibration_required");
    expect((await statusOf(tool.assetTag)).status).toBe("quarantined");

    t.clock.set("2026-06-15T16:00:00Z");
    await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-06-15T15:30:00Z" }));
    const released = await q.post(`/api/tools/${tool.assetTag}/release`, { reason: "Recalibrated, passes" });
    expect(released.body.status).toBe("in_calibration");
    t.clock.set("2026-06-15T15:00:00Z");
  });
});

describe("status at an instant", () => {
  it("the status can be asked for a past instant: before its first calibration the tool was never calibrated", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-05-01T14:00:00Z" }));
    expect((await statusOf(tool.assetTag, "2026-04-30T12:00:00Z")).status).toBe("never_calibrated");
    expect(await statusOf(tool.assetTag, "2026-05-02T12:00:00-05:00")).toMatchObject({ status: "in_calibration", dueAt: "2027-05-01" });
    const bad = await (await t.agent("mechanic")).get(`/api/tools/${tool.assetTag}/status?at=yesterday`);
    expect(bad.status).toBe(400);
  });
});

describe("bad input", () => {
  it("a calibration with a reading typed as text, no points, or a future date is refused with 400 and nothing is written", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const q = await t.agent("quality");
    const text = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.5, asFound: "0.5x" as unknown as number }] }));
    expect(text.status).toBe(400);
    expect(text.body.error.details[0].path).toEqual(["points", 0, "asFound"]);
    expect((await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [] }))).status).toBe(400);
    const future = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "2026-06-16T15:00:00Z" }));
    expect(future.status).toBe(400);
    expect(future.body.error.code).toBe("performed_in_future");
    const unknownStd = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody(["00000000-0000-4000-8000-000000000000"]));
    expect(unknownStd.status).toBe(400);
    expect(unknownStd.body.error.code).toBe("unknown_standard");
    expect(await calibrationCount(tool.id)).toBe(0);
  });

  it("guarded acceptance with no way to know U is refused with 400 uncertainty_required, not a server error", async () => {
    const { tool } = await micrometerBench(t.db);
    const lab = await makeLab(t.db);
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, {
      performedAt: "2026-06-12T15:00:00Z",
      source: "outside_lab",
      labId: lab.id,
      decisionRule: "guarded",
      points: [{ nominal: 0.5, asFound: 0.5 }],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("uncertainty_required");
    expect(await calibrationCount(tool.id)).toBe(0);
  });

  it("a family without a permissible error needs one per point: 400 invalid_mpe naming the point, never a server error", async () => {
    const family = await makeFamily(t.db, { name: "No MPE family (test)", mpe: null, checkPoints: [] });
    const tool = await makeTool(t.db, { familyId: family.id });
    const { standard } = await makeStandard(t.db);
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.25, asFound: 0.25, mpe: 0.0001 }, { nominal: 0.5, asFound: 0.5 }] }));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_mpe");
    expect(res.body.error.message).toMatch(/Point 2 \(0.5 in\) has no permissible error/);
    expect(await calibrationCount(tool.id)).toBe(0);
  });

  it("a permissible error of zero or less reverses the limits: 400 naming the point, and nothing is written", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.5, asFound: 0.5 }, { nominal: 0.71, asFound: 0.71, mpe: -0.0001 }] }));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Point 2 \(0.71\): the permissible error must be greater than zero/);
    expect(res.body.error.details[0].path).toEqual(["points", 1, "mpe"]);
    expect(await calibrationCount(tool.id)).toBe(0);
  });

  it("repeat readings whose mean is not the as-found reading are refused naming the point", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const res = await (await t.agent("quality")).post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.5, asFound: 0.5003, repeatReadings: [0.5, 0.5001] }] }));
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: "readings_mismatch", message: expect.stringMatching(/Point 1 \(0.5 in\).*mean/) });
  });

  it("a malformed record id is a 400 and an unknown one a 404", async () => {
    const a = await t.agent("auditor");
    expect((await a.get("/api/calibrations/not-a-uuid")).status).toBe(400);
    expect((await a.get("/api/calibrations/00000000-0000-4000-8000-000000000000")).status).toBe(404);
    expect((await a.get("/api/tools/NO-SUCH-TAG/calibrations")).status).toBe(404);
  });
});

describe("traceability chain", () => {
  it("shows tool → calibration → standard (with the unit its certificate's U is stated in) → certificate → lab and accreditation → national institute", async () => {
    const lab = await makeLab(t.db, { name: "Chain Lab (test)", accreditationBody: "Demo Accreditation Board", accreditationExpiresAt: "2028-01-01" });
    const { tool } = await micrometerBench(t.db);
    const { standard } = await makeStandard(t.db, { assetTag: "GBS-CHAIN" }, { labId: lab.id, labName: lab.name, nationalInstitute: "Demo National Measurement Institute" });
    const q = await t.agent("quality");
    const cal = await q.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id]));
    const chain = await (await t.agent("auditor")).get(`/api/tools/${tool.assetTag}/chain`);
    expect(chain.status).toBe(200);
    expect(chain.body.calibration.id).toBe(cal.body.id);
    expect(chain.body.standards[0]).toMatchObject({
      assetTag: "GBS-CHAIN",
      unit: "in",
      certificate: { labName: "Chain Lab (test)", nationalInstitute: "Demo National Measurement Institute", lab: { accreditation: "valid", accreditationBody: "Demo Accreditation Board" } },
    });
    expect(chain.body.gaps).toEqual([]);
  });
});

describe("OpenAPI", () => {
  it("lists the calibration, check and chain routes", async () => {
    const doc = (await (await t.agent()).get("/api/openapi.json")).body;
    for (const p of ["/api/tools/{assetTag}/calibrations", "/api/tools/{assetTag}/checks", "/api/tools/{assetTag}/chain", "/api/calibrations/{id}/review", "/api/calibrations/certificate-files"]) {
      expect(doc.paths[p], p).toBeDefined();
    }
    expect(doc.paths["/api/tools/{assetTag}/calibrations"].post.requestBody.content["application/json"].schema.properties.decisionRule).toBeDefined();
  });
});

describe("who may record calibrations and checks", () => {
  let tag = "";
  let calId = "";
  let stdId = "";
  beforeAll(async () => {
    const bench = await micrometerBench(t.db, { toolTag: "MATRIX-CAL" });
    tag = bench.tool.assetTag;
    stdId = bench.standard.id;
    calId = (await makeCalibration(t.db, bench.tool.id, { performedAt: new Date("2026-06-01T14:00:00Z"), nextDueAt: "2027-06-01", source: "outside_lab" })).id;
  });
  roleMatrix(() => t, [
    { method: "post", label: "/api/tools/:assetTag/calibrations", path: () => `/api/tools/${tag}/calibrations`, body: () => calibrationBody([stdId], { points: [{ nominal: 0.5, asFound: 0.5 }] }), allowed: ["quality", "admin"] },
    { method: "get", label: "/api/tools/:assetTag/calibrations", path: () => `/api/tools/${tag}/calibrations`, allowed: ALL },
    { method: "get", label: "/api/calibrations/:id", path: () => `/api/calibrations/${calId}`, allowed: ALL },
    { method: "post", label: "/api/calibrations/:id/review", path: () => `/api/calibrations/${calId}/review`, body: { accepted: true, findings: "Reviewed in the role matrix" }, allowed: ["quality", "admin"] },
    { method: "patch", label: "/api/calibrations/:id", path: () => `/api/calibrations/${calId}`, body: { notes: "x" }, allowed: ["quality", "admin"] },
    { method: "delete", label: "/api/calibrations/:id", path: () => `/api/calibrations/${calId}`, allowed: ["quality", "admin"] },
    { method: "post", path: "/api/calibrations/certificate-files", allowed: ["quality", "admin"] },
    { method: "get", label: "/api/calibrations/:id/certificate", path: () => `/api/calibrations/${calId}/certificate`, allowed: ALL },
    { method: "get", label: "/api/tools/:assetTag/chain", path: () => `/api/tools/${tag}/chain`, allowed: ALL },
    { method: "get", path: "/api/calibrations/conditional-results", allowed: ["quality", "auditor", "admin"] },
    { method: "get", label: "/api/calibrations/:id/record.pdf", path: () => `/api/calibrations/${calId}/record.pdf`, allowed: ALL },
    { method: "post", label: "/api/tools/:assetTag/checks", path: () => `/api/tools/${tag}/checks`, body: { nominal: 0.5, reading: 0.5 }, allowed: ["mechanic", "crib", "quality", "admin"] },
    { method: "get", label: "/api/tools/:assetTag/checks", path: () => `/api/tools/${tag}/checks`, allowed: ALL },
    { method: "patch", label: "/api/checks/:id", path: "/api/checks/00000000-0000-4000-8000-000000000000", body: { reading: 1 }, allowed: ["mechanic", "crib", "quality", "admin"] },
    { method: "delete", label: "/api/checks/:id", path: "/api/checks/00000000-0000-4000-8000-000000000000", allowed: ["mechanic", "crib", "quality", "admin"] },
  ]);
});
