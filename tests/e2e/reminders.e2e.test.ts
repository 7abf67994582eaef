import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import path from "node:path";
import type pg from "pg";
import { pino } from "pino";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { startBrowserApp, DEMO_PASSWORD, type BrowserApp } from "../support/browser";
import { memoryStorage } from "../support/test-app";
import { createApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { systemClock } from "../../server/platform/clock";
import { smtpMailer } from "../../server/platform/mailer";
import { seedDemoOnce } from "../../server/seed";
import { startMailCatcher, type MailCatcher } from "../../server/dev-services/mail-catcher";

// The demo as `npm start` runs it: mail goes over SMTP to the local catcher and
// the outbox reads the catcher. The shared browser harness sends mail to
// memory, so this file serves the same seeded database from its own app, wired
// like `npm start`, and uses the harness for the browser.

let b: BrowserApp;
let catcher: MailCatcher;
let server: Server;
let url: string;

beforeAll(async () => {
  b = await startBrowserApp({ seed: false });
  catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
  const config = loadConfig({
    NODE_ENV: "test",
    DATABASE_URL: "postgres://app@127.0.0.1/unused-here",
    SESSION_SECRET: "browser-test-session-secret",
    LOG_LEVEL: "silent",
    CRON_ENABLED: "false",
    MAIL_CATCHER_URL: `http://127.0.0.1:${catcher.httpPort}`,
  });
  const mailer = smtpMailer(`smtp://127.0.0.1:${catcher.smtpPort}`, config.MAIL_FROM);
  const storage = memoryStorage();
  await seedDemoOnce({ db: b.db, clock: systemClock, config, mailer, storage }, DEMO_PASSWORD);
  const pool = (b.db as unknown as { $client: pg.Pool }).$client;
  const clientDir = path.resolve(process.env.TENTHWISE_CLIENT_DIR ?? "dist/client");
  const app = createApp({ db: b.db, pool, config, clock: systemClock, mailer, storage, logger: pino({ level: "silent" }), clientDir });
  server = await new Promise((resolve) => {
    const s = app.listen(0, "127.0.0.1", () => resolve(s));
  });
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise<void>((resolve) => server?.close(() => resolve()));
  await catcher?.close();
  await b?.close();
});

async function signIn(page: Page, role: string) {
  await page.goto(`${url}/sign-in`);
  await page.getByLabel("E-mail").fill(`${role}@tenthwise.test`);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"));
  await page.getByRole("main").waitFor();
}

describe("reminder mail in the demo", () => {
  it("the admin opens the outbox, sees the demo's reminder digests and reads one", async () => {
    const { page, context, errors } = await b.newPage();
    await signIn(page, "admin");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox" }).click();
    await page.waitForURL(/\/admin\/outbox$/);
    const table = page.getByRole("table", { name: "Outbox" });
    await table.waitFor();
    const rows = table.getByRole("row");
    expect(await rows.count()).toBeGreaterThan(1);
    await expect(table.textContent()).resolves.toContain("Tool calibration reminders");
    await expect(table.textContent()).resolves.toContain("crib@tenthwise.test");

    await page.getByRole("button", { name: /Open the message to crib@tenthwise\.test/ }).first().click();
    const message = page.getByRole("article", { name: /Message: Tool calibration reminders/ });
    await message.waitFor();
    await expect(message.textContent()).resolves.toMatch(/Has it:/);
    await expect(message.textContent()).resolves.toMatch(/http:\/\/127\.0\.0\.1:\d+\/tools\/[A-Z]/);
    await b.screenshot(page, "reminders-outbox-message");
    await page.getByRole("button", { name: "Show as HTML" }).click();
    await page.frameLocator('iframe[title="Message as HTML"]').getByRole("link").first().waitFor();
    await b.screenshot(page, "reminders-outbox-message-html");
    await page.getByRole("button", { name: "Close" }).click();
    await b.screenshot(page, "reminders-outbox-admin");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the admin runs reminders now: nothing is sent twice, and the run is listed", async () => {
    const { page, context, errors } = await b.newPage();
    await signIn(page, "admin");
    await page.goto(`${url}/admin/reminders`);
    const runs = page.getByRole("table", { name: "Reminder runs" });
    await runs.getByRole("row").nth(1).waitFor();
    const before = catcher.messages().length;
    await page.getByRole("button", { name: "Run reminders now" }).click();
    const status = page.getByRole("status").filter({ hasText: "e-mail" });
    await status.waitFor();
    await expect(status.textContent()).resolves.toMatch(/^0 e-mails sent; \d+ reminders? (was|were) already sent by an earlier run\.$/);
    expect(catcher.messages().length).toBe(before);
    await expect(runs.getByRole("row").count()).resolves.toBe(3); // header, the seed's run, this one
    // The first start's run is named as such, not as a person who has since left.
    await expect(runs.getByRole("row").filter({ hasText: "First start (demo set-up)" }).count()).resolves.toBe(1);
    await expect(runs.textContent()).resolves.not.toContain("no longer on record");
    await runs.getByRole("button", { name: /Details of the run/ }).last().click();
    await page.getByRole("table", { name: "Reminders of this run" }).waitFor();
    await b.screenshot(page, "reminders-runs-admin");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a mechanic chooses their notifications on a phone; escalations are not theirs to see", async () => {
    const { page, context, errors } = await b.newPage({ width: 390, height: 844 });
    await signIn(page, "mechanic");
    await page.goto(`${url}/me/notifications`);
    const mine = page.getByRole("checkbox", { name: /My tools/ });
    await mine.waitFor();
    expect(await mine.isChecked()).toBe(true);
    expect(await page.getByRole("checkbox", { name: /Escalations/ }).count()).toBe(0);
    await mine.uncheck();
    await page.getByRole("button", { name: "Save my notifications" }).click();
    await page.getByRole("status").filter({ hasText: "Saved" }).waitFor();
    await page.reload();
    await page.getByRole("checkbox", { name: /My tools/ }).waitFor();
    expect(await page.getByRole("checkbox", { name: /My tools/ }).isChecked()).toBe(false);
    await b.screenshot(page, "reminders-preferences-mechanic-phone");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("quality sees escalations locked on", async () => {
    const { page, context } = await b.newPage();
    await signIn(page, "quality");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "My notifications" }).click();
    const esc = page.getByRole("checkbox", { name: /Escalations/ });
    await esc.waitFor();
    expect(await esc.isChecked()).toBe(true);
    expect(await esc.isDisabled()).toBe(true);
    expect(await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox" }).count()).toBe(0);
    await b.screenshot(page, "reminders-preferences-quality");
    await context.close();
  });
});
