import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import path from "node:path";
import { startBrowserApp, DEMO_PASSWORD, SCREENSHOT_DIR, type BrowserApp } from "../support/browser";
import { seedUsers } from "../../server/seed/users.seed";
import { makeCheckout } from "../support/factories";
import { makeHold } from "../support/factories-quality";
import { makeLimitTable, makeJob, makeToolInCalibration, pinAndBoreItems } from "../support/factories-inspection";

// A check sheet entered through the keyboard grid: the pin-and-bore pair (two pistons) and a barrel measured at two
// stations, with invented demo limits. Clearance and taper figures below are worked by hand from the values typed
// (loosest = largest bore − smallest pin, tightest = smallest bore − largest pin; taper = top − bottom per direction).
const DAY = 86_400_000;
const day = (offset: number) => new Date(Date.now() + offset * DAY).toISOString().slice(0, 10);

let app: BrowserApp;
let jobId: string;
let secondJobId: string;
let tags: { mic: string; tel: string; overdue: string };
let dropped: { id: string; assetTag: string };

beforeAll(async () => {
  app = await startBrowserApp({ seed: false });
  const people = await seedUsers(app.db, DEMO_PASSWORD);
  const table = await makeLimitTable(app.db, {
    engineModel: "Harrow HF-360 (demo, invented)",
    name: "Pin, bore and barrel (demo)",
    items: [
      ...pinAndBoreItems,
      { key: "barrel_top", label: "Barrel bore, top", section: "Barrel", kind: "bore", min: 1.5, max: 1.502, serviceableMax: 1.506, directions: 2, repeat: 1, toolKinds: ["telescoping_gauge"] },
      { key: "barrel_bottom", label: "Barrel bore, bottom", section: "Barrel", kind: "bore", min: 1.5, max: 1.502, serviceableMax: 1.506, directions: 2, repeat: 1, toolKinds: ["telescoping_gauge"] },
      { key: "barrel_taper", label: "Barrel taper", section: "Barrel", kind: "taper", stationKeys: ["barrel_top", "barrel_bottom"], max: 0.0012, repeat: 1 },
    ],
  });
  const job = await makeJob(app.db, table.id, people.mechanic.id, { engineSerial: "HF360-GRID-1", engineModel: "Harrow HF-360 (demo, invented)", openedAt: new Date(Date.now() - 3600_000) });
  jobId = job.id;
  const inCal = { performedAt: new Date(Date.now() - 30 * DAY).toISOString(), nextDueAt: day(300) };
  const mic = await makeToolInCalibration(app.db, { ...inCal, rangeMin: "1", rangeMax: "2" });
  const tel = await makeToolInCalibration(app.db, { ...inCal, kind: "telescoping_gauge", rangeMin: "0.3125", rangeMax: "6" });
  const overdue = await makeToolInCalibration(app.db, { performedAt: new Date(Date.now() - 400 * DAY).toISOString(), nextDueAt: day(-10), rangeMin: "1", rangeMax: "2" });
  for (const t of [mic, tel, overdue]) await makeCheckout(app.db, t.id, people.mechanic.id, { issuedAt: new Date(Date.now() - 3600_000), dueBackAt: new Date(Date.now() + 8 * 3600_000) });
  tags = { mic: mic.assetTag, tel: tel.assetTag, overdue: overdue.assetTag };
  secondJobId = (await makeJob(app.db, table.id, people.mechanic.id, { engineSerial: "HF360-GRID-2", engineModel: "Harrow HF-360 (demo, invented)", openedAt: new Date(Date.now() - 3600_000) })).id;
  dropped = await makeToolInCalibration(app.db, { ...inCal, rangeMin: "1", rangeMax: "2" });
  await makeCheckout(app.db, dropped.id, people.mechanic.id, { issuedAt: new Date(Date.now() - 3600_000), dueBackAt: new Date(Date.now() + 8 * 3600_000) });
});
afterAll(async () => app?.close());

/** What a gauge with a data cable does: types the value and presses Enter. */
async function gauge(page: Page, value: string) {
  await page.keyboard.type(value);
  await page.keyboard.press("Enter");
}
const focusedName = (page: Page) => page.evaluate(() => document.activeElement?.getAttribute("aria-label") ?? document.activeElement?.textContent ?? "");
const row = (page: Page, place: string) => page.getByRole("row", { name: `${place} in the grid` });

