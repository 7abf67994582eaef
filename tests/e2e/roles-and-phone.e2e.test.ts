import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, startBrowserApp, type BrowserApp } from "../support/browser";
import { seedUsers } from "../../server/seed/users.seed";
import { makeUsableTool } from "../support/factories-crib";
import { findUserByEmail, makeCheckout, makeTool } from "../support/factories";
import { addDays } from "../../shared/common/dates";

let b: BrowserApp;
const today = new Date().toISOString().slice(0, 10);
const inCalibration = (tag: string, over: Parameters<typeof makeUsableTool>[1] = {}) =>
  makeUsableTool(b.db, { assetTag: tag, description: "Outside micrometer 0-1 in (demo)", ...over }, { performedAt: new Date(Date.now() - 30 * 86_400_000), nextDueAt: addDays(today, 300) });
const overdue = (tag: string) => makeUsableTool(b.db, { assetTag: tag, description: "Outside micrometer 1-2 in (demo)" }, { performedAt: new Date(Date.now() - 400 * 86_400_000), nextDueAt: addDays(today, -5) });

beforeAll(async () => {
  b = await startBrowserApp({ seed: false });
  await seedUsers(b.db, DEMO_PASSWORD);
  await inCalibration("PH-MIC-01");
  await overdue("PH-MIC-02");
  await inCalibration("PH-MIC-03");
  // A 1–2 in micrometer out with Dagny Forsell, to come back with a zero check.
  const mic12 = await inCalibration("PH-MIC-12", { description: "Outside micrometer 1-2 in (demo)", rangeMin: "1", rangeMax: "2" });
  const dagny = await findUserByEmail(b.db, "mechanic@tenthwise.test");
  // A dial caliper kept for reference only (no calibration required).
  await makeTool(b.db, { assetTag: "PH-CAL-01", description: "Dial caliper 0-6 in (reference only, demo)", rangeMin: "0", rangeMax: "6", resolution: "0.001", calibrationRequired: false });
  await makeCheckout(b.db, mic12.id, dagny!.id, { issuedAt: new Date(Date.now() - 3_600_000), dueBackAt: new Date(Date.now() + 3_600_000) });
});
afterAll(async () => {
  b?.db.$client.on("error", () => undefined);
  await b?.close();
});

/** True when the element's box lies wholly inside the visible window: seen without scrolling. */
async function inViewport(page: import("playwright-core").Page, locator: import("playwright-core").Locator) {
  const box = await locator.boundingBox();
  const vp = page.viewportSize()!;
  return !!box && box.y >= 0 && box.x >= 0 && box.y + Math.min(box.height, 120) <= vp.height && box.x + box.width <= vp.width;
}

describe("the crib counter on a phone (390 px)", () => {
  it("the answer to each scan is in view without scrolling: issued, and refused in plain words", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "crib");
    await page.goto("/crib");
    await page.getByRole("heading", { name: "Crib counter" }).waitFor();
    await page.getByLabel("Person (name, e-mail or badge)").fill("B-1042");
    await page.keyboard.press("Enter");
    await page.getByText("Issuing to").waitFor();
    await page.getByLabel("Asset tag").waitFor();

    await page.keyboard.type("PH-MIC-02");
    await page.keyboard.press("Enter");
    const refusal = page.getByRole("alert", { name: "Do not issue PH-MIC-02" });
    await refusal.waitFor();
    // The title and first line of the answer are on screen (the top of the box and its verdict).
    await expect(inViewport(page, refusal)).resolves.toBe(true);
    await expect(page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).resolves.toBe(true);

    await page.getByLabel("Asset tag").focus();
    await page.keyboard.type("PH-MIC-01");
    await page.keyboard.press("Enter");
    const issued = page.getByRole("status", { name: "Issued PH-MIC-01" });
    await issued.waitFor();
    await expect(inViewport(page, issued)).resolves.toBe(true);
    await b.screenshot(page, "crib-counter-phone-answer");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a tool reported lost: the answer comes into view below the buttons, saying so in plain words", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "crib");
    await page.goto("/crib");
    await page.getByRole("tab", { name: "Lost, found, retire" }).click();
    await page.getByLabel("Asset tag").fill("PH-MIC-03");
    await page.getByLabel("Reason").fill("Not returned from the test cell; searched the bay");
    await page.getByRole("button", { name: "Mark lost" }).click();
    const lost = page.getByRole("alert", { name: "PH-MIC-03 recorded as lost" });
    await lost.waitFor();
    await expect(inViewport(page, lost)).resolves.toBe(true);
    await b.screenshot(page, "crib-lost-phone-answer");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a zero check at nominal 0 on a 1–2 in micrometer is refused in the form before it is sent", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "crib");
    await page.goto("/crib");
    await page.getByRole("tab", { name: "Return" }).click();
    await page.getByLabel("Asset tag").fill("PH-MIC-12");
    await page.keyboard.press("Enter");
    const form = page.getByRole("heading", { name: "Return PH-MIC-12" });
    await form.waitFor();
    await expect(inViewport(page, form)).resolves.toBe(true);
    await page.getByLabel("Nominal (in)").fill("0");
    await page.getByLabel("Reading (in)").fill("0");
    await page.getByText(/The check point 0 in is outside the range of PH-MIC-12 \(1–2 in\)/).waitFor();
    await expect(page.getByRole("button", { name: "Record return" }).isDisabled()).resolves.toBe(true);
    await page.getByLabel("Nominal (in)").fill("1");
    await page.getByLabel("Reading (in)").fill("1.0001");
    await page.getByRole("button", { name: "Record return" }).click();
    await page.getByText("Zero check passed").waitFor();
    expect(errors).toEqual([]);
    await context.close();
  });
});

