import fs from "node:fs";
import path from "node:path";
import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { pino } from "pino";
import { createApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { systemClock, type Clock } from "../../server/platform/clock";
import { seedDemoOnce } from "../../server/seed";
import { createTestDatabase } from "./test-db";
import { memoryMailer, memoryStorage } from "./test-app";
import type { Role } from "../../shared/auth/roles";

export const DEMO_PASSWORD = "tenthwise-demo";
export const SCREENSHOT_DIR = path.resolve("test-results/screenshots");

/**
 * The built app (dist/client, built by `npm test` first) served on loopback
 * over a fresh database seeded with the demo shop, and headless Chromium from
 * Debian's package.
 */
export async function startBrowserApp(opts: { clock?: Clock; seed?: boolean } = {}) {
  const clientDir = path.resolve(process.env.TENTHWISE_CLIENT_DIR ?? "dist/client");
  if (!fs.existsSync(path.join(clientDir, "index.html"))) throw new Error("dist/client is missing: run `npm run build` (npm test does) before browser tests");
  const database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: database.url, SESSION_SECRET: "browser-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
  const clock = opts.clock ?? systemClock;
  const mailer = memoryMailer();
  const storage = memoryStorage();
  if (opts.seed !== false) await seedDemoOnce({ db: database.db, clock, config, mailer, storage }, DEMO_PASSWORD);
  const app = createApp({ db: database.db, pool: database.pool, config, clock, mailer, storage, logger: pino({ level: "silent" }), clientDir });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, "127.0.0.1", () => resolve(s));
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const browser: Browser = await chromium.launch({
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
  fs.mkdirSync(SCREENSHOT_DIR, { recursive: true });

  /** A fresh browser context (own cookies); page errors are collected so a test can assert there were none. */
  async function newPage(viewport = { width: 1280, height: 900 }): Promise<{ page: Page; context: BrowserContext; errors: string[] }> {
    const context = await browser.newContext({ baseURL: baseUrl, viewport });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    page.on("console", (m) => {
      if (m.type() === "error" && !/status of (401|403|404|409|400)/.test(m.text())) errors.push(m.text());
    });
    return { page, context, errors };
  }

  /** Signs in through the sign-in page as a demo person. */
  async function signIn(page: Page, role: Role | string) {
    const email = role.includes("@") ? role : `${role}@tenthwise.test`;
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"));
    await page.getByRole("main").waitFor();
  }

  async function screenshot(page: Page, name: string) {
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
  }

  return {
    baseUrl,
    db: database.db,
    mailer,
    storage,
    browser,
    newPage,
    signIn,
    screenshot,
    async close() {
      await browser.close();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await database.drop();
    },
  };
}
export type BrowserApp = Awaited<ReturnType<typeof startBrowserApp>>;
