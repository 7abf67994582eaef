import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeCalibration, makeCheckout, makeTool, makeFamily } from "../support/factories";
import { makeFeelerSetInCalibration, makeJob, makeLimitTable, makePinSheet, makeToolInCalibration, pinAndBoreItems } from "../support/factories-inspection";
import { readings, readingTools, users } from "../../server/db/schema";
import { eq } from "drizzle-orm";
import { CreateReadingSchema, ENTER_A_NUMBER } from "../../shared/readings/readings.schemas";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  // The test inspector's record holds her certificate number; she signs with it.
  await t.db.update(users).set({ certificateNumber: "IA-TEST-1" }).where(eq(users.id, t.people.inspector.id));
});
afterAll(async () => t.close());

/** A pin-and-bore sheet with a 1–2 in micrometer and a telescoping gauge, both issued to the mechanic. */
const pinSheet = () => makePinSheet(t.db, t.people.mechanic.id);

const readingsOf = async (jobId: string) => t.db.select().from(readings).where(eq(readings.jobId, jobId));
const row = (sheet: { items: { key: string; rows: { index: number }[] }[] }, key: string, index = 1) =>
  sheet.items.find((i) => i.key === key)!.rows.find((r) => r.index === index)! as any;

describe("sizes and clearances on the check sheet", () => {
  it("journal 1.1250/1.1247 and bore 1.1271/1.1273 give a clearance of 0.0026 in, within 0.0010–0.0045 (common practice; demo limits)", async () => {
    const { job, mic, tel } = await pinSheet();
    const a = await t.agent("mechanic");
    const pin = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    expect(pin.status).toBe(201);
    // Journal size = smallest reading; out-of-round = largest − smallest (common practice).
    expect(pin.body).toMatchObject({ size: 1.1247, outOfRound: 0.0003, verdict: "within_limits", flags: [] });
    const bore = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(bore.status).toBe(201);
    // Bore size = largest reading; clearance = bore − journal (common practice).
    expect(bore.body).toMatchObject({ size: 1.1273, outOfRound: 0.0002, clearance: 0.0026, verdict: "within_limits" });

    const sheet = (await a.get(`/api/jobs/${job.id}`)).body;
    const c = row(sheet, "pin_clearance");
    expect(c.clearance).toBe(0.0026);
    expect(c.verdict).toBe("within_limits");
    expect(c.verdictText).toBe("Within new limits");
    const pinRow = row(sheet, "pin");
    expect(pinRow.reading.values).toEqual([1.125, 1.1247]);
    expect(pinRow.reading.tools[0]).toMatchObject({ assetTag: mic.assetTag, statusAtReading: "in_calibration", dueAtReading: "2027-04-30" });
    expect(pinRow.reading.takenBy.name).toBe("Test mechanic");
    // The bore names both the gauge and the micrometer that read it.
    expect(row(sheet, "pin_bore").reading.tools.map((x: { assetTag: string }) => x.assetTag)).toEqual([tel.assetTag, mic.assetTag]);
    expect(row(sheet, "pin_clearance", 2).verdict).toBe("pending");
  });

  it("a clearance exactly on the new maximum is within limits (exact decimals, not binary floating point)", async () => {
    const { job, mic, tel } = await pinSheet();
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.125, 1.125], toolAssetTags: [mic.assetTag] });
    const bore = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 2, values: [1.1295, 1.129], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(bore.body.clearance).toBe(0.0045);
    const c = row((await a.get(`/api/jobs/${job.id}`)).body, "pin_clearance", 2);
    expect(c.verdict).toBe("within_limits");
    expect(c.verdictText).toBe("Within new limits");
  });

  it("a worn clearance beyond the new maximum but within the serviceable limit is accepted, and the sheet says which limit decided", async () => {
    const { job, mic, tel } = await pinSheet();
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.1245, 1.1246], toolAssetTags: [mic.assetTag] });
    const bore = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", values: [1.1293, 1.1291], toolAssetTags: [tel.assetTag, mic.assetTag] });
    // Bore 1.1293 is past the new maximum 1.1280 but inside the serviceable 1.1295.
    expect(bore.body.verdict).toBe("within_limits");
    const sheet = (await a.get(`/api/jobs/${job.id}`)).body;
    expect(row(sheet, "pin_bore").verdictText).toBe("Within serviceable limits (worn beyond new)");
    const c = row(sheet, "pin_clearance");
    expect(c.clearance).toBe(0.0048);
    expect(c.judgement.band).toBe("serviceable");
    expect(c.verdictText).toBe("Within serviceable limits (worn beyond new)");
  });

  it("a clearance past the serviceable limit is outside limits", async () => {
    const { job, mic, tel } = await pinSheet();
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.124, 1.1241], toolAssetTags: [mic.assetTag] });
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", values: [1.1292, 1.1291], toolAssetTags: [tel.assetTag, mic.assetTag] });
    const c = row((await a.get(`/api/jobs/${job.id}`)).body, "pin_clearance");
    expect(c.clearance).toBe(0.0052);
    expect(c.verdict).toBe("outside_limits");
    expect(c.verdictText).toBe("Outside serviceable limits: loosest fit 0.0052 loose is 0.0002 over the serviceable maximum 0.0050 loose");
  });

  it("a metric micrometer on an inch table converts exactly: 28.575 mm is 1.125 in (1 in = 25.4 mm exactly, NIST SP 811)", async () => {
    const { job, tel, mic } = await pinSheet();
    const metric = await makeToolInCalibration(t.db, { unit: "mm", rangeMin: "25", rangeMax: "50", resolution: "0.001", ownerUserId: t.people.mechanic.id });
    const a = await t.agent("mechanic");
    const pin = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [28.575, 28.575], toolAssetTags: [metric.assetTag] });
    expect(pin.status).toBe(201);
    expect(pin.body.size).toBe(1.125);
    const bore = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(bore.body.clearance).toBe(0.0023);
    const r = row((await a.get(`/api/jobs/${job.id}`)).body, "pin").reading;
    // The raw values stay as typed, in the tool's unit.
    expect(r).toMatchObject({ values: [28.575, 28.575], unit: "mm", size: 1.125 });
  });
});

