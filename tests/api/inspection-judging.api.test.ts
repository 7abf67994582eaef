import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCheckout } from "../support/factories";
import { makeFeelerSetInCalibration, makeJob, makeLimitTable, makeToolInCalibration } from "../support/factories-inspection";
import { readingJudgements, readings, readingTools } from "../../server/db/schema";
import { judgeStoredReadings } from "../../server/modules/readings/reading-judgements.service";
import type { LimitItemInput } from "../../shared/limit-tables/limit-tables.schemas";

// The judging rules through the API, on the sheet and in the PDF. Limits are demo values (invented); the rules are
// ISO 14405-1 / ISO 8015 two-point size (from memory), ISO 1 (20 °C), the limit-gauge principle (ISO 1938-1, from
// memory) and shop practice (common practice, no source).
let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => t.close());

type Sheet = { items: { key: string; rows: { index: number; verdict: string; verdictText: string; place: any; judgedDifferently: boolean; reading: any }[] }[]; summary: any };
const row = (sheet: Sheet, key: string, index = 1) => sheet.items.find((i) => i.key === key)!.rows.find((r) => r.index === index)!;

/** A sheet on the given items, with a 1–2 in micrometer and a telescoping gauge issued to the mechanic. */
async function sheetWith(items: LimitItemInput[], over: { expansionPerK?: number; unit?: "in" | "mm" } = {}) {
  const table = await makeLimitTable(t.db, { items, ...over });
  const job = await makeJob(t.db, table.id, t.people.mechanic.id);
  const mic = await makeToolInCalibration(t.db, { rangeMin: "1", rangeMax: "2", ownerUserId: t.people.mechanic.id });
  const tel = await makeToolInCalibration(t.db, { kind: "telescoping_gauge", rangeMin: "0.3125", rangeMax: "6", ownerUserId: t.people.mechanic.id });
  return { table, job, mic, tel };
}

const journal = (over: Partial<LimitItemInput> = {}): LimitItemInput => ({ key: "journal", label: "Journal", kind: "journal", min: 1.123, max: 1.125, ...over });
const bore = (over: Partial<LimitItemInput> = {}): LimitItemInput => ({ key: "bore", label: "Bore", kind: "bore", min: 1.125, max: 1.128, ...over });

describe("every two-point reading is judged (ISO 14405-1 default two-point size; ISO 8015 — from memory)", () => {
  it("a journal limited to 1.1230–1.1250 read 1.1252 and 1.1245 is outside, and the sheet says which reading and by how much", async () => {
    const { job, mic } = await sheetWith([journal()]);
    const a = await t.agent("mechanic");
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.1252, 1.1245], toolAssetTags: [mic.assetTag] });
    expect(res.status).toBe(201);
    // The size stays the smallest reading (for wear and clearances), but it no longer hides the other one.
    expect(res.body).toMatchObject({ size: 1.1245, verdict: "outside_limits", verdictText: "Outside new limits: direction 1 1.1252 is 0.0002 over the maximum 1.1250" });
    expect(res.body.place.directions[0]).toMatchObject({ raw: 1.1252, verdict: "outside_limits", beyond: { side: "max", limit: 1.125, by: 0.0002 } });
    const r = row((await a.get(`/api/jobs/${job.id}`)).body, "journal");
    expect(r).toMatchObject({ verdict: "outside_limits", judgedDifferently: false });
    expect(r.reading.recordedVerdict).toBe("outside_limits");
  });
});

