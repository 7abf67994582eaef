import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { createTestApp, type TestApp, type memoryMailer } from "../support/test-app";
import { makeStandard, makeTool } from "../support/factories";
import { makeExactCalibration, makeCheck, makeJob, makeLimitTable, makeReading, signJob } from "../support/factories-investigations";
import { roleMatrix } from "../support/role-matrix";
import { onOutOfToleranceFinding, suspectReadingIds, type Finding } from "../../server/modules/investigations/investigations.hooks";
import { dispositions, investigations } from "../../server/db/schema";
import { updateSettings } from "../../server/modules/settings/settings.service";
// @ts-expect-error pdf-parse's inner module has no types
import pdfParse from "pdf-parse/lib/pdf-parse.js";

// Demo limits (invented, common practice for the arithmetic): stem 0.4335–0.4340 in, guide 0.4355–0.4370 in,
// stem-to-guide clearance 0.0015–0.0035 in, rocker pin 0.1000–0.1010 in. The micrometer MPE ± 0.0001 in is
// ASME B89.1.13 (secondary source). Clearance = bore − journal; journal size = smallest value, bore size =
// largest value (common practice).

const NOW = "2026-06-15T15:00:00Z";
const GOOD_CAL = "2026-01-10T15:00:00Z";
const FINDING_AT = "2026-06-15T14:00:00Z";
const sec = (iso: string, s: number) => new Date(new Date(iso).getTime() + s * 1000);

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: NOW });
});
afterAll(async () => t?.close());

const mail = () => (t.mailer as ReturnType<typeof memoryMailer>).sent;

/** Calls the hook the way the calibration, check and crib services do: inside their transaction. */
async function find(finding: Finding) {
  const out = await t.db.transaction((tx) => onOutOfToleranceFinding(tx, { clock: t.clock, mailer: t.mailer, timeZone: "America/Chicago" }, finding));
  return out!.investigationId;
}

/** The investigation with every affected item, read page by page as the page and the report read them. */
async function detail(id: string) {
  const a = await t.agent("auditor");
  const res = await a.get(`/api/investigations/${id}`);
  expect(res.status).toBe(200);
  const items: unknown[] = [];
  for (let page = 1; ; page++) {
    const p = await a.get(`/api/investigations/${id}/items?page=${page}&pageSize=2`);
    expect(p.status).toBe(200);
    items.push(...p.body.items);
    if (p.body.items.length === 0 || items.length >= p.body.total) break;
  }
  expect(items).toHaveLength(res.body.totals.items);
  return { ...res.body, items } as Record<string, any>;
}

/** A micrometer with one good calibration in January and an as-found failure (+0.0003 in at 0.500 in) today. */
async function failingMicrometer() {
  const tool = await makeTool(t.db, { assetTag: `MIC-${Math.random().toString(36).slice(2, 7).toUpperCase()}` });
  const good = await makeExactCalibration(t.db, tool.id, { performedAt: GOOD_CAL, points: [{ nominal: "0.105", asFound: "0.1050" }, { nominal: "0.500", asFound: "0.5000" }, { nominal: "1.000", asFound: "1.0000" }] });
  const bad = await makeExactCalibration(t.db, tool.id, {
    performedAt: FINDING_AT,
    points: [
      { nominal: "0.105", asFound: "0.1050", asLeft: "0.1050" },
      { nominal: "0.500", asFound: "0.5003", asLeft: "0.5000", uncertainty: "0.00002" },
      { nominal: "1.000", asFound: "0.9999", asLeft: "1.0000" },
    ],
  });
  return { tool, good, bad };
}