describe("ISO 286 fits worked through a limits table in millimetres", () => {
  async function fitSheet(hole: [number, number], shaft: [number, number], clearance: [number, number]) {
    const table = await makeLimitTable(t.db, {
      unit: "mm",
      items: [
        { key: "shaft", label: "Shaft", kind: "journal", min: shaft[0], max: shaft[1] },
        { key: "hole", label: "Hole", kind: "bore", min: hole[0], max: hole[1] },
        { key: "fit", label: "Fit", kind: "clearance", boreKey: "hole", journalKey: "shaft", min: clearance[0], max: clearance[1] },
      ],
    });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const mic = await makeToolInCalibration(t.db, { unit: "mm", rangeMin: "0", rangeMax: "25", ownerUserId: t.people.mechanic.id });
    const mic2 = await makeToolInCalibration(t.db, { unit: "mm", rangeMin: "25", rangeMax: "50", ownerUserId: t.people.mechanic.id });
    const tel = await makeToolInCalibration(t.db, { kind: "telescoping_gauge", unit: "mm", rangeMin: "8", rangeMax: "150", ownerUserId: t.people.mechanic.id });
    return { job, mic, mic2, tel };
  }

  it("25 H7/g6: hole 25.021 and shaft 24.980 give 0.041 mm, on the maximum and within (ISO 286-2: 0.007 to 0.041 mm)", async () => {
    const { job, mic, mic2, tel } = await fitSheet([25.0, 25.021], [24.98, 24.993], [0.007, 0.041]);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "shaft", values: [24.98, 24.985], toolAssetTags: [mic.assetTag] });
    const hole = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "hole", values: [25.021, 25.018], toolAssetTags: [tel.assetTag, mic2.assetTag] });
    // In binary floating point 25.021 − 24.980 is 0.04100000000000037 and would fail; exact decimals keep it on the limit.
    expect(hole.body.clearance).toBe(0.041);
    expect(row((await a.get(`/api/jobs/${job.id}`)).body, "fit").verdict).toBe("within_limits");
  });

  it("25 H7/g6 at the tightest: hole 25.000 and shaft 24.993 give 0.007 mm, within (ISO 286-2)", async () => {
    const { job, mic, mic2, tel } = await fitSheet([25.0, 25.021], [24.98, 24.993], [0.007, 0.041]);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "shaft", values: [24.993, 24.993], toolAssetTags: [mic.assetTag] });
    const hole = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "hole", values: [25.0, 25.0], toolAssetTags: [tel.assetTag, mic2.assetTag] });
    expect(hole.body.clearance).toBe(0.007);
    expect(row((await a.get(`/api/jobs/${job.id}`)).body, "fit").verdict).toBe("within_limits");
  });

  it("25 H7/k6 is a transition fit: hole 25.000 on shaft 25.015 is 0.015 mm interference, within +0.019 to −0.015 mm (ISO 286-2)", async () => {
    const { job, mic2, tel } = await fitSheet([25.0, 25.021], [25.002, 25.015], [-0.015, 0.019]);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "shaft", values: [25.015, 25.015], toolAssetTags: [mic2.assetTag] });
    const hole = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "hole", values: [25.0, 25.0], toolAssetTags: [tel.assetTag, mic2.assetTag] });
    expect(hole.body.clearance).toBe(-0.015);
    expect(row((await a.get(`/api/jobs/${job.id}`)).body, "fit").verdict).toBe("within_limits");
  });

  it("10 H7/g6 judged outside when the clearance passes 0.029 mm (ISO 286-2: 0.005 to 0.029 mm)", async () => {
    const { job, mic, tel } = await fitSheet([10.0, 10.015], [9.986, 9.995], [0.005, 0.029]);
    const a = await t.agent("mechanic");
    await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "shaft", values: [9.986, 9.99], toolAssetTags: [mic.assetTag] });
    const hole = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "hole", values: [10.016, 10.01], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect(hole.body.clearance).toBe(0.03);
    expect(row((await a.get(`/api/jobs/${job.id}`)).body, "fit").verdict).toBe("outside_limits");
  });
});

