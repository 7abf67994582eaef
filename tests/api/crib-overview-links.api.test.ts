import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCheckout } from "../support/factories";
import { makeUsableTool } from "../support/factories-crib";

// "Not returned" on the overview leads to the custody board filtered with ?overdue=true
// (src/features/overview/components/links.ts): the count and the list's total are the same tools.

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => {
  t.pool.on("error", () => undefined);
  await t.close();
});

const tags = (page: { items: { tool: { assetTag: string } }[] }) => page.items.map((c) => c.tool.assetTag).sort();

describe("tools not returned by their due-back time", () => {
  it("the overview's count of tools not returned equals the total of the custody list it opens; returned tools and tools not yet due back are not counted", async () => {
    const mechanic = t.people.mechanic.id;
    const late = await makeUsableTool(t.db);
    const dueNow = await makeUsableTool(t.db);
    const dueTonight = await makeUsableTool(t.db);
    const backLate = await makeUsableTool(t.db);
    await makeCheckout(t.db, late.id, mechanic, { issuedAt: new Date("2026-06-14T13:00:00Z"), dueBackAt: new Date("2026-06-14T22:00:00Z") });
    await makeCheckout(t.db, dueNow.id, mechanic, { dueBackAt: new Date("2026-06-15T15:00:00Z") });
    await makeCheckout(t.db, dueTonight.id, mechanic, { dueBackAt: new Date("2026-06-15T22:00:00Z") });
    await makeCheckout(t.db, backLate.id, mechanic, {
      issuedAt: new Date("2026-06-13T13:00:00Z"),
      dueBackAt: new Date("2026-06-13T22:00:00Z"),
      returnedAt: new Date("2026-06-14T14:00:00Z"),
      returnCondition: "ok",
    });
    const quality = await t.agent("quality");

    const count = async () => (await quality.get("/api/stats/dashboard")).body.notReturned as number;
    const list = async () => (await quality.get("/api/checkouts?open=true&overdue=true")).body;

    // Due back at this very minute is not yet late; only the tool due yesterday is.
    const now = await list();
    expect(tags(now)).toEqual([late.assetTag]);
    expect(await count()).toBe(now.total);
    expect(now.items[0].notBackInTime).toBe(true);

    // After the end of the shift the tool due tonight is late too; the count follows the list.
    t.clock.set("2026-06-15T22:30:00Z");
    const evening = await list();
    expect(tags(evening)).toEqual([late.assetTag, dueNow.assetTag, dueTonight.assetTag].sort());
    expect(await count()).toBe(evening.total);
    expect(evening.total).toBe(3);

    // overdue=false is the rest of the board: out, and not yet due back.
    t.clock.set("2026-06-15T15:00:00Z");
    expect(tags((await quality.get("/api/checkouts?open=true&overdue=false")).body)).toEqual([dueNow.assetTag, dueTonight.assetTag].sort());

    // Returning the late tool takes it off the list and off the count.
    const crib = await t.agent("crib");
    expect((await crib.post(`/api/checkouts/${now.items[0].id}/return`, { condition: "ok" })).status).toBe(200);
    expect((await list()).total).toBe(0);
    expect(await count()).toBe(0);
  });

  it("a not-returned filter that is neither true nor false is bad input: 400", async () => {
    const res = await (await t.agent("crib")).get("/api/checkouts?open=true&overdue=yes");
    expect(res.status).toBe(400);
    expect(res.body.error.details).toBeTruthy();
  });
});
