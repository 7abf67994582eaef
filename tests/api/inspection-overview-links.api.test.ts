import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeLimitTable } from "../support/factories-inspection";
import { makeUsableTool } from "../support/factories-crib";
import * as inv from "../support/factories-investigations";
import { users } from "../../server/db/schema";
import { eq } from "drizzle-orm";

// The counts on the overview lead to filtered lists (src/features/overview/components/links.ts); a count and
// the list it opens must agree, whatever the sheets and investigations hold.

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  // An inspector signs with the certificate number on her record.
  await t.db.update(users).set({ certificateNumber: "IA-LINKS" }).where(eq(users.id, t.people.inspector.id));
});
afterAll(async () => t?.close());

const ids = (page: { items: { id: string }[] }) => page.items.map((i) => i.id).sort();

describe("check sheets awaiting signature", () => {
  it("the inspector's count of sheets awaiting signature equals the total of the list it opens, and a sheet corrected after sign-off needs signing again", async () => {
    const table = await makeLimitTable(t.db, { items: [{ key: "visual", label: "Crankcase visual", kind: "visual" }] });
    const m = await t.agent("mechanic");
    const i = await t.agent("inspector");
    const open = async (serial: string) => (await m.post("/api/jobs", { limitTableId: table.id, engineSerial: serial })).body as { id: string };

    const empty = await open("AWS-EMPTY"); // opened, nothing measured: open, nothing to sign yet
    const measured = await open("AWS-MEASURED"); // measured, not signed: awaiting
    const signed = await open("AWS-SIGNED"); // measured and signed
    const corrected = await open("AWS-CORRECTED"); // signed, then a reading corrected: awaiting again
    for (const j of [measured, signed, corrected]) expect((await m.post(`/api/jobs/${j.id}/readings`, { itemKey: "visual", visualResult: "serviceable" })).status).toBe(201);
    for (const j of [signed, corrected]) expect((await i.post(`/api/jobs/${j.id}/sign`, { certificateNumber: "IA-LINKS" })).status).toBe(200);
    t.clock.set("2026-06-15T16:00:00Z");
    const sheet = (await m.get(`/api/jobs/${corrected.id}`)).body;
    const readingId = sheet.items[0].rows[0].reading.id;
    expect((await m.post(`/api/readings/${readingId}/supersede`, { reason: "Recorded on the wrong engine", visualResult: "serviceable" })).status).toBe(201);

    const stats = (await i.get("/api/stats/inspection")).body;
    const list = (await i.get("/api/jobs?status=awaiting_signature")).body;
    expect(list.total).toBe(2);
    expect(ids(list)).toEqual([measured.id, corrected.id].sort());
    expect(stats.sheetsTotal).toBe(list.total);
    expect(stats.sheetsAwaitingSignature.map((s: { id: string }) => s.id).sort()).toEqual(ids(list));
    // The shop dashboard carries the same count.
    expect((await (await t.agent("quality")).get("/api/stats/dashboard")).body.sheetsAwaitingSignature).toBe(list.total);

    // Open = not signed, measured or not; signed = signed and nothing corrected since.
    expect(ids((await i.get("/api/jobs?status=open")).body)).toEqual([empty.id, measured.id, corrected.id].sort());
    expect(ids((await i.get("/api/jobs?status=signed")).body)).toEqual([signed.id]);

    // Signing the outstanding sheets empties the list and the count together.
    for (const j of [measured, corrected]) expect((await i.post(`/api/jobs/${j.id}/sign`, { certificateNumber: "IA-LINKS" })).status).toBe(200);
    expect((await i.get("/api/stats/inspection")).body.sheetsTotal).toBe(0);
    expect((await i.get("/api/jobs?status=awaiting_signature")).body.total).toBe(0);
    t.clock.set("2026-06-15T15:00:00Z");
  });

  it("a mechanic's open check sheets on the overview are the jobs list's open sheets that are theirs, a corrected signed sheet among them", async () => {
    const table = await makeLimitTable(t.db, { items: [{ key: "visual", label: "Cylinder visual", kind: "visual" }] });
    const m = await t.agent("mechanic");
    const i = await t.agent("inspector");
    const own = (await m.post("/api/jobs", { limitTableId: table.id, engineSerial: "MINE-OWN" })).body;
    const corrected = (await m.post("/api/jobs", { limitTableId: table.id, engineSerial: "MINE-CORRECTED" })).body;
    const signed = (await m.post("/api/jobs", { limitTableId: table.id, engineSerial: "MINE-SIGNED" })).body;
    for (const j of [corrected, signed]) {
      await m.post(`/api/jobs/${j.id}/readings`, { itemKey: "visual", visualResult: "serviceable" });
      expect((await i.post(`/api/jobs/${j.id}/sign`, { certificateNumber: "IA-LINKS" })).status).toBe(200);
    }
    t.clock.set("2026-06-15T17:00:00Z");
    const readingId = (await m.get(`/api/jobs/${corrected.id}`)).body.items[0].rows[0].reading.id;
    expect((await m.post(`/api/readings/${readingId}/supersede`, { reason: "Wrong cylinder noted", visualResult: "serviceable" })).status).toBe(201);

    // A sheet quality opened becomes the mechanic's with their first reading on it; one they never touched does not.
    const q = await t.agent("quality");
    const measuredThere = (await q.post("/api/jobs", { limitTableId: table.id, engineSerial: "MINE-MEASURED" })).body;
    const untouched = (await q.post("/api/jobs", { limitTableId: table.id, engineSerial: "MINE-UNTOUCHED" })).body;
    expect((await m.post(`/api/jobs/${measuredThere.id}/readings`, { itemKey: "visual", visualResult: "serviceable" })).status).toBe(201);

    const mine = (await m.get("/api/stats/mine")).body.openJobs.map((j: { id: string }) => j.id).sort();
    const list = (await m.get("/api/jobs?status=open&mine=true&pageSize=200")).body;
    expect(ids(list)).toEqual(expect.arrayContaining([own.id, corrected.id, measuredThere.id]));
    expect(ids(list)).not.toContain(signed.id);
    expect(ids(list)).not.toContain(untouched.id);
    expect(mine).toEqual(ids(list));
    expect(list.total).toBe(mine.length);
    // Newest activity first: the sheets read on at 17:00 come before the one opened at 15:00 and never read on.
    const order = (await m.get("/api/stats/mine")).body.openJobs.map((j: { id: string }) => j.id);
    expect(order.indexOf(corrected.id)).toBeLessThan(order.indexOf(own.id));
    expect(order.indexOf(measuredThere.id)).toBeLessThan(order.indexOf(own.id));
    t.clock.set("2026-06-15T15:00:00Z");
  });

  it("an unknown sheet status is bad input: 400 naming the allowed values", async () => {
    const res = await (await t.agent("inspector")).get("/api/jobs?status=waiting");
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body.error.details)).toContain("awaiting_signature");
  });
});

