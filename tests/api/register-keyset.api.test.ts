import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCalibration, makeFamily, makeTool } from "../support/factories";
import { makeHold } from "../support/factories-quality";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  const family = await makeFamily(t.db);
  // Eleven overdue tools (three share a due date), two in calibration, one quarantined, one never calibrated.
  const due = ["2026-01-05", "2026-02-10", "2026-02-10", "2026-02-10", "2026-03-01", "2026-03-20", "2026-04-02", "2026-04-30", "2026-05-15", "2026-06-01", "2026-06-14", "2026-12-01", "2027-01-01"];
  for (const [i, d] of due.entries()) {
    const tool = await makeTool(t.db, { familyId: family.id, assetTag: `KS-${String(20 - i).padStart(2, "0")}`, description: `Demo caliper ${i}` });
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2025-06-01T15:00:00Z"), nextDueAt: d });
  }
  const held = await makeTool(t.db, { familyId: family.id, assetTag: "KS-HELD" });
  await makeCalibration(t.db, held.id, { performedAt: new Date("2025-06-01T15:00:00Z"), nextDueAt: "2026-02-01" });
  await makeHold(t.db, held.id, new Date("2026-06-01T15:00:00Z"));
  await makeTool(t.db, { familyId: family.id, assetTag: "KS-NEVER" });
});
afterAll(() => t.close());

type Page = { items: { assetTag: string; status: string; dueAt: string | null }[]; total: number; nextCursor: string | null };

async function walk(query: string, pageSize: number) {
  const agent = await t.agent("mechanic");
  const seen: Page["items"] = [];
  let after: string | null = null;
  for (let i = 0; i < 20; i++) {
    const res = await agent.get(`/api/tools?${query}&pageSize=${pageSize}${after ? `&after=${after}` : ""}`);
    expect(res.status).toBe(200);
    const page = res.body as Page;
    seen.push(...page.items);
    after = page.nextCursor;
    if (!after) return { seen, total: page.total };
  }
  throw new Error("the cursor never ran out");
}

describe("the register pages by cursor (?after=nextCursor)", () => {
  it("walks the overdue tools by due date, oldest first, ties by asset tag, each once, the quarantined one left out", async () => {
    const { seen, total } = await walk("status=overdue&sort=dueAt&q=KS-", 4);
    expect(total).toBe(11);
    expect(seen.map((x) => `${x.dueAt} ${x.assetTag}`)).toEqual([
      "2026-01-05 KS-20",
      "2026-02-10 KS-17",
      "2026-02-10 KS-18",
      "2026-02-10 KS-19",
      "2026-03-01 KS-16",
      "2026-03-20 KS-15",
      "2026-04-02 KS-14",
      "2026-04-30 KS-13",
      "2026-05-15 KS-12",
      "2026-06-01 KS-11",
      "2026-06-14 KS-10",
    ]);
    expect(new Set(seen.map((x) => x.status))).toEqual(new Set(["overdue"]));
  });

  it("gives the same rows as numbered pages, newest due date first with the never-calibrated tool last", async () => {
    const { seen } = await walk("sort=-dueAt&q=KS-", 3);
    const agent = await t.agent("mechanic");
    const numbered: Page["items"] = [];
    for (let page = 1; page <= 6; page++) numbered.push(...((await agent.get(`/api/tools?sort=-dueAt&q=KS-&pageSize=3&page=${page}`)).body as Page).items);
    expect(seen.map((x) => x.assetTag)).toEqual(numbered.map((x) => x.assetTag));
    expect(seen).toHaveLength(15);
    expect(seen[0]).toMatchObject({ assetTag: "KS-08", dueAt: "2027-01-01", status: "in_calibration" });
    expect(seen.at(-1)).toMatchObject({ assetTag: "KS-NEVER", dueAt: null, status: "never_calibrated" });
  });

  it("refuses a cursor it did not issue (400)", async () => {
    const res = await (await t.agent("mechanic")).get("/api/tools?after=bm90LWEtY3Vyc29y");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("bad_cursor");
  });
});
