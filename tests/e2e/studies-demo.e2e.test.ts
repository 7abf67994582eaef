import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startBrowserApp, type BrowserApp } from "../support/browser";

// The demo shop's gauge studies (invented, labelled demo): a finished one of the 0–1 in micrometers on the piston
// pin (not acceptable) and one in progress on the valve stems; and what they change on other pages.
let app: BrowserApp;
beforeAll(async () => {
  app = await startBrowserApp();
});
afterAll(async () => app?.close());

describe("gauge studies in the demo shop", () => {
  it("a micrometer's page and the limits table show the latest study and its verdict; the overview lists characteristics without an acceptable study", async () => {
    const { page, errors } = await app.newPage();
    await app.signIn(page, "quality");
    const gaps = page.getByRole("list", { name: "Characteristics without an acceptable gauge study" });
    await gaps.getByText("Piston pin dia.").waitFor();
    await expect(gaps.innerText()).resolves.toMatch(/Piston pin dia\.[\s\S]*Not acceptable/);
    await expect(gaps.innerText()).resolves.toContain("No study");

    await page.goto("/tools/MIC-0101");
    const card = page.getByRole("heading", { name: "Gauge studies" }).locator("xpath=ancestor::section[1]");
    await card.getByText(/Piston pin dia\./).waitFor();
    await expect(card.innerText()).resolves.toMatch(/GRR-0001[\s\S]*Not acceptable/);
    await expect(card.innerText()).resolves.toContain("GRR-0002 in progress");
    await app.screenshot(page, "studies-tool-page");

    await card.getByRole("link", { name: "GRR-0001" }).click();
    await page.getByRole("heading", { name: /GRR-0001 — Piston pin dia\./ }).waitFor();
    await expect(page.getByRole("note").filter({ hasText: "Demo study" }).count()).resolves.toBe(1);
    await page.getByRole("region", { name: "Verdict" }).getByText(/^GRR [\d.]+ % of the tolerance · ndc \d+$/).waitFor();
    await page.locator(".recharts-surface").first().waitFor();
    await app.screenshot(page, "studies-demo-finished");
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("the demo mechanic finds the study in progress on the bench and carries on where she stopped", async () => {
    const { page, errors } = await app.newPage({ width: 1024, height: 768 });
    await app.signIn(page, "mechanic");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Gauge studies to take" }).click();
    await page.getByText("7 of 16 measured").waitFor();
    await page.getByRole("link", { name: /GRR-0002/ }).click();
    await page.getByRole("status").filter({ hasText: "no. 8 of 16" }).waitFor();
    await expect(page.getByLabel("Tool you measure with (tag)").inputValue()).resolves.toBe("MIC-0101");
    await app.screenshot(page, "studies-demo-bench");
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
