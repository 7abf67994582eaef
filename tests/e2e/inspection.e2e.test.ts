import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startBrowserApp, DEMO_PASSWORD, type BrowserApp } from "../support/browser";
import { seedUsers } from "../../server/seed/users.seed";
import { makeCheckout } from "../support/factories";
import { makeLimitTable, makeJob, makeToolInCalibration } from "../support/factories-inspection";

// The world is built here (people, tools in calibration, a limits table, a job) so the check sheet can be driven
// on its own; dates are relative to the real clock the browser app runs on.
const DAY = 86_400_000;
const day = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);

let app: BrowserApp;
let jobId: string;
let openedAt: Date;
let tags: { mic: string; tel: string; overdue: string };

beforeAll(async () => {
  app = await startBrowserApp({ seed: false });
  const people = await seedUsers(app.db, DEMO_PASSWORD);
  const table = await makeLimitTable(app.db, {
    engineModel: "Harrow HF-360 (demo, invented)",
    name: "Pin and bore (demo)",
    items: [
      { key: "pin", label: "Piston pin dia.", section: "Piston and pin", kind: "journal", min: 1.124, max: 1.125 },
      { key: "pin_bore", label: "Piston pin bore", section: "Piston and pin", kind: "bore", min: 1.1265, max: 1.128, serviceableMax: 1.1295 },
      { key: "pin_clearance", label: "Pin to piston clearance", section: "Piston and pin", kind: "clearance", boreKey: "pin_bore", journalKey: "pin", min: 0.001, max: 0.0045 },
    ],
  });
  openedAt = new Date(Date.now() - 3600_000);
  const job = await makeJob(app.db, table.id, people.mechanic.id, { engineSerial: "HF360-E2E-1", engineModel: "Harrow HF-360 (demo, invented)", openedAt });
  jobId = job.id;
  const inCal = { performedAt: new Date(Date.now() - 30 * DAY).toISOString(), nextDueAt: day(300) };
  const mic = await makeToolInCalibration(app.db, { ...inCal, rangeMin: "1", rangeMax: "2" });
  const tel = await makeToolInCalibration(app.db, { ...inCal, kind: "telescoping_gauge", rangeMin: "0.3125", rangeMax: "6" });
  const overdue = await makeToolInCalibration(app.db, { performedAt: new Date(Date.now() - 400 * DAY).toISOString(), nextDueAt: day(-10), rangeMin: "1", rangeMax: "2" });
  for (const t of [mic, tel, overdue]) await makeCheckout(app.db, t.id, people.mechanic.id, { issuedAt: new Date(Date.now() - 3600_000), dueBackAt: new Date(Date.now() + 8 * 3600_000) });
  tags = { mic: mic.assetTag, tel: tel.assetTag, overdue: overdue.assetTag };
});
afterAll(async () => app?.close());

