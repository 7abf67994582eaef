import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import path from "node:path";
import type { Locator } from "playwright-core";
import { SCREENSHOT_DIR, startBrowserApp, type BrowserApp } from "../support/browser";
import { jobs } from "../../server/db/schema";

// The demo shop as seeded: the signed sheet of HF360-D-40217 holds a place caught by each judging rule, and the
// half-measured HF360-D-40388 takes feeler checks with leaves inside the limits. Demo values (invented).
let b: BrowserApp;
const jobOf = async (serial: string) => (await b.db.select({ id: jobs.id }).from(jobs).where(eq(jobs.engineSerial, serial)))[0].id;
beforeAll(async () => {
  b = await startBrowserApp();
});
afterAll(async () => b?.close());

/** The sheet is long: a place is photographed on its own. */
const shoot = (l: Locator, name: string) => l.screenshot({ path: path.join(SCREENSHOT_DIR, `${name}.png`) });

describe("the check sheet judges parts by the current rules", () => {
  it("an inspector sees, on the signed demo sheet, each reading judged, both fits, radial limits, form, 20 °C and feeler checks judged again", async () => {
    const { page, errors } = await b.newPage({ width: 1280, height: 900 });
    await b.signIn(page, "inspector");
    await page.goto(`/jobs/${await jobOf("HF360-D-40217")}`);
    await page.getByRole("heading", { name: /Check sheet — HF360-D-40217/ }).waitFor();
    await page.getByRole("alert").filter({ hasText: "Judged again under the current rules" }).waitFor();
    await expect(page.getByRole("complementary", { name: "Cautions" }).count()).resolves.toBeGreaterThan(0);

    // Every two-point reading: pin no. 2 is 0.0001 over its maximum in direction 1.
    const pin = page.getByLabel("Piston pin dia. no. 2", { exact: true });
    await expect(pin.getByRole("list", { name: "Every reading" }).innerText()).resolves.toContain("0.0001 over the maximum");
    await shoot(pin, "judging-every-reading");
    // Both fits: pin no. 4's tightest fit is under the minimum.
    await expect(page.getByLabel("Pin to piston clearance no. 4", { exact: true }).innerText()).resolves.toMatch(/tightest fit 0\.0002 loose is 0\.0001 under the minimum 0\.0003 loose/);
    // Radial: the rocker clearance is judged on half the diametral clearance, and says so.
    const rocker = page.getByLabel("Rocker bushing to shaft clearance no. 9", { exact: true });
    await expect(rocker.innerText()).resolves.toMatch(/0\.00025 loose radial/);
    await expect(rocker.innerText()).resolves.toContain("0.0005 diametral, halved");
    await shoot(rocker, "judging-radial");
    // Form: cylinder no. 3 out of round, no. 5 tapered.
    await expect(page.getByLabel("Barrel bore, top of ring travel no. 3", { exact: true }).innerText()).resolves.toContain("out-of-round 0.0015 is 0.0003 over the maximum 0.0012");
    await expect(page.getByLabel("Barrel taper (top − bottom of ring travel) no. 5", { exact: true }).innerText()).resolves.toContain("taper, direction 1 0.0016 is 0.0004 over the maximum 0.0012");
    // 20 °C: the warm piston's bore, raw and corrected.
    const warm = page.getByLabel("Piston pin bore (aluminium piston) no. 6", { exact: true });
    await expect(warm.innerText()).resolves.toMatch(/0\.8753 in → 0\.875112 at 20 °C/);
    await expect(warm.innerText()).resolves.toContain("Corrected to 20 °C (ISO 1): part at 30 °C, steel tool at 20 °C");
    // Feeler checks recorded with leaves outside the limits, judged again.
    const ring = page.getByLabel("Top compression ring side clearance no. 1", { exact: true });
    await expect(ring.innerText()).resolves.toContain("Recorded within limits under earlier rules; judged outside under the current rules");
    await shoot(ring, "judging-feeler-rules-1");
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it("a mechanic's feeler check shows the chosen leaves or stack and why; a set that cannot bracket the limits asks for a measured gap", async () => {
    const { page, errors } = await b.newPage({ width: 1024, height: 900 });
    await b.signIn(page, "mechanic");
    await page.goto(`/jobs/${await jobOf("HF360-D-40388")}`);
    await page.getByRole("heading", { name: /Check sheet — HF360-D-40388/ }).waitFor();

    await page.getByRole("button", { name: "Measure Top compression ring side clearance no. 2" }).click();
    const entry = page.getByRole("group", { name: "Entry for Top compression ring side clearance no. 2" });
    await entry.getByLabel("Top compression ring side clearance no. 2, feeler set tag").fill("FLR-0101");
    const leaves = entry.getByLabel("Leaves to use");
    await leaves.waitFor();
    await expect(leaves.innerText()).resolves.toContain("— must enter. No-go:");
    await expect(leaves.innerText()).resolves.toContain("the thinnest leaf or stack at or above the minimum 0.0045");
    await entry.getByLabel("Did the go enter?").selectOption("yes");
    await entry.getByLabel("Did the no-go enter?").selectOption("no");
    await entry.getByText("Within new limits (go entered, no-go did not)").waitFor();
    await shoot(entry, "judging-feeler-leaves");
    await entry.getByRole("button", { name: "Save reading" }).click();
    await page.getByLabel("Top compression ring side clearance no. 2", { exact: true }).getByText("Within new limits (go entered, no-go did not)").waitFor();

    await page.getByRole("button", { name: "Measure Second ring side clearance no. 2" }).click();
    const second = page.getByRole("group", { name: "Entry for Second ring side clearance no. 2" });
    await second.getByLabel("Second ring side clearance no. 2, feeler set tag").fill("FLR-0101");
    await second.getByText("This set cannot check the gap go/no-go inside its limits").waitFor();
    const options = await second.getByLabel("Thickest leaf that enters").locator("option").allTextContents();
    const leaf = options.find((o) => o.startsWith("0.003 "))!;
    await second.getByLabel("Thickest leaf that enters").selectOption({ label: leaf });
    await second.getByText(/measured gap: thickest to enter/).waitFor();
    await shoot(second, "judging-measured-gap");
    await second.getByRole("button", { name: "Save reading" }).click();
    await page.getByLabel("Second ring side clearance no. 2", { exact: true }).getByText(/measured gap: thickest to enter 0\.003/).waitFor();
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