describe("feeler gaps checked go/no-go", () => {
  const LEAVES = ["0.0015", "0.002", "0.003", "0.004", "0.005", "0.006", "0.007", "0.008", "0.009", "0.010", "0.012", "0.015", "0.020", "0.025"];
  async function feelerSheet(opts: Parameters<typeof makeFeelerSetInCalibration>[2] = { rejected: ["0.004"] }) {
    const table = await makeLimitTable(t.db, { items: [{ key: "ring_side", label: "Ring side clearance", kind: "feeler", min: 0.0045, max: 0.006, repeat: 6 }] });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const { tool } = await makeFeelerSetInCalibration(t.db, LEAVES, opts);
    await makeCheckout(t.db, tool.id, t.people.mechanic.id);
    return { job, set: tool };
  }

  it("go and no-go sit inside the limits, chosen by calibrated thickness; a leaf rejected at calibration is skipped (ISO 1938-1 principle, from memory; common practice)", async () => {
    const { job, set } = await feelerSheet();
    const a = await t.agent("mechanic");
    const leaves = await a.get(`/api/jobs/${job.id}/feeler-leaves?itemKey=ring_side&setTag=${set.assetTag}`);
    expect(leaves.status).toBe(200);
    // Limits 0.0045–0.0060: the thinnest at or above 0.0045 is the stack 0.0015 + 0.003 (0.004 is rejected); the
    // thickest at or below 0.0060 is the 0.006 leaf. The earlier choice (0.003 under, 0.007 over) proved nothing.
    expect(leaves.body).toMatchObject({ mode: "go_no_go", goLeaf: { label: "0.0015 + 0.003", thickness: 0.0045 }, noGoLeaf: { label: "0.006", thickness: 0.006 } });
    expect(leaves.body.goLeaf.leaves.map((l: { label: string }) => l.label)).toEqual(["0.0015", "0.003"]);
    expect(leaves.body.leaves.map((l: { label: string }) => l.label)).not.toContain("0.004");
    expect(leaves.body.why).toContain("at or above the minimum");
    const ok = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring_side", index: 1, toolAssetTags: [set.assetTag], goEntered: true, noGoEntered: false });
    expect(ok.status).toBe(201);
    expect(ok.body).toMatchObject({ verdict: "within_limits", goLeaf: { label: "0.0015 + 0.003", thickness: 0.0045 }, noGoLeaf: { label: "0.006", thickness: 0.006 } });
  });

  it("a no-go leaf that enters means the gap is too wide: outside limits", async () => {
    const { job, set } = await feelerSheet();
    const a = await t.agent("mechanic");
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring_side", index: 2, toolAssetTags: [set.assetTag], goEntered: true, noGoEntered: true });
    expect(res.body.verdict).toBe("outside_limits");
    const go = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "ring_side", index: 3, toolAssetTags: [set.assetTag], goEntered: false, noGoEntered: false });
    expect(go.body.verdict).toBe("outside_limits");
  });

  it("leaves are chosen by their calibrated thickness: a 0.006 leaf measured 0.0061 is over the 0.0060 maximum and cannot be the no-go", async () => {
    const { job, set } = await feelerSheet({ calibrated: { "0.006": "0.0061" }, rejected: ["0.004"] });
    const a = await t.agent("mechanic");
    const leaves = await a.get(`/api/jobs/${job.id}/feeler-leaves?itemKey=ring_side&setTag=${set.assetTag}`);
    // The thickest at or under 0.0060 is then 0.005 (0.002 + 0.003 is as thick; one leaf is preferred to a stack).
    expect(leaves.body).toMatchObject({ mode: "go_no_go", noGoLeaf: { label: "0.005", thickness: 0.005 }, goLeaf: { thickness: 0.0045 } });
  });
});

