import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, startBrowserApp, type BrowserApp } from "../support/browser";
import { seedUsers } from "../../server/seed/users.seed";
import { makeUsableTool } from "../support/factories-crib";
import { findUserByEmail, makeCheckout } from "../support/factories";
import { addDays } from "../../shared/common/dates";

let b: BrowserApp;
const today = new Date().toISOString().slice(0, 10);
// Tools of our own, dated from the real clock the browser app runs on.
const inCalibration = (tag: string) => makeUsableTool(b.db, { assetTag: tag, description: "Outside micrometer 0-1 in (demo)" }, { performedAt: new Date(Date.now() - 30 * 86_400_000), nextDueAt: addDays(today, 300) });
const overdue = (tag: string) => makeUsableTool(b.db, { assetTag: tag, description: "Outside micrometer 1-2 in (demo)" }, { performedAt: new Date(Date.now() - 400 * 86_400_000), nextDueAt: addDays(today, -5) });

beforeAll(async () => {
  // The demo people only: the tools below are this test's own, so the counter
  // flow does not hang on the rest of the demo shop.
  b = await startBrowserApp({ seed: false });
  await seedUsers(b.db, DEMO_PASSWORD);
  await inCalibration("E2E-MIC-01");
  await overdue("E2E-MIC-02");
  await inCalibration("E2E-MIC-03");
  // Out with Ezra Okonkwo-Lind since yesterday, not back by the end of that shift.
  const late = await inCalibration("E2E-DIA-04");
  const ezra = await findUserByEmail(b.db, "okonkwo@tenthwise.test");
  await makeCheckout(b.db, late.id, ezra!.id, { issuedAt: new Date(Date.now() - 30 * 3_600_000), dueBackAt: new Date(Date.now() - 20 * 3_600_000), workOrder: "WO-DEMO-2240" });
});
afterAll(async () => {
  // Dropping the database (with force) may reach a pooled connection still
  // closing; its FATAL 57P01 is expected then, not a failure.
  b?.db.$client.on("error", () => undefined);
  await b?.close();
});

describe("the crib counter with a keyboard-wedge scanner", () => {
  it("the attendant scans a badge and tools: a good tool is issued, an overdue one is refused in plain words, and the field stays ready", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "crib");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Crib counter" }).click();
    await page.getByRole("heading", { name: "Crib counter" }).waitFor();

    // The badge scanner types the code and Enter.
    await page.getByLabel("Person (name, e-mail or badge)").fill("B-1042");
    await page.keyboard.press("Enter");
    await page.getByText("Issuing to").waitFor();
    await expect(page.getByText("Dagny Forsell").first().isVisible()).resolves.toBe(true);

    const tagField = page.getByLabel("Asset tag");
    await tagField.waitFor();
    await page.keyboard.type("E2E-MIC-01");
    await page.keyboard.press("Enter");
    const issued = page.getByRole("status", { name: "Issued E2E-MIC-01" });
    await issued.waitFor();
    await expect(issued.textContent()).resolves.toContain("Dagny Forsell");
    // Ready for the next scan without a click.
    await expect(tagField.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    await expect(tagField.inputValue()).resolves.toBe("");

    await page.keyboard.type("E2E-MIC-02");
    await page.keyboard.press("Enter");
    const refusal = page.getByRole("alert", { name: "Do not issue E2E-MIC-02" });
    await refusal.waitFor();
    const said = await refusal.textContent();
    expect(said).toMatch(/may not be issued: it is overdue/);
    expect(said).toContain(`Calibration ran out on ${addDays(today, -5)}`);
    await expect(tagField.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    await b.screenshot(page, "crib-counter-refusal");

    // Back it comes, damaged.
    await page.getByRole("tab", { name: "Return" }).click();
    await page.getByLabel("Asset tag").waitFor();
    await page.getByLabel("Asset tag").focus();
    await page.keyboard.type("E2E-MIC-01");
    await page.keyboard.press("Enter");
    await page.getByRole("heading", { name: "Return E2E-MIC-01" }).waitFor();
    await page.getByLabel("Damaged").check();
    await page.getByLabel("Note").fill("Dropped at the bench; spindle binds");
    await page.getByRole("button", { name: "Record return" }).click();
    const back = page.getByRole("alert", { name: "Returned E2E-MIC-01" });
    await back.waitFor();
    await expect(back.textContent()).resolves.toContain("Quarantined");
    await b.screenshot(page, "crib-counter-damaged-return");

    // The custody board no longer lists it.
    await page.goto("/crib/custody");
    await page.getByRole("table", { name: "Tools out of the crib" }).waitFor();
    await expect(page.getByRole("table", { name: "Tools out of the crib" }).getByText("E2E-MIC-01").count()).resolves.toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });
});

describe("custody, my tools and labels", () => {
  it("the custody board marks a tool not back by the end of shift; its holder sees it under My tools; labels print with QR codes", async () => {
    const crib = await b.newPage();
    await b.signIn(crib.page, "crib");
    await crib.page.goto("/crib/custody");
    const board = crib.page.getByRole("table", { name: "Tools out of the crib" });
    await board.getByText("E2E-DIA-04").waitFor();
    await expect(board.getByRole("row").filter({ hasText: "E2E-DIA-04" }).textContent()).resolves.toContain("Not back");
    await b.screenshot(crib.page, "crib-custody-board");

    await crib.page.goto("/print/labels?assetTags=E2E-MIC-03,E2E-DIA-04");
    await crib.page.getByRole("img", { name: "QR code for E2E-DIA-04" }).waitFor();
    await expect(crib.page.getByLabel("Label sheet").textContent()).resolves.toContain(`Due ${addDays(today, 300)}`);
    await b.screenshot(crib.page, "crib-labels-print-view");
    await crib.page.goto("/crib/shipments");
    await crib.page.getByRole("heading", { name: "Outside lab shipments" }).waitFor();
    await b.screenshot(crib.page, "crib-shipments");
    await crib.page.goto("/crib/labels");
    await crib.page.getByRole("heading", { name: "Labels and tags" }).waitFor();
    await b.screenshot(crib.page, "crib-labels");
    expect(crib.errors).toEqual([]);
    await crib.context.close();

    const ezra = await b.newPage({ width: 390, height: 844 });
    await b.signIn(ezra.page, "okonkwo@tenthwise.test");
    await ezra.page.goto("/my-tools");
    await ezra.page.getByRole("link", { name: "E2E-DIA-04" }).waitFor();
    await b.screenshot(ezra.page, "my-tools-phone");
    expect(ezra.errors).toEqual([]);
    await ezra.context.close();
  });
});

describe("the tool status page on a phone", () => {
  it("a usable tool says USABLE with its due date; an overdue tool says DO NOT USE with the reason", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "mechanic");
    await page.goto("/t/E2E-MIC-03");
    await page.getByRole("status").filter({ hasText: "USABLE" }).waitFor();
    await expect(page.getByText(addDays(today, 300)).first().isVisible()).resolves.toBe(true);
    await b.screenshot(page, "status-page-phone-usable");

    await page.goto("/t/E2E-MIC-02");
    await page.getByRole("status").filter({ hasText: "DO NOT USE" }).waitFor();
    await expect(page.getByText(`Calibration ran out on ${addDays(today, -5)}`).isVisible()).resolves.toBe(true);
    await b.screenshot(page, "status-page-phone-do-not-use");
    expect(errors).toEqual([]);
    await context.close();
  });
});