describe("entering a check sheet through the keyboard grid", () => {
  it("a mechanic enters every place by keyboard alone, with values sent as keystrokes + Enter; drafts survive a reload; each place is judged as it arrives and saved", async () => {
    const { page, errors } = await app.newPage({ width: 1440, height: 900 });
    await app.signIn(page, "mechanic");
    await page.goto(`/jobs/${jobId}`);
    await page.getByRole("heading", { name: /Check sheet — HF360-GRID-1/ }).waitFor();
    await page.getByRole("button", { name: "Open the entry grid" }).focus();
    await page.keyboard.press("Enter");
    await page.getByRole("table", { name: "Entry grid" }).waitFor();
    await expect(page.evaluate(() => document.activeElement?.id)).resolves.toBe("entry-grid-tool");

    // The overdue micrometer is refused before anything is measured, with the register's reason.
    await gauge(page, tags.overdue);
    const refusal = page.getByRole("alert").filter({ hasText: `${tags.overdue} may not be used for readings` });
    await refusal.waitFor();
    await expect(refusal.innerText()).resolves.toMatch(/Calibration ran out on \d{4}-\d{2}-\d{2}/);

    // The right micrometer: in hand, and the cursor goes to the first cell.
    await gauge(page, tags.mic);
    await page.getByRole("group", { name: "Tools in hand" }).getByText(`Measuring tool: ${tags.mic}`).waitFor();
    await expect.poll(() => focusedName(page)).toBe("Piston pin dia. no. 1, direction 1");
    await gauge(page, "+1.12490"); // as a gauge sends it: signed, zero-padded
    await expect(focusedName(page)).resolves.toBe("Piston pin dia. no. 1, direction 2");
    await page.keyboard.type("1.1248");
    await page.keyboard.press("Tab");
    await expect(focusedName(page)).resolves.toBe("Piston pin dia. no. 2, direction 1");
    await gauge(page, "1.1236");
    await gauge(page, "1.1238");
    // Pin no. 1 judged as it arrived; pin no. 2 is worn under the minimum (1.1240 − 1.1236 = 0.0004).
    await row(page, "Piston pin dia. no. 1").getByText("Within new limits").waitFor();
    await expect(row(page, "Piston pin dia. no. 2").innerText()).resolves.toContain("0.0004 under the minimum 1.1240");

    // The bore is read through a telescoping gauge: its tag scanned into the cell puts it in hand too.
    await expect(focusedName(page)).resolves.toBe("Piston pin bore no. 1, direction 1");
    await gauge(page, tags.tel);
    await page.getByRole("group", { name: "Tools in hand" }).getByText(`Transfer gauge: ${tags.tel}`).waitFor();
    await expect.poll(() => focusedName(page)).toBe("Piston pin bore no. 1, direction 1");
    await gauge(page, "1.1271");
    await expect(row(page, "Piston pin bore no. 1").getByText("not saved").count()).resolves.toBe(1);
    await app.screenshot(page, "entry-grid-midway");

    // The page reloads mid-sheet: the drafts and the tools in hand are still there, marked not saved.
    await page.reload();
    await page.getByRole("table", { name: "Entry grid" }).waitFor();
    await expect(page.getByLabel("Piston pin dia. no. 1, direction 1").inputValue()).resolves.toBe("1.12490");
    await expect(page.getByLabel("Piston pin dia. no. 2, direction 2").inputValue()).resolves.toBe("1.1238");
    await expect(page.getByLabel("Piston pin bore no. 1, direction 1").inputValue()).resolves.toBe("1.1271");
    await expect(row(page, "Piston pin dia. no. 1").innerText()).resolves.toContain("Draft, not saved");
    await expect(row(page, "Piston pin dia. no. 2").innerText()).resolves.toMatch(/Outside new limits/);
    await page.getByRole("group", { name: "Tools in hand" }).getByText(`Transfer gauge: ${tags.tel}`).waitFor();
    await expect.poll(() => focusedName(page)).toBe("Piston pin bore no. 1, direction 2");

    // On through the rest of the sheet; the clearance and the taper appear beside the rows that complete them.
    await gauge(page, "1.1273");
    await expect(row(page, "Piston pin bore no. 1").innerText()).resolves.toMatch(/Pin to piston clearance:\s*0\.0025 loose loosest, 0\.0022 loose tightest\s*✓?\s*Within new limits/);
    for (const v of ["1.1270", "1.1272", "1.5012", "1.5009", "1.5004", "1.5003"]) await gauge(page, v);
    await expect(row(page, "Barrel bore, bottom no. 1").innerText()).resolves.toMatch(/Barrel taper:\s*taper 0\.0008/);
    // After the last cell the cursor is on the save button.
    await expect(page.evaluate(() => document.activeElement?.id)).resolves.toBe("entry-grid-save");
    await expect(page.evaluate(() => document.activeElement?.textContent)).resolves.toBe("Save 6 drafted places");
    await app.screenshot(page, "entry-grid-before-save");
    await page.keyboard.press("Enter");
    await page.getByRole("status").filter({ hasText: "6 places saved." }).waitFor();

    for (const place of ["Piston pin dia. no. 1", "Piston pin dia. no. 2", "Piston pin bore no. 1", "Piston pin bore no. 2", "Barrel bore, top no. 1", "Barrel bore, bottom no. 1"]) {
      await row(page, place).getByText("Saved", { exact: true }).waitFor();
    }
    await expect(row(page, "Piston pin dia. no. 2").innerText()).resolves.toMatch(/Outside new limits/);
    // The sheet below holds them as saved readings, judged by the server with the same rules.
    await page.getByLabel("Piston pin bore no. 1", { exact: true }).getByText(/^size 1\.1273 in/).waitFor();
    await expect(page.getByLabel("Pin to piston clearance no. 1").innerText()).resolves.toContain("0.0025 loose");
    await page.getByLabel("Pin to piston clearance no. 1").getByText("Within new limits").waitFor();
    await expect(page.getByLabel("Barrel taper no. 1").innerText()).resolves.toContain("taper 0.0008");
    await app.screenshot(page, "entry-grid-saved");

    // No draft is left in the browser once saved; the tools stay in hand.
    await page.reload();
    await page.getByRole("table", { name: "Entry grid" }).waitFor();
    await expect(page.getByRole("table", { name: "Entry grid" }).getByRole("textbox").count()).resolves.toBe(0);
    await page.getByRole("group", { name: "Tools in hand" }).getByText(`Measuring tool: ${tags.mic}`).waitFor();
    const kept = await page.evaluate(() => Object.entries(localStorage).filter(([k]) => k.startsWith("tenthwise.entry-grid")).map(([, v]) => JSON.parse(v) as { rows: object }));
    expect(kept.map((k) => k.rows)).toEqual([{}]);
    expect(errors).toEqual([]);
    await page.context().close();
  }, 180_000); // a whole sheet typed key by key, two reloads and six saves: longer than one page visit

  it("on a phone the grid scrolls inside its own box and adds no sideways scroll to the page", async () => {
    const { page, errors } = await app.newPage({ width: 390, height: 844 });
    await app.signIn(page, "mechanic");
    await page.goto(`/jobs/${jobId}?entry=keyboard`);
    const grid = page.getByRole("region", { name: /Entry grid/ });
    await grid.waitFor();
    // Nothing of the grid's section reaches past the screen's edge; the table scrolls inside its own box.
    const wide = await page.evaluate(() => {
      const section = document.querySelector("section[aria-labelledby=entry-grid-heading]")!;
      const out = [...section.querySelectorAll("*")].filter((e) => e.getBoundingClientRect().right > window.innerWidth && !e.closest(".overflow-x-auto"));
      return { section: section.getBoundingClientRect().right, out: out.map((e) => e.tagName) };
    });
    expect(wide.section).toBeLessThanOrEqual(390);
    expect(wide.out).toEqual([]);
    await expect(grid.evaluate((e) => e.scrollWidth > e.clientWidth)).resolves.toBe(true);
    await app.screenshot(page, "entry-grid-phone");
    await grid.screenshot({ path: path.join(SCREENSHOT_DIR, "entry-grid-phone-grid.png") });
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("a place the server refuses stays a draft, with the refusal on its row in plain words", async () => {
    const { page, errors } = await app.newPage({ width: 1440, height: 900 });
    await app.signIn(page, "mechanic");
    await page.goto(`/jobs/${secondJobId}?entry=keyboard`);
    await page.getByRole("table", { name: "Entry grid" }).waitFor();
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe("entry-grid-tool");
    await gauge(page, dropped.assetTag);
    await expect.poll(() => focusedName(page)).toBe("Piston pin dia. no. 1, direction 1");
    // A value sent while the cursor is back in the tool box still lands in the cell it was in.
    await page.getByLabel("Tool in hand: scan or type its tag, then Enter").focus();
    await gauge(page, "1.1249");
    await expect(page.getByLabel("Piston pin dia. no. 1, direction 1").inputValue()).resolves.toBe("1.1249");
    await expect(focusedName(page)).resolves.toBe("Piston pin dia. no. 1, direction 2");
    await gauge(page, "1.1248");
    // Meanwhile the micrometer is put on hold at the crib: the server refuses the reading when it is saved.
    await makeHold(app.db, dropped.id, new Date(Date.now() - 60_000), "Dropped on the shop floor");
    await page.getByRole("button", { name: "Save 1 drafted place" }).focus();
    await page.keyboard.press("Enter");
    await page.getByRole("status").filter({ hasText: "0 places saved, 1 refused" }).waitFor();
    const refused = row(page, "Piston pin dia. no. 1");
    await expect(refused.innerText()).resolves.toContain("Refused");
    await expect(refused.getByRole("alert").innerText()).resolves.toMatch(new RegExp(`${dropped.assetTag} may not be used now: .*Dropped on the shop floor`));
    // The tool box now shows why the micrometer in hand may not be used.
    await page.getByRole("group", { name: "Tools in hand" }).getByText(/✕ Quarantined.*Readings with it will be refused/).waitFor();
    await app.screenshot(page, "entry-grid-refused");
    // Still there after a reload, for the quality manager or another micrometer.
    await page.reload();
    await page.getByRole("table", { name: "Entry grid" }).waitFor();
    await expect(page.getByLabel("Piston pin dia. no. 1, direction 2").inputValue()).resolves.toBe("1.1248");
    await expect(row(page, "Piston pin dia. no. 1").getByRole("alert").innerText()).resolves.toContain("Dropped on the shop floor");
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