describe("refusals and flags", () => {
  it("an overdue micrometer is refused with its reason, and nothing is written", async () => {
    const { job } = await pinSheet();
    const overdue = await makeToolInCalibration(t.db, { performedAt: "2025-05-01T15:00:00Z", nextDueAt: "2026-05-01" });
    const a = await t.agent("mechanic");
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [overdue.assetTag] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_not_usable");
    expect(res.body.error.message).toContain("Calibration ran out on 2026-05-01");
    expect(res.body.error.details.tools[0]).toMatchObject({ assetTag: overdue.assetTag, status: "overdue" });
    expect(await readingsOf(job.id)).toHaveLength(0);
  });

  it("quality may accept a reading taken with an overdue tool, with a reason; the reading is flagged override and tool_overdue", async () => {
    const { job } = await pinSheet();
    const overdue = await makeToolInCalibration(t.db, { performedAt: "2025-05-01T15:00:00Z", nextDueAt: "2026-05-01" });
    const mech = await t.agent("mechanic");
    const refusedForMechanic = await mech.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [overdue.assetTag], override: { reason: "Only gauge on site" } });
    expect(refusedForMechanic.status).toBe(403);
    const q = await t.agent("quality");
    const res = await q.post(`/api/jobs/${job.id}/readings`, {
      itemKey: "pin",
      values: [1.125, 1.1247],
      toolAssetTags: [overdue.assetTag],
      override: { reason: "Checked against SET-01 before use; recalibration booked" },
    });
    expect(res.status).toBe(201);
    expect(res.body.flags).toEqual(expect.arrayContaining(["override", "tool_overdue"]));
    const r = row((await q.get(`/api/jobs/${job.id}`)).body, "pin").reading;
    expect(r.overrideReason).toContain("SET-01");
    expect(r.tools[0].statusAtReading).toBe("overdue");
  });

  it("a quarantined tool is refused even for a personal tool of the reader", async () => {
    const { job } = await pinSheet();
    const mine = await makeToolInCalibration(t.db, { ownerUserId: t.people.mechanic.id });
    const { holds } = await import("../../server/db/schema");
    await t.db.insert(holds).values({ toolId: mine.id, placedAt: new Date("2026-06-14T12:00:00Z"), reason: "Dropped on the floor" });
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mine.assetTag] });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain("Dropped on the floor");
  });

  it("fewer values than the item's directions is bad input, and nothing is written", async () => {
    const { job, mic } = await pinSheet();
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125], toolAssetTags: [mic.assetTag] });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toEqual(["values"]);
    expect(await readingsOf(job.id)).toHaveLength(0);
  });

  it("an unknown item, a place beyond the item's count, or an unknown tool is refused", async () => {
    const { job, mic } = await pinSheet();
    const a = await t.agent("mechanic");
    expect((await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "crank_journal", values: [1.1, 1.1], toolAssetTags: [mic.assetTag] })).status).toBe(400);
    expect((await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 3, values: [1.125, 1.125], toolAssetTags: [mic.assetTag] })).status).toBe(400);
    const unknown = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.125], toolAssetTags: ["NOPE-0000"] });
    expect(unknown.status).toBe(404);
    expect((await a.post(`/api/jobs/not-a-uuid/readings`, { itemKey: "pin", values: [1.125, 1.125], toolAssetTags: [mic.assetTag] })).status).toBe(400);
    expect((await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: ["1.125", 1.125], toolAssetTags: [mic.assetTag] })).status).toBe(400);
    expect(await readingsOf(job.id)).toHaveLength(0);
  });

  it("a bore read through a telescoping gauge must name the micrometer too", async () => {
    const { job, tel } = await pinSheet();
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("micrometer_not_named");
  });

  it("a value outside the micrometer's range is flagged outside_tool_range", async () => {
    const { job } = await pinSheet();
    const small = await makeToolInCalibration(t.db, { rangeMin: "0", rangeMax: "1", ownerUserId: t.people.mechanic.id });
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [small.assetTag] });
    expect(res.status).toBe(201);
    expect(res.body.flags).toEqual(["outside_tool_range"]);
  });

  it("a tool neither issued to the reader nor their own is flagged not_in_custody", async () => {
    const { job } = await pinSheet();
    const shelf = await makeToolInCalibration(t.db);
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [shelf.assetTag] });
    expect(res.body.flags).toEqual(["not_in_custody"]);
  });

  it("a thousandths micrometer on a one-thousandth tolerance is flagged resolution_too_coarse (rule of ten, AIAG MSA)", async () => {
    const { job } = await pinSheet();
    const coarse = await makeToolInCalibration(t.db, { resolution: "0.001", ownerUserId: t.people.mechanic.id });
    const res = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.124], toolAssetTags: [coarse.assetTag] });
    expect(res.body.flags).toEqual(["resolution_too_coarse"]);
  });

  it("the resolution ratio is the shop's setting, 10:1 by default (common rule of thumb, no source): at 20:1 a tenth micrometer on a 0.001 in tolerance is flagged", async () => {
    const admin = await t.agent("admin");
    expect((await admin.get("/api/settings")).body.resolutionRatio).toBe(10);
    const { job, mic } = await pinSheet();
    const m = await t.agent("mechanic");
    // 0.0001 in is exactly a tenth of the 1.124–1.125 in tolerance: not coarser at 10:1.
    expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] })).body.flags).toEqual([]);
    expect((await admin.patch("/api/settings", { resolutionRatio: 20 })).status).toBe(200);
    try {
      expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] })).body.flags).toEqual(["resolution_too_coarse"]);
      const bad = await admin.patch("/api/settings", { resolutionRatio: 0.5 });
      expect(bad.status).toBe(400);
      expect(bad.body.error.message).toContain("coarser than the tolerance");
    } finally {
      await admin.patch("/api/settings", { resolutionRatio: 10 });
    }
  });

  it("a flag every reading of an item carries is shown once, on the item; a flag of one reading stays on its place", async () => {
    const { job } = await pinSheet();
    const coarse = await makeToolInCalibration(t.db, { resolution: "0.001", ownerUserId: t.people.mechanic.id });
    const notIssued = await makeToolInCalibration(t.db, { resolution: "0.001", rangeMin: "1", rangeMax: "2" });
    const m = await t.agent("mechanic");
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.124], toolAssetTags: [coarse.assetTag] });
    // One reading so far of two places: its flag stays on its place.
    let sheet = (await m.get(`/api/jobs/${job.id}`)).body;
    expect(sheet.items.find((i: { key: string }) => i.key === "pin").flags).toEqual([]);
    expect(row(sheet, "pin", 1).flags).toEqual(["resolution_too_coarse"]);
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.125, 1.124], toolAssetTags: [notIssued.assetTag] });
    sheet = (await m.get(`/api/jobs/${job.id}`)).body;
    const pin = sheet.items.find((i: { key: string }) => i.key === "pin");
    expect(pin.flags).toEqual(["resolution_too_coarse"]);
    expect(row(sheet, "pin", 1).flags).toEqual([]);
    expect(row(sheet, "pin", 2).flags).toEqual(["not_in_custody"]);
    // The readings keep every flag they were recorded with.
    expect(row(sheet, "pin", 2).reading.flags).toEqual(expect.arrayContaining(["resolution_too_coarse", "not_in_custody"]));
    expect(sheet.summary.flagged).toBe(2);
  });

  it("a value that is not a number is refused in plain words, the same the form shows", async () => {
    const { job, mic } = await pinSheet();
    const m = await t.agent("mechanic");
    for (const values of [["abc", 1.125], [null, 1.125]]) {
      const res = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values, toolAssetTags: [mic.assetTag] });
      expect(res.status).toBe(400);
      expect(res.body.error.message).toBe(`${ENTER_A_NUMBER} (values.0)`);
      expect(res.body.error.message).toBe("Enter a number, e.g. 1.1245 (values.0)");
    }
    const warm = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag], temperatureC: "warm" });
    expect(warm.body.error.message).toContain("Enter the temperature in °C as a number");
    // The form runs the same schema: "abc" typed in a direction reads as NaN there.
    const parsed = CreateReadingSchema.safeParse({ itemKey: "pin", values: [Number("abc"), 1.125], toolAssetTags: [mic.assetTag] });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0].message).toBe("Enter a number, e.g. 1.1245");
  });

  it("each tool's status is stored with the reading: a micrometer overdue later still shows in calibration, due 2027-04-30, on the reading it took", async () => {
    const { job, mic } = await pinSheet();
    const m = await t.agent("mechanic");
    const r = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    const [stored] = await t.db.select().from(readingTools).where(eq(readingTools.readingId, r.body.id));
    expect(stored).toMatchObject({ statusAtReading: "in_calibration", dueAtReading: "2027-04-30" });
    t.clock.set("2027-05-10T15:00:00Z");
    try {
      // The micrometer is overdue now, and a new reading with it is refused …
      const now = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
      expect(now.body.error.code).toBe("tool_not_usable");
      // … but the sheet shows it as it was when the reading was taken.
      const sheet = (await m.get(`/api/jobs/${job.id}`)).body;
      expect(row(sheet, "pin", 1).reading.tools[0]).toMatchObject({ assetTag: mic.assetTag, statusAtReading: "in_calibration", dueAtReading: "2027-04-30" });
      expect(sheet.tools).toEqual([expect.objectContaining({ assetTag: mic.assetTag, statusAtReading: "in_calibration" })]);
    } finally {
      t.clock.set("2026-06-15T15:00:00Z");
    }
  });

  it("a place already measured takes a correction with a reason, not a second reading; the old reading stays on record", async () => {
    const { job, mic } = await pinSheet();
    const a = await t.agent("mechanic");
    const first = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    const again = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1248], toolAssetTags: [mic.assetTag] });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("reading_exists");
    expect((await a.post(`/api/readings/${first.body.id}/supersede`, { values: [1.125, 1.1248], toolAssetTags: [mic.assetTag] })).status).toBe(400);
    const fix = await a.post(`/api/readings/${first.body.id}/supersede`, { reason: "Anvil was not wiped; measured again", values: [1.125, 1.1248], toolAssetTags: [mic.assetTag] });
    expect(fix.status).toBe(201);
    expect(fix.body.size).toBe(1.1248);
    const sheet = (await a.get(`/api/jobs/${job.id}`)).body;
    const r = row(sheet, "pin");
    expect(r.reading).toMatchObject({ id: fix.body.id, supersedesId: first.body.id, supersedeReason: "Anvil was not wiped; measured again" });
    // The correction replaces the reading: the sheet and the jobs list both count one reading at that place.
    const listed = (await a.get(`/api/jobs?engineSerial=${encodeURIComponent(job.engineSerial)}`)).body.items.find((j: { id: string }) => j.id === job.id);
    expect(sheet.readingCount).toBe(1);
    expect(listed.readingCount).toBe(1);
    expect(r.history).toHaveLength(1);
    expect(r.history[0]).toMatchObject({ id: first.body.id, supersededById: fix.body.id, values: [1.125, 1.1247] });
    expect((await a.post(`/api/readings/${first.body.id}/supersede`, { reason: "Second try at the old one", values: [1.125, 1.1248], toolAssetTags: [mic.assetTag] })).body.error.code).toBe("reading_superseded");
  });

  it("mechanics saving at once: one reading holds a place however many arrive together; different places are all saved (common practice, no source)", async () => {
    const { job, mic, tel } = await pinSheet();
    const a = await t.agent("mechanic");
    const same = await Promise.all(Array.from({ length: 8 }, (_, i) => a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.1240 + i / 10000], toolAssetTags: [mic.assetTag] })));
    expect(same.map((r) => r.status).sort()).toEqual([201, 409, 409, 409, 409, 409, 409, 409]);
    expect(same.filter((r) => r.status === 409).every((r) => r.body.error.code === "reading_exists")).toBe(true);
    const fixes = await Promise.all(Array.from({ length: 6 }, (_, i) => a.post(`/api/readings/${same.find((r) => r.status === 201)!.body.id}/supersede`, { reason: `Measured again (${i})`, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] })));
    expect(fixes.map((r) => r.status).sort()).toEqual([201, 409, 409, 409, 409, 409]);
    const pins = (await readingsOf(job.id)).filter((r) => r.itemKey === "pin" && r.index === 1);
    expect(pins).toHaveLength(2);
    const both = await Promise.all([
      a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] }),
      a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 2, values: [1.127, 1.1272], toolAssetTags: [tel.assetTag, mic.assetTag] }),
    ]);
    expect(both.map((r) => r.status)).toEqual([201, 201]);
  });

  /**
   * Holds the sheet's row as a sign-off does (FOR UPDATE) in a transaction of its own, runs `meanwhile` in it, sends
   * `post` (whose reads see none of it yet), waits until the post's write waits for the sheet, then commits.
   */
  async function aheadOfTheWrite(jobId: string, meanwhile: (q: (text: string, values: unknown[]) => Promise<unknown>) => Promise<void>, post: () => PromiseLike<any>) {
    const other = await t.pool.connect();
    try {
      await other.query("begin");
      await other.query("select id from jobs where id = $1 for update", [jobId]);
      await meanwhile((text, values) => other.query(text, values));
      const answer = Promise.resolve(post());
      for (let i = 0; i < 500; i++) {
        const waiting = await t.pool.query("select count(*)::int as n from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock'");
        if (waiting.rows[0].n > 0) break;
        await new Promise((r) => setTimeout(r, 10));
      }
      await other.query("commit");
      return await answer;
    } finally {
      other.release();
    }
  }

  it("a reading that reaches its place just after another one is refused, not stored beside it: the write looks at the place again once it holds it (common practice, no source)", async () => {
    const { job, mic } = await pinSheet();
    const a = await t.agent("mechanic");
    let otherId = "";
    const res = await aheadOfTheWrite(
      job.id,
      async (q) => {
        const r = (await q(
          `insert into readings (job_id, item_key, index, values, unit, size, out_of_round, verdict, taken_by, taken_at) values ($1, 'pin', 1, '["1.1250","1.1248"]', 'in', '1.1248', '0.0002', 'within_limits', $2, now()) returning id`,
          [job.id, t.people.mechanic.id],
        )) as { rows: { id: string }[] };
        otherId = r.rows[0].id;
      },
      () => a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] }),
    );
    expect(res.status, JSON.stringify(res.body)).toBe(409);
    expect(res.body.error.code).toBe("reading_exists");
    expect(res.body.error.details).toMatchObject({ readingId: otherId });
    expect((await readingsOf(job.id)).filter((r) => r.itemKey === "pin" && r.index === 1).map((r) => r.id)).toEqual([otherId]);
  });

  it("a reading sent while an inspector signs the sheet is refused once the sign-off is in, and the signed sheet stays as signed (common practice, no source)", async () => {
    const { job, mic } = await pinSheet();
    const a = await t.agent("mechanic");
    const res = await aheadOfTheWrite(
      job.id,
      async (q) => {
        await q("insert into job_signoffs (job_id, inspector_id, certificate_number, signed_at) values ($1, $2, 'IA-TEST-1', now())", [job.id, t.people.inspector.id]);
      },
      () => a.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] }),
    );
    expect(res.status, JSON.stringify(res.body)).toBe(409);
    expect(res.body.error.code).toBe("sheet_signed");
    expect(await readingsOf(job.id)).toHaveLength(0);
    expect((await a.get(`/api/jobs/${job.id}`)).body).toMatchObject({ status: "signed", locked: true });
  });

  it("part temperature and material give a correction to 20 °C beside the raw size, never replacing it (ISO 1; JCGM 100 H.1)", async () => {
    const table = await makeLimitTable(t.db, { unit: "mm", items: [{ key: "journal", label: "Aluminium journal", kind: "journal", min: 49.9, max: 50.1 }] });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const mic = await makeToolInCalibration(t.db, { unit: "mm", rangeMin: "25", rangeMax: "50", ownerUserId: t.people.mechanic.id });
    const a = await t.agent("mechanic");
    const res = await a.post(`/api/jobs/${job.id}/readings`, { itemKey: "journal", values: [50, 50], toolAssetTags: [mic.assetTag], temperatureC: 25, partMaterial: "aluminium_7075" });
    expect(res.body.size).toBe(50);
    const sheetRow = row((await a.get(`/api/jobs/${job.id}`)).body, "journal");
    // 7075 journal 50 mm read with a steel micrometer at 25 °C reads 2.975 µm large (reference-values.md, JCGM 100:2008 H.1).
    expect(sheetRow.reading.size).toBe(50);
    expect(sheetRow.place.thermal).toMatchObject({ correction: -0.002975, source: "reading", material: "aluminium_7075" });
    expect(sheetRow.place).toMatchObject({ rawSize: 50, size: 49.997025 });
    // The judged place is sent once, on the row: the reading beside it does not carry a second copy.
    expect(sheetRow.reading).not.toHaveProperty("place");
  });
});