describe("both fits of a clearance (common practice): loosest against the maximum, tightest against the minimum", () => {
  const items = [journal({ min: 1.12, max: 1.13 }), bore({ min: 1.12, max: 1.13 }), { key: "fit", label: "Journal clearance", kind: "clearance" as const, boreKey: "bore", journalKey: "journal", min: 0.001, max: 0.003 }];

  it("bore 1.1256/1.1270 on journal 1.1250/1.1243: loosest 0.0027 is within, but the tightest 0.0006 is under the 0.0010 minimum", async () => {
    const { job, mic, tel } = await sheetWith(items);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.125, 1.1243], toolAssetTags: [mic.assetTag] });
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "bore", values: [1.1256, 1.127], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(res.status).toBe(201);
    // `clearance` stays the loosest; the tightest and a verdict per side come beside it.
    expect(res.body).toMatchObject({ clearance: 0.0027, tightestClearance: 0.0006, clearanceBasis: "diametral", loosestVerdict: "within_limits", tightestVerdict: "outside_limits" });
    expect(res.body.completes[0]).toMatchObject({ label: "Journal clearance", place: { kind: "fit", verdict: "outside_limits" } });
    const c = row((await a.get(`/api/jobs/${job.id}`)).body, "fit");
    expect(c).toMatchObject({ verdict: "outside_limits", verdictText: "Outside new limits: tightest fit 0.0006 loose is 0.0004 under the minimum 0.0010 loose" });
    expect(c.place.loosest).toMatchObject({ value: 0.0027, boreValue: 1.127, journalValue: 1.1243, verdict: "within_limits" });
    expect(c.place.tightest).toMatchObject({ value: 0.0006, boreValue: 1.1256, journalValue: 1.125, verdict: "outside_limits", beyond: { by: 0.0004 } });
  });

  it("journal 1.1250/1.1247 and bore 1.1271/1.1273: loosest 0.0026, tightest 0.0021, both within (reference-values.md, shop practice)", async () => {
    const { job, mic, tel } = await sheetWith(items);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "bore", values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(res.body).toMatchObject({ clearance: 0.0026, tightestClearance: 0.0021, loosestVerdict: "within_limits", tightestVerdict: "within_limits" });
  });
});

describe("radial limits: half the diametral clearance where the table says radial (common practice)", () => {
  const items = [journal({ min: 1.12, max: 1.13 }), bore({ min: 1.12, max: 1.13 }), { key: "fit", label: "Bushing clearance", kind: "clearance" as const, boreKey: "bore", journalKey: "journal", radial: true, min: 0.0005, max: 0.0015 }];

  it("1.1273 − 1.1247 = 0.0026 diametral is 0.0013 radial, inside 0.0005–0.0015: accepted, and labelled radial", async () => {
    const { job, mic, tel } = await sheetWith(items);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.1247, 1.1247], toolAssetTags: [mic.assetTag] });
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "bore", values: [1.1273, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(res.body).toMatchObject({ clearance: 0.0013, clearanceBasis: "radial", loosestVerdict: "within_limits" });
    const c = row((await a.get(`/api/jobs/${job.id}`)).body, "fit");
    expect(c.place).toMatchObject({ basis: "radial", verdict: "within_limits", loosest: { value: 0.0013, diametral: 0.0026 } });
  });

  it("0.0009 diametral is 0.00045 radial, under the 0.0005 radial minimum: refused where the diametral figure would pass", async () => {
    const { job, mic, tel } = await sheetWith(items);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.1247, 1.1247], toolAssetTags: [mic.assetTag] });
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "bore", values: [1.1256, 1.1256], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(res.body).toMatchObject({ tightestClearance: 0.00045, tightestVerdict: "outside_limits" });
    expect(row((await a.get(`/api/jobs/${job.id}`)).body, "fit").verdict).toBe("outside_limits");
  });

  it("radial limits belong to clearances only", async () => {
    const q = await t.agent("quality");
    const res = await q.post("/api/limit-tables", { name: "Bad", engineModel: "M", unit: "in", sourceDocument: "D", sourceRevision: "A", items: [journal({ radial: true })] });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body.error.details)).toContain("Only a clearance item");
  });
});

