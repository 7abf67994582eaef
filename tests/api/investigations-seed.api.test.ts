import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { pino } from "pino";
import request from "supertest";
import { createApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { fixedClock } from "../../server/platform/clock";
import { seedDemoOnce } from "../../server/seed";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { memoryMailer, memoryStorage } from "../support/test-app";

// The demo shop as a new user first sees it (one seed serves every check of the demo here): MIC-0104 failed its as-found check today, and the investigation
// opened by itself over the readings it took on both demo engines.
let database: TestDatabase;
let app: ReturnType<typeof createApp>;
const mailer = memoryMailer();

beforeAll(async () => {
  database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: database.url, SESSION_SECRET: "seed-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
  const clock = fixedClock("2026-06-15T15:00:00Z");
  await seedDemoOnce({ db: database.db, clock, config, mailer, storage: memoryStorage() }, "tenthwise-demo");
  app = createApp({ db: database.db, pool: database.pool, config, clock, mailer, storage: memoryStorage(), logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
  // The whole demo shop is seeded here; on a shared two-core machine that alone can pass a minute.
}, 300_000);
afterAll(async () => database?.drop());

async function signedIn(email: string) {
  const a = request.agent(app);
  const token = (await a.get("/api/auth/csrf")).body.token;
  await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email, password: "tenthwise-demo" });
  return a;
}

describe("the demo investigation", () => {
  it("MIC-0104's failed as-found check opened one investigation over both demo jobs, with one disposition recorded and the rest open", async () => {
    const a = await signedIn("auditor@tenthwise.test");
    const list = await a.get("/api/investigations?toolAssetTag=MIC-0104");
    expect(list.status).toBe(200);
    expect(list.body).toHaveLength(1);
    const inv = list.body[0];
    expect(inv.status).toBe("open");
    expect(new Set(inv.affectedReadings.map((r: { jobId: string }) => r.jobId)).size).toBe(2);
    const detail = (await a.get(`/api/investigations/${inv.id}`)).body;
    expect(detail.finding.errors.find((e: { nominal: number }) => e.nominal === 0.5).error).toBe(0.0003);
    const answered = (await a.get(`/api/investigations/${inv.id}/items?disposition=no_impact`)).body;
    expect(answered.items).toHaveLength(1);
    expect(answered.items[0].dispositions).toHaveLength(1);
    expect(detail.undisposedCount).toBe(detail.affectedCount - 1);
    expect(detail.totals.undisposed).toBe(detail.totals.items - 1);
    expect(detail.finding.notifications.status).toBe("sent");
    expect(mailer.sent.some((m) => m.subject.includes("MIC-0104") && m.to === "quality@tenthwise.test")).toBe(true);
  });
});

// The README names the invented demo shop; a newcomer sees the same name in Settings and in the
// reminder e-mails the first start sends, never a placeholder.
describe("the demo shop's name", () => {
  it("Settings and the first reminder e-mails both call the shop Harrow Flats Engine Works, labelled a demo shop", async () => {
    const a = await signedIn("admin@tenthwise.test");
    const settings = await a.get("/api/settings");
    expect(settings.status).toBe(200);
    expect(settings.body.shopName).toBe("Harrow Flats Engine Works, demo shop");

    const reminders = mailer.sent.filter((m) => m.subject.startsWith("Tool calibration reminders"));
    expect(reminders.length).toBeGreaterThan(0);
    for (const m of reminders) {
      expect(m.subject).toContain("(Harrow Flats Engine Works, demo shop)");
      expect(m.text).toContain("These measuring tools at Harrow Flats Engine Works, demo shop ");
      expect(m.subject + m.text).not.toContain("Tenthwise shop");
    }
  });
});
