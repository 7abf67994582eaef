import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { startBrowserApp, DEMO_PASSWORD, type BrowserApp } from "../support/browser";
import { seedUsers } from "../../server/seed/users.seed";
import { AIAG_DATA, makeStudyWorld } from "../support/factories-studies";

// The world is built here (the demo people, a characteristic read as a deviation from a master, dial indicators in
// calibration) so the study can be set up and taken on its own, on the real clock the browser app runs on.
let app: BrowserApp;
let world: Awaited<ReturnType<typeof makeStudyWorld>>;
let studyPath: string;
const MECHANICS = [
  { email: "mechanic@tenthwise.test", name: "Dagny Forsell" },
  { email: "okonkwo@tenthwise.test", name: "Ezra Okonkwo-Lind" },
  { email: "vashti@tenthwise.test", name: "Vashti Penrose" },
];

beforeAll(async () => {
  app = await startBrowserApp({ seed: false });
  await seedUsers(app.db, DEMO_PASSWORD);
  world = await makeStudyWorld(app.db, { now: new Date().toISOString() });
});
afterAll(async () => app?.close());

/** Answers every prompt like a gauge on a data cable: the value typed into the focused field, then Enter. */
async function takeStudy(page: Page, appraiser: number, tag: string) {
  // The tool's tag scanned like any label: tag, then Enter, which moves on to the value.
  await page.getByLabel("Tool you measure with (tag)").fill(tag);
  await page.getByLabel("Tool you measure with (tag)").press("Enter");
  for (let n = 1; n <= 30; n++) {
    const status = page.getByRole("status").filter({ hasText: `no. ${n} of 30` });
    await status.waitFor();
    const m = (await status.innerText()).match(/Measure Pin P-(\d+) — trial (\d)/)!;
    const value = AIAG_DATA[Number(m[1]) - 1][appraiser][Number(m[2]) - 1];
    const field = page.getByLabel(`Value for Pin P-${m[1]}, trial ${m[2]} (mm)`);
    await expect(field.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    await page.keyboard.type(String(value));
    await page.keyboard.press("Enter");
    // Blind: the page shows only the value just entered, never an earlier one.
    await page.getByText(`Just recorded: Pin P-${m[1]}, trial ${m[2]} = ${value} mm`).waitFor();
  }
  await page.getByText("You have measured every part of this study").waitFor();
}

describe("a gauge study set up by quality and taken blind by three mechanics", () => {
  it("quality sets up 10 parts × 3 mechanics × 3 trials on a characteristic from a limits table", async () => {
    const { page, errors } = await app.newPage();
    await app.signIn(page, "quality");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Gauge studies" }).click();
    await page.getByRole("link", { name: "Set up a study" }).click();
    await page.getByLabel("Limits table").selectOption({ label: `Test flat-four (invented) — ${world.table.name} (v1)` });
    await page.getByLabel("Characteristic (journal or bore size)").selectOption({ label: "Pin dia., deviation from master (test) — -3–3 mm" });
    await page.getByLabel("Tool family under study").selectOption({ label: `${world.family.name} (Dial indicator)` });
    for (let i = 0; i < 10; i++) await page.getByLabel(`Part ${i + 1} label`).fill(`Pin P-${String(i + 1).padStart(2, "0")}`);
    // A study needs its appraisers: refused with the reason until they are chosen.
    await page.getByRole("button", { name: "Set up the study" }).click();
    await page.getByRole("alert").filter({ hasText: "at least 2 appraisers" }).waitFor();
    for (const m of MECHANICS) await page.getByLabel(m.name).check();
    await app.screenshot(page, "studies-set-up");
    await page.getByRole("button", { name: "Set up the study" }).click();
    await page.waitForURL(/\/studies\/[0-9a-f-]{36}$/);
    studyPath = new URL(page.url()).pathname;
    await page.getByRole("heading", { name: /GRR-\d{4} — Pin dia., deviation from master/ }).waitFor();
    await expect(page.getByLabel("Progress by appraiser").innerText()).resolves.toContain("0 of 30");
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("each mechanic takes it on the bench page, one prompt at a time, typing values and Enter; a non-number is refused and records nothing", async () => {
    for (const [j, m] of MECHANICS.entries()) {
      const { page, errors } = await app.newPage({ width: 1024, height: 768 });
      await app.signIn(page, m.email);
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Gauge studies to take" }).click();
      await page.getByRole("link", { name: /GRR-\d{4}: Pin dia., deviation from master/ }).click();
      if (j === 0) {
        await page.getByLabel("Tool you measure with (tag)").fill(world.indicators[0].assetTag);
        await page.getByLabel("Tool you measure with (tag)").press("Enter");
        await page.getByRole("status").filter({ hasText: "no. 1 of 30" }).waitFor();
        await page.keyboard.type("0,29x");
        await page.keyboard.press("Enter");
        await page.getByRole("alert").filter({ hasText: "Type the value as a number" }).waitFor();
        await page.getByRole("status").filter({ hasText: "no. 1 of 30" }).waitFor();
        await app.screenshot(page, "studies-bench-prompt");
        await page.getByRole("textbox", { name: /Value for/ }).fill("");
      }
      await takeStudy(page, j, world.indicators[j].assetTag);
      if (j === 0) await app.screenshot(page, "studies-bench-done");
      expect(errors).toEqual([]);
      await page.context().close();
    }
  }, 240_000);

  it("the study page shows the AIAG figures: GRR σ 0.302373, 27.9 % of total variation, ndc 4, and the charts; 30.2 % of this tolerance is not acceptable", async () => {
    const { page, errors } = await app.newPage({ width: 1280, height: 1000 });
    await app.signIn(page, "quality");
    await page.goto(studyPath);
    const verdict = page.getByRole("region", { name: "Verdict" });
    await verdict.getByText("GRR 30.2 % of the tolerance · ndc 4").waitFor();
    await expect(verdict.innerText()).resolves.toContain("Not acceptable");
    const components = page.getByRole("table", { name: "Variance components" });
    const grrRow = components.getByRole("row", { name: /Gauge R&R/ });
    // 0.3023725 lies on the sixth digit: printed 0.302373 in the example, 0.302372 in its check (msa-check-values.md A).
    await expect(grrRow.innerText()).resolves.toMatch(/0\.30237[23][\s\S]*27\.9 %/);
    await expect(components.getByRole("row", { name: /Repeatability/ }).innerText()).resolves.toContain("0.199933");
    await expect(components.getByRole("row", { name: /^Appraiser\b/ }).first().innerText()).resolves.toContain("0.226838");
    await expect(page.getByRole("table", { name: "Analysis of variance" }).innerText()).resolves.toContain("Repeatability (with interaction)");
    for (const chart of ["Range chart by appraiser", "Average chart by appraiser", "Each appraiser's average per part", "Components (ANOVA)"]) {
      await page.getByRole("img", { name: new RegExp(chart.replace(/[()]/g, "\\$&")) }).waitFor();
    }
    await page.locator(".recharts-surface").first().waitFor();
    await app.screenshot(page, "studies-analysis");
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
