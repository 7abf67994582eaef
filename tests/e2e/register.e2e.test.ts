import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startBrowserApp, type BrowserApp } from "../support/browser";

// The register, the tool page, the calibration form and the chain view, driven
// like a person would, over the seeded demo shop (tags from the brief's list).
let b: BrowserApp;
beforeAll(async () => {
  b = await startBrowserApp();
});
afterAll(async () => b?.close());

const registerTable = (page: import("playwright-core").Page) => page.getByRole("table", { name: "Tool register" });

/** The crib attendant on the whole register, its first page shown. */
async function openRegister() {
  const opened = await b.newPage();
  await b.signIn(opened.page, "crib");
  await opened.page.goto("/tools");
  const table = registerTable(opened.page);
  await table.getByRole("link", { name: "MIC-0101" }).waitFor();
  return { ...opened, table };
}

describe("the tool register in the browser", () => {
  it("lists the shop's tools and filters to the overdue ones, keeping the filter in the address", async () => {
    const { page, context, errors, table } = await openRegister();
    await expect(table.getByRole("link", { name: "MIC-0110" }).count()).resolves.toBe(1);
    await b.screenshot(page, "register-all");

    await page.getByLabel("Filter by status").selectOption("overdue");
    await page.waitForURL(/status=overdue/);
    await table.getByRole("link", { name: "MIC-0101" }).waitFor({ state: "detached" });
    await expect(table.getByRole("link", { name: "MIC-0110" }).count()).resolves.toBe(1);
    const statuses = await table.locator("tbody tr td:nth-child(2)").allTextContents();
    expect(statuses.length).toBeGreaterThan(0);
    expect(statuses.every((s) => s.includes("Overdue"))).toBe(true);
    await b.screenshot(page, "register-overdue");

    // A dashboard link lands on the same filtered view.
    await page.goto("/tools?status=overdue");
    await table.getByRole("link", { name: "MIC-0110" }).waitFor();
    await expect(table.getByRole("link", { name: "MIC-0101" }).count()).resolves.toBe(0);
    const csv = await page.getByRole("link", { name: "Export CSV" }).getAttribute("href");
    expect(csv).toMatch(/format=csv/);
    expect(csv).toMatch(/status=overdue/);
    const exported = await (await page.request.get(csv!)).text();
    expect(exported).toMatch(/MIC-0110/);
    expect(exported).not.toMatch(/MIC-0101/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("Next reads on from the last tool shown (by keyset), and lists the same tools as the page by its number", async () => {
    const { page, context, errors, table } = await openRegister();
    await page.getByText(/^Page 1 of [2-9]$/).waitFor();
    const onward = page.waitForRequest((r) => /\/api\/tools\?.*after=/.test(r.url()) && /page=2/.test(r.url()));
    await page.getByRole("button", { name: "Next" }).click();
    await onward;
    await page.getByText(/^Page 2 of [2-9]$/).waitFor();
    await table.getByRole("link", { name: "MIC-0101" }).waitFor({ state: "detached" });
    const shown = await table.locator("tbody tr td:first-child a").allTextContents();
    const byNumber = (await (await page.request.get("/api/tools?sort=assetTag&page=2&pageSize=50")).json()) as { items: { assetTag: string }[] };
    expect(shown).toEqual(byNumber.items.map((t) => t.assetTag));
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a dashboard link to tools due within 30 days lands on the register filtered on the server, shows the filter, and clearing it lists every tool again", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "crib");
    await page.goto("/tools?dueWithinDays=30&sort=dueAt");
    const table = registerTable(page);
    const chip = page.getByRole("group", { name: "Due filter" });
    await expect(chip.textContent()).resolves.toMatch(/Due: within 30 days/);
    // MIC-0201 is due soon in the demo shop; MIC-0110 is overdue and MIC-0101 is months from due.
    await table.getByRole("link", { name: "MIC-0201" }).waitFor();
    await expect(table.getByRole("link", { name: "MIC-0110" }).count()).resolves.toBe(0);
    await expect(table.getByRole("link", { name: "MIC-0101" }).count()).resolves.toBe(0);
    const statuses = await table.locator("tbody tr td:nth-child(2)").allTextContents();
    expect(statuses.every((s) => /Due soon|In calibration|Limited/.test(s))).toBe(true);
    const csv = await page.getByRole("link", { name: "Export CSV" }).getAttribute("href");
    expect(csv).toMatch(/dueWithinDays=30/);
    await b.screenshot(page, "register-due-within-30");

    await chip.getByRole("button", { name: "Clear due-date filter" }).click();
    await page.waitForURL((u) => !u.search.includes("dueWithinDays"));
    await table.getByRole("link", { name: "MIC-0110" }).waitFor();
    await expect(chip.count()).resolves.toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the location filter offers the shop's locations in a list and keeps the choice in the address", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "mechanic");
    await page.goto("/tools");
    const table = registerTable(page);
    await table.getByRole("link", { name: "MIC-0101" }).waitFor();
    const location = page.getByLabel("Filter by location");
    await expect(location.evaluate((el) => el.tagName)).resolves.toBe("SELECT");
    await expect.poll(() => location.locator("option").allTextContents()).toContain("Quarantine shelf");
    await location.selectOption("Quarantine shelf");
    await page.waitForURL(/location=Quarantine(\+|%20)shelf/);
    await table.getByRole("link", { name: "MIC-0101" }).waitFor({ state: "detached" });
    await expect(table.getByRole("link", { name: "MIC-0111" }).count()).resolves.toBe(1);
    await b.screenshot(page, "register-location-filter");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the page of an overdue tool says, large, do not use, and why", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "mechanic");
    await page.goto("/tools/MIC-0110");
    const answer = page.getByRole("region", { name: "May MIC-0110 be used?" });
    await answer.waitFor();
    await expect(answer.getByTestId("tool-answer").textContent()).resolves.toBe("Do not use");
    await expect(answer.textContent()).resolves.toMatch(/Overdue/);
    await expect(answer.getByRole("list", { name: "Reasons" }).textContent()).resolves.toMatch(/Calibration ran out on \d{4}-\d{2}-\d{2}/);
    await expect(page.getByRole("complementary", { name: "Cautions" }).count()).resolves.toBe(1);
    await b.screenshot(page, "tool-overdue-desktop");

    const phone = await b.newPage({ width: 390, height: 844 });
    await b.signIn(phone.page, "mechanic");
    await phone.page.goto("/tools/MIC-0110");
    await phone.page.getByTestId("tool-answer").waitFor();
    await expect(phone.page.getByTestId("tool-answer").isVisible()).resolves.toBe(true);
    await b.screenshot(phone.page, "tool-overdue-phone");
    expect([...errors, ...phone.errors]).toEqual([]);
    await phone.context.close();
    await context.close();
  });

  it("a usable tool's page says usable until its due date", async () => {
    const { page, context } = await b.newPage();
    await b.signIn(page, "mechanic");
    await page.goto("/tools/MIC-0103");
    await expect(page.getByTestId("tool-answer").textContent()).resolves.toBe("Usable");
    await expect(page.getByRole("region", { name: "May MIC-0103 be used?" }).textContent()).resolves.toMatch(/until \d{4}-\d{2}-\d{2}/);
    await b.screenshot(page, "tool-usable-desktop");
    await context.close();
  });

  it("a mechanic may record an intermediate check but does not see Log calibration", async () => {
    const { page, context } = await b.newPage();
    await b.signIn(page, "mechanic");
    await page.goto("/tools/MIC-0103");
    await page.getByTestId("tool-answer").waitFor();
    await expect(page.getByRole("button", { name: "Record intermediate check" }).count()).resolves.toBe(1);
    await expect(page.getByRole("link", { name: "Log calibration" }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Quarantine" }).count()).resolves.toBe(0);
    await context.close();
  });

  it("a quality manager logs a calibration and sees error, verdict and TUR live, then the signed result", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "quality");
    await page.goto("/tools/MIC-0103");
    await page.getByRole("link", { name: "Log calibration" }).click();
    await page.waitForURL(/\/tools\/MIC-0103\/calibrate$/);
    await page.getByRole("table", { name: "Check points entry" }).waitFor();

    // The form starts from the family's check plan.
    const nominals: string[] = [];
    for (let i = 1; ; i++) {
      const input = page.getByLabel(`Point ${i} nominal`, { exact: true });
      if ((await input.count()) === 0) break;
      nominals.push(await input.inputValue());
    }
    expect(nominals.length).toBeGreaterThan(1);
    expect(nominals.every((n) => n !== "")).toBe(true);

    await page.getByRole("list", { name: "Reference standards" }).getByRole("checkbox", { name: /GBS-01/ }).check();

    // Point 1 reads a half-tenth large; the error and verdict appear as it is typed. The error is against the demo block's
    // certified size (0.105 in block, certified 0.104999 in), so it is +0.000051 in (arithmetic).
    const first = Number(nominals[0]);
    await page.getByLabel("Point 1 as found", { exact: true }).fill(String(+(first + 0.00005).toFixed(5)));
    await expect(page.getByLabel("Point 1 error").textContent()).resolves.toMatch(/^\+0\.000051/);
    await expect(page.getByLabel("Point 1 verdict").textContent()).resolves.toMatch(/Pass/);
    // A typed U of 0.60 µm (0.0000236 in) against ± 0.0001 in gives a TUR of 4.2:1 (arithmetic on Z540.3 §5.3 b).
    await page.getByLabel("Point 1 U", { exact: true }).fill("0.0000236");
    await expect(page.getByLabel("Point 1 TUR").textContent()).resolves.toMatch(/^4\.2:1/);
    // Point 2 reads three tenths large: out of tolerance, shown at once.
    await page.getByLabel("Point 2 as found", { exact: true }).fill(String(+(Number(nominals[1]) + 0.0003).toFixed(4)));
    await expect(page.getByLabel("Point 2 verdict").textContent()).resolves.toMatch(/Fail/);
    // Adjusted back in: as left on the nominal. Typing an as-left that differs ticks "adjusted", so release is on as left.
    await page.getByLabel("Point 2 as left", { exact: true }).fill(nominals[1]);
    await expect(page.getByRole("checkbox", { name: /The tool was adjusted/ }).isChecked()).resolves.toBe(true);
    await expect(page.getByLabel("Point 2 verdict").textContent()).resolves.toMatch(/Found: fail.*Pass.*release on as left/);
    for (let i = 3; i <= nominals.length; i++) await page.getByLabel(`Point ${i} as found`, { exact: true }).fill(nominals[i - 1]);

    const summary = page.getByRole("region", { name: "Result so far" });
    // As found and the release are stated apart, so they never contradict each other.
    await expect(summary.textContent()).resolves.toMatch(/As found: ✕Out of tolerance · Fail/);
    await expect(summary.textContent()).resolves.toMatch(/Release: ✓Adjusted, then released/);
    await expect(summary.textContent()).resolves.toMatch(/Next due: \d{4}-\d{2}-\d{2}/);
    // With the budget U (resolution 0.0001 in) the ratio falls under 4:1 at the other points: the Z540.3 warning shows.
    await expect(summary.getByRole("note").textContent()).resolves.toMatch(/under 4:1/);
    await b.screenshot(page, "calibration-form-live");

    await page.getByRole("button", { name: "Sign the calibration record" }).click();
    const saved = page.getByRole("status", { name: "Saved calibration" });
    await saved.waitFor();
    await expect(saved.textContent()).resolves.toMatch(/Adjusted/);
    await expect(saved.textContent()).resolves.toMatch(/next due \d{4}-\d{2}-\d{2}/);
    await b.screenshot(page, "calibration-saved");

    await page.getByRole("link", { name: "Back to MIC-0103" }).click();
    const history = page.getByRole("list", { name: "Calibration records" });
    await expect(history.getByRole("listitem").first().textContent()).resolves.toMatch(/Adjusted/);
    // The decision rule in plain words, without symbols the shop font lacks.
    const newest = (await history.getByRole("listitem").first().textContent()) ?? "";
    expect(newest).toMatch(/Simple acceptance: released when the error is within ± MPE/);
    expect(newest).not.toMatch(/[≤≥√∞]|\|error\|/);
    // The record's uncertainty budget opens as a table, and the record prints with it.
    await history.getByRole("listitem").first().getByText("Uncertainty budget of each point").click();
    await history.getByRole("table", { name: "Uncertainty budget, point 2" }).waitFor();
    await expect(history.getByRole("link", { name: /Calibration record with uncertainty budgets/ }).first().getAttribute("href")).resolves.toMatch(/\/record\.pdf$/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the chain view leads from the tool to its standard's certificate and the national institute", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "auditor");
    await page.goto("/tools/MIC-0101");
    await page.getByRole("link", { name: "Traceability chain" }).click();
    const chain = page.getByRole("list", { name: "Traceability chain" });
    await chain.waitFor();
    const text = (await chain.textContent()) ?? "";
    // The register seed calibrates inch micrometers against GBS-01, certified by Meridian Dimensional Lab.
    expect(text).toMatch(/Reference standardGBS-01/);
    expect(text).toMatch(/Certificate MDL-DEMO-GBS-01-\d/);
    expect(text).toMatch(/Meridian Dimensional Lab/);
    expect(text).toMatch(/National measurement institute/);
    expect(text).toMatch(/National Length Institute of Harrow/);
    // The certificate's U is shown in the standard's own unit.
    expect(text).toMatch(/Expanded uncertaintyU = 0\.0000\d+ in \(k = 2\)/);
    const href = await chain.getByRole("link", { name: /Download certificate MDL-DEMO-GBS-01-/ }).getAttribute("href");
    const file = await page.request.get(href!);
    expect(file.status()).toBe(200);
    await b.screenshot(page, "chain-mic-0101");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a quality manager reviews an outside lab's certificate and the tool returns to service", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "quality");
    await page.goto("/tools/DIA-0103");
    await expect(page.getByTestId("tool-answer").textContent()).resolves.toBe("Do not use");
    await expect(page.getByRole("region", { name: "May DIA-0103 be used?" }).textContent()).resolves.toMatch(/awaiting review/);
    const review = page.getByRole("form", { name: "Certificate review" });
    await review.getByLabel("Findings").fill("Results, uncertainty and traceability checked against the scope; acceptable.");
    await b.screenshot(page, "outside-lab-review");
    await review.getByRole("button", { name: "Accept certificate" }).click();
    const newest = page.getByRole("list", { name: "Calibration records" }).getByRole("listitem").first();
    await expect(newest.locator("p", { hasText: "Certificate reviewed and accepted" }).textContent()).resolves.toMatch(/by Teodor Quill .*acceptable/);
    await expect(page.getByTestId("tool-answer").textContent()).resolves.toMatch(/^Usable/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a correction supersedes the earlier calibration with a reason; the earlier record stays, marked", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "quality");
    await page.goto("/tools/MIC-0106");
    const history = page.getByRole("list", { name: "Calibration records" });
    await history.getByRole("listitem").first().waitFor();
    const before = await history.getByRole("listitem").count();
    await history.getByRole("link", { name: "Correct this record" }).first().click();
    await page.getByLabel("Reason for the correction").fill("Wrong standard named on the first entry.");
    await page.getByRole("button", { name: "Sign the correcting record" }).click();
    await page.getByRole("status", { name: "Saved calibration" }).waitFor();
    await page.getByRole("link", { name: "Back to MIC-0106" }).click();
    await expect.poll(() => history.getByRole("listitem").count()).toBe(before + 1);
    await expect(history.getByRole("listitem").nth(1).textContent()).resolves.toMatch(/Superseded/);
    await expect(history.getByRole("listitem").first().textContent()).resolves.toMatch(/Wrong standard named on the first entry/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the crib quarantines a dropped tool with a reason, and releases it back into use", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "crib");
    await page.goto("/tools/MIC-0109");
    await expect(page.getByTestId("tool-answer").textContent()).resolves.toBe("Usable");
    await expect(page.getByRole("link", { name: "Log calibration" }).count()).resolves.toBe(0);
    await page.getByRole("button", { name: "Quarantine" }).click();
    await page.getByLabel(/Why is MIC-0109 quarantined/).fill("Dropped on the bench floor.");
    await page.getByRole("button", { name: "Quarantine" }).click();
    await expect.poll(() => page.getByTestId("tool-answer").textContent()).toBe("Do not use");
    await expect(page.getByRole("list", { name: "Reasons" }).textContent()).resolves.toMatch(/Quarantined since .*Dropped on the bench floor/);
    await page.getByRole("button", { name: "Release from quarantine" }).click();
    await page.getByLabel(/Why may MIC-0109 be released/).fill("Checked on the check block: reads true.");
    await page.getByRole("button", { name: "Release from quarantine" }).click();
    await expect.poll(() => page.getByTestId("tool-answer").textContent()).toBe("Usable");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a calibration dated when its standard was out of calibration is refused in plain words, and nothing is signed", async () => {
    const { page, context, errors } = await b.newPage();
    await b.signIn(page, "quality");
    await page.goto("/tools/MIC-0108/calibrate");
    await page.getByRole("table", { name: "Check points entry" }).waitFor();
    await page.getByRole("checkbox", { name: /GBS-01/ }).check();
    // Years before the demo's first certificate of GBS-01 was issued.
    await page.getByLabel("Performed at").fill("2023-01-10T10:00");
    await expect(page.getByRole("list", { name: "Reference standards" }).textContent()).resolves.toMatch(/GBS-01.*Not in calibration on that date/);
    for (let i = 1; ; i++) {
      const nominal = page.getByLabel(`Point ${i} nominal`, { exact: true });
      if ((await nominal.count()) === 0) break;
      await page.getByLabel(`Point ${i} as found`, { exact: true }).fill(await nominal.inputValue());
    }
    await page.getByRole("button", { name: "Sign the calibration record" }).click();
    const refusal = page.getByRole("alert").filter({ hasText: "not in calibration" });
    // No certificate of GBS-01 had been issued yet: the refusal says so rather than that one ran out.
    await expect(refusal.textContent()).resolves.toMatch(/A reference standard you chose was not in calibration on the calibration date\. No certificate of GBS-01 covers 2023-01-10/);
    await expect(refusal.textContent()).resolves.not.toMatch(/ran out/);
    await expect(page.getByRole("status", { name: "Saved calibration" }).count()).resolves.toBe(0);
    await b.screenshot(page, "calibration-refused");
    expect(errors).toEqual([]);
    await context.close();
  });
});
