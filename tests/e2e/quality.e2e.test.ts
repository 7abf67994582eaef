import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, startBrowserApp, type BrowserApp } from "../support/browser";
import { seedUsers } from "../../server/seed/users.seed";
import { makeCalibration, makeCheckout, makeTool } from "../support/factories";
import { makeDriftingTool, makeJob, makeOpenInvestigation, makeRecalibratedFamily } from "../support/factories-quality";
import { addDays } from "../../shared/common/dates";
import { sql } from "drizzle-orm";

let b: BrowserApp;
let driftTag: string;
let reviewedFamilyId: string;
const DAY = 86_400_000;
beforeAll(async () => {
  // The shop is arranged here (relative to today) so the dashboards have known numbers whatever the demo seed holds.
  b = await startBrowserApp({ seed: false });
  const people = await seedUsers(b.db, DEMO_PASSWORD);
  const today = new Date().toISOString().slice(0, 10);
  const ago = (days: number) => new Date(Date.now() - days * DAY);
  reviewedFamilyId = (await makeRecalibratedFamily(b.db, { inTolerance: 15, outOfTolerance: 5, firstDate: addDays(today, -565) })).family.id;
  await makeRecalibratedFamily(b.db, { inTolerance: 6, outOfTolerance: 0, firstDate: addDays(today, -700), intervalDays: 365 });
  const dueIn = async (tag: string, days: number) => {
    const tool = await makeTool(b.db, { assetTag: tag });
    await makeCalibration(b.db, tool.id, { performedAt: ago(365 - days), nextDueAt: addDays(today, days) });
    return tool;
  };
  const issued = await dueIn("MIC-0301", 5);
  await dueIn("MIC-0302", 20);
  await dueIn("MIC-0303", -3);
  await dueIn("MIC-0304", 60);
  const personal = await makeTool(b.db, { assetTag: "MIC-P-31", ownerType: "personal", ownerUserId: people.mechanic.id });
  await makeCalibration(b.db, personal.id, { performedAt: ago(100), nextDueAt: addDays(today, 265) });
  await makeCheckout(b.db, issued.id, people.mechanic.id, { issuedAt: ago(0.1), dueBackAt: new Date(Date.now() + 0.2 * DAY) });
  await makeJob(b.db, { openedBy: people.mechanic.id, readingsBy: people.mechanic.id, readings: 4, at: ago(1) });
  await makeOpenInvestigation(b.db, issued.id, 2);
  // Older lines on the trail than one page holds (the tool register's edits of last month), for its paging.
  await b.db.execute(sql`
    insert into audit_events (at, actor_id, action, entity_type, entity_id)
    select now() - interval '30 days' + g * interval '1 minute', ${people.quality.id}::uuid, 'tool.update', 'tool', 'MIC-0304'
    from generate_series(1, 60) g`);
  driftTag = (
    await makeDriftingTool(b.db, [
      { date: addDays(today, -700), asFound: "0.50000" },
      { date: addDays(today, -400), asFound: "0.50003" },
      { date: addDays(today, -60), asFound: "0.50006" },
    ])
  ).assetTag;
});
afterAll(async () => b?.close());