describe("form limits: out-of-round per size item, taper between two stations (common practice)", () => {
  const items: LimitItemInput[] = [
    bore({ key: "top", label: "Bore, top", min: 1.125, max: 1.13, outOfRoundMax: 0.0008 }),
    bore({ key: "bottom", label: "Bore, bottom", min: 1.125, max: 1.13, outOfRoundMax: 0.0008 }),
    { key: "taper", label: "Bore taper", kind: "taper", stationKeys: ["top", "bottom"], max: 0.001 },
  ];

  it("out-of-round 0.0009 over a 0.0008 limit puts the place outside; taper 0.0014 over 0.0010 is outside; both computed exactly", async () => {
    const { job, mic, tel } = await sheetWith(items);
    const a = await t.agent("mechanic");
    const top = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "top", values: [1.1279, 1.127], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(top.body).toMatchObject({ outOfRound: 0.0009, verdict: "outside_limits" });
    expect(top.body.place).toMatchObject({ outOfRoundLimit: 0.0008, outOfRoundVerdict: "outside_limits", outOfRoundBeyond: 0.0001 });
    const bottom = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "bottom", values: [1.1265, 1.1264], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(bottom.body.completes[0].place).toMatchObject({ kind: "taper", taper: 0.0014, verdict: "outside_limits" });
    const sheet = (await a.get(`/api/jobs/${job.id}`)).body;
    expect(row(sheet, "taper").place.directions).toEqual([
      { direction: 1, a: 1.1279, b: 1.1265, difference: 0.0014 },
      { direction: 2, a: 1.127, b: 1.1264, difference: 0.0006 },
    ]);
    expect(row(sheet, "taper").verdictText).toBe("Outside new limits: taper, direction 1 0.0014 is 0.0004 over the maximum 0.0010");
  });

  it("a taper must name two stations of the same kind; a taper item is never read directly", async () => {
    const q = await t.agent("quality");
    const bad = await q.post("/api/limit-tables", { name: "Bad", engineModel: "M", unit: "in", sourceDocument: "D", sourceRevision: "A", items: [items[0], journal(), { key: "taper", label: "T", kind: "taper", stationKeys: ["top", "journal"], max: 0.001 }] });
    expect(bad.status).toBe(400);
    const { job, mic } = await sheetWith(items);
    const direct = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "taper", values: [0.001, 0.001], toolAssetTags: [mic.assetTag] });
    expect(direct.status).toBe(400);
  });
});

describe("lengths judged at 20 °C (ISO 1) when a part temperature and an expansion coefficient are known", () => {
  it("a warm aluminium bore read 1.1281/1.1280 at 30 °C with tools at 20 °C is 1.12785… at 20 °C: inside the 1.1280 maximum; raw and corrected both shown", async () => {
    // 1.1281 × 21.5 × 10⁻⁶ × 10 = 0.0002425415, so 1.1281 is 1.1278574585 at 20 °C (ΔL = L·α·(t − 20); α of 356.0 cast, Callister App. B)
    const { job, mic, tel } = await sheetWith([bore({ expansionPerK: 0.0000215 })]);
    const a = await t.agent("mechanic");
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "bore", values: [1.1281, 1.128], toolAssetTags: [tel.assetTag, mic.assetTag], temperatureC: 30, toolTemperatureC: 20 });
    expect(res.body).toMatchObject({ size: 1.1281, verdict: "within_limits" });
    expect(res.body.place).toMatchObject({ rawSize: 1.1281, size: 1.1278574585, thermal: { source: "item", correction: -0.0002425415, partTemperatureC: 30, toolTemperatureC: 20 } });
    const r = row((await a.get(`/api/jobs/${job.id}`)).body, "bore");
    expect(r.reading.size).toBe(1.1281);
    expect(r.place.directions[0]).toMatchObject({ raw: 1.1281, inTableUnit: 1.1281, value: 1.1278574585 });
    // Read cold, the same values are judged as read: over the maximum.
    const cold = await sheetWith([bore({ expansionPerK: 0.0000215 })]);
    expect((await a.post(`/api/jobs/${cold.job.id}/readings`, { itemKey: "bore", values: [1.1281, 1.128], toolAssetTags: [cold.tel.assetTag, cold.mic.assetTag] })).body.verdict).toBe("outside_limits");
  });

  it("the table's coefficient serves items that give none (steel part at 25 °C, tool at 20 °C: −L·α·5)", async () => {
    const { job, mic } = await sheetWith([journal({ min: 1.1, max: 1.2 })], { expansionPerK: 0.0000115 });
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.125, 1.125], toolAssetTags: [mic.assetTag], temperatureC: 25, toolTemperatureC: 20 });
    // 1.125 × 11.5 × 10⁻⁶ × 5 = 0.0000646875
    expect(res.body.place.thermal).toMatchObject({ source: "table", correction: -0.0000646875 });
  });
});

