import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray, sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeTool } from "../support/factories";
import { makeExactCalibration, makeJob, makeLimitTable, makeReading, VALVE_SCENARIO } from "../support/factories-investigations";
import { onOutOfToleranceFinding, type Finding } from "../../server/modules/investigations/investigations.hooks";
import { dispositions, limitItems, readingTools, readings } from "../../server/db/schema";
import { evidenceOfRows } from "../../server/modules/readings/reading-evidence";
import { toItemView } from "../../server/modules/limit-tables/limit-tables.service";
import { rejudgeAffectedReading, type ReviewedReading } from "../../shared/investigations/affected-reading";
import { sizeFromValues } from "../../shared/inspection/sizes";

// Demo limits (invented, common practice for the arithmetic): stem 0.4335–0.4340 in, guide 0.4355–0.4370 in,
// stem-to-guide clearance 0.0015–0.0035 in, rocker pin 0.1000–0.1010 in; eight valves a sheet. The micrometer's
// as-found error (+0.0003 in at 0.500 in) is invented; the re-judging it feeds is checked against the shared
// computation (shared/investigations/affected-reading.ts), the same one the check sheet's judging uses.

const { now: NOW, goodCal: GOOD_CAL, findingAt: FINDING_AT, valves: VALVES, stems, guides } = VALVE_SCENARIO;
const SHEETS = 12;

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: NOW });
});
afterAll(async () => t?.close());

async function find(finding: Finding) {
  const out = await t.db.transaction((tx) => onOutOfToleranceFinding(tx, { clock: t.clock, mailer: t.mailer, timeZone: "America/Chicago" }, finding));
  return out!.investigationId;
}

async function failingMicrometer(tag: string) {
  const tool = await makeTool(t.db, { assetTag: tag });
  await makeExactCalibration(t.db, tool.id, { performedAt: GOOD_CAL, points: [{ nominal: "0.105", asFound: "0.1050" }, { nominal: "0.500", asFound: "0.5000" }, { nominal: "1.000", asFound: "1.0000" }] });
  const bad = await makeExactCalibration(t.db, tool.id, {
    performedAt: FINDING_AT,
    points: [
      { nominal: "0.105", asFound: "0.1050", asLeft: "0.1050" },
      { nominal: "0.500", asFound: "0.5003", asLeft: "0.5000", uncertainty: "0.00002" },
      { nominal: "1.000", asFound: "0.9999", asLeft: "1.0000" },
    ],
  });
  return { tool, bad };
}

/** Every affected item of an investigation, page by page. */
async function allItems(id: string, query = "") {
  const a = await t.agent("auditor");
  const out: any[] = [];
  for (let page = 1; ; page++) {
    const res = await a.get(`/api/investigations/${id}/items?page=${page}&pageSize=100${query}`);
    expect(res.status).toBe(200);
    out.push(...res.body.items);
    if (res.body.items.length === 0 || out.length >= res.body.total) return out;
  }
}

/**
 * Twelve check sheets of eight valves each, measured with the failing micrometer and a second tool in turn: the
 * stems, the guides of every other valve, and a rocker pin; a few stems corrected (the first reading superseded).
 * Inserted in bulk, as the sheets would have stored them.
 */