describe("pages say what a role may not do", () => {
  it("the auditor finds custody and shipments in the menu, reads settings without a save button, and is told plainly where they may not act", async () => {
    const { page, context, errors } = await b.newPage({ width: 1440, height: 900 });
    await b.signIn(page, "auditor");
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.getByRole("link", { name: "Custody board" }).click();
    await page.getByRole("heading", { name: /custody/i }).first().waitFor();
    await nav.getByRole("link", { name: "Lab shipments" }).click();
    await page.getByText("Your role (Auditor)").waitFor();
    await expect(page.getByRole("button", { name: /^Ship/ }).count()).resolves.toBe(0);
    await expect(nav.getByRole("link", { name: "Crib counter" }).count()).resolves.toBe(0);

    await page.goto("/admin/settings");
    await page.getByRole("note").filter({ hasText: "Your role (Auditor) can read this page but not change settings" }).waitFor();
    await expect(page.getByRole("button", { name: "Save settings" }).count()).resolves.toBe(0);
    await expect(page.getByLabel("Shop name").isDisabled()).resolves.toBe(true);
    await page.getByText("Every day at 06:00, shop time.").waitFor();

    await page.goto("/admin/users");
    await page.getByRole("note").filter({ hasText: "Your role (Auditor) cannot see or change the list of people" }).waitFor();
    await expect(page.getByRole("heading", { name: "Add a person" }).count()).resolves.toBe(0);

    await page.goto("/crib");
    await page.getByRole("note").filter({ hasText: "Your role (Auditor) cannot issue or take back tools" }).waitFor();
    await expect(page.getByLabel("Asset tag").count()).resolves.toBe(0);

    await page.goto("/admin/reminders");
    await page.getByRole("note").filter({ hasText: "Your role (Auditor) cannot see the reminder runs or send reminders" }).waitFor();
    await expect(page.getByRole("button", { name: "Run reminders now" }).count()).resolves.toBe(0);
    await expect(page.getByText("No runs yet").count()).resolves.toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the administrator's People page fits 1440 px with the form to add a person in view", async () => {
    const { page, context, errors } = await b.newPage({ width: 1440, height: 900 });
    await b.signIn(page, "admin");
    await page.goto("/admin/users");
    const add = page.getByRole("heading", { name: "Add a person" });
    await add.waitFor();
    await expect(page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).resolves.toBe(true);
    const box = await add.boundingBox();
    expect(box && box.x + box.width <= 1440).toBe(true);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a reference-only caliper's status page says what it may be used for, not a plain 'usable'", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "mechanic");
    await page.goto("/t/PH-CAL-01");
    await page.getByText("REFERENCE ONLY", { exact: false }).first().waitFor();
    await page.getByText(/not for acceptance readings/i).first().waitFor();
    await expect(page.getByText("USABLE", { exact: true }).count()).resolves.toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the DO NOT USE tag is offered for an overdue tool and refused, with the reason, for a usable one", async () => {
    const { page, context, errors } = await b.newPage({ width: 1440, height: 900 });
    await b.signIn(page, "crib");
    await page.goto("/crib/labels");
    const tagField = page.getByLabel("Asset tag of the tool to tag");
    await tagField.fill("PH-MIC-01");
    await page.getByText(/PH-MIC-01 may be used .*no DO NOT USE tag/).waitFor();
    await expect(page.getByRole("link", { name: "Open tag PDF" }).count()).resolves.toBe(0);
    await tagField.fill("PH-MIC-02");
    await page.getByText(/PH-MIC-02: Overdue — may not be used/).waitFor();
    await page.getByRole("link", { name: "Open tag PDF" }).waitFor();
    expect(errors).toEqual([]);
    await context.close();
  });
});