describe("feeler leaves inside the limits (limit-gauge principle, ISO 1938-1 — from memory; common practice)", () => {
  const LEAVES = ["0.0015", "0.002", "0.003", "0.004", "0.005", "0.006", "0.007", "0.008", "0.010", "0.015", "0.020", "0.025"];
  async function feelerSheet(items: LimitItemInput[], opts: Parameters<typeof makeFeelerSetInCalibration>[2] = {}) {
    const table = await makeLimitTable(t.db, { items });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const { tool, elements } = await makeFeelerSetInCalibration(t.db, LEAVES, opts);
    await makeCheckout(t.db, tool.id, t.people.mechanic.id);
    return { job, set: tool, elements };
  }
  const ring = { key: "ring", label: "Ring side clearance", kind: "feeler" as const, min: 0.0045, max: 0.006, repeat: 3 };

  it("limits 0.0045–0.0060 use a go of 0.0045 and a no-go of 0.0060 (never 0.004 and 0.007): a 0.0041 gap refuses the go, a 0.0065 gap takes the no-go — both outside", async () => {
    const { job, set } = await feelerSheet([ring]);
    const a = await t.agent("mechanic");
    const tight = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring", index: 1, toolAssetTags: [set.assetTag], goEntered: false, noGoEntered: false });
    expect(tight.body).toMatchObject({ verdict: "outside_limits", goLeaf: { thickness: 0.0045 }, noGoLeaf: { thickness: 0.006 } });
    const loose = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring", index: 2, toolAssetTags: [set.assetTag], goEntered: true, noGoEntered: true });
    expect(loose.body.verdict).toBe("outside_limits");
    const ok = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring", index: 3, toolAssetTags: [set.assetTag], goEntered: true, noGoEntered: false });
    expect(ok.body).toMatchObject({ verdict: "within_limits", place: { gapLow: 0.0045, gapHigh: 0.006 } });
    // The answer keeps goLeaf with the stack's total thickness and its leaves.
    expect(ok.body.goLeaf).toMatchObject({ label: "0.0015 + 0.003", thickness: 0.0045, leaves: [{ label: "0.0015", thickness: 0.0015 }, { label: "0.003", thickness: 0.003 }] });
    const r = row((await a.get(`/api/jobs/${job.id}`)).body, "ring", 3);
    expect(r.reading.feeler).toMatchObject({ mode: "go_no_go", go: { thickness: 0.0045 }, noGo: { thickness: 0.006 } });
    expect(r.reading.feeler.why).toContain("thinnest leaf or stack at or above the minimum");
  });

  it("when the set cannot make a go and a no-go inside 0.0030–0.0034, the check is a measured gap: the thickest leaf or stack that enters, judged against the limits", async () => {
    const narrow = { key: "second", label: "Second ring side clearance", kind: "feeler" as const, min: 0.003, max: 0.0034, repeat: 3 };
    const { job, set, elements } = await feelerSheet([narrow], { rejected: ["0.007"] });
    const a = await t.agent("mechanic");
    const leaves = await a.get(`/api/jobs/${job.id}/feeler-leaves?itemKey=second&setTag=${set.assetTag}`);
    expect(leaves.body).toMatchObject({ mode: "measured_gap", goLeaf: null, noGoLeaf: null, min: 0.003, max: 0.0034 });
    expect(leaves.body.why).toContain("Record the thickest leaf or stack that enters");
    const goNoGo = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "second", index: 1, toolAssetTags: [set.assetTag], goEntered: true, noGoEntered: false });
    expect(goNoGo.status).toBe(409);
    expect(goNoGo.body.error.code).toBe("feeler_measured_gap_needed");
    const id = (label: string) => elements.find((e: { label: string }) => e.label === label)!.id;
    const rejected = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "second", index: 1, toolAssetTags: [set.assetTag], gapLeafIds: [id("0.007")] });
    expect(rejected.status).toBe(400);
    const gap = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "second", index: 1, toolAssetTags: [set.assetTag], gapLeafIds: [id("0.003")] });
    expect(gap.status).toBe(201);
    expect(gap.body).toMatchObject({ verdict: "within_limits", measuredGap: { label: "0.003", thickness: 0.003 } });
    const stack = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "second", index: 2, toolAssetTags: [set.assetTag], gapLeafIds: [id("0.0015"), id("0.002")] });
    expect(stack.body).toMatchObject({ verdict: "outside_limits", measuredGap: { thickness: 0.0035 } });
    expect(stack.body.verdictText).toContain("0.0001 over the maximum 0.0034");
  });
});