describe("the quality overview in the browser", () => {
  it("the quality manager's dashboard shows what is due and overdue, and a count opens the filtered register", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "quality");
    const main = page.getByRole("main");
    await main.getByText("Falling due, next 12 weeks").waitFor();
    const overdue = main.getByRole("link", { name: /^\d+ ?Overdue ?Do not use ?\. Open the list\.$/ });
    await expect(overdue.count()).resolves.toBe(1);
    await expect(main.getByRole("link", { name: /Due within 7 days/ }).count()).resolves.toBe(1);
    await expect(main.getByRole("link", { name: /Not returned/ }).count()).resolves.toBe(1);
    await expect(main.getByText("In tolerance at recalibration, by family").count()).resolves.toBe(1);
    await expect(main.getByRole("complementary", { name: "Cautions" }).count()).resolves.toBe(1);
    // Each week's bar opens the tools falling due that week.
    await expect(main.getByRole("link", { name: /^Week of \d\d-\d\d: \d+ tools falling due\. Open the list\.$/ }).count()).resolves.toBe(12);
    await b.screenshot(page, "quality-dashboard-quality");
    await overdue.click();
    await page.waitForURL(/\/tools\?status=overdue/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a mechanic's dashboard lists their tools with due dates and their open check sheets", async () => {
    const { page, context, errors } = await b.newPage({ width: 820, height: 1180 });
    await b.signIn(page, "mechanic");
    const main = page.getByRole("main");
    await main.getByText("My tools and their due dates").waitFor();
    await expect(main.getByRole("link", { name: "MIC-0301" }).count()).resolves.toBe(1);
    await expect(main.getByRole("link", { name: "MIC-P-31" }).count()).resolves.toBe(1);
    await expect(main.getByText("My open check sheets").first().count()).resolves.toBe(1);
    await expect(main.getByRole("link", { name: /Falling due/ }).count()).resolves.toBe(0);
    await b.screenshot(page, "quality-dashboard-mechanic-tablet");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("an inspector sees sheets awaiting signature and investigations needing a disposition", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "inspector");
    const main = page.getByRole("main");
    await main.getByRole("heading", { name: "Waiting on inspection" }).waitFor();
    await expect(main.getByRole("link", { name: /Sheets awaiting signature/ }).count()).resolves.toBe(1);
    await b.screenshot(page, "quality-dashboard-inspector-phone");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the interval review, a tool's drift and the audit trail open for the quality manager", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "quality");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Interval analysis" }).click();
    await page.getByRole("table", { name: "Families" }).waitFor();
    await b.screenshot(page, "quality-intervals");
    await page.goto(`/analysis/intervals/${reviewedFamilyId}`);
    await page.getByText("Staircase suggestion (ILAC-G24 method 1)").waitFor();
    // 15 of 20 in tolerance on a 365-day interval: [0.509, 0.913] lies below R* 95 %, so the interval changes, to 65.1 days
    // (NCSL RP-1 method A3 and exponential model (from memory); binomial arithmetic, reference-values.md).
    await page.getByText("65.1 days (set as 65 days)").waitFor();
    await page.getByText("50.9 % – 91.3 %").first().waitFor();
    await page.getByRole("status").filter({ hasText: /Shorten to 65.1 days: 15 of 20 found in tolerance/ }).waitFor();
    await page.getByLabel("Rationale").fill("Five of twenty found out of tolerance; shorten per the reliability model.");
    await page.getByRole("button", { name: "Record decision" }).click();
    await page.getByRole("status").filter({ hasText: "Recorded; 20 tools now on the new interval." }).waitFor();
    await page.getByText("365 → 65 days").waitFor();
    await b.screenshot(page, "quality-interval-family");

    await page.goto(`/analysis/drift/${driftTag}`);
    await page.getByRole("heading", { name: `Drift: ${driftTag}` }).waitFor();
    await page.getByText(/Expected to reach the permissible error around \d{4}-\d{2}-\d{2}/).first().waitFor();
    await b.screenshot(page, "quality-drift");

    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Audit trail" }).click();
    await page.getByRole("table", { name: "Audit trail" }).getByText("Family interval changed").waitFor();
    // The change reads field by field in words, the interval from 365 to 65 days marked as changed.
    const line = page.getByRole("table", { name: "Audit trail" }).getByRole("row").filter({ hasText: "Family interval changed" }).first();
    await line.getByText("Details").click();
    const change = line.getByRole("table", { name: "Change: Family interval changed" });
    const interval = change.getByRole("row").filter({ has: page.getByRole("rowheader", { name: "Default interval days" }) });
    await expect(interval.getByRole("cell").allTextContents()).resolves.toEqual(["365", "65"]);
    await change.getByRole("rowheader", { name: "Rationale" }).waitFor();
    await b.screenshot(page, "quality-audit");
    // "Next" reads on from the last line shown (by keyset: the cursor of the page before), "Previous" goes back.
    const pager = page.getByText(/^Page 1 of \d+$/);
    await pager.waitFor();
    const onward = page.waitForRequest((r) => /\/api\/audit\?.*after=\d+_\d+/.test(r.url()));
    await page.getByRole("button", { name: "Next" }).click();
    await onward;
    await page.getByText(/^Page 2 of \d+$/).waitFor();
    await page.getByText(/^51–\d+ of \d+$/).waitFor();
    await page.getByRole("button", { name: "Previous" }).click();
    await pager.waitFor();
    await page.getByRole("table", { name: "Audit trail" }).getByText("Family interval changed").first().waitFor();
    expect(errors).toEqual([]);
    await context.close();
  });

  it("an auditor reads the interval analysis but records no decision, and may export but not import", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "auditor");
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.getByRole("link", { name: "Interval analysis" }).click();
    await page.getByRole("table").getByRole("link").first().click();
    await page.waitForURL(/\/analysis\/intervals\/.+/);
    await page.getByRole("heading", { name: "Interval test (NCSL RP-1 method A3) and reliability model" }).waitFor();
    await expect(page.getByRole("heading", { name: "Record an interval decision" }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Record decision" }).count()).resolves.toBe(0);
    await nav.getByRole("link", { name: "Import and export" }).click();
    await page.getByRole("link", { name: "Download the register (CSV)" }).waitFor();
    await expect(page.getByRole("button", { name: "Check the file" }).count()).resolves.toBe(0);
    await b.screenshot(page, "quality-transfers-auditor");
    expect(errors).toEqual([]);
    await context.close();
  });
});