describe("sign-off", () => {
  it("an inspector cannot sign while items are missing, signs a complete sheet with a certificate number, and the signed sheet is locked", async () => {
    const { job, mic, tel } = await pinSheet();
    const m = await t.agent("mechanic");
    const i = await t.agent("inspector");
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    const early = await i.post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-TEST-1" });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe("sheet_incomplete");
    const pin2 = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.1249, 1.1248], toolAssetTags: [mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 1, values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 2, values: [1.127, 1.1272], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect((await i.post(`/api/jobs/${job.id}/sign`, {})).status).toBe(400);
    const signed = await i.post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-TEST-1", note: "Pins and bores within limits" });
    expect(signed.status).toBe(200);
    expect(signed.body).toMatchObject({ status: "signed", locked: true });
    expect(signed.body.signoffs[0]).toMatchObject({ certificateNumber: "IA-TEST-1", inspector: { name: "Test inspector" } });

    const late = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.125], toolAssetTags: [mic.assetTag] });
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe("sheet_signed");
    expect((await i.post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-TEST-1" })).body.error.code).toBe("sheet_signed");

    // A correction with a reason is still possible; the sheet then needs signing again.
    t.clock.set("2026-06-15T16:00:00Z");
    const fix = await m.post(`/api/readings/${pin2.body.id}/supersede`, { reason: "Wrong pin measured", values: [1.1249, 1.1249], toolAssetTags: [mic.assetTag] });
    expect(fix.status).toBe(201);
    const after = (await i.get(`/api/jobs/${job.id}`)).body;
    expect(after).toMatchObject({ status: "open", locked: false, changedSinceSignoff: true });
    t.clock.set("2026-06-15T15:00:00Z");
  });

  it("the sign-off form fills in the inspector's own certificate number, and the server refuses a number that is not hers", async () => {
    const { job, mic, tel } = await pinSheet();
    const m = await t.agent("mechanic");
    for (const index of [1, 2]) {
      await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
      await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index, values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    }
    const i = await t.agent("inspector");
    expect((await i.get("/api/me/inspector-certificate")).body).toEqual({ name: "Test inspector", certificateNumber: "IA-TEST-1" });
    const other = await i.post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-OTHER-2" });
    expect(other.status).toBe(409);
    expect(other.body.error.code).toBe("certificate_not_yours");
    expect(other.body.error.message).toContain("IA-OTHER-2");
    expect((await i.get(`/api/jobs/${job.id}`)).body).toMatchObject({ status: "open", signoffs: [] });
    // An admin with no number on record cannot sign at all.
    const noNumber = await (await t.agent("admin")).post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-TEST-1" });
    expect(noNumber.status).toBe(409);
    expect(noNumber.body.error.code).toBe("certificate_not_on_record");
    expect((await (await t.agent("admin")).get("/api/me/inspector-certificate")).body.certificateNumber).toBeNull();
    // Her own number as she might type it (spaces, lower case) signs, recorded as on her record.
    const ok = await i.post(`/api/jobs/${job.id}/sign`, { certificateNumber: " ia-test-1 " });
    expect(ok.status).toBe(200);
    expect(ok.body.signoffs[0].certificateNumber).toBe("IA-TEST-1");
  });

  it("the PDF check sheet names every tool used, with due dates, who measured, who signed, and the cautions", async () => {
    const { job, mic, tel } = await pinSheet();
    const m = await t.agent("mechanic");
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 1, values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.1249, 1.1248], toolAssetTags: [mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 1, values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 2, values: [1.127, 1.1272], toolAssetTags: [tel.assetTag, mic.assetTag] });
    await (await t.agent("inspector")).post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-TEST-1" });
    const a = await t.agent("auditor");
    const res = await a.raw.get(`/api/jobs/${job.id}/check-sheet.pdf`).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on("data", (c: Buffer) => parts.push(c));
      r.on("end", () => cb(null, Buffer.concat(parts)));
    });
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    // pdf-parse ships no types; its lib entry avoids the package's debug self-test.
    const pdfParse = (await import("pdf-parse/lib/pdf-parse.js" as string)).default as (b: Buffer) => Promise<{ text: string }>;
    const text = (await pdfParse(res.body as Buffer)).text.replace(/\s+/g, " ");
    expect(text).toContain(mic.assetTag);
    expect(text).toContain(tel.assetTag);
    expect(text).toContain("due 2027-04-30");
    expect(text).toContain("Test mechanic");
    expect(text).toContain("IA-TEST-1");
    expect(text).toContain("0.0026 loose");
    expect(text).toContain("DEMO DATA");
    expect(text).toContain("appropriately certificated persons");
  });
});