describe("existing readings judged again under the current rules, evidence untouched", () => {
  it("readings recorded under the earlier rules get new verdict rows from the re-judging job; the sheet marks those judged otherwise; a second run adds nothing", async () => {
    const ringItem = { key: "ring", label: "Ring side clearance", kind: "feeler" as const, min: 0.0045, max: 0.0065 };
    const table = await makeLimitTable(t.db, { items: [journal(), ringItem] });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const mic = await makeToolInCalibration(t.db, { rangeMin: "1", rangeMax: "2" });
    const { tool: set, elements } = await makeFeelerSetInCalibration(t.db, ["0.003", "0.004", "0.005", "0.006", "0.007"]);
    const at = new Date("2026-06-10T15:00:00Z");
    // As the earlier rules stored them: the journal judged on its smallest reading only, the feeler on a go under
    // the minimum and a no-go over the maximum.
    const [j] = await t.db.insert(readings).values({ jobId: job.id, itemKey: "journal", index: 1, values: ["1.1252", "1.1245"], unit: "in", size: "1.1245", outOfRound: "0.0007", verdict: "within_limits", takenAt: at }).returning();
    const leaf = (l: string) => elements.find((e: { label: string }) => e.label === l)!.id;
    const [f] = await t.db.insert(readings).values({ jobId: job.id, itemKey: "ring", index: 1, values: [], unit: "in", goEntered: true, noGoEntered: false, goLeafId: leaf("0.004"), noGoLeafId: leaf("0.007"), verdict: "within_limits", takenAt: at }).returning();
    await t.db.insert(readingTools).values([
      { readingId: j.id, toolId: mic.id, position: 1, statusAtReading: "in_calibration", takenAt: at },
      { readingId: f.id, toolId: set.id, position: 1, statusAtReading: "in_calibration", takenAt: at },
    ]);
    const before = await t.db.select().from(readings).where(eq(readings.jobId, job.id));

    const first = await judgeStoredReadings({ db: t.db, clock: t.clock });
    expect(first.judged).toBeGreaterThanOrEqual(2);
    const rows = await t.db.select().from(readingJudgements).where(sql`${readingJudgements.readingId} in (${j.id}, ${f.id})`);
    expect(rows.map((r) => r.verdict)).toEqual(["outside_limits", "outside_limits"]);
    expect((await judgeStoredReadings({ db: t.db, clock: t.clock })).judged).toBe(0);

    const sheet = (await (await t.agent("auditor")).get(`/api/jobs/${job.id}`)).body;
    expect(sheet.summary.judgedDifferently).toBe(2);
    const jr = row(sheet, "journal");
    expect(jr).toMatchObject({ verdict: "outside_limits", judgedDifferently: true, reading: { recordedVerdict: "within_limits" } });
    expect(jr.reading.judgedAt).toBe("2026-06-15T15:00:00.000Z");
    const fr = row(sheet, "ring");
    expect(fr.verdictText).toContain("the thickest leaf that entered (0.004: 0.0040 thick) is under the minimum 0.0045");
    expect(fr.reading.feeler.why).toContain("Recorded before the leaves were kept with the reading");

    // The evidence is as it was, and the verdict rows cannot be rewritten.
    expect(await t.db.select().from(readings).where(eq(readings.jobId, job.id))).toEqual(before);
    const refusal = (p: Promise<unknown>) => p.then(() => "changed", (e: { cause?: Error; message: string }) => e.cause?.message ?? e.message);
    expect(await refusal(t.db.execute(sql`update reading_judgements set verdict = 'within_limits' where reading_id = ${j.id}`))).toMatch(/record_signed/);
  });
});