describe("opening an investigation when a tool is found out of tolerance", () => {
  it("the window runs from the last good calibration: a reading one second before it is out, one second after it is in, and one after the finding is out", async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const before = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4338", "0.4338"], takenAt: sec(GOOD_CAL, -1), toolIds: [tool.id] });
    const after = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", index: 1, values: ["0.4338", "0.4338"], takenAt: sec(GOOD_CAL, 1), toolIds: [tool.id] });
    const atFinding = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1005", "0.1005"], takenAt: FINDING_AT, toolIds: [tool.id] });
    const afterFinding = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1005", "0.1005"], takenAt: sec(FINDING_AT, 1), toolIds: [tool.id] });

    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: t.people.quality.id });
    const inv = await detail(id);
    expect(inv.windowStart).toBe(new Date(GOOD_CAL).toISOString());
    expect(inv.windowEnd).toBe(new Date(FINDING_AT).toISOString());
    const ids = inv.items.map((i: { readingId: string }) => i.readingId);
    expect(ids).toContain(after.id);
    expect(ids).toContain(atFinding.id);
    expect(ids).not.toContain(before.id);
    expect(ids).not.toContain(afterFinding.id);
  });

  it("a tool never known good puts every reading before the finding in the window (no start)", async () => {
    const tool = await makeTool(t.db);
    const cal = await makeExactCalibration(t.db, tool.id, { performedAt: FINDING_AT, points: [{ nominal: "0.500", asFound: "0.5004" }] });
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const old = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4338", "0.4338"], takenAt: "2019-03-01T12:00:00Z", toolIds: [tool.id] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: cal.id, at: new Date(FINDING_AT), actorId: null });
    const inv = await detail(id);
    expect(inv.windowStart).toBeNull();
    expect(inv.items.map((i: { readingId: string }) => i.readingId)).toEqual([old.id]);
  });

  it("an adjustment leaves the tool known good as-left: the next finding's window starts at that adjustment, not at the older passing calibration", async () => {
    const { tool, bad: adjusted } = await failingMicrometer();
    const later = await makeExactCalibration(t.db, tool.id, { performedAt: "2026-06-15T14:30:00Z", points: [{ nominal: "0.500", asFound: "0.4997" }] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: later.id, at: new Date("2026-06-15T14:30:00Z"), actorId: null });
    expect((await detail(id)).windowStart).toBe(new Date(FINDING_AT).toISOString());
    expect(adjusted.result).toBe("adjusted");
  });

  it("superseded readings are left out and their corrections are in; readings taken under an override are in", async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const first = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4339", "0.4339"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id] });
    const correction = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4338", "0.4338"], takenAt: "2026-03-01T15:05:00Z", toolIds: [tool.id], supersedesId: first.id });
    const overridden = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1005", "0.1005"], takenAt: "2026-03-02T15:00:00Z", toolIds: [tool.id], overrideReason: "Only gauge on the bench", overrideBy: t.people.quality.id });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const inv = await detail(id);
    const ids = inv.items.map((i: { readingId: string }) => i.readingId);
    expect(ids).not.toContain(first.id);
    expect(ids).toEqual(expect.arrayContaining([correction.id, overridden.id]));
    expect(inv.items.find((i: { readingId: string }) => i.readingId === overridden.id).override).toBe(true);
  });

  it("with the shop's setting on, a passing intermediate check after the last calibration starts the window", async () => {
    const tool = await makeTool(t.db);
    await makeExactCalibration(t.db, tool.id, { performedAt: GOOD_CAL, points: [{ nominal: "0.500", asFound: "0.5000" }] });
    await makeCheck(t.db, tool.id, { performedAt: "2026-04-01T15:00:00Z", nominal: "0.500", reading: "0.5000" });
    const failed = await makeCheck(t.db, tool.id, { performedAt: FINDING_AT, nominal: "0.500", reading: "0.5003" });
    await t.db.transaction((tx) => updateSettings(tx, "America/Chicago", { windowStartsAtPassingCheck: true }, t.people.admin.id));
    try {
      const id = await find({ kind: "check_failure", toolId: tool.id, checkId: failed.id, at: new Date(FINDING_AT), actorId: null });
      const inv = await detail(id);
      expect(inv.windowStart).toBe(new Date("2026-04-01T15:00:00Z").toISOString());
      expect(inv.finding.errors).toEqual([{ nominal: 0.5, error: 0.0003, uncertainty: null, mpe: 0.0001 }]);
    } finally {
      await t.db.transaction((tx) => updateSettings(tx, "America/Chicago", { windowStartsAtPassingCheck: false }, t.people.admin.id));
    }
  });
});