describe("open investigations", () => {
  it("the count of open investigations equals the total of the open investigations list, and a tool's investigations list by its tag", async () => {
    const crib = await t.agent("crib");
    const quality = await t.agent("quality");
    const lostA = await makeUsableTool(t.db);
    const lostB = await makeUsableTool(t.db);
    const a = (await crib.post(`/api/tools/${lostA.assetTag}/lost`, { reason: "Not at the bench after the shift" })).body;
    const b = (await crib.post(`/api/tools/${lostB.assetTag}/lost`, { reason: "Not at the bench after the shift" })).body;
    expect(a.investigationId).toBeTruthy();
    expect(b.investigationId).toBeTruthy();
    const closed = await quality.post(`/api/investigations/${b.investigationId}/close`, { summary: "No readings were taken with it; nothing affected." });
    expect(closed.status).toBe(200);

    const overview = (await quality.get("/api/stats/overview")).body;
    const dashboard = (await quality.get("/api/stats/dashboard")).body;
    const list = await quality.get("/api/investigations?status=open");
    expect(list.status).toBe(200);
    const total = Number(list.headers["x-total-count"]);
    expect(total).toBe(1);
    expect(list.body.map((v: { id: string }) => v.id)).toEqual([a.investigationId]);
    expect(overview.openInvestigations).toBe(total);
    expect(dashboard.openInvestigations).toBe(total);

    const ofTool = await quality.get(`/api/investigations?status=open&toolAssetTag=${lostB.assetTag}`);
    expect(ofTool.body).toEqual([]);
    const allOfTool = await quality.get(`/api/investigations?toolAssetTag=${lostB.assetTag}`);
    expect(allOfTool.body.map((v: { id: string; status: string }) => [v.id, v.status])).toEqual([[b.investigationId, "closed"]]);
  });

  it("the count of investigations needing a disposition equals the list it opens, and a decided item takes its investigation off it", async () => {
    const crib = await t.agent("crib");
    const quality = await t.agent("quality");
    const tool = await makeUsableTool(t.db);
    const { table } = await inv.makeLimitTable(t.db);
    const job = await inv.makeJob(t.db, table.id);
    await inv.makeReading(t.db, { jobId: job.id, itemKey: "stem", kind: "journal", values: ["0.4337", "0.4338"], takenAt: t.clock.now(), toolIds: [tool.id] });
    const lost = (await crib.post(`/api/tools/${tool.assetTag}/lost`, { reason: "Left on the engine stand; not found" })).body;
    const needing = async () => (await quality.get("/api/stats/inspection")).body.investigationsNeedingDisposition.length;
    const listed = async () => Number((await quality.get("/api/investigations?status=open&awaitingDisposition=true")).headers["x-total-count"]);
    const before = await needing();
    expect(await listed()).toBe(before);
    expect((await quality.get("/api/investigations?status=open&awaitingDisposition=true")).body.map((v: { id: string }) => v.id)).toContain(lost.investigationId);

    const affected = (await quality.get(`/api/investigations/${lost.investigationId}/items`)).body;
    const decided = await quality.post(`/api/investigations/${lost.investigationId}/dispositions`, {
      itemIds: affected.items.map((i: { id: string }) => i.id),
      kind: "no_impact",
      rationale: "Stem read 0.0003 in inside both limits; the part was also checked with a second micrometer in calibration.",
    });
    expect(decided.status).toBe(201);
    expect(await needing()).toBe(before - 1);
    expect(await listed()).toBe(before - 1);
  });

  it("an unknown investigation status is bad input: 400", async () => {
    expect((await (await t.agent("quality")).get("/api/investigations?status=pending")).status).toBe(400);
  });
});