describe("the check-sheet PDF shows what the rules judged", () => {
  it("prints every reading's mark, both fits (radial where so), the 20 °C length and the verdict reasons, with the cautions", async () => {
    const items: LimitItemInput[] = [journal({ min: 1.12, max: 1.13 }), bore({ min: 1.12, max: 1.13, expansionPerK: 0.0000215 }), { key: "fit", label: "Bushing clearance", kind: "clearance", boreKey: "bore", journalKey: "journal", radial: true, min: 0.0005, max: 0.0015 }];
    const { job, mic, tel } = await sheetWith(items);
    const m = await t.agent("mechanic");
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [1.1247, 1.1247], toolAssetTags: [mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "bore", values: [1.1256, 1.1256], toolAssetTags: [tel.assetTag, mic.assetTag], temperatureC: 22 });
    const res = await (await t.agent("auditor")).raw.get(`/api/jobs/${job.id}/check-sheet.pdf`).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on("data", (c: Buffer) => parts.push(c));
      r.on("end", () => cb(null, Buffer.concat(parts)));
    });
    const pdfParse = (await import("pdf-parse/lib/pdf-parse.js" as string)).default as (b: Buffer) => Promise<{ text: string }>;
    const text = (await pdfParse(res.body as Buffer)).text.replace(/\s+/g, " ");
    expect(text).toContain("Bushing clearance (radial)");
    expect(text).toContain("tightest");
    expect(text).toContain("radial");
    expect(text).toContain("at 20 °C");
    expect(text).toContain("under the minimum");
    expect(text).toContain("appropriately certificated persons");
  });

  it("prints out-of-round against its limit, the taper by direction, and the feeler's go and no-go stacks with their thicknesses", async () => {
    const items: LimitItemInput[] = [
      bore({ key: "top", label: "Bore, top", min: 1.125, max: 1.13, outOfRoundMax: 0.0008 }),
      bore({ key: "bottom", label: "Bore, bottom", min: 1.125, max: 1.13 }),
      { key: "taper", label: "Bore taper", kind: "taper", stationKeys: ["top", "bottom"], max: 0.001 },
      { key: "ring", label: "Ring side clearance", kind: "feeler", min: 0.0045, max: 0.006 },
    ];
    const { job, mic, tel } = await sheetWith(items);
    const { tool: set } = await makeFeelerSetInCalibration(t.db, ["0.0015", "0.002", "0.003", "0.005", "0.006", "0.007"]);
    await makeCheckout(t.db, set.id, t.people.mechanic.id);
    const m = await t.agent("mechanic");
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "top", values: [1.1279, 1.127], toolAssetTags: [tel.assetTag, mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "bottom", values: [1.1265, 1.1264], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring", toolAssetTags: [set.assetTag], goEntered: true, noGoEntered: false })).status).toBe(201);
    const res = await (await t.agent("auditor")).raw.get(`/api/jobs/${job.id}/check-sheet.pdf`).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on("data", (c: Buffer) => parts.push(c));
      r.on("end", () => cb(null, Buffer.concat(parts)));
    });
    const pdfParse = (await import("pdf-parse/lib/pdf-parse.js" as string)).default as (b: Buffer) => Promise<{ text: string }>;
    const text = (await pdfParse(res.body as Buffer)).text.replace(/\s+/g, " ");
    expect(text).toContain("OOR 0.0009 (max 0.0008, over)");
    expect(text).toContain("taper 0.0014 (max 0.0010)");
    expect(text).toContain("1: 1.1279 − 1.1265");
    expect(text).toContain("go 0.0015 + 0.003 stack (0.0045) entered");
    expect(text).toContain("no-go 0.006 (0.0060) did not enter");
    expect(text).toContain("gap at least 0.0045, under 0.0060");
  });
});
