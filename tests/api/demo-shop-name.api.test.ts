import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { pino } from "pino";
import request from "supertest";
import { createApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { fixedClock } from "../../server/platform/clock";
import { seedDemoOnce } from "../../server/seed";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { memoryMailer, memoryStorage } from "../support/test-app";

// The README names the invented demo shop; a newcomer sees the same name in Settings and in the
// reminder e-mails the first start sends, never a placeholder.
let database: TestDatabase;
let app: ReturnType<typeof createApp>;
const mailer = memoryMailer();

beforeAll(async () => {
  database = await createTestDatabase();
  const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: database.url, SESSION_SECRET: "seed-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
  const clock = fixedClock("2026-06-15T15:00:00Z");
  await seedDemoOnce({ db: database.db, clock, config, mailer, storage: memoryStorage() }, "tenthwise-demo");
  app = createApp({ db: database.db, pool: database.pool, config, clock, mailer, storage: memoryStorage(), logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
  // Seeding the whole demo shop takes a while on a busy machine.
}, 300_000);
afterAll(async () => database?.drop());

async function signedIn(email: string) {
  const a = request.agent(app);
  const token = (await a.get("/api/auth/csrf")).body.token;
  await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email, password: "tenthwise-demo" });
  return a;
}

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
