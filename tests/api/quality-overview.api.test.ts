import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCalibration, makeCheckout, makeTool } from "../support/factories";
import { makeHold, makeJob, makeOpenInvestigation } from "../support/factories-quality";
import { statusContext, statusesFor } from "../../server/modules/tools/tool-status.service";
import { recordAudit } from "../../server/modules/audit/audit.repository";
import { tools as toolsTable } from "../../server/db/schema";

let t: TestApp;
const tags: Record<string, string> = {};
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  const calibrated = async (key: string, performedAt: string, nextDueAt: string) => {
    const tool = await makeTool(t.db, { assetTag: `OV-${key}` });
    await makeCalibration(t.db, tool.id, { performedAt: new Date(performedAt), nextDueAt });
    tags[key] = tool.assetTag;
    return tool;
  };
  await calibrated("IN", "2026-01-10T15:00:00Z", "2027-01-10");
  const soon5 = await calibrated("DUE5", "2025-06-20T15:00:00Z", "2026-06-20");
  await calibrated("DUE25", "2025-07-10T15:00:00Z", "2026-07-10");
  await calibrated("OVER", "2025-06-01T15:00:00Z", "2026-06-01");
  const held = await calibrated("HELD", "2026-01-10T15:00:00Z", "2027-01-10");
  await makeHold(t.db, held.id, new Date("2026-06-14T15:00:00Z"));
  tags.NEVER = (await makeTool(t.db, { assetTag: "OV-NEVER" })).assetTag;
  // The mechanic holds DUE5, past its due-back time, and owns a personal micrometer.
  await makeCheckout(t.db, soon5.id, t.people.mechanic.id, { issuedAt: new Date("2026-06-15T12:00:00Z"), dueBackAt: new Date("2026-06-15T14:00:00Z") });
  const personal = await makeTool(t.db, { assetTag: "OV-PERS", ownerType: "personal", ownerUserId: t.people.mechanic.id });
  await makeCalibration(t.db, personal.id, { performedAt: new Date("2026-02-01T15:00:00Z"), nextDueAt: "2027-02-01" });
  await makeOpenInvestigation(t.db, soon5.id, 2);
  await makeJob(t.db, { openedBy: t.people.mechanic.id, readingsBy: t.people.mechanic.id, readings: 3 });
  await makeJob(t.db, { openedBy: t.people.inspector.id });
  await makeJob(t.db, { openedBy: t.people.mechanic.id, readingsBy: t.people.mechanic.id, readings: 1, signedBy: t.people.inspector.id });
});
afterAll(() => t.close());

describe("the quality overview", () => {
  it("counts tools by the status each tool shows, with due within 30 days, overdue and open investigations (api.md)", async () => {
    const res = await (await t.agent("mechanic")).get("/api/stats/overview");
    expect(res.status).toBe(200);
    expect(Object.keys(res.body).sort()).toEqual(["byStatus", "dueWithin30Days", "openInvestigations", "overdue"]);
    expect(res.body.byStatus).toMatchObject({ in_calibration: 2, due_soon: 2, overdue: 1, quarantined: 1, never_calibrated: 1, lost: 0 });
    expect(res.body).toMatchObject({ dueWithin30Days: 2, overdue: 1, openInvestigations: 1 });

    // The same counts as the one status derivation gives tool by tool.
    const ids = (await t.db.select({ id: toolsTable.id }).from(toolsTable)).map((r) => r.id);
    const views = await statusesFor(t.db, ids, t.clock.now(), await statusContext(t.db, t.config.SHOP_TIME_ZONE));
    const tally: Record<string, number> = {};
    for (const v of views.values()) tally[v.status] = (tally[v.status] ?? 0) + 1;
    for (const [status, n] of Object.entries(res.body.byStatus)) expect(n, status).toBe(tally[status] ?? 0);
  });

  it("the dashboard adds due within 7 days, tools not returned, due per week for 12 weeks and sheets awaiting signature", async () => {
    const res = await (await t.agent("crib")).get("/api/stats/dashboard");
    expect(res.body).toMatchObject({ dueWithin7Days: 1, dueWithin30Days: 2, notReturned: 1, sheetsAwaitingSignature: 1, investigationsNeedingDisposition: 1, totalTools: 7, today: "2026-06-15" });
    expect(res.body.dueByWeek).toHaveLength(12);
    expect(res.body.dueByWeek[0]).toEqual({ weekStart: "2026-06-15", weekEnd: "2026-06-21", count: 1 });
    expect(res.body.dueByWeek[3].count).toBe(1);
    expect(res.body.dueByWeek.reduce((a: number, w: { count: number }) => a + w.count, 0)).toBe(2);
  });

  it("a mechanic sees the tools in their custody and their own, with due dates, and their unsigned check sheets", async () => {
    const res = await (await t.agent("mechanic")).get("/api/stats/mine");
    expect(res.body.tools.map((x: { assetTag: string; relation: string; dueAt: string }) => [x.assetTag, x.relation, x.dueAt])).toEqual([
      ["OV-DUE5", "issued", "2026-06-20"],
      ["OV-PERS", "personal", "2027-02-01"],
    ]);
    expect(res.body.openJobs).toHaveLength(1);
    expect(res.body.openJobs[0].readings).toBe(3);
    const inspector = await (await t.agent("inspector")).get("/api/stats/mine");
    expect(inspector.body.tools).toEqual([]);
  });

  it("an inspector sees sheets with readings and no sign-off, and investigations still needing a disposition", async () => {
    const res = await (await t.agent("inspector")).get("/api/stats/inspection");
    expect(res.body.sheetsAwaitingSignature).toHaveLength(1);
    expect(res.body.investigationsNeedingDisposition[0]).toMatchObject({ toolAssetTag: "OV-DUE5", itemsAwaitingDisposition: 2 });
  });
});