async function manySheets() {
  const { tool, bad } = await failingMicrometer("MIC-BULK-1");
  const other = await makeTool(t.db, { assetTag: "SHG-BULK-1" });
  const { table } = await makeLimitTable(t.db, [
    { key: "stem", label: "Exhaust valve stem", kind: "journal", min: "0.4335", max: "0.4340", repeat: VALVES },
    { key: "guide", label: "Exhaust valve guide", kind: "bore", min: "0.4355", max: "0.4370", repeat: VALVES },
    { key: "stem_clearance", label: "Stem to guide clearance", kind: "clearance", min: "0.0015", max: "0.0035", boreKey: "guide", journalKey: "stem", repeat: VALVES },
    { key: "pin", label: "Rocker pin", kind: "journal", min: "0.1000", max: "0.1010" },
  ]);
  const jobs: Awaited<ReturnType<typeof makeJob>>[] = [];
  for (let j = 0; j < SHEETS; j++) jobs.push(await makeJob(t.db, table.id, { engineSerial: `HF-BULK-${String(j + 1).padStart(2, "0")}` }));
  type Row = typeof readings.$inferInsert & { tools: string[] };
  const rows: Row[] = [];
  const base = new Date("2026-02-01T15:00:00Z").getTime();
  jobs.forEach((job, j) => {
    for (let v = 1; v <= VALVES; v++) {
      const at = (m: number) => new Date(base + j * 86_400_000 + v * 600_000 + m * 1000);
      const stem = stems[(v + j) % VALVES];
      const guide = guides[(v * 3 + j) % VALVES];
      const verdict = (value: string, min: string, max: string) => (Number(value) >= Number(min) && Number(value) <= Number(max) ? "within_limits" : "outside_limits");
      rows.push({ jobId: job.id, itemKey: "stem", index: v, values: [stem, stem], unit: "in", size: String(sizeFromValues("journal", [stem, stem]).size), verdict: verdict(stem, "0.4335", "0.4340"), flags: [], takenAt: at(0), tools: [tool.id] });
      rows.push({ jobId: job.id, itemKey: "guide", index: v, values: [guide, guide], unit: "in", size: String(sizeFromValues("bore", [guide, guide]).size), verdict: verdict(guide, "0.4355", "0.4370"), flags: [], takenAt: at(30), tools: v % 2 ? [tool.id] : [other.id] });
    }
    rows.push({ jobId: job.id, itemKey: "pin", index: 1, values: ["0.1002", "0.1002"], unit: "in", size: "0.1002", verdict: "within_limits", flags: [], takenAt: new Date(base + j * 86_400_000 + 7_200_000), tools: [tool.id] });
  });
  const inserted = await t.db.insert(readings).values(rows.map(({ tools: _t, ...r }) => r)).returning();
  await t.db.insert(readingTools).values(inserted.flatMap((r, i) => rows[i].tools.map((toolId, p) => ({ readingId: r.id, toolId, position: p + 1, statusAtReading: "in_calibration" as const, takenAt: r.takenAt }))));
  // Valve 1 of the first three sheets was read again as a correction: the first reading is out, its correction in.
  const corrected = [];
  for (let j = 0; j < 3; j++) {
    const first = inserted.find((r) => r.jobId === jobs[j].id && r.itemKey === "stem" && r.index === 1)!;
    corrected.push(first.id);
    await makeReading(t.db, { jobId: jobs[j].id, itemKey: "stem", index: 1, kind: "journal", values: ["0.4338", "0.4338"], takenAt: new Date(first.takenAt.getTime() + 60_000), toolIds: [tool.id], supersedesId: first.id });
  }
  const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: t.people.quality.id });
  return { tool, other, table, jobs, id, corrected };
}

let bulk: Awaited<ReturnType<typeof manySheets>>;

