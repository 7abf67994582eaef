import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeFamily, makeTool } from "../support/factories";
import { checksOf, makeUsableTool } from "../support/factories-crib";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => {
  t.pool.on("error", () => undefined);
  await t.close();
});

const issue = async (tag: string) => (await t.agent("crib")).post("/api/checkouts", { assetTag: tag, userEmail: t.people.mechanic.email });

describe("checks outside the tool's range", () => {
  it("a return zero check at nominal 0 on a 1–2 in micrometer is refused, nothing is recorded and the tool stays out", async () => {
    const tool = await makeUsableTool(t.db, { description: "Outside micrometer 1-2 in", rangeMin: "1", rangeMax: "2" });
    const out = await issue(tool.assetTag);
    expect(out.status).toBe(201);
    expect(out.body.tool).toMatchObject({ unit: "in", rangeMin: 1, rangeMax: 2 });
    const crib = await t.agent("crib");
    const res = await crib.post(`/api/checkouts/${out.body.id}/return`, { condition: "ok", zeroCheck: { nominal: 0, reading: 0 } });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("check_outside_range");
    expect(res.body.error.message).toMatch(/outside the range of .* \(1–2 in\)/);
    expect(res.body.error.details[0].path).toEqual(["zeroCheck", "nominal"]);
    expect(await checksOf(t.db, tool.id)).toHaveLength(0);
    const still = await crib.get(`/api/checkouts?open=true&assetTag=${tool.assetTag}`);
    expect(still.body.items).toHaveLength(1);
    // On its 1 in setting standard the same check is recorded and judged.
    const ok = await crib.post(`/api/checkouts/${out.body.id}/return`, { condition: "ok", zeroCheck: { nominal: 1, reading: 1.0001 } });
    expect(ok.status).toBe(200);
    expect(ok.body.zeroCheck).toMatchObject({ passed: true, deviation: 0.0001 });
  });

  it("an intermediate check at a point the tool cannot read is refused with the same words", async () => {
    const tool = await makeUsableTool(t.db, { rangeMin: "1", rangeMax: "2" });
    const res = await (await t.agent("crib")).post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0, reading: 0 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("check_outside_range");
    expect(res.body.error.message).toMatch(/outside the range of .* \(1–2 in\)/);
  });
});

describe("tool families", () => {
  it("the families list counts the tools of each family", async () => {
    const fam = await makeFamily(t.db, { name: "Depth micrometer 0-3 in (count)" });
    const other = await makeFamily(t.db, { name: "Depth micrometer 0-6 in (count)" });
    await makeTool(t.db, { familyId: fam.id });
    await makeTool(t.db, { familyId: fam.id });
    await makeTool(t.db, { familyId: other.id });
    const list = await (await t.agent("auditor")).get("/api/families?q=Depth micrometer");
    const count = (id: string) => list.body.items.find((f: { id: string }) => f.id === id)?.toolCount;
    expect(count(fam.id)).toBe(2);
    expect(count(other.id)).toBe(1);
  });
});

describe("the audit trail in words", () => {
  it("names actions, record types, people and records (by tag, linked to their page) instead of codes and ids", async () => {
    const tool = await makeUsableTool(t.db);
    const out = await issue(tool.assetTag);
    const crib = await t.agent("crib");
    await crib.post(`/api/checkouts/${out.body.id}/return`, { condition: "ok" });
    expect((await crib.post(`/api/tools/${tool.assetTag}/lost`, { reason: "Not found at the bench after the shift" })).status).toBe(200);

    const auditor = await t.agent("auditor");
    const checkoutLines = await auditor.get(`/api/audit?entityType=checkout&entityId=${out.body.id}`);
    expect(checkoutLines.status).toBe(200);
    const issued = checkoutLines.body.items.find((e: { action: string }) => e.action === "checkout.issue");
    expect(issued).toMatchObject({
      actionLabel: "Tool issued",
      entityTypeLabel: "Checkout",
      actorName: "Test crib",
      record: { title: `${tool.assetTag} issued to ${t.people.mechanic.name}`, path: `/tools/${tool.assetTag}` },
    });
    expect(checkoutLines.body.items.map((e: { actionLabel: string }) => e.actionLabel)).toContain("Tool returned");

    const toolLines = await auditor.get(`/api/audit?entityType=tool&entityId=${tool.assetTag}`);
    expect(toolLines.body.items[0]).toMatchObject({ action: "tool.lifecycle.lost", actionLabel: "Tool reported lost", entityTypeLabel: "Tool", record: { title: tool.assetTag, path: `/tools/${tool.assetTag}` } });

    const facets = await auditor.get("/api/audit/facets");
    expect(facets.body.entityTypeOptions).toEqual(expect.arrayContaining([{ value: "checkout", label: "Checkout" }, { value: "tool", label: "Tool" }]));
  });

  it("a record type the trail cannot name still reads as words, and a record gone from the register says so", async () => {
    const { recordAudit } = await import("../../server/modules/audit/audit.repository");
    await recordAudit(t.db, { actorId: null, action: "tool_hold.note", entityType: "tool_hold", entityId: "00000000-0000-4000-8000-000000000001" });
    const res = await (await t.agent("auditor")).get("/api/audit?entityType=tool_hold&entityId=00000000-0000-4000-8000-000000000001");
    expect(res.body.items[0]).toMatchObject({ actionLabel: "Tool hold note", entityTypeLabel: "Quarantine hold", record: null, actorName: null });
  });
});
