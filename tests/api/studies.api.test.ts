import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { count, eq } from "drizzle-orm";
// @ts-expect-error pdf-parse's inner module has no types
import pdfParse from "pdf-parse/lib/pdf-parse.js";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeCheckout } from "../support/factories";
import { makeJob } from "../support/factories-inspection";
import { AIAG_DATA, agentFor, makeMechanics, makeStudyWorld, takeWholeStudy, type StudyAgent } from "../support/factories-studies";
import { auditEvents, gaugeStudies, gaugeStudyResults, gaugeStudyValues } from "../../server/db/schema";

let t: TestApp;
let world: Awaited<ReturnType<typeof makeStudyWorld>>;
let mechanics: Awaited<ReturnType<typeof makeMechanics>>;
let appraisers: StudyAgent[];
let finishedId: string;

const studyBody = (over: object = {}) => ({
  limitTableId: world.table.id,
  itemKey: "dev",
  familyId: world.family.id,
  parts: Array.from({ length: 10 }, (_, i) => ({ label: `Pin P-${String(i + 1).padStart(2, "0")}` })),
  appraiserIds: mechanics.map((m) => m.id),
  trials: 3,
  purpose: "Can the indicators on the comparator stand sort piston pins? (test)",
  ...over,
});
const studies = async () => (await t.db.select({ n: count() }).from(gaugeStudies))[0].n;
const valuesOf = async (id: string) => t.db.select().from(gaugeStudyValues).where(eq(gaugeStudyValues.studyId, id));

beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  world = await makeStudyWorld(t.db);
  mechanics = await makeMechanics(t);
  appraisers = await Promise.all(mechanics.map((m) => agentFor(t, m.email)));
  const q = await t.agent("quality");
  const res = await q.post("/api/studies", studyBody());
  if (res.status !== 201) throw new Error(JSON.stringify(res.body));
  finishedId = res.body.id;
  await takeWholeStudy(finishedId, appraisers, AIAG_DATA, world.indicators.map((x) => x.assetTag));
});
afterAll(() => t.close());

describe("setting up a gauge study", () => {
  it("a quality manager sets up 10 parts × 3 mechanics × 3 trials; each appraiser gets every part once per trial in a kept random order", async () => {
    const q = await t.agent("quality");
    const res = await q.post("/api/studies", studyBody());
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ parts: 10, trials: 3, state: "in_progress", valuesTaken: 0, valuesNeeded: 90, alpha: 0.25, verdict: null });
    expect(res.body.reference).toMatch(/^GRR-\d{4}$/);
    expect(res.body.characteristic).toMatchObject({ itemKey: "dev", min: -3, max: 3, tolerance: 6, unit: "mm" });
    expect(res.body.appraisers.map((a: { id: string }) => a.id)).toEqual(mechanics.map((m) => m.id));
    const order = res.body.runOrder as number[][][];
    expect(order).toHaveLength(3);
    for (const a of order) for (const trial of a) expect([...trial].sort((x, y) => x - y)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    // Kept: the same order on every read.
    expect((await q.get(`/api/studies/${res.body.id}`)).body.runOrder).toEqual(order);
  });

  it("a study with a missing trial count is refused with a clear 400 and nothing is set up", async () => {
    const before = await studies();
    const { trials: _omit, ...body } = studyBody();
    const res = await (await t.agent("quality")).post("/api/studies", body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_input");
    expect(res.body.error.message).toMatch(/trials/);
    expect(await studies()).toBe(before);
  });

  it("an appraiser without the mechanic role is refused (400, naming the person) and nothing is set up", async () => {
    const before = await studies();
    const res = await (await t.agent("quality")).post("/api/studies", studyBody({ appraiserIds: [mechanics[0].id, t.people.inspector.id] }));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Test inspector is not a mechanic/);
    expect(res.body.error.details[0].path).toEqual(["appraiserIds", 1]);
    expect(await studies()).toBe(before);
  });

  it("fewer than five parts, one appraiser or four trials are refused (400)", async () => {
    const q = await t.agent("quality");
    expect((await q.post("/api/studies", studyBody({ parts: [{ label: "a" }, { label: "b" }] }))).status).toBe(400);
    expect((await q.post("/api/studies", studyBody({ appraiserIds: [mechanics[0].id] }))).status).toBe(400);
    expect((await q.post("/api/studies", studyBody({ trials: 4 }))).status).toBe(400);
  });

  it("a clearance is worked out, not measured: a study of it is refused (400)", async () => {
    const res = await (await t.agent("quality")).post("/api/studies", studyBody({ itemKey: "pin_clearance" }));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/measures a journal or a bore/);
  });

  it("a family the limits item does not name for that characteristic is refused (409 tool_kind_unsuitable)", async () => {
    const res = await (await t.agent("quality")).post("/api/studies", studyBody({ familyId: undefined, toolAssetTag: world.otherFamilyTool.assetTag }));
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_kind_unsuitable");
  });
});