describe("filling a check sheet on a tablet", () => {
  it("a mechanic types a pin and its bore, sees size, clearance and verdict as they type, saves them, and an overdue micrometer is refused with its reason", async () => {
    const { page, errors } = await app.newPage({ width: 1024, height: 768 });
    await app.signIn(page, "mechanic");
    await page.goto(`/jobs/${jobId}`);
    await page.getByRole("heading", { name: /Check sheet — HF360-E2E-1/ }).waitFor();
    await expect(page.getByRole("note").filter({ hasText: "Demo limits" }).count()).resolves.toBe(1);

    // An overdue micrometer: refused, with the reason from the register.
    await page.getByRole("button", { name: "Measure Piston pin dia. no. 1" }).click();
    await page.getByLabel("Piston pin dia. no. 1, direction 1").fill("1.1250");
    await page.getByLabel("Piston pin dia. no. 1, direction 2").fill("1.1247");
    await page.getByLabel("Piston pin dia. no. 1, micrometer tag").fill(tags.overdue);
    await expect(page.getByLabel("Live result for Piston pin dia. no. 1").innerText()).resolves.toContain("Size 1.1247 in");
    await page.getByRole("button", { name: "Save reading" }).click();
    const refusal = page.getByRole("alert").filter({ hasText: "may not be used now" });
    await refusal.waitFor();
    await expect(refusal.innerText()).resolves.toMatch(/Calibration ran out on \d{4}-\d{2}-\d{2}/);
    await app.screenshot(page, "inspection-refused-tool");

    // The right micrometer: saved.
    await page.getByLabel("Piston pin dia. no. 1, micrometer tag").fill(tags.mic);
    await page.getByRole("button", { name: "Save reading" }).click();
    const pinRow = page.getByLabel("Piston pin dia. no. 1", { exact: true });
    await pinRow.getByText(/^size 1\.1247 in/).waitFor();

    // The bore: gauge and micrometer; the clearance shows live before saving.
    await page.getByRole("button", { name: "Measure Piston pin bore no. 1" }).click();
    await page.getByLabel("Piston pin bore no. 1, direction 1").fill("1.1271");
    await page.getByLabel("Piston pin bore no. 1, direction 2").fill("1.1273");
    await page.getByLabel("Piston pin bore no. 1, gauge tag").fill(tags.tel);
    await page.getByLabel("Piston pin bore no. 1, micrometer tag").fill(tags.mic);
    const live = page.getByLabel("Live result for Piston pin bore no. 1");
    await live.getByText("Pin to piston clearance: 0.0026 loose loosest, 0.0021 loose tightest — Within new limits").waitFor();
    await expect(page.getByLabel("Pin to piston clearance no. 1").innerText()).resolves.toContain("0.0026 loose");
    await app.screenshot(page, "inspection-live-clearance");
    await page.getByRole("button", { name: "Save reading" }).click();
    await page.getByLabel("Piston pin bore no. 1", { exact: true }).getByText(/^size 1\.1273 in/).waitFor();
    const saved = page.getByLabel("Pin to piston clearance no. 1");
    await saved.getByText("Within new limits").waitFor();
    await expect(saved.innerText()).resolves.not.toContain("as typed");
    await app.screenshot(page, "inspection-saved-sheet");
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("an inspector reviews the tools and signs with a certificate number; the sheet is then locked", async () => {
    const { page, errors } = await app.newPage({ width: 1024, height: 768 });
    await app.signIn(page, "inspector");
    await page.goto(`/jobs/${jobId}`);
    const tools = page.getByRole("table", { name: "Tools used" });
    await tools.getByText(tags.mic).waitFor();
    await expect(tools.innerText()).resolves.toContain(tags.tel);
    await expect(page.getByRole("button", { name: /Measure/ }).count()).resolves.toBe(0);
    // Filled in from her user record (demo inspector, IA-DEMO-40817); a number that is not hers is refused.
    const cert = page.getByLabel("Inspector certificate number");
    await expect.poll(() => cert.inputValue()).toBe("IA-DEMO-40817");
    await cert.fill("IA-DEMO-51230");
    await page.getByRole("button", { name: "Sign check sheet" }).click();
    await page.getByText(/IA-DEMO-51230 is not the one on your record/).waitFor();
    await cert.fill("IA-DEMO-40817");
    await page.getByRole("button", { name: "Sign check sheet" }).click();
    await page.getByText(/Signed by .*certificate IA-DEMO-40817/).waitFor();
    await page.getByText("Signed", { exact: true }).first().waitFor();
    await app.screenshot(page, "inspection-signed");
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("a check sheet opened straight from its link shows its times in the shop's zone, even when the shop's settings come after the sheet", async () => {
    const { page, errors } = await app.newPage({ width: 1024, height: 768 });
    await app.signIn(page, "inspector");
    // The settings (which name the shop's zone) held back until the sheet has long arrived.
    await page.route("**/api/settings", async (route) => {
      await new Promise((r) => setTimeout(r, 400));
      await route.continue();
    });
    await page.goto(`/jobs/${jobId}`);
    await page.getByRole("table", { name: "Tools used" }).waitFor();
    // The browser runs in UTC, the shop in America/Chicago: the time is the shop's, with its zone named.
    const p = Object.fromEntries(
      new Intl.DateTimeFormat("en-CA", { timeZone: "America/Chicago", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", hourCycle: "h23" })
        .formatToParts(openedAt)
        .map((x) => [x.type, x.value]),
    );
    await page.getByText(new RegExp(`^${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute} GMT-[56] by `)).waitFor();
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("on a phone (390 px) the check sheet fits the screen: nothing scrolls sideways", async () => {
    const { page, errors } = await app.newPage({ width: 390, height: 844 });
    await app.signIn(page, "mechanic");
    await page.goto(`/jobs/${jobId}`);
    await page.getByRole("table", { name: "Tools used" }).waitFor();
    await expect(page.evaluate(() => document.documentElement.scrollWidth)).resolves.toBeLessThanOrEqual(390);
    await app.screenshot(page, "inspection-sheet-phone");
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