describe("limits tables", () => {
  const base = { name: "Valve train", engineModel: "Test flat-four (invented)", unit: "in", sourceDocument: "Invented manual", sourceRevision: "A" };

  it("quality builds a table; limits keep their exact decimals", async () => {
    const q = await t.agent("quality");
    const res = await q.post("/api/limit-tables", { ...base, items: pinAndBoreItems });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ version: 1, supersedesId: null, itemCount: 3 });
    const clearance = res.body.items.find((i: { key: string }) => i.key === "pin_clearance");
    expect(clearance).toMatchObject({ min: 0.001, max: 0.0045, serviceableMax: 0.005, boreKey: "pin_bore", journalKey: "pin" });
    expect(res.body.items[0].directions).toBe(2);
    const got = await (await t.agent("mechanic")).get(`/api/limit-tables/${res.body.id}`);
    expect(got.body.items).toHaveLength(3);
  });

  it("bad items are refused whole: duplicate keys, a clearance naming a missing bore, min above max, zero directions or repeats", async () => {
    const q = await t.agent("quality");
    const cases = [
      [pinAndBoreItems[0], pinAndBoreItems[0]],
      [pinAndBoreItems[0], { ...pinAndBoreItems[2], boreKey: "no_such_bore" }],
      [{ ...pinAndBoreItems[0], min: 1.126, max: 1.125 }],
      [{ ...pinAndBoreItems[0], directions: 0 }],
      [{ ...pinAndBoreItems[0], repeat: 0 }],
    ];
    const before = (await q.get("/api/limit-tables?pageSize=500")).body.total;
    for (const items of cases) {
      const res = await q.post("/api/limit-tables", { ...base, items });
      expect(res.status, JSON.stringify(items)).toBe(400);
    }
    expect((await q.get("/api/limit-tables?pageSize=500")).body.total).toBe(before);
  });

  it("a revision is a new version; a job opened on the old one keeps it, and the old one cannot be revised twice", async () => {
    const q = await t.agent("quality");
    const v1 = (await q.post("/api/limit-tables", { ...base, name: "Revised table", items: pinAndBoreItems })).body;
    const job = await (await t.agent("mechanic")).post("/api/jobs", { limitTableId: v1.id, engineSerial: "HX-REV-1", workOrder: "WO-1" });
    expect(job.status).toBe(201);
    expect(job.body).toMatchObject({ limitTableId: v1.id, engineModel: base.engineModel, status: "open" });
    const v2 = await q.post(`/api/limit-tables/${v1.id}/revisions`, { ...base, name: "Revised table", sourceRevision: "B", items: pinAndBoreItems.map((i) => (i.key === "pin_clearance" ? { ...i, max: 0.004 } : i)) });
    expect(v2.status).toBe(201);
    expect(v2.body).toMatchObject({ version: 2, supersedesId: v1.id, sourceRevision: "B" });
    expect((await q.get(`/api/limit-tables/${v1.id}`)).body.supersededById).toBe(v2.body.id);
    const sheet = (await q.get(`/api/jobs/${job.body.id}`)).body;
    expect(sheet.limitTable).toMatchObject({ id: v1.id, version: 1, supersededById: v2.body.id });
    expect(sheet.items.find((i: { key: string }) => i.key === "pin_clearance").max).toBe(0.0045);
    const again = await q.post(`/api/limit-tables/${v1.id}/revisions`, { ...base, items: pinAndBoreItems });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("table_superseded");
    const current = (await q.get(`/api/limit-tables?current=true&q=Revised`)).body;
    expect(current.items.map((x: { id: string }) => x.id)).toEqual([v2.body.id]);
  });
});

