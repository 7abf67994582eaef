import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Writable } from "node:stream";
import { pino } from "pino";
import { and, eq } from "drizzle-orm";
import { createTestApp, memoryMailer, type TestApp } from "../support/test-app";
import { makeTool } from "../support/factories";
import { makeExactCalibration, makeJob, makeLimitTable, VALVE_SCENARIO } from "../support/factories-investigations";
import { onOutOfToleranceFinding, type Finding } from "../../server/modules/investigations/investigations.hooks";
import { gatherPendingInvestigations } from "../../server/modules/investigations/investigations.service";
import { auditEvents, readingTools, readings } from "../../server/db/schema";
import { sizeFromValues } from "../../shared/inspection/sizes";

// A finding over a large window is recorded at once and its affected readings are gathered right after it commits
// (server/modules/investigations/investigations.service.ts, gatherReadings). What must hold, whatever the timing:
// the readings gathered are exactly those the same finding re-judges in its own transaction (the shared computation,
// shared/investigations/affected-reading.ts); nothing is decided on the investigation before they are all there; a
// gathering cut off (a dropped connection) is finished by the minute's sweep, once. Demo limits and errors (invented):
// stem 0.4335–0.4340 in, guide 0.4355–0.4370 in, clearance 0.0015–0.0035 in; as-found +0.0003 in at 0.500 in.

const { now: NOW, goodCal: GOOD_CAL, findingAt: FINDING_AT, valves: VALVES, stems, guides } = VALVE_SCENARIO;
const SHEETS = 4;

let t: TestApp;
const mail = () => (t.mailer as ReturnType<typeof memoryMailer>).sent;
let table: Awaited<ReturnType<typeof makeLimitTable>>["table"];
beforeAll(async () => {
  t = await createTestApp({ now: NOW });
  ({ table } = await makeLimitTable(t.db, [
    { key: "stem", label: "Exhaust valve stem", kind: "journal", min: "0.4335", max: "0.4340", repeat: VALVES },
    { key: "guide", label: "Exhaust valve guide", kind: "bore", min: "0.4355", max: "0.4370", repeat: VALVES },
    { key: "stem_clearance", label: "Stem to guide clearance", kind: "clearance", min: "0.0015", max: "0.0035", boreKey: "guide", journalKey: "stem", repeat: VALVES },
  ]));
});
afterAll(async () => t?.close());

/** A micrometer found +0.0003 in out at 0.500 in, with the same stems and guides measured on its own sheets. */
async function micrometerWithSheets(tag: string) {
  const tool = await makeTool(t.db, { assetTag: tag });
  await makeExactCalibration(t.db, tool.id, { performedAt: GOOD_CAL, points: [{ nominal: "0.500", asFound: "0.5000" }] });
  const bad = await makeExactCalibration(t.db, tool.id, { performedAt: FINDING_AT, points: [{ nominal: "0.500", asFound: "0.5003", asLeft: "0.5000" }] });
  const within = (v: string, min: string, max: string) => (Number(v) >= Number(min) && Number(v) <= Number(max) ? ("within_limits" as const) : ("outside_limits" as const));
  const base = new Date("2026-02-01T15:00:00Z").getTime();
  for (let j = 0; j < SHEETS; j++) {
    const job = await makeJob(t.db, table.id, { engineSerial: `${tag}-E${j + 1}` });
    const rows = [];
    for (let v = 1; v <= VALVES; v++) {
      const at = (s: number) => new Date(base + j * 86_400_000 + v * 600_000 + s * 1000);
      const stem = stems[(v + j) % VALVES];
      const guide = guides[(v * 3 + j) % VALVES];
      rows.push({ jobId: job.id, itemKey: "stem", index: v, values: [stem, stem], unit: "in" as const, size: String(sizeFromValues("journal", [stem, stem]).size), verdict: within(stem, "0.4335", "0.4340"), flags: [], takenAt: at(0) });
      rows.push({ jobId: job.id, itemKey: "guide", index: v, values: [guide, guide], unit: "in" as const, size: String(sizeFromValues("bore", [guide, guide]).size), verdict: within(guide, "0.4355", "0.4370"), flags: [], takenAt: at(30) });
    }
    const inserted = await t.db.insert(readings).values(rows).returning();
    await t.db.insert(readingTools).values(inserted.map((r) => ({ readingId: r.id, toolId: tool.id, position: 1, statusAtReading: "in_calibration" as const, takenAt: r.takenAt })));
  }
  const finding: Finding = { kind: "as_found_failure", toolId: tool.id, calibrationId: bad.id, at: new Date(FINDING_AT), actorId: t.people.quality.id };
  return { tool, finding };
}