describe("the audit trail", () => {
  beforeAll(async () => {
    const line = (actorId: string, entityId: string, at: string) => recordAudit(t.db, { actorId, action: "tool.update", entityType: "trail-test", entityId, at: new Date(at) });
    await line(t.people.quality.id, "MIC-A", "2026-06-01T15:00:00Z");
    await line(t.people.crib.id, "MIC-A", "2026-06-10T15:00:00Z");
    // 2026-06-12 at 23:30 in Chicago is 04:30 on the 13th in UTC: it belongs to the shop's 12th.
    await line(t.people.crib.id, "MIC-B", "2026-06-13T04:30:00Z");
  });

  it("filters by person, by record and by dates in the shop's time zone, newest first", async () => {
    const a = await t.agent("auditor");
    const byPerson = await a.get(`/api/audit?entityType=trail-test&actorId=${t.people.crib.id}`);
    expect(byPerson.body.total).toBe(2);
    expect(byPerson.body.items.map((e: { entityId: string }) => e.entityId)).toEqual(["MIC-B", "MIC-A"]);
    expect(byPerson.body.items[0].actorName).toBe(t.people.crib.name);

    const byRecord = await a.get("/api/audit?entityType=trail-test&entityId=MIC-A");
    expect(byRecord.body.total).toBe(2);

    const day = await a.get("/api/audit?entityType=trail-test&from=2026-06-12&to=2026-06-12");
    expect(day.status, JSON.stringify(day.body)).toBe(200);
    expect(day.body.items.map((e: { entityId: string }) => e.entityId)).toEqual(["MIC-B"]);
    const range = await a.get("/api/audit?entityType=trail-test&from=2026-06-02&to=2026-06-11");
    expect(range.body.total).toBe(1);
  });

  it("pages on the server", async () => {
    const res = await (await t.agent("quality")).get("/api/audit?entityType=trail-test&page=2&pageSize=2");
    expect(res.body.total).toBe(3);
    expect(res.body.items).toHaveLength(1);
    expect(res.body.items[0].entityId).toBe("MIC-A");
  });

  it("reads a long trail on by keyset, every line once and in order, and says 'more than' past 10,000 lines rather than counting them all", async () => {
    // 10,050 lines of one record type, three to an instant and instants 7 µs apart (finer than a JavaScript date):
    // a page that ends inside an instant must go on with the rest of it.
    await t.db.execute(sql`
      insert into audit_events (at, action, entity_type, entity_id)
      select timestamptz '2026-03-01T08:00:00Z' + (g / 3) * interval '7 microseconds', 'tool.update', 'trail-long', 'MIC-' || g
      from generate_series(0, 10049) g`);
    const a = await t.agent("auditor");
    const seen: number[] = [];
    const ats: string[] = [];
    let after: string | null = null;
    let pages = 0;
    do {
      const res = await a.get(`/api/audit?entityType=trail-long&pageSize=500${after ? `&after=${after}` : ""}`);
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      expect(res.body.total).toBe(10_000);
      expect(res.body.totalCapped).toBe(true);
      seen.push(...res.body.items.map((e: { id: number }) => e.id));
      ats.push(...res.body.items.map((e: { at: string }) => e.at));
      after = res.body.nextCursor;
      pages++;
    } while (after && pages < 30);
    expect(pages).toBe(21);
    expect(new Set(seen).size).toBe(10_050);
    // Newest first; lines of one instant newest (highest id) first.
    expect(ats).toEqual([...ats].sort().reverse());
    for (let i = 1; i < seen.length; i++) if (ats[i] === ats[i - 1]) expect(seen[i]).toBeLessThan(seen[i - 1]);
    // The keyset pages are the pages by number.
    const third = await a.get("/api/audit?entityType=trail-long&pageSize=500&page=3");
    expect(third.body.items.map((e: { id: number }) => e.id)).toEqual(seen.slice(1000, 1500));
    // A short list is counted exactly, and says when no page follows.
    const short = await a.get("/api/audit?entityType=trail-test");
    expect(short.body).toMatchObject({ total: 3, totalCapped: false, nextCursor: null });
  });

  it("a cursor that this list did not give is bad input", async () => {
    const res = await (await t.agent("auditor")).get("/api/audit?after=2026-03-01");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_input");
  });

  it("a person filter that is not an id is bad input", async () => {
    const res = await (await t.agent("admin")).get("/api/audit?actorId=someone");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_input");
  });

  it("lists the record types on the trail for its filter", async () => {
    const res = await (await t.agent("admin")).get("/api/audit/facets");
    expect(res.body.entityTypes).toContain("trail-test");
  });
});

describe("exports for an auditor", () => {
  it("the register export lists every tool with its status and due date", async () => {
    const res = await (await t.agent("auditor")).get("/api/exports/register.csv");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/text\/csv/);
    expect(res.headers["content-disposition"]).toMatch(/attachment; filename="tenthwise-register-2026-06-15.csv"/);
    const lines = res.text.replace(/^\uFEFF/, "").trim().split("\r\n");
    expect(lines).toHaveLength(1 + 7);
    expect(lines.find((l) => l.startsWith("OV-OVER,"))).toContain(",overdue,Overdue,no,2026-06-01,");
  });

  it("the history export has a line per calibration point", async () => {
    const res = await (await t.agent("mechanic")).get("/api/exports/history.csv");
    const lines = res.text.replace(/^\uFEFF/, "").trim().split("\r\n");
    expect(lines[0]).toMatch(/^performedAt,assetTag,/);
    expect(lines).toHaveLength(1 + 6);
  });
});
