import request from "supertest";
import { pino } from "pino";
import { createApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { fixedClock } from "../../server/platform/clock";
import type { Mailer, OutgoingMail } from "../../server/platform/mailer";
import type { ObjectStorage } from "../../server/platform/storage";
import { createTestDatabase, type TestDatabase } from "./test-db";
import { usersService } from "../../server/modules/users/users.service";
import type { Role } from "../../shared/auth/roles";
import { ROLES } from "../../shared/auth/roles";

export const TEST_PASSWORD = "correct-horse-battery";

/** Object storage kept in memory for API tests that upload certificates and photos. */
export function memoryStorage(): ObjectStorage & { objects: Map<string, { body: Buffer; contentType: string }> } {
  const objects = new Map<string, { body: Buffer; contentType: string }>();
  let n = 0;
  return {
    objects,
    async put(prefix, body, contentType, fileName) {
      const key = `${prefix}/${++n}-${fileName ?? "file"}`;
      objects.set(key, { body, contentType });
      return key;
    },
    async get(key) {
      const o = objects.get(key);
      if (!o) throw new Error(`no object ${key}`);
      return o;
    },
  };
}

/** A mailer that keeps what it was asked to send (tests of mail content use the real catcher instead). */
export function memoryMailer(): Mailer & { sent: OutgoingMail[] } {
  const sent: OutgoingMail[] = [];
  return { sent, async send(m) { sent.push(m); } };
}

export interface TestAppOptions {
  now?: string;
  env?: Record<string, string>;
  mailer?: Mailer;
  storage?: ObjectStorage;
}

/**
 * The real app on a fresh PostgreSQL database, with a movable clock, one
 * signed-in user per role, and helpers that carry the session cookie and
 * CSRF token like the browser does.
 */
export async function createTestApp(opts: TestAppOptions = {}) {
  const database: TestDatabase = await createTestDatabase();
  const config = loadConfig({
    NODE_ENV: "test",
    DATABASE_URL: database.url,
    SESSION_SECRET: "test-session-secret-0123456789",
    LOG_LEVEL: "silent",
    CRON_ENABLED: "false",
    SHOP_TIME_ZONE: "America/Chicago",
    ...opts.env,
  });
  const clock = fixedClock(opts.now ?? "2026-06-15T15:00:00Z");
  const mailer = opts.mailer ?? memoryMailer();
  const storage = opts.storage ?? memoryStorage();
  const app = createApp({ db: database.db, pool: database.pool, config, clock, mailer, storage, logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
  const users = usersService({ db: database.db, clock });

  const people = {} as Record<Role, { id: string; email: string; name: string; role: Role }>;
  for (const role of ROLES) {
    const u = await users.create({ email: `${role}@test.example`, name: `Test ${role}`, role, password: TEST_PASSWORD }, null);
    people[role] = u;
  }

  /** A browser-like session: cookie jar plus CSRF header on writes. */
  async function agent(role?: Role) {
    const a = request.agent(app);
    let token = (await a.get("/api/auth/csrf")).body.token as string;
    if (role) {
      const res = await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: people[role].email, password: TEST_PASSWORD });
      if (res.status !== 200) throw new Error(`sign-in as ${role} failed: ${res.status} ${JSON.stringify(res.body)}`);
      token = res.body.csrfToken;
    }
    const withToken = <T extends { set(h: string, v: string): T }>(r: T) => r.set("X-CSRF-Token", token);
    return {
      raw: a,
      token: () => token,
      get: (url: string) => a.get(url),
      post: (url: string, body?: object) => withToken(a.post(url)).send(body ?? {}),
      put: (url: string, body?: object) => withToken(a.put(url)).send(body ?? {}),
      patch: (url: string, body?: object) => withToken(a.patch(url)).send(body ?? {}),
      delete: (url: string) => withToken(a.delete(url)),
      /** Multipart upload with extra fields. */
      upload: (url: string, field: string, file: Buffer, fileName: string, fields: Record<string, string> = {}) => {
        let r = withToken(a.post(url)).attach(field, file, fileName);
        for (const [k, v] of Object.entries(fields)) r = r.field(k, v);
        return r;
      },
    };
  }

  return { app, db: database.db, pool: database.pool, database, config, clock, mailer, storage, people, agent, close: () => database.drop() };
}
export type TestApp = Awaited<ReturnType<typeof createTestApp>>;
export type TestAgent = Awaited<ReturnType<TestApp["agent"]>>;