describe("re-judging the affected readings", () => {
  it("a stem read with the failed micrometer shows its diameter over the error band (±0.00032 in: +0.0003 and its U, both signs); it and its clearance could change", async () => {
    const { tool, bad } = await failingMicrometer();
    const other = await makeTool(t.db);
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    // Stem 0.4338/0.4336 → size 0.4336 (smallest); guide 0.4368/0.4369 → size 0.4369 (largest); loosest fit 0.0033.
    const stem = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4338", "0.4336"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id] });
    await makeReading(t.db, { jobId: job.id, itemKey: "guide", kind: "bore", values: ["0.4368", "0.4369"], takenAt: "2026-03-01T15:10:00Z", toolIds: [other.id] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const item = (await detail(id)).items.find((i: { readingId: string }) => i.readingId === stem.id);
    expect(item.verdictCouldChange).toBe(true);
    // The stem shows a diameter, never the clearance: 0.4336 could be 0.43328 to 0.43392 (exact decimals).
    expect(item).toMatchObject({ quantity: "diameter", measuredValue: 0.4336, bandLow: 0.43328, bandHigh: 0.43392, marginBefore: 0.0001, marginAfter: -0.00022 });
    // Most likely: the error at the point nearest the size (+0.0003 at 0.5 in) taken off: 0.4333.
    expect(item.correctedValue).toBe(0.4333);
    // The clearance it feeds, from the journal side: loosest 0.0033 could be 0.00298 to 0.00362, over the 0.0035 maximum.
    const fit = item.places.find((p: { itemKey: string }) => p.itemKey === "stem_clearance");
    expect(fit).toMatchObject({ quantity: "loosest fit", value: 0.0033, low: 0.00298, high: 0.00362, couldChange: true });
    expect(item.basis).toContain("Error band ±0.00032 in");
    expect(item.basis).toContain("at the check point nearest the size: +0.0003 in at 0.5 in");
  });

  it("a guide read with the failed tool shows a bore diameter; mid-tolerance, it and its clearance hold over the whole band", async () => {
    const { tool, bad } = await failingMicrometer();
    const other = await makeTool(t.db);
    const { table } = await makeLimitTable(t.db, [
      { key: "stem", kind: "journal" },
      { key: "guide", label: "Guide", kind: "bore", min: "0.4355", max: "0.4370" },
      { key: "stem_clearance", label: "Stem to guide clearance", kind: "clearance", min: "0.0015", max: "0.0035", boreKey: "guide", journalKey: "stem" },
    ]);
    const job = await makeJob(t.db, table.id);
    await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4336", "0.4336"], takenAt: "2026-03-01T15:00:00Z", toolIds: [other.id], verdict: "pending" });
    const guide = await makeReading(t.db, { jobId: job.id, itemKey: "guide", kind: "bore", values: ["0.4365", "0.4365"], takenAt: "2026-03-01T15:10:00Z", toolIds: [tool.id], verdict: "within_limits" });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const item = (await detail(id)).items.find((i: { readingId: string }) => i.readingId === guide.id);
    expect(item).toMatchObject({ quantity: "bore diameter", measuredValue: 0.4365, correctedValue: 0.4362, bandLow: 0.43618, bandHigh: 0.43682, verdictCouldChange: false });
    // From the bore side the clearance moves with the bore: 0.0029 could be 0.00258 to 0.00322, inside 0.0015–0.0035.
    expect(item.places.find((p: { itemKey: string }) => p.itemKey === "stem_clearance")).toMatchObject({ value: 0.0029, low: 0.00258, high: 0.00322, couldChange: false });
  });

  it("the largest error found bounds every reading, even one nearest a check point that showed none", async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    // Pin 0.1002 is nearest the 0.105 point (error 0), but the band of ±0.00032 takes it down to 0.09988, under 0.1000.
    const pin = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1002", "0.1002"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const item = (await detail(id)).items.find((i: { readingId: string }) => i.readingId === pin.id);
    expect(item.correctedValue).toBe(0.1002);
    expect(item.marginAfter).toBe(-0.00012);
    expect(item.verdictCouldChange).toBe(true);
    expect(item.basis).toContain("the largest |error| found at any check point in the tool's range (+0.0003 in at 0.5 in, U 0.00002), applied with both signs");
  });

  it("a lost tool's error is unknown: every reading since it was last known good could have been judged differently", async () => {
    const tool = await makeTool(t.db);
    await makeExactCalibration(t.db, tool.id, { performedAt: GOOD_CAL, points: [{ nominal: "0.500", asFound: "0.5000" }] });
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const comfortable = await makeReading(t.db, { jobId: job.id, itemKey: "guide", kind: "bore", values: ["0.4362", "0.4362"], takenAt: "2026-02-01T15:00:00Z", toolIds: [tool.id] });
    const id = await find({ kind: "lost", toolId: tool.id, at: new Date(FINDING_AT), actorId: t.people.crib.id });
    const inv = await detail(id);
    expect(inv.trigger).toBe("lost");
    expect(inv.finding.errors).toBeNull();
    const item = inv.items.find((i: { readingId: string }) => i.readingId === comfortable.id);
    expect(item.verdictCouldChange).toBe(true);
    expect(item.correctedValue).toBeNull();
    expect(item.marginAfter).toBeNull();
    expect(item.marginBefore).toBe(0.0007);
    expect(item.basis).toContain("unknown");
  });

  it("a damaged tool with no calibration since is treated as unknown, and the investigation names the checkout", async () => {
    const tool = await makeTool(t.db);
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    await makeReading(t.db, { jobId: job.id, itemKey: "guide", kind: "bore", values: ["0.4362"], takenAt: "2026-02-01T15:00:00Z", toolIds: [tool.id] });
    const checkoutId = "00000000-0000-4000-8000-000000000001";
    const id = await find({ kind: "damaged", toolId: tool.id, checkoutId, at: new Date(FINDING_AT), actorId: null });
    const inv = await detail(id);
    expect(inv.checkoutId).toBe(checkoutId);
    expect(inv.couldChangeCount).toBe(1);
  });
});

describe("the cascade from a reference standard", () => {
  it("calibrations performed with the standard in its window are re-judged, and only the tools whose verdict could change are carried in with their readings", async () => {
    const { standard } = await makeStandard(t.db, {}, { issuedAt: "2026-01-10", dueAt: "2027-01-10" });
    const toolA = await makeTool(t.db, { assetTag: "CAS-A" });
    const toolB = await makeTool(t.db, { assetTag: "CAS-B" });
    const toolC = await makeTool(t.db, { assetTag: "CAS-C" });
    // A: +0.00008 recorded; the standard was really 0.00005 small, so the true error is +0.00013 — outside ± 0.0001.
    const calA = await makeExactCalibration(t.db, toolA.id, { performedAt: "2026-03-01T15:00:00Z", points: [{ nominal: "0.500", asFound: "0.50008" }], standardIds: [standard.id] });
    // B: 0 recorded → +0.00005 true: still inside.
    const calB = await makeExactCalibration(t.db, toolB.id, { performedAt: "2026-03-02T15:00:00Z", points: [{ nominal: "0.500", asFound: "0.50000" }], standardIds: [standard.id] });
    // C: calibrated before the standard's certificate: outside the window.
    const calC = await makeExactCalibration(t.db, toolC.id, { performedAt: "2025-12-01T15:00:00Z", points: [{ nominal: "0.500", asFound: "0.50008" }], standardIds: [standard.id] });
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const readingA = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4336", "0.4336"], takenAt: "2026-04-01T15:00:00Z", toolIds: [toolA.id] });
    const readingB = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1005"], takenAt: "2026-04-01T15:00:00Z", toolIds: [toolB.id] });

    const quality = await t.agent("quality");
    const res = await quality.post(`/api/standards/${standard.id}/findings`, { foundAt: "2026-06-10T15:00:00Z", errors: [{ nominal: 0.5, error: -0.00005 }], note: "Found small at its recalibration" });
    expect(res.status).toBe(201);
    const inv = await detail(res.body.investigationId);
    expect(inv.toolAssetTag).toBe(standard.assetTag);
    expect(inv.standard.assetTag).toBe(standard.assetTag);
    const cals = inv.items.filter((i: { kind: string }) => i.kind === "calibration");
    expect(cals.map((i: { calibrationId: string }) => i.calibrationId).sort()).toEqual([calA.id, calB.id].sort());
    expect(cals.map((i: { calibrationId: string }) => i.calibrationId)).not.toContain(calC.id);
    const a = cals.find((i: { calibrationId: string }) => i.calibrationId === calA.id);
    expect(a.verdictCouldChange).toBe(true);
    expect(a.correctedValue).toBe(0.00013);
    expect(cals.find((i: { calibrationId: string }) => i.calibrationId === calB.id).verdictCouldChange).toBe(false);
    const readingItems = inv.items.filter((i: { kind: string }) => i.kind === "reading");
    expect(readingItems.map((i: { readingId: string }) => i.readingId)).toEqual([readingA.id]);
    expect(readingItems[0].toolAssetTag).toBe("CAS-A");
    expect(readingItems[0].correctedValue).toBe(0.43347);
    expect(readingItems.map((i: { readingId: string }) => i.readingId)).not.toContain(readingB.id);
    // Filtering by a carried-in tool finds the cascade too.
    const byTool = await quality.get("/api/investigations?toolAssetTag=CAS-A");
    expect(byTool.body.map((x: { id: string }) => x.id)).toContain(inv.id);
  });

  it("a finding on an unknown standard is a 404, a bad id a 400, and a finding without errors a 400", async () => {
    const quality = await t.agent("quality");
    expect((await quality.post(`/api/standards/00000000-0000-4000-8000-000000000000/findings`, { foundAt: "2026-06-10T15:00:00Z", errors: [{ nominal: 0.5, error: 0.0001 }] })).status).toBe(404);
    expect((await quality.post(`/api/standards/not-a-uuid/findings`, { foundAt: "2026-06-10T15:00:00Z", errors: [{ nominal: 0.5, error: 0.0001 }] })).status).toBe(400);
    const { standard } = await makeStandard(t.db);
    const before = await t.db.select().from(investigations);
    const res = await quality.post(`/api/standards/${standard.id}/findings`, { foundAt: "2026-06-10T15:00:00Z", errors: [] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_input");
    expect((await t.db.select().from(investigations)).length).toBe(before.length);
  });
});

describe("notifications and the suspect flag", () => {
  it("quality, the inspector who signed and the mechanic who measured an affected job are e-mailed once the opening transaction commits", async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4338"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id], takenBy: t.people.mechanic.id });
    await signJob(t.db, job.id, t.people.inspector.id, "2026-03-02T15:00:00Z");
    const sentBefore = mail().length;
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    await vi.waitFor(() => expect(mail().length).toBeGreaterThanOrEqual(sentBefore + 3));
    const to = mail().slice(sentBefore).map((m) => m.to);
    expect(to).toEqual(expect.arrayContaining([t.people.quality.email, t.people.inspector.email, t.people.mechanic.email]));
    expect(mail().slice(sentBefore).every((m) => m.subject.includes(tool.assetTag))).toBe(true);
    await vi.waitFor(async () => expect((await detail(id)).finding.notifications.status).toBe("sent"));
    const inv = await detail(id);
    expect(inv.finding.notifications.recipients.find((r: { email: string }) => r.email === t.people.inspector.email).reasons[0]).toContain(job.engineSerial);
  });

  it("when the finding's transaction rolls back, there is no investigation and nobody is e-mailed", async () => {
    const { tool, bad } = await failingMicrometer();
    const sentBefore = mail().length;
    const countBefore = (await t.db.select().from(investigations)).length;
    await expect(
      t.db.transaction(async (tx) => {
        await onOutOfToleranceFinding(tx, { clock: t.clock, mailer: t.mailer, timeZone: "America/Chicago" }, { kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
        throw new Error("the calibration was refused after all");
      }),
    ).rejects.toThrow("refused after all");
    await new Promise((r) => setTimeout(r, 50));
    expect(mail().length).toBe(sentBefore);
    expect((await t.db.select().from(investigations)).length).toBe(countBefore);
  });

  it("readings in an open investigation are suspect; once it is closed they are not", async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const r = await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1005"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id] });
    const untouched = await makeReading(t.db, { jobId: job.id, itemKey: "pin", index: 2, kind: "journal", values: ["0.1005"], takenAt: "2026-03-01T15:00:00Z", toolIds: [] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    expect([...(await suspectReadingIds(t.db, [r.id, untouched.id]))]).toEqual([r.id]);
    const q = await t.agent("quality");
    expect((await q.post(`/api/investigations/${id}/dispositions`, { jobId: job.id, kind: "no_impact", rationale: "Pin remeasured on a calibrated micrometer during reassembly: 0.1004." })).status).toBe(201);
    expect((await q.post(`/api/investigations/${id}/close`, { summary: "No impact." })).status).toBe(200);
    expect((await suspectReadingIds(t.db, [r.id])).size).toBe(0);
  });
});

describe("dispositions and close-out", () => {
  async function openWithTwoJobs() {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job1 = await makeJob(t.db, table.id);
    const job2 = await makeJob(t.db, table.id);
    const r1 = await makeReading(t.db, { jobId: job1.id, itemKey: "stem", kind: "journal", values: ["0.4336"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id], takenBy: t.people.mechanic.id });
    const r2 = await makeReading(t.db, { jobId: job1.id, itemKey: "pin", kind: "journal", values: ["0.1005"], takenAt: "2026-03-01T15:01:00Z", toolIds: [tool.id] });
    const r3 = await makeReading(t.db, { jobId: job2.id, itemKey: "pin", kind: "journal", values: ["0.1005"], takenAt: "2026-03-03T15:00:00Z", toolIds: [tool.id] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const inv = await detail(id);
    const itemOf = (readingId: string) => inv.items.find((i: { readingId: string }) => i.readingId === readingId).id as string;
    return { id, tool, job1, job2, r1, r2, r3, item1: itemOf(r1.id), item2: itemOf(r2.id), item3: itemOf(r3.id) };
  }
  const dispositionCount = async () => (await t.db.select().from(dispositions)).length;

  it("a disposition without a rationale (missing or blank) is refused and nothing is recorded", async () => {
    const o = await openWithTwoJobs();
    const q = await t.agent("quality");
    const before = await dispositionCount();
    const missing = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item1], kind: "no_impact" });
    expect(missing.status).toBe(400);
    expect(missing.body.error.details.some((i: { path: string[] }) => i.path.includes("rationale"))).toBe(true);
    expect((await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item1], kind: "no_impact", rationale: "   " })).status).toBe(400);
    expect((await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item1], kind: "notify_owner", rationale: "Owner told" })).status).toBe(400);
    expect((await q.post(`/api/investigations/not-an-id/dispositions`, { itemIds: [o.item1], kind: "no_impact", rationale: "x" })).status).toBe(400);
    expect(await dispositionCount()).toBe(before);
  });

  it("mechanics, the crib and auditors may not decide dispositions, and nothing is recorded when they try", async () => {
    const o = await openWithTwoJobs();
    const before = await dispositionCount();
    for (const role of ["mechanic", "crib", "auditor"] as const) {
      const res = await (await t.agent(role)).post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item1], kind: "no_impact", rationale: "Looks fine to me" });
      expect(res.status, role).toBe(403);
    }
    expect(await dispositionCount()).toBe(before);
  });

  it("an inspector disposes a whole job at once; the investigation closes only when every item has a disposition; then it takes nothing more", async () => {
    const o = await openWithTwoJobs();
    const inspector = await t.agent("inspector");
    const q = await t.agent("quality");
    const byJob = await inspector.post(`/api/investigations/${o.id}/dispositions`, {
      jobId: o.job1.id,
      kind: "notify_owner",
      rationale: "Engine already returned to the owner; owner asked to hold it for remeasurement.",
      notifiedWhom: "Owner's maintenance manager",
      notifiedHow: "Telephone, then e-mail",
    });
    expect(byJob.status).toBe(201);
    expect(byJob.body.dispositions.map((d: { itemId: string }) => d.itemId).sort()).toEqual([o.item1, o.item2].sort());
    expect(byJob.body.dispositions[0].decidedBy.id).toBe(t.people.inspector.id);
    expect(byJob.body.dispositions[0].notifiedAt).toBe(new Date(NOW).toISOString());
    const listed = (await q.get(`/api/investigations?toolAssetTag=${o.tool.assetTag}`)).body[0];
    expect({ affected: listed.affectedCount, awaiting: listed.undisposedCount }).toEqual({ affected: 3, awaiting: 1 });

    const early = await q.post(`/api/investigations/${o.id}/close`, { summary: "Done" });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe("dispositions_missing");
    expect(early.body.error.details.itemIds).toEqual([o.item3]);
    expect((await inspector.post(`/api/investigations/${o.id}/close`, { summary: "Done" })).status).toBe(403);
    expect((await q.post(`/api/investigations/${o.id}/close`, { summary: " " })).status).toBe(400);

    expect((await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item3], kind: "recall", rationale: "Pin at the edge; recall the cylinder for remeasurement." })).status).toBe(201);
    const closed = await q.post(`/api/investigations/${o.id}/close`, { summary: "Job 1 owner notified; job 2 recalled." });
    expect(closed.status).toBe(200);
    const inv = await detail(o.id);
    expect(inv.status).toBe("closed");
    expect(inv.closingSummary).toBe("Job 1 owner notified; job 2 recalled.");
    expect(inv.closedBy).toBe(t.people.quality.name);

    const before = await dispositionCount();
    const late = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item3], kind: "no_impact", rationale: "Second thoughts" });
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe("investigation_closed");
    expect((await q.post(`/api/investigations/${o.id}/close`, { summary: "Again" })).body.error.code).toBe("investigation_closed");
    expect(await dispositionCount()).toBe(before);
  });

  it("a remeasurement must be a later reading of the same place on the same sheet; the investigation links it", async () => {
    const o = await openWithTwoJobs();
    const q = await t.agent("quality");
    const unrelated = await makeReading(t.db, { jobId: o.job1.id, itemKey: "pin", index: 2, kind: "journal", values: ["0.1006"], takenAt: "2026-06-15T14:50:00Z", toolIds: [] });
    const refusedRes = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item2], kind: "remeasure", rationale: "Remeasured", remeasureReadingId: unrelated.id });
    expect(refusedRes.status).toBe(409);
    expect(refusedRes.body.error.code).toBe("remeasure_not_later_reading");
    const again = await makeReading(t.db, { jobId: o.job1.id, itemKey: "pin", kind: "journal", values: ["0.1004"], takenAt: "2026-06-15T14:55:00Z", toolIds: [], supersedesId: o.r2.id });
    const ok = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item2], kind: "remeasure", rationale: "Remeasured with MIC in calibration: 0.1004, within limits.", remeasureReadingId: again.id });
    expect(ok.status).toBe(201);
    expect((await detail(o.id)).items.find((i: { id: string }) => i.id === o.item2).dispositions[0].remeasureReadingId).toBe(again.id);
    const items = await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item1, "00000000-0000-4000-8000-000000000009"], kind: "no_impact", rationale: "x" });
    expect(items.status).toBe(409);
    expect(items.body.error.code).toBe("items_not_in_investigation");
  });

  it("the PDF report prints the finding, the window, every affected reading with its margins and disposition, and the cautions", async () => {
    const o = await openWithTwoJobs();
    const q = await t.agent("quality");
    await q.post(`/api/investigations/${o.id}/dispositions`, { itemIds: [o.item3], kind: "no_impact", rationale: "Pin was replaced with a new part anyway." });
    const res = await (await t.agent("auditor")).get(`/api/investigations/${o.id}/report.pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on("data", (c: Buffer) => chunks.push(c));
      r.on("end", () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toContain("application/pdf");
    const text = ((await pdfParse(res.body)).text as string).replace(/\s+/g, " ");
    expect(text).toContain(`Out-of-tolerance investigation — ${o.tool.assetTag}`);
    expect(text).toContain("+0.0003 in at 0.500 in");
    expect(text).toContain("2026-01-10 09:00:00");
    expect(text).toContain(o.job1.engineSerial);
    expect(text).toContain("Exhaust valve stem");
    expect(text).toContain("as read +0.0001 in, at the worst of the error band -0.00022 in");
    expect(text).toContain("diameter 0.4336 in (over the error band 0.43328 in to 0.43392 in)");
    expect(text).toContain("Pin was replaced with a new part anyway.");
    expect(text).toContain("Disposition: none yet");
    expect(text).toContain("prompt a qualified evaluation of each affected reading; they are not determinations");
    expect(text).toContain("appropriately certificated persons");
  });
});

describe("GET /api/investigations (api.md)", () => {
  it("answers an array of { id, toolAssetTag, status, windowStart, windowEnd, affectedReadings: [{ readingId, jobId, verdictCouldChange }] }, filtered by tool", async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    const r = await makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4336"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id] });
    const id = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    const res = await (await t.agent("mechanic")).get(`/api/investigations?toolAssetTag=${tool.assetTag}`);
    expect(res.status).toBe(200);
    expect(Array.isArray(res.body)).toBe(true);
    expect(res.body).toHaveLength(1);
    expect(res.body[0]).toMatchObject({
      id,
      toolAssetTag: tool.assetTag,
      status: "open",
      windowStart: new Date(GOOD_CAL).toISOString(),
      windowEnd: new Date(FINDING_AT).toISOString(),
      affectedReadings: [{ readingId: r.id, jobId: job.id, verdictCouldChange: true }],
    });
    expect(Object.keys(res.body[0].affectedReadings[0]).sort()).toEqual(["jobId", "readingId", "verdictCouldChange"]);
    expect((await (await t.agent("mechanic")).get(`/api/investigations?toolAssetTag=NO-SUCH-TAG`)).body).toEqual([]);
  });

  it("lists open investigations first, filters by status and by job, pages with the total in X-Total-Count, and refuses a bad filter with 400", async () => {
    const a = await t.agent("auditor");
    const all = await a.get("/api/investigations?pageSize=500");
    const statuses = all.body.map((x: { status: string }) => x.status);
    expect(statuses.indexOf("closed")).toBeGreaterThan(statuses.lastIndexOf("open"));
    expect(Number(all.headers["x-total-count"])).toBe(all.body.length);
    const page = await a.get("/api/investigations?page=2&pageSize=1");
    expect(page.body).toHaveLength(1);
    expect(page.body[0].id).toBe(all.body[1].id);
    expect((await a.get("/api/investigations?status=closed")).body.every((x: { status: string }) => x.status === "closed")).toBe(true);
    const withReadings = all.body.find((x: { affectedReadings: unknown[] }) => x.affectedReadings.length > 0);
    const jobId = withReadings.affectedReadings[0].jobId;
    const byJob = await a.get(`/api/investigations?jobId=${jobId}`);
    expect(byJob.body.length).toBeGreaterThan(0);
    expect(byJob.body.every((x: { affectedReadings: { jobId: string }[] }) => x.affectedReadings.some((r) => r.jobId === jobId))).toBe(true);
    expect((await a.get("/api/investigations?status=maybe")).status).toBe(400);
    expect((await a.get("/api/investigations?jobId=12")).status).toBe(400);
    expect((await a.get("/api/investigations/12")).status).toBe(400);
    expect((await a.get("/api/investigations/00000000-0000-4000-8000-000000000000")).status).toBe(404);
  });

  it("the openings, notices, dispositions and close-outs are in the audit trail", async () => {
    const rows = await t.db.query.auditEvents.findMany({ where: (e, { like }) => like(e.action, "investigation.%") });
    const actions = new Set(rows.map((r) => r.action));
    for (const a of ["investigation.open", "investigation.notified", "investigation.disposition", "investigation.close"]) expect(actions).toContain(a);
    const closedInv = await t.db.query.investigations.findFirst({ where: eq(investigations.status, "closed") });
    expect(closedInv?.closedAt).not.toBeNull();
  });
});

describe("who may use the investigation routes", () => {
  let invId = "";
  let itemId = "";
  let stdId = "";
  beforeAll(async () => {
    const { tool, bad } = await failingMicrometer();
    const { table } = await makeLimitTable(t.db);
    const job = await makeJob(t.db, table.id);
    await makeReading(t.db, { jobId: job.id, itemKey: "pin", kind: "journal", values: ["0.1005"], takenAt: "2026-03-01T15:00:00Z", toolIds: [tool.id] });
    invId = await find({ kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: null });
    itemId = (await detail(invId)).items[0].id;
    stdId = (await makeStandard(t.db)).standard.id;
  });
  const everyone = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
  roleMatrix(() => t, [
    { method: "get", path: "/api/investigations", allowed: everyone },
    { method: "get", path: () => `/api/investigations/${invId}`, label: "/api/investigations/:id", allowed: everyone },
    { method: "get", path: () => `/api/investigations/${invId}/report.pdf`, label: "/api/investigations/:id/report.pdf", allowed: everyone },
    {
      method: "post",
      path: () => `/api/investigations/${invId}/dispositions`,
      label: "/api/investigations/:id/dispositions",
      body: () => ({ itemIds: [itemId], kind: "no_impact", rationale: "Checked against the remeasured part." }),
      allowed: ["inspector", "quality", "admin"],
    },
    { method: "post", path: () => `/api/investigations/${invId}/close`, label: "/api/investigations/:id/close", body: { summary: "All items answered." }, allowed: ["quality", "admin"] },
    {
      method: "post",
      path: () => `/api/standards/${stdId}/findings`,
      label: "/api/standards/:id/findings",
      body: { foundAt: "2026-06-10T15:00:00Z", errors: [{ nominal: 0.5, error: 0.00001 }] },
      allowed: ["quality", "admin"],
    },
  ]);
});