describe("opening an investigation on a tool with many readings", () => {
  beforeAll(async () => {
    bulk = await manySheets();
  });

  it("every reading the tool took in the window is re-judged exactly as the shared computation judges it, sheet by sheet", async () => {
    const items = await allItems(bulk.id);
    // Stems (eight a sheet, one corrected on three sheets: the correction replaces the first), the odd guides, the pin.
    expect(items).toHaveLength(SHEETS * (VALVES + VALVES / 2 + 1));
    const ids = items.map((i) => i.readingId);
    for (const c of bulk.corrected) expect(ids).not.toContain(c);

    // The expected answer, computed the plain way: each reading with the other current readings of its sheet and valve.
    const itemRows = (await t.db.select().from(limitItems).where(eq(limitItems.limitTableId, bulk.table.id))).sort((a, b) => a.seq - b.seq).map(toItemView);
    const current = await t.db
      .select()
      .from(readings)
      .where(and(inArray(readings.jobId, bulk.jobs.map((j) => j.id)), sql`not exists (select 1 from readings s where s.supersedes_id = ${readings.id})`));
    const toolRows = await t.db.select().from(readingTools).where(inArray(readingTools.readingId, current.map((r) => r.id)));
    const evidence = await evidenceOfRows(t.db, current, "in");
    const reviewed = (r: (typeof current)[number]): ReviewedReading => ({ ...evidence.get(r.id)!, id: r.id, toolIds: toolRows.filter((x) => x.readingId === r.id).map((x) => x.toolId), recordedVerdict: r.verdict });
    let couldChange = 0;
    for (const item of items) {
      const r = current.find((x) => x.id === item.readingId)!;
      const expected = rejudgeAffectedReading({
        reading: reviewed(r),
        toolId: bulk.tool.id,
        errors: { unit: "in", points: [{ nominal: 0.105, error: 0, uncertainty: null }, { nominal: 0.5, error: 0.0003, uncertainty: 0.00002 }, { nominal: 1, error: -0.0001, uncertainty: null }], range: { min: 0, max: 1 } },
        siblings: current.filter((x) => x.jobId === r.jobId && x.index === r.index && x.id !== r.id).map(reviewed),
        items: itemRows,
        ctx: { tableUnit: "in", tableExpansionPerK: null },
        label: (it, index) => `${it.label}${it.repeat > 1 ? ` no. ${index}` : ""}`,
      });
      expect({ couldChange: item.verdictCouldChange, basis: item.basis, before: item.marginBefore, after: item.marginAfter, likely: item.correctedValue, low: item.bandLow, high: item.bandHigh, places: item.places }).toEqual({
        couldChange: expected.verdictCouldChange,
        basis: expected.basis,
        before: expected.marginBefore,
        after: expected.marginAfter,
        likely: expected.correctedValue,
        low: expected.bandLow,
        high: expected.bandHigh,
        places: expected.places,
      });
      if (expected.verdictCouldChange) couldChange++;
    }
    // Both kinds are present, so the comparison covers a verdict that holds and one that could change.
    expect(couldChange).toBeGreaterThan(0);
    expect(couldChange).toBeLessThan(items.length);
  });

  it("the investigation page answers its finding and totals without the items; the items come a page at a time, could-change first, then by sheet and time", async () => {
    const a = await t.agent("auditor");
    const detail = await a.get(`/api/investigations/${bulk.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.items).toBeUndefined();
    expect(detail.body.affectedReadings).toBeUndefined();
    const totals = detail.body.totals;
    expect(totals.items).toBe(SHEETS * (VALVES + VALVES / 2 + 1));
    expect(totals.couldChange + totals.holds).toBe(totals.items);
    expect(totals.byVerdict.within_limits + totals.byVerdict.outside_limits + totals.byVerdict.pending).toBe(totals.readings);
    expect(totals.undisposed).toBe(totals.items);
    expect(detail.body.jobs.map((j: { engineSerial: string }) => j.engineSerial)).toEqual(bulk.jobs.map((j) => j.engineSerial));

    const page1 = await a.get(`/api/investigations/${bulk.id}/items?pageSize=25`);
    expect(page1.body.items).toHaveLength(25);
    expect(page1.body.total).toBe(totals.items);
    const all = await allItems(bulk.id);
    const firstHold = all.findIndex((i) => !i.verdictCouldChange);
    expect(firstHold).toBe(totals.couldChange);
    expect(all.slice(firstHold).every((i) => !i.verdictCouldChange)).toBe(true);
    // Within each group: by sheet, then by time.
    for (const group of [all.slice(0, firstHold), all.slice(firstHold)]) {
      const keys = group.map((i) => `${i.job.engineSerial} ${i.takenAt}`);
      expect(keys).toEqual([...keys].sort());
    }
    // Pages do not overlap and cover everything.
    expect(new Set(all.map((i) => i.id)).size).toBe(totals.items);
  });

  it("filters by re-judged verdict, recorded verdict, sheet and text, with totals over the filter, and sorts by a column either way", async () => {
    const a = await t.agent("auditor");
    const totals = (await a.get(`/api/investigations/${bulk.id}`)).body.totals;
    const holds = await a.get(`/api/investigations/${bulk.id}/items?couldChange=false&pageSize=500`);
    expect(holds.body.total).toBe(totals.holds);
    expect(holds.body.items.every((i: { verdictCouldChange: boolean }) => !i.verdictCouldChange)).toBe(true);
    expect(holds.body.totals.couldChange).toBe(0);

    const outside = await a.get(`/api/investigations/${bulk.id}/items?verdict=outside_limits&pageSize=500`);
    expect(outside.body.total).toBe(totals.byVerdict.outside_limits);
    expect(outside.body.items.every((i: { originalVerdict: string }) => i.originalVerdict === "outside_limits")).toBe(true);

    const sheet = bulk.jobs[4];
    const ofSheet = await a.get(`/api/investigations/${bulk.id}/items?jobId=${sheet.id}&pageSize=500`);
    expect(ofSheet.body.total).toBe(VALVES + VALVES / 2 + 1);
    expect(ofSheet.body.items.every((i: { job: { id: string } }) => i.job.id === sheet.id)).toBe(true);
    const bySerial = await a.get(`/api/investigations/${bulk.id}/items?q=${sheet.engineSerial}&pageSize=500`);
    expect(bySerial.body.items.map((i: { id: string }) => i.id).sort()).toEqual(ofSheet.body.items.map((i: { id: string }) => i.id).sort());
    const pins = await a.get(`/api/investigations/${bulk.id}/items?q=rocker&pageSize=500`);
    expect(pins.body.total).toBe(SHEETS);

    const newest = await a.get(`/api/investigations/${bulk.id}/items?sort=-takenAt&pageSize=500`);
    const times = newest.body.items.map((i: { takenAt: string }) => i.takenAt);
    expect(times).toEqual([...times].sort().reverse());
    const byTool = await a.get(`/api/investigations/${bulk.id}/items?sort=tool&pageSize=500`);
    expect(byTool.body.items.every((i: { toolAssetTag: string }) => i.toolAssetTag === "MIC-BULK-1")).toBe(true);
    const worst = await a.get(`/api/investigations/${bulk.id}/items?sort=margin&pageSize=500`);
    const margins = worst.body.items.map((i: { marginAfter: number | null }) => i.marginAfter).filter((m: number | null) => m != null);
    expect(margins).toEqual([...margins].sort((x: number, y: number) => x - y));

    expect((await a.get(`/api/investigations/${bulk.id}/items?sort=weight`)).status).toBe(400);
    expect((await a.get(`/api/investigations/${bulk.id}/items?verdict=maybe`)).status).toBe(400);
    expect((await a.get(`/api/investigations/${bulk.id}/items?pageSize=501`)).status).toBe(400);
    expect((await a.get(`/api/investigations/00000000-0000-4000-8000-000000000000/items`)).status).toBe(404);
    const beyond = await a.get(`/api/investigations/${bulk.id}/items?page=99&pageSize=100`);
    expect(beyond.body.items).toEqual([]);
    expect(beyond.body.total).toBe(totals.items);
  });
});

describe("one disposition for the selected rows", () => {
  it("quality records one disposition for the rows selected, all of them in one answer, audited with every item", async () => {
    const q = await t.agent("quality");
    // Thirty rows across the sheets (every third of the table), as a quality manager ticks them.
    const page = (await allItems(bulk.id)).filter((_, i) => i % 3 === 0).slice(0, 30);
    const ids = page.map((i: { id: string }) => i.id);
    const res = await q.post(`/api/investigations/${bulk.id}/dispositions`, { itemIds: ids, kind: "no_impact", rationale: "Parts replaced at reassembly; the readings decide nothing now." });
    expect(res.status).toBe(201);
    expect(res.body.dispositions).toHaveLength(30);
    const after = await q.get(`/api/investigations/${bulk.id}/items?disposition=no_impact&pageSize=500`);
    expect(after.body.items.map((i: { id: string }) => i.id).sort()).toEqual([...ids].sort());
    expect(after.body.items.every((i: { disposition: { kind: string; decidedBy: { name: string } } }) => i.disposition.kind === "no_impact" && i.disposition.decidedBy.name === t.people.quality.name)).toBe(true);
    const audit = await t.db.query.auditEvents.findMany({ where: (e, { and, eq }) => and(eq(e.action, "investigation.disposition"), eq(e.entityId, bulk.id)) });
    expect((audit.at(-1)!.after as { itemIds: string[] }).itemIds.sort()).toEqual([...ids].sort());
    expect((await q.get(`/api/investigations/${bulk.id}`)).body.totals.undisposed).toBe(SHEETS * (VALVES + VALVES / 2 + 1) - 30);
  });

  it("one bad row refuses the whole selection: nothing is recorded", async () => {
    const q = await t.agent("quality");
    const before = (await t.db.select().from(dispositions)).length;
    const ids = (await q.get(`/api/investigations/${bulk.id}/items?disposition=none&pageSize=10`)).body.items.map((i: { id: string }) => i.id);
    const res = await q.post(`/api/investigations/${bulk.id}/dispositions`, { itemIds: [...ids, "00000000-0000-4000-8000-00000000000a"], kind: "recall", rationale: "Recall the lot." });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("items_not_in_investigation");
    expect(res.body.error.details.itemIds).toEqual(["00000000-0000-4000-8000-00000000000a"]);
    // A remeasurement answers one reading; a selection cannot be "remeasured" at once.
    const many = await q.post(`/api/investigations/${bulk.id}/dispositions`, { itemIds: ids, kind: "remeasure", rationale: "Remeasured", remeasureReadingId: "00000000-0000-4000-8000-00000000000b" });
    expect(many.status).toBe(400);
    const notified = await q.post(`/api/investigations/${bulk.id}/dispositions`, { itemIds: ids, kind: "notify_owner", rationale: "Owner told." });
    expect(notified.status).toBe(400);
    expect((await t.db.select().from(dispositions)).length).toBe(before);
  });

  it("mechanics, the crib and auditors may not record one for a selection; inspectors may", async () => {
    const ids = (await (await t.agent("auditor")).get(`/api/investigations/${bulk.id}/items?disposition=none&pageSize=5`)).body.items.map((i: { id: string }) => i.id);
    const before = (await t.db.select().from(dispositions)).length;
    for (const role of ["mechanic", "crib", "auditor"] as const) {
      const res = await (await t.agent(role)).post(`/api/investigations/${bulk.id}/dispositions`, { itemIds: ids, kind: "no_impact", rationale: "Fine." });
      expect(res.status, role).toBe(403);
    }
    expect((await t.db.select().from(dispositions)).length).toBe(before);
    const res = await (await t.agent("inspector")).post(`/api/investigations/${bulk.id}/dispositions`, { itemIds: ids, kind: "recall", rationale: "Cylinders recalled for remeasurement." });
    expect(res.status).toBe(201);
    expect(res.body.dispositions).toHaveLength(5);
  });
});

describe("changing a disposition and picking the remeasurement", () => {
  async function smallInvestigation() {
    const { tool, bad } = await failingMicrometer(`MIC-CHG-${Math.random().toString(36).slice(2, 6).toUpperCase()}`);
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const otherJob = await makeJob(t.db, table.id);
    const pin = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1002", "0.1002"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id], takenBy: t.people.mechanic.id });
    const earlier = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4337", "0.4337"], takenAt: "2026-02-01T15:00:00Z", toolIds: [] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const items = await allItems(id);
    const pinItem = items.find((i) => i.readingId === pin.id)!;
    return { tool, table, job, otherJob, pin, earlier, id, pinItem };
  }

  it("the remeasurement is picked from the later readings of the same place on the same sheet, newest first", async () => {
    const o = await smallInvestigation();
    const other = await makeTool(t.db, { assetTag: `MIC-OK-${Math.random().toString(36).slice(2, 6).toUpperCase()}` });
    const before = await makeReading(t.db, { jobId: o.job.id, itemKey: "pin", kind: "journal", values: ["0.1003"], takenAt: "2026-02-20T15:00:00Z", toolIds: [other.id] });
    const later1 = await makeReading(t.db, { jobId: o.job.id, itemKey: "pin", kind: "journal", values: ["0.1004", "0.1004"], takenAt: "2026-06-15T14:40:00Z", toolIds: [other.id], takenBy: t.people.mechanic.id });
    const later2 = await makeReading(t.db, { jobId: o.job.id, itemKey: "pin", kind: "journal", values: ["0.1005"], takenAt: "2026-06-15T14:50:00Z", toolIds: [other.id], supersedesId: o.pin.id });
    const otherPlace = await makeReading(t.db, { jobId: o.job.id, itemKey: "stem", kind: "journal", values: ["0.4337"], takenAt: "2026-06-15T14:45:00Z", toolIds: [other.id] });
    const otherSheet = await makeReading(t.db, { jobId: o.otherJob.id, itemKey: "pin", kind: "journal", values: ["0.1004"], takenAt: "2026-06-15T14:45:00Z", toolIds: [other.id] });

    const q = await t.agent("quality");
    const res = await q.get(`/api/investigations/${o.id}/items/${o.pinItem.id}/remeasure-candidates`);
    expect(res.status).toBe(200);
    expect(res.body.map((c: { id: string }) => c.id)).toEqual([later2.id, later1.id]);
    expect(res.body[0]).toMatchObject({ correctsAffected: true, values: [0.1005], unit: "in", toolAssetTags: [other.assetTag] });
    expect(res.body[1]).toMatchObject({ correctsAffected: false, takenBy: t.people.mechanic.name, verdict: "within_limits" });

    for (const wrong of [before, otherPlace, otherSheet, o.pin]) {
      const refusedRes = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.pinItem.id], kind: "remeasure", rationale: "Remeasured.", remeasureReadingId: wrong.id });
      expect(refusedRes.status).toBe(409);
      expect(refusedRes.body.error.code).toBe("remeasure_not_later_reading");
    }
    const ok = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.pinItem.id], kind: "remeasure", rationale: "Remeasured with a micrometer in calibration: 0.1004 in, within limits.", remeasureReadingId: later1.id });
    expect(ok.status).toBe(201);
    const item = (await allItems(o.id)).find((i) => i.id === o.pinItem.id)!;
    expect(item.disposition).toMatchObject({ kind: "remeasure", remeasureReadingId: later1.id });
  });

  it("a disposition changed from Remeasured back to No impact is saved as a new one superseding it; the remeasured one is kept", async () => {
    const o = await smallInvestigation();
    const later = await makeReading(t.db, { jobId: o.job.id, itemKey: "pin", kind: "journal", values: ["0.1004"], takenAt: "2026-06-15T14:40:00Z", toolIds: [] });
    const q = await t.agent("quality");
    const first = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.pinItem.id], kind: "remeasure", rationale: "Remeasured: 0.1004 in.", remeasureReadingId: later.id });
    expect(first.status).toBe(201);
    // As the form sends it after switching the kind back: the remeasurement field left blank.
    const changed = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.pinItem.id], kind: "no_impact", rationale: "The pin was replaced with a new part; the old reading decides nothing.", remeasureReadingId: "" });
    expect(changed.status).toBe(201);
    expect(changed.body.dispositions[0]).toMatchObject({ kind: "no_impact", supersedesId: first.body.dispositions[0].id, remeasureReadingId: null });

    const item = (await allItems(o.id)).find((i) => i.id === o.pinItem.id)!;
    expect(item.disposition.kind).toBe("no_impact");
    expect(item.dispositions.map((d: { kind: string }) => d.kind)).toEqual(["remeasure", "no_impact"]);
    expect(item.dispositions[0].remeasureReadingId).toBe(later.id);
    expect((await q.get(`/api/investigations/${o.id}/items?disposition=remeasure`)).body.total).toBe(0);
    expect((await q.get(`/api/investigations/${o.id}/items?disposition=no_impact`)).body.total).toBe(1);

    const audit = await t.db.query.auditEvents.findMany({ where: (e, { and, eq }) => and(eq(e.action, "investigation.disposition"), eq(e.entityId, o.id)) });
    const last = audit.sort((a, b) => Number(a.id) - Number(b.id)).find((e) => (e.after as { kind: string }).kind === "no_impact")!;
    expect((last.before as { dispositions: { kind: string }[] }).dispositions[0].kind).toBe("remeasure");

    // The old row is evidence: the database refuses to change it.
    await expect(t.db.update(dispositions).set({ rationale: "edited" }).where(eq(dispositions.id, first.body.dispositions[0].id))).rejects.toThrow();
    // Changing it back to Remeasured is a third row, superseding the second.
    const third = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.pinItem.id], kind: "remeasure", rationale: "Remeasured after all.", remeasureReadingId: later.id });
    expect(third.body.dispositions[0].supersedesId).toBe(changed.body.dispositions[0].id);
  });
});

describe("an affected item keeps the sheet's words and facts as they were recorded", () => {
  it("a place named with quotes, a backslash and a degree sign reads the same on the item; its sheet, place, time and recorded verdict are the reading's", async () => {
    const { tool, bad } = await failingMicrometer("MIC-WORDS-1");
    const label = 'Cam bore "B" \\ 90° side';
    const serial = 'HF-"Q"\\7';
    const { table } = await makeLimitTable(t.db, [{ key: "bore_b", label, kind: "bore", min: "0.4355", max: "0.4370", repeat: 2 }]);
    const job = await makeJob(t.db, table.id, { engineSerial: serial });
    const r = await makeReading(t.db, { jobId: job.id, itemKey: "bore_b", kind: "bore", index: 2, values: ["0.4369", "0.4368"], verdict: "within_limits", takenAt: "2026-03-02T16:30:00Z", toolIds: [tool.id] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });

    const items = await allItems(id);
    expect(items).toHaveLength(1);
    const [item] = items;
    expect(item).toMatchObject({ readingId: r.id, index: 2, takenAt: "2026-03-02T16:30:00.000Z", originalVerdict: "within_limits", job: { id: job.id, engineSerial: serial } });
    expect(item.places[0].label).toBe(`${label} no. 2`);
    expect(item.places[0].text.startsWith(`${label} no. 2: `)).toBe(true);
    expect(item.basis).toContain(`${label} no. 2: `);
    // The sheet's serial, quotes and all, finds the item; the recorded verdict filters it.
    const a = await t.agent("auditor");
    const bySerial = await a.get(`/api/investigations/${id}/items?q=${encodeURIComponent(serial)}`);
    expect(bySerial.body.items.map((i: { id: string }) => i.id)).toEqual([item.id]);
    expect((await a.get(`/api/investigations/${id}/items?verdict=outside_limits`)).body.total).toBe(0);
  });
});