describe("taking a study blind on the bench", () => {
  let id: string;
  beforeAll(async () => {
    id = (await (await t.agent("quality")).post("/api/studies", studyBody({ parts: studyBody().parts.slice(0, 5), appraiserIds: mechanics.slice(0, 2).map((m) => m.id), trials: 2 }))).body.id;
  });

  it("the appraiser sees only the next part and trial in their order, never another value", async () => {
    const s = await appraisers[0].get(`/api/studies/${id}/session`);
    expect(s.status).toBe(200);
    expect(s.body.prompt).toMatchObject({ position: 1, trial: 1 });
    expect(s.body.prompt.partLabel).toMatch(/^Pin P-0\d$/);
    expect(s.body.last).toBeNull();
    expect(JSON.stringify(s.body)).not.toMatch(/"values"/);
    // Mechanics take studies; they do not read the values and results.
    expect((await appraisers[0].get(`/api/studies/${id}`)).status).toBe(403);
  });

  it("a value out of the randomized order is refused (409 out_of_run_order) and nothing is stored", async () => {
    const s = (await appraisers[0].get(`/api/studies/${id}/session`)).body;
    const wrongPart = (s.prompt.part % 5) + 1;
    const res = await appraisers[0].post(`/api/studies/${id}/values`, { part: wrongPart, trial: 1, value: 0.1, toolAssetTags: [world.indicators[0].assetTag] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("out_of_run_order");
    expect(await valuesOf(id)).toHaveLength(0);
  });

  it("a value that is not a number, or a value without its trial, is refused (400) and nothing is stored", async () => {
    const s = (await appraisers[0].get(`/api/studies/${id}/session`)).body;
    const notANumber = await appraisers[0].post(`/api/studies/${id}/values`, { part: s.prompt.part, trial: s.prompt.trial, value: "0.12a", toolAssetTags: [world.indicators[0].assetTag] });
    expect(notANumber.status).toBe(400);
    expect(notANumber.body.error.details[0].path).toEqual(["value"]);
    const noTrial = await appraisers[0].post(`/api/studies/${id}/values`, { part: s.prompt.part, value: 0.12, toolAssetTags: [world.indicators[0].assetTag] });
    expect(noTrial.status).toBe(400);
    expect(noTrial.body.error.message).toMatch(/trial/);
    expect(await valuesOf(id)).toHaveLength(0);
  });

  it("an overdue tool is refused with its reason (409 tool_not_usable), as for any reading", async () => {
    const s = (await appraisers[0].get(`/api/studies/${id}/session`)).body;
    const res = await appraisers[0].post(`/api/studies/${id}/values`, { part: s.prompt.part, trial: s.prompt.trial, value: 0.12, toolAssetTags: [world.overdue.assetTag] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_not_usable");
    expect(res.body.error.message).toMatch(/Calibration ran out/);
    expect(await valuesOf(id)).toHaveLength(0);
  });

  it("a tool outside the family under study is refused (409 tool_not_in_study)", async () => {
    const s = (await appraisers[0].get(`/api/studies/${id}/session`)).body;
    const res = await appraisers[0].post(`/api/studies/${id}/values`, { part: s.prompt.part, trial: s.prompt.trial, value: 0.12, toolAssetTags: [world.otherFamilyTool.assetTag] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_not_in_study");
  });

  it("a mechanic who is not an appraiser of the study may not take it (403)", async () => {
    const res = await appraisers[2].get(`/api/studies/${id}/session`);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("not_an_appraiser");
  });

  it("a value is stored as typed with the tool's status at that moment; the next prompt follows, showing only the value just entered", async () => {
    const s = (await appraisers[0].get(`/api/studies/${id}/session`)).body;
    const res = await appraisers[0].post(`/api/studies/${id}/values`, { part: s.prompt.part, trial: s.prompt.trial, value: 0.1234, toolAssetTags: [world.indicators[0].assetTag.toLowerCase()] });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ taken: 1, needed: 10, studyComplete: false });
    const after = (await appraisers[0].get(`/api/studies/${id}/session`)).body;
    expect(after.prompt.position).toBe(2);
    expect(after.last).toMatchObject({ value: 0.1234, unit: "mm", partLabel: s.prompt.partLabel, trial: 1, toolAssetTags: [world.indicators[0].assetTag] });
    const detail = (await (await t.agent("quality")).get(`/api/studies/${id}`)).body;
    expect(detail.values[0].tools[0]).toMatchObject({ assetTag: world.indicators[0].assetTag, statusAtReading: "in_calibration" });
    // The other appraiser's prompt knows nothing of it.
    expect((await appraisers[1].get(`/api/studies/${id}/session`)).body).toMatchObject({ taken: 0, last: null });
  });

  it("the appraiser corrects the value just entered with a reason; the old value stays on record, superseded", async () => {
    const last = (await appraisers[0].get(`/api/studies/${id}/session`)).body.last;
    const noReason = await appraisers[0].post(`/api/study-values/${last.id}/supersede`, { value: 0.1243, toolAssetTags: [world.indicators[0].assetTag] });
    expect(noReason.status).toBe(400);
    const res = await appraisers[0].post(`/api/study-values/${last.id}/supersede`, { value: 0.1243, toolAssetTags: [world.indicators[0].assetTag], reason: "Digits swapped when typing" });
    expect(res.status).toBe(201);
    const again = await appraisers[0].post(`/api/study-values/${last.id}/supersede`, { value: 0.1, toolAssetTags: [world.indicators[0].assetTag], reason: "Second try at the same value" });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("value_superseded");
    const others = await appraisers[1].post(`/api/study-values/${res.body.id}/supersede`, { value: 0.2, toolAssetTags: [world.indicators[1].assetTag], reason: "Not mine to correct" });
    expect(others.status).toBe(403);
    const rows = await valuesOf(id);
    expect(rows.map((r) => r.value).sort()).toEqual(["0.1234", "0.1243"]);
    expect(rows.find((r) => r.value === "0.1243")).toMatchObject({ supersedesId: last.id, supersedeReason: "Digits swapped when typing" });
    expect((await appraisers[0].get(`/api/studies/${id}/session`)).body).toMatchObject({ taken: 1, last: { value: 0.1243 } });
  });

  it("study values are evidence: the database refuses to change or delete one", async () => {
    // Straight to the pool: PostgreSQL's own refusal, not Drizzle's wrapping of it.
    await expect(t.pool.query("update gauge_study_values set value = 0 where study_id = $1", [id])).rejects.toThrow(/record_signed/);
    await expect(t.pool.query("delete from gauge_studies where id = $1", [id])).rejects.toThrow(/record_signed/);
    await expect(t.pool.query("update gauge_study_results set verdict = 'acceptable' where study_id = $1", [finishedId])).rejects.toThrow(/record_signed/);
  });
});

describe("the analysis of a finished study, fed the AIAG MSA 4th ed. example data", () => {
  it("both methods reproduce the published figures: ANOVA EV 0.199933, AV 0.226838, GRR 0.302373, 27.9 % of TV, ndc 4; average-and-range GRR 0.305766, 26.7 %, ndc 5 (msa-check-values.md A: [seen] / [derived])", async () => {
    const res = await (await t.agent("auditor")).get(`/api/studies/${finishedId}`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ state: "complete", valuesTaken: 90 });
    const a = res.body.analysis;
    const c = (k: string) => a.anova.components.find((x: { key: string }) => x.key === k);
    expect(a.anova.pooled).toBe(true);
    expect(a.anova.pInteraction).toBeCloseTo(0.9741, 4);
    expect(c("repeatability").sd).toBeCloseTo(0.199933, 6);
    expect(c("appraiser").sd).toBeCloseTo(0.226838, 6);
    expect(c("grr").sd).toBeCloseTo(0.302373, 5);
    expect(c("part").sd).toBeCloseTo(1.042327, 6);
    expect(c("grr").percentTotalVariation).toBeCloseTo(27.9, 1);
    expect(a.anova.ndc).toBe(4);
    expect(a.averageRange.grr).toBeCloseTo(0.305766, 6);
    expect(a.averageRange.components.find((x: { key: string }) => x.key === "grr").percentTotalVariation).toBeCloseTo(26.68, 2);
    expect(a.averageRange.ndc).toBe(5);
    // Against this invented characteristic's 6-unit tolerance: 6 × 0.302373 / 6 = 30.2 % — not acceptable.
    expect(c("grr").percentTolerance).toBeCloseTo(30.24, 2);
    expect(res.body).toMatchObject({ verdict: "not_acceptable", ndc: 4 });
    expect(res.body.percentGrr).toBeCloseTo(30.24, 2);
    expect(a.charts.range.points).toHaveLength(30);
  });

  it("the PDF report carries the study, the verdict, the charts' titles and the cautions", async () => {
    const res = await (await t.agent("quality")).get(`/api/studies/${finishedId}/report.pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on("data", (c: Buffer) => chunks.push(c));
      r.on("end", () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    const text = ((await pdfParse(res.body)).text as string).replace(/\s+/g, " ");
    expect(text).toMatch(/Gauge study GRR-\d{4}/);
    expect(text).toMatch(/Not acceptable — GRR 30\.2 % of the tolerance, ndc 4/);
    expect(text).toMatch(/Range chart by appraiser/);
    expect(text).toMatch(/Average chart by appraiser/);
    expect(text).toMatch(/Appraiser × part interaction/);
    expect(text).toMatch(/Components of variation/);
    expect(text).toMatch(/airworthiness/);
  });

  it("a correction on a finished study writes a new result; the old result stays", async () => {
    const before = (await t.db.select({ n: count() }).from(gaugeStudyResults).where(eq(gaugeStudyResults.studyId, finishedId)))[0].n;
    const last = (await appraisers[2].get(`/api/studies/${finishedId}/session`)).body.last;
    const res = await appraisers[2].post(`/api/study-values/${last.id}/supersede`, { value: last.value, toolAssetTags: [world.indicators[2].assetTag], reason: "Re-entered after checking the stand (same value)" });
    expect(res.status).toBe(201);
    expect(res.body.studyComplete).toBe(true);
    const after = (await t.db.select({ n: count() }).from(gaugeStudyResults).where(eq(gaugeStudyResults.studyId, finishedId)))[0].n;
    expect(after).toBe(before + 1);
  });
});

describe("what a finished study changes elsewhere", () => {
  it("the tool's family and the limits item show the latest study and its verdict", async () => {
    const m = await t.agent("mechanic");
    const byFamily = (await m.get(`/api/studies/latest?familyId=${world.family.id}`)).body;
    const dev = byFamily.find((x: { characteristic: { itemKey: string } }) => x.characteristic.itemKey === "dev");
    expect(dev.latest).toMatchObject({ id: finishedId, verdict: "not_acceptable", ndc: 4 });
    const byTable = (await m.get(`/api/studies/latest?limitTableId=${world.table.id}`)).body;
    expect(byTable.find((x: { family: { id: string } }) => x.family.id === world.family.id).latest.id).toBe(finishedId);
    expect((await m.get(`/api/studies/latest`)).status).toBe(400);
  });

  it("a reading on that characteristic with a tool of the failed family carries the flag gauge_study_not_acceptable", async () => {
    const job = await makeJob(t.db, world.table.id, t.people.mechanic.id);
    const tool = world.indicators[0];
    await makeCheckout(t.db, tool.id, t.people.mechanic.id);
    const m = await t.agent("mechanic");
    const res = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "dev", values: [0.12, 0.14], toolAssetTags: [tool.assetTag] });
    expect(res.status).toBe(201);
    expect(res.body.flags).toContain("gauge_study_not_acceptable");
    // Kept with the reading on the sheet and in its audit line, not only in the answer.
    const kept = (await m.get(`/api/jobs/${job.id}`)).body.items.find((i: { key: string }) => i.key === "dev").rows[0].reading;
    expect(kept.flags).toContain("gauge_study_not_acceptable");
    const [line] = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, res.body.id));
    expect((line.after as { flags: string[] }).flags).toEqual(res.body.flags);
    // Named beside a tool of another family, the indicator still brings the flag with it.
    const second = await makeJob(t.db, world.table.id, t.people.mechanic.id);
    const both = await m.post(`/api/jobs/${second.id}/readings`, { itemKey: "dev", values: [0.12, 0.14], toolAssetTags: [world.otherFamilyTool.assetTag, tool.assetTag] });
    expect(both.status, JSON.stringify(both.body)).toBe(201);
    expect(both.body.flags).toContain("gauge_study_not_acceptable");
    // A characteristic without a failed study carries no such flag.
    const other = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [22.215, 22.22], toolAssetTags: [world.otherFamilyTool.assetTag] });
    expect(other.status).toBe(201);
    expect(other.body.flags).not.toContain("gauge_study_not_acceptable");
  });

  it("the quality overview lists characteristics with no study and with a failed one", async () => {
    const res = await (await t.agent("quality")).get("/api/studies/gaps");
    expect(res.status).toBe(200);
    const mine = res.body.items.filter((g: { limitTableId: string }) => g.limitTableId === world.table.id);
    expect(mine.find((g: { itemKey: string }) => g.itemKey === "dev")).toMatchObject({ reason: "not_acceptable", latest: { id: finishedId, verdict: "not_acceptable" } });
    expect(mine.find((g: { itemKey: string }) => g.itemKey === "pin")).toMatchObject({ reason: "no_study", latest: null });
    expect(mine.find((g: { itemKey: string }) => g.itemKey === "pin_bore")).toMatchObject({ reason: "no_study" });
    // Clearances are worked out, never studied: not listed.
    expect(mine.find((g: { itemKey: string }) => g.itemKey === "pin_clearance")).toBeUndefined();
    expect(res.body.notAcceptable).toBeGreaterThanOrEqual(1);
  });

  it("a study set up after the shop changes α keeps the new α; one set up before keeps its own", async () => {
    const admin = await t.agent("admin");
    expect((await admin.patch("/api/settings", { studyPoolingAlpha: 0.05 })).status).toBe(200);
    const q = await t.agent("quality");
    const res = await q.post("/api/studies", studyBody({ trials: 2 }));
    expect(res.body.alpha).toBe(0.05);
    expect((await q.get(`/api/studies/${finishedId}`)).body.alpha).toBe(0.25);
    expect((await admin.patch("/api/settings", { studyPoolingAlpha: 1.5 })).status).toBe(400);
    await admin.patch("/api/settings", { studyPoolingAlpha: 0.25 });
  });
});

describe("who may use gauge studies", () => {
  let valueId: string;
  beforeAll(async () => {
    // A value of the test app's own mechanic, so the allowed role is refused by nothing but the unknown tool.
    valueId = (await valuesOf(finishedId)).filter((v) => v.takenBy === t.people.mechanic.id && !v.supersedesId)[0].id;
  });
  roleMatrix(() => t, [
    { method: "get", path: "/api/studies", allowed: ["quality", "inspector", "auditor", "admin"] },
    { method: "post", path: "/api/studies", body: () => studyBody({ trials: 2 }), allowed: ["quality", "admin"] },
    { method: "get", path: () => `/api/studies/${finishedId}`, label: "/api/studies/:id", allowed: ["quality", "inspector", "auditor", "admin"] },
    { method: "get", path: () => `/api/studies/${finishedId}/report.pdf`, label: "/api/studies/:id/report.pdf", allowed: ["quality", "inspector", "auditor", "admin"] },
    { method: "get", path: "/api/studies/mine", allowed: ["mechanic"] },
    { method: "get", path: () => `/api/studies/${finishedId}/session`, label: "/api/studies/:id/session", allowed: ["mechanic"] },
    { method: "post", path: () => `/api/studies/${finishedId}/values`, label: "/api/studies/:id/values", body: { part: 1, trial: 1, value: 0.1, toolAssetTags: ["DIA-X"] }, allowed: ["mechanic"] },
    { method: "post", path: () => `/api/study-values/${valueId}/supersede`, label: "/api/study-values/:id/supersede", body: { value: 0.1, toolAssetTags: ["DIA-X"], reason: "Role matrix probe" }, allowed: ["mechanic"] },
    { method: "get", path: () => `/api/studies/latest?familyId=${world.family.id}`, label: "/api/studies/latest", allowed: ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] },
    { method: "get", path: "/api/studies/gaps", allowed: ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] },
  ]);
});