describe("jobs list", () => {
  it("lists jobs paged, filtered by engine serial, status and mine", async () => {
    const table = await makeLimitTable(t.db, { items: [{ key: "visual", label: "Cylinder barrel visual", kind: "visual" }] });
    const m = await t.agent("mechanic");
    const j1 = (await m.post("/api/jobs", { limitTableId: table.id, engineSerial: "LIST-0001" })).body;
    const j2 = (await (await t.agent("quality")).post("/api/jobs", { limitTableId: table.id, engineSerial: "LIST-0002" })).body;
    const visual = await m.post(`/api/jobs/${j1.id}/readings`, { itemKey: "visual", visualResult: "serviceable" });
    expect(visual.status).toBe(201);
    const reject = await m.post(`/api/jobs/${j2.id}/readings`, { itemKey: "visual", visualResult: "reject" });
    expect(reject.status).toBe(400);
    await (await t.agent("inspector")).post(`/api/jobs/${j1.id}/sign`, { certificateNumber: "IA-TEST-1" });
    const bySerial = (await m.get("/api/jobs?engineSerial=LIST-&pageSize=1")).body;
    expect(bySerial.total).toBe(2);
    expect(bySerial.items).toHaveLength(1);
    const signed = (await m.get("/api/jobs?engineSerial=LIST-&status=signed")).body;
    expect(signed.items.map((j: { engineSerial: string }) => j.engineSerial)).toEqual(["LIST-0001"]);
    const open = (await m.get("/api/jobs?engineSerial=LIST-&status=open")).body;
    expect(open.items.map((j: { engineSerial: string }) => j.engineSerial)).toEqual(["LIST-0002"]);
    const mine = (await m.get("/api/jobs?engineSerial=LIST-&mine=true")).body;
    expect(mine.items.map((j: { engineSerial: string }) => j.engineSerial)).toEqual(["LIST-0001"]);
    expect((await m.post("/api/jobs", { limitTableId: "00000000-0000-4000-8000-000000000000", engineSerial: "X" })).status).toBe(404);
  });
});