/** Opens the finding in its own transaction, as recording the calibration does; `inlineReadings` 0 gathers afterwards. */
/** The operator's log, as written lines. */
const warnings: { investigationId?: string; msg: string }[] = [];
const logger = pino(
  { level: "warn" },
  new Writable({
    write(chunk, _enc, cb) {
      for (const l of String(chunk).split("\n")) if (l.trim()) warnings.push(JSON.parse(l));
      cb();
    },
  }),
);

async function open(finding: Finding, inlineReadings?: number) {
  const out = await t.db.transaction((tx) =>
    onOutOfToleranceFinding(tx, { clock: t.clock, mailer: t.mailer, logger, timeZone: "America/Chicago", inlineReadings }, finding),
  );
  return out!.investigationId;
}

/** Every affected item, in the sheets' and places' order, as the page gives them. */
async function itemsOf(id: string) {
  const a = await t.agent("auditor");
  const res = await a.get(`/api/investigations/${id}/items?page=1&pageSize=200`);
  expect(res.status).toBe(200);
  return res.body.items as any[];
}

/** Waits (up to 10 s) until the investigation says its readings are gathered. */
async function gathered(id: string) {
  const a = await t.agent("auditor");
  for (let i = 0; i < 200; i++) {
    const res = await a.get(`/api/investigations/${id}`);
    if (res.body.gathering === false) return res.body;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("the investigation was still gathering after 10 s");
}

/** Holds back every write of affected items until the returned function is called (as a slow or busy database would). */
async function holdItemWrites() {
  const client = await t.pool.connect();
  await client.query("begin");
  await client.query("lock table investigation_items in share mode");
  return async () => {
    await client.query("rollback");
    client.release();
  };
}

describe("a finding over a large window", () => {
  it("is recorded at once; until its readings are gathered the investigation says so and refuses closing, dispositions and the report; then it lists exactly what re-judging in the finding's own transaction lists", async () => {
    const inline = await micrometerWithSheets("MIC-GATHER-A");
    const later = await micrometerWithSheets("MIC-GATHER-B");
    const inlineId = await open(inline.finding);
    const release = await holdItemWrites();
    let laterId: string;
    try {
      laterId = await open(later.finding, 0);
      const quality = await t.agent("quality");
      const inv = await quality.get(`/api/investigations/${laterId}`);
      expect(inv.status).toBe(200);
      expect(inv.body).toMatchObject({ status: "open", gathering: true, toolAssetTag: "MIC-GATHER-B" });
      const list = await quality.get("/api/investigations?status=open");
      expect(list.body.find((x: any) => x.id === laterId)).toMatchObject({ gathering: true });
      expect(list.body.find((x: any) => x.id === inlineId)).toMatchObject({ gathering: false, affectedCount: SHEETS * VALVES * 2 });

      const close = await quality.post(`/api/investigations/${laterId}/close`, { summary: "Nothing affected." });
      expect(close.status).toBe(409);
      expect(close.body.error.code).toBe("investigation_gathering");
      const jobId = (await t.db.select({ jobId: readings.jobId }).from(readings).innerJoin(readingTools, eq(readingTools.readingId, readings.id)).where(eq(readingTools.toolId, later.tool.id)).limit(1))[0].jobId;
      const disposed = await quality.post(`/api/investigations/${laterId}/dispositions`, { jobId, kind: "no_impact", rationale: "Checked again." });
      expect(disposed.status).toBe(409);
      expect(disposed.body.error.code).toBe("investigation_gathering");
      const report = await quality.get(`/api/investigations/${laterId}/report.pdf`);
      expect(report.status).toBe(409);
      expect(report.body.error.code).toBe("investigation_gathering");
      // The sweep finds it held by the gathering under way and leaves it to that one.
      expect(await gatherPendingInvestigations(t.db, { clock: t.clock, mailer: t.mailer })).toBe(0);
    } finally {
      await release();
    }
    const done = await gathered(laterId!);
    expect(done.totals.items).toBe(SHEETS * VALVES * 2);

    const a = await itemsOf(inlineId);
    const b = await itemsOf(laterId!);
    expect(b).toHaveLength(a.length);
    const comparable = (x: any) => ({
      place: `${x.itemLabel} no. ${x.index}`,
      values: x.values,
      quantity: x.quantity,
      measuredValue: x.measuredValue,
      bandLow: x.bandLow,
      bandHigh: x.bandHigh,
      places: x.places,
      originalVerdict: x.originalVerdict,
      correctedValue: x.correctedValue,
      marginBefore: x.marginBefore,
      marginAfter: x.marginAfter,
      verdictCouldChange: x.verdictCouldChange,
      basis: x.basis,
      takenAt: x.takenAt,
    });
    expect(b.map(comparable)).toEqual(a.map(comparable));
    expect(b.filter((x) => x.verdictCouldChange).length).toBeGreaterThan(0);

    // Told once, after gathering, with the counts gathered; the trail says it opened, then gathered.
    const subject = "Out-of-tolerance investigation opened: MIC-GATHER-B (as-found out of tolerance)";
    const notices = mail().filter((m) => m.subject === subject);
    expect(notices.length).toBeGreaterThan(0);
    expect(new Set(notices.map((m) => m.to)).size).toBe(notices.length);
    expect(notices[0].text).toContain(`Affected items: ${SHEETS * VALVES * 2};`);
    const trail = await t.db.select().from(auditEvents).where(and(eq(auditEvents.entityType, "investigation"), eq(auditEvents.entityId, laterId!)));
    expect(trail.map((x) => x.action).sort()).toEqual(["investigation.gathered", "investigation.notified", "investigation.open"]);
  });

  it("whose gathering fails (its statement cancelled, as a timeout or a restart would end it) stays gathering and is gathered once by the minute's sweep", async () => {
    const { finding } = await micrometerWithSheets("MIC-GATHER-C");
    const release = await holdItemWrites();
    let id: string;
    try {
      id = await open(finding, 0);
      // The gathering waits on the held table; cancel its statement.
      const other = await t.pool.connect();
      try {
        let cancelled = 0;
        for (let i = 0; i < 100 && cancelled === 0; i++) {
          const res = await other.query(
            "select pg_cancel_backend(pid) as ok from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock' and query ilike '%insert into investigation_items%'",
          );
          cancelled = res.rows.length;
          if (!cancelled) await new Promise((r) => setTimeout(r, 50));
        }
        expect(cancelled).toBe(1);
      } finally {
        other.release();
      }
    } finally {
      await release();
    }
    const a = await t.agent("auditor");
    await new Promise((r) => setTimeout(r, 200));
    expect((await a.get(`/api/investigations/${id!}`)).body.gathering).toBe(true);
    // The operator's log says so, naming the investigation.
    expect(warnings.filter((w) => w.investigationId === id!).map((w) => w.msg)).toEqual([
      "investigation: gathering its affected readings failed; the minute's sweep gathers them",
    ]);
    expect(await gatherPendingInvestigations(t.db, { clock: t.clock, mailer: t.mailer })).toBe(1);
    expect(await gatherPendingInvestigations(t.db, { clock: t.clock, mailer: t.mailer })).toBe(0);
    const inv = await a.get(`/api/investigations/${id!}`);
    expect(inv.body).toMatchObject({ gathering: false });
    expect(inv.body.totals.items).toBe(SHEETS * VALVES * 2);
    expect(await itemsOf(id!)).toHaveLength(SHEETS * VALVES * 2);
    const subject = "Out-of-tolerance investigation opened: MIC-GATHER-C (as-found out of tolerance)";
    const notices = mail().filter((m) => m.subject === subject);
    expect(notices.length).toBeGreaterThan(0);
    expect(new Set(notices.map((m) => m.to)).size).toBe(notices.length);
  });
});
