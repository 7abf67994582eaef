import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeTool } from "../support/factories";
import { makeOpenInvestigation } from "../support/factories-quality";

// "Items awaiting a disposition" is read from investigation_tallies, kept by database triggers with every affected
// item and disposition added. Each check compares it with the count taken from the records themselves (the definition:
// an item waits until it has at least one disposition; a disposition that replaces another does not count it again).
// Common practice, no source.

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(() => t.close());

/** Items of the investigation without any disposition, counted from the records. */
async function waitingFromRecords(id: string): Promise<number> {
  const r = await t.db.execute(sql`
    select count(*)::int as n from investigation_items i
    where i.investigation_id = ${id} and not exists (select 1 from dispositions d where d.investigation_item_id = i.id)`);
  return Number((r.rows[0] as { n: number }).n);
}

async function itemIds(id: string): Promise<string[]> {
  const res = await (await t.agent("quality")).get(`/api/investigations/${id}/items?page=1&pageSize=50`);
  expect(res.status).toBe(200);
  return res.body.items.map((i: { id: string }) => i.id);
}

const dispose = async (id: string, ids: string[], kind = "no_impact", rationale = "Re-measured part well inside limits.") =>
  (await t.agent("quality")).post(`/api/investigations/${id}/dispositions`).send({ itemIds: ids, kind, rationale });

async function awaiting(id: string): Promise<number | null> {
  const res = await (await t.agent("inspector")).get("/api/stats/inspection");
  const row = res.body.investigationsNeedingDisposition.find((x: { id: string }) => x.id === id);
  return row ? row.itemsAwaitingDisposition : null;
}

describe("items awaiting a disposition", () => {
  it("counts each affected item until its first disposition; a replaced disposition does not count it twice", async () => {
    const tool = await makeTool(t.db, { assetTag: "TALLY-1" });
    const inv = await makeOpenInvestigation(t.db, tool.id, 4);
    const ids = await itemIds(inv.id);
    expect(ids).toHaveLength(4);
    expect(await awaiting(inv.id)).toBe(4);

    // Two items in one disposition.
    expect((await dispose(inv.id, ids.slice(0, 2))).status).toBe(201);
    expect(await awaiting(inv.id)).toBe(2);
    expect(await waitingFromRecords(inv.id)).toBe(2);

    // Changing the mind about one of them replaces its disposition: it is still disposed of, once.
    expect((await dispose(inv.id, [ids[0]], "recall", "Part recalled for re-inspection.")).status).toBe(201);
    expect(await awaiting(inv.id)).toBe(2);
    // The affected-items page says the same, for the whole investigation and for the items whose verdict could change.
    const page = await (await t.agent("quality")).get(`/api/investigations/${inv.id}/items?page=1&pageSize=50`);
    expect(page.body.totals).toMatchObject({ items: 4, undisposed: 2 });
    const couldChange = await (await t.agent("quality")).get(`/api/investigations/${inv.id}/items?page=1&pageSize=50&couldChange=true`);
    expect(couldChange.body.totals).toMatchObject({ items: 4, undisposed: 2 });

    // One already disposed of and one not, together: only the new one comes off.
    expect((await dispose(inv.id, [ids[1], ids[2]])).status).toBe(201);
    expect(await awaiting(inv.id)).toBe(1);
    expect(await waitingFromRecords(inv.id)).toBe(1);

    const listed = await (await t.agent("quality")).get(`/api/investigations?awaitingDisposition=true&pageSize=100`);
    expect(listed.body.map((i: { id: string }) => i.id)).toContain(inv.id);

    // The last one: the investigation leaves the inspector's list and the list of those awaiting a disposition.
    expect((await dispose(inv.id, [ids[3]])).status).toBe(201);
    expect(await awaiting(inv.id)).toBeNull();
    expect(await waitingFromRecords(inv.id)).toBe(0);
    const none = await (await t.agent("quality")).get(`/api/investigations?awaitingDisposition=true&pageSize=100`);
    expect(none.body.map((i: { id: string }) => i.id)).not.toContain(inv.id);
    const done = await (await t.agent("quality")).get(`/api/investigations?awaitingDisposition=false&pageSize=100`);
    expect(done.body.map((i: { id: string }) => i.id)).toContain(inv.id);
  });

  it("two people disposing of the same items at once leave them counted once", async () => {
    const tool = await makeTool(t.db, { assetTag: "TALLY-2" });
    const inv = await makeOpenInvestigation(t.db, tool.id, 3);
    const ids = await itemIds(inv.id);
    const answers = await Promise.all([dispose(inv.id, ids.slice(0, 2)), dispose(inv.id, ids.slice(0, 2), "notify_owner", "Owner told by phone.").catch((e) => e)]);
    expect(answers.filter((a) => a.status === 201).length).toBeGreaterThanOrEqual(1);
    expect(await awaiting(inv.id)).toBe(await waitingFromRecords(inv.id));
    expect(await awaiting(inv.id)).toBe(1);
  });

  it("an investigation with no affected item awaits nothing", async () => {
    const tool = await makeTool(t.db, { assetTag: "TALLY-3" });
    const inv = await makeOpenInvestigation(t.db, tool.id, 0);
    expect(await awaiting(inv.id)).toBeNull();
    const listed = await (await t.agent("quality")).get(`/api/investigations?awaitingDisposition=false&pageSize=100`);
    expect(listed.body.map((i: { id: string }) => i.id)).toContain(inv.id);
  });

  it("the app cannot write the tallies itself", async () => {
    const tool = await makeTool(t.db, { assetTag: "TALLY-4" });
    const inv = await makeOpenInvestigation(t.db, tool.id, 1);
    const refused = await t.db.execute(sql`update investigation_tallies set disposed_items = items where investigation_id = ${inv.id}`).then(
      () => null,
      (e: { cause?: { code?: string } }) => e.cause?.code,
    );
    expect(refused).toBe("42501");
    expect(await awaiting(inv.id)).toBe(1);
  });
});