describe("who may do what", () => {
  let ctx: { tableId: string; jobId: string; readingId: string; micTag: string };
  beforeAll(async () => {
    const table = await makeLimitTable(t.db, { items: pinAndBoreItems });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const mic = await makeToolInCalibration(t.db);
    const r = await (await t.agent("mechanic")).post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    ctx = { tableId: table.id, jobId: job.id, readingId: r.body.id, micTag: mic.assetTag };
  });
  const tableBody = { name: "Matrix", engineModel: "M", unit: "in", sourceDocument: "D", sourceRevision: "A", items: pinAndBoreItems };
  const all = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
  roleMatrix(() => t, [
    { method: "get", path: "/api/limit-tables", allowed: all },
    { method: "post", path: "/api/limit-tables", body: tableBody, allowed: ["quality", "admin"] },
    { method: "get", path: () => `/api/limit-tables/${ctx.tableId}`, label: "/api/limit-tables/:id", allowed: all },
    { method: "post", path: () => `/api/limit-tables/${ctx.tableId}/revisions`, label: "/api/limit-tables/:id/revisions", body: tableBody, allowed: ["quality", "admin"] },
    { method: "get", path: "/api/jobs", allowed: all },
    { method: "post", path: "/api/jobs", body: () => ({ limitTableId: ctx.tableId, engineSerial: "MATRIX-1" }), allowed: ["quality", "inspector", "admin", "mechanic"] },
    { method: "get", path: () => `/api/jobs/${ctx.jobId}`, label: "/api/jobs/:id", allowed: all },
    { method: "get", path: () => `/api/jobs/${ctx.jobId}/check-sheet.pdf`, label: "/api/jobs/:id/check-sheet.pdf", allowed: all },
    { method: "get", path: () => `/api/jobs/${ctx.jobId}/feeler-leaves?itemKey=pin&setTag=X`, label: "/api/jobs/:id/feeler-leaves", allowed: all },
    // Auditors and crib attendants record no readings.
    { method: "post", path: () => `/api/jobs/${ctx.jobId}/readings`, label: "/api/jobs/:id/readings", body: () => ({ itemKey: "pin", index: 2, values: [1.125, 1.125], toolAssetTags: [ctx.micTag] }), allowed: ["mechanic", "quality", "admin"] },
    { method: "post", path: () => `/api/readings/${ctx.readingId}/supersede`, label: "/api/readings/:id/supersede", body: () => ({ reason: "matrix check", values: [1.125, 1.125], toolAssetTags: [ctx.micTag] }), allowed: ["mechanic", "quality", "admin"] },
    { method: "post", path: () => `/api/jobs/${ctx.jobId}/sign`, label: "/api/jobs/:id/sign", body: { certificateNumber: "IA-1" }, allowed: ["inspector", "admin"] },
    { method: "get", path: "/api/me/inspector-certificate", allowed: ["inspector", "admin"] },
  ]);
});
