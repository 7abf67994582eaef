import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { startBrowserApp, type BrowserApp } from "../support/browser";

// A count on the overview opens the list it counted (src/features/overview/components/links.ts): the list
// arrives filtered, says so with a chip that can be cleared, and holds as many records as the count said.

let b: BrowserApp;
beforeAll(async () => {
  b = await startBrowserApp();
});
afterAll(async () => b?.close());

/** The number an overview tile shows, found by its accessible name ("2 Not returned Past due-back time. Open the list."). */
async function tileCount(page: Page, label: string) {
  const tile = page.getByRole("main").getByRole("link", { name: new RegExp(`^\\d+ ?${label}( [^.]*?)? ?\\. Open the list\\.$`) });
  await tile.waitFor();
  const shown = (await tile.innerText()).trim();
  return { tile, count: Number(/^(\d+)/.exec(shown)![1]) };
}

/** Waits for the list's rows to settle, then reads the chip's total and counts the rows shown. */
async function listed(page: Page, table: string, noun: RegExp) {
  const chips = page.getByRole("group", { name: "Active filters" });
  const total = chips.getByText(noun);
  await total.waitFor();
  await page.locator(`table[aria-label="${table}"][aria-busy="false"]`).waitFor();
  const shown = Number(/(\d+)/.exec((await total.textContent()) ?? "")![1]);
  const rows = await page.getByRole("table", { name: table }).locator("tbody tr").count();
  return { chips, shown, rows };
}

async function openTile(page: Page, label: string, url: RegExp) {
  await page.goto("/");
  const { tile, count } = await tileCount(page, label);
  await tile.click();
  await page.waitForURL(url);
  return count;
}

describe("counts on the overview open the lists they count", () => {
  it("quality clicks the number of tools not returned, of open investigations and of sheets awaiting signature, and each list shows that many", async () => {
    const { page, errors } = await b.newPage();
    await b.signIn(page, "quality");

    // Tools not returned by their due-back time → the custody board, filtered.
    const notReturned = await openTile(page, "Not returned", /\/crib\/custody\?overdue=true/);
    expect(notReturned).toBeGreaterThan(0);
    const custody = await listed(page, "Tools out of the crib", /\d+ tools? out/);
    expect(custody.shown).toBe(notReturned);
    expect(custody.rows).toBe(notReturned);
    await expect(page.getByRole("checkbox", { name: "Only not back in time" }).isChecked()).resolves.toBe(true);
    await b.screenshot(page, "overview-links-not-returned");
    // Clearing the chip widens the list to every tool out.
    await custody.chips.getByRole("button", { name: "Clear filter Not returned by their due-back time" }).click();
    await page.waitForURL((u) => !u.search.includes("overdue"));
    // The address changes a moment before the page re-renders: wait for the page, not the address.
    await expect.poll(() => page.getByRole("group", { name: "Active filters" }).count()).toBe(0);
    await expect.poll(() => page.getByRole("checkbox", { name: "Only not back in time" }).isChecked()).toBe(false);

    // Open investigations → the investigations list, open ones only.
    const openInvestigations = await openTile(page, "Open investigations", /\/investigations\?status=open/);
    expect(openInvestigations).toBeGreaterThan(0);
    const inv = await listed(page, "Investigations", /\d+ investigations?/);
    expect(inv.shown).toBe(openInvestigations);
    expect(inv.rows).toBe(openInvestigations);
    await expect(page.getByRole("combobox", { name: "Filter by status" }).inputValue()).resolves.toBe("open");
    await expect(inv.chips.getByRole("button", { name: "Clear filter Open" }).count()).resolves.toBe(1);
    await b.screenshot(page, "overview-links-open-investigations");

    // Sheets awaiting signature → the check sheets, those with readings and no sign-off covering them.
    const awaiting = await openTile(page, "Sheets awaiting signature", /\/jobs\?status=awaiting_signature/);
    expect(awaiting).toBeGreaterThan(0);
    const sheets = await listed(page, "Jobs", /\d+ check sheets?/);
    expect(sheets.shown).toBe(awaiting);
    expect(sheets.rows).toBe(awaiting);
    await expect(page.getByRole("combobox", { name: "Status" }).inputValue()).resolves.toBe("awaiting_signature");
    await b.screenshot(page, "overview-links-awaiting-signature");
    await sheets.chips.getByRole("button", { name: "Clear filter Awaiting signature" }).click();
    await page.waitForURL((u) => !u.search.includes("status"));
    await expect.poll(() => page.getByRole("combobox", { name: "Status" }).inputValue()).toBe("");

    expect(errors).toEqual([]);
  });

  it("a tool's investigations open from a link with its asset tag, the tag filled in and shown as a chip", async () => {
    const { page, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "quality");
    await page.goto("/investigations?toolAssetTag=MIC-0104");
    const inv = await listed(page, "Investigations", /\d+ investigations?/);
    expect(inv.shown).toBeGreaterThan(0);
    await expect(page.getByRole("textbox", { name: "Filter by tool asset tag" }).inputValue()).resolves.toBe("MIC-0104");
    const cells = await page.getByRole("table", { name: "Investigations" }).locator("tbody tr td:first-child").allTextContents();
    expect(cells.every((c) => c.startsWith("MIC-0104"))).toBe(true);
    await b.screenshot(page, "overview-links-tool-investigations-phone");
    await inv.chips.getByRole("button", { name: "Clear filter Tool MIC-0104" }).click();
    await page.waitForURL((u) => !u.search.includes("toolAssetTag"));
    await expect.poll(() => page.getByRole("textbox", { name: "Filter by tool asset tag" }).inputValue()).toBe("");
    expect(errors).toEqual([]);
  });
});
