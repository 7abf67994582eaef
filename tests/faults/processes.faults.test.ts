import { afterAll, beforeAll, describe, expect, it } from "vitest";
import http from "node:http";
import request from "supertest";
import { sql } from "drizzle-orm";
import { createTestDatabase, type TestDatabase } from "../support/test-db";
import { startAppProcess, type AppProcess } from "../support/processes";
import { startMailCatcher, type MailCatcher } from "../../server/dev-services/mail-catcher";
import { usersService } from "../../server/modules/users/users.service";
import { fixedClock } from "../../server/platform/clock";
import { makeFamily } from "../support/factories";
import { makeQuarantinedTool } from "../support/factories-crib";
import { makeDueTool } from "../support/factories-reminders";
import { addDays, calendarDate } from "../../shared/common/dates";
import { TEST_PASSWORD } from "../support/test-app";
import type { Role } from "../../shared/auth/roles";

// Real app processes (the server as production starts it) on one database: two side by side sharing no
// memory, and one killed in the middle of its work and started again. Nothing is lost, nothing is done
// twice, and service comes back.

let database: TestDatabase;
let catcher: MailCatcher;
const people: Partial<Record<Role, string>> = {};
let env: Record<string, string>;
const running: AppProcess[] = [];

beforeAll(async () => {
  database = await createTestDatabase();
  catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
  const users = usersService({ db: database.db, clock: fixedClock(new Date()) });
  for (const role of ["admin", "quality", "crib", "mechanic", "inspector"] as Role[]) {
    people[role] = (await users.create({ email: `${role}@test.example`, name: `Test ${role}`, role, password: TEST_PASSWORD }, null)).id;
  }
  env = {
    DATABASE_URL: database.url,
    SESSION_SECRET: "processes-test-session-secret",
    SMTP_URL: `smtp://127.0.0.1:${catcher.smtpPort}`,
    MAIL_CATCHER_URL: `http://127.0.0.1:${catcher.httpPort}`,
    SHOP_TIME_ZONE: "America/Chicago",
    DB_POOL_MAX: "6",
  };
}, 120_000);

afterAll(async () => {
  for (const p of running) await p.stop().catch(() => undefined);
  await catcher?.close();
  await database?.drop();
});

async function start() {
  const p = await startAppProcess(env);
  running.push(p);
  return p;
}

/** Signs in on one process; the cookie and CSRF token work on any process (the session is in PostgreSQL). */
async function signIn(url: string, role: Role) {
  const a = request.agent(url);
  const token = (await a.get("/api/auth/csrf")).body.token as string;
  const res = await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: `${role}@test.example`, password: TEST_PASSWORD });
  expect(res.status).toBe(200);
  const cookie = (res.headers["set-cookie"] as unknown as string[]).map((c) => c.split(";")[0]).join("; ");
  return { cookie, token: res.body.csrfToken as string };
}

const post = (url: string, path: string, who: { cookie: string; token: string }, body: object = {}) =>
  request(url).post(path).set("Cookie", who.cookie).set("X-CSRF-Token", who.token).send(body);

describe("two app processes on one database, sharing no memory", () => {
  let a: AppProcess;
  let b: AppProcess;
  beforeAll(async () => {
    [a, b] = await Promise.all([start(), start()]);
  }, 120_000);

  it("a person signed in on one process is signed in on the other", async () => {
    const who = await signIn(a.url, "quality");
    const me = await request(b.url).get("/api/auth/me").set("Cookie", who.cookie);
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe("quality@test.example");
    // And a write on the other process carries the same CSRF token.
    const fam = await post(b.url, "/api/families", who, { name: "Outside micrometer (scale-out)", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365 });
    expect(fam.status).toBe(201);
  });

  it("a reminder run started on both at once sends each digest once", async () => {
    const today = calendarDate(new Date(), "America/Chicago");
    // Four people each hold a tool coming due within the 7-day stage: four digests to them, one to the crib.
    const holders: Role[] = ["mechanic", "inspector", "quality", "admin"];
    for (const [i, who] of holders.entries()) {
      await makeDueTool(database.db, { assetTag: `SCALE-${i}`, dueAt: addDays(today, 5), issuedTo: people[who], issuedAt: new Date(Date.now() - 3_600_000).toISOString(), dueBackAt: new Date(Date.now() + 6 * 3_600_000).toISOString() });
    }
    catcher.clear();
    const admin = await signIn(a.url, "admin");
    const [ra, rb] = await Promise.all([post(a.url, "/api/admin/jobs/reminders/run", admin), post(b.url, "/api/admin/jobs/reminders/run", admin)]);
    expect([ra.status, rb.status]).toEqual([200, 200]);
    const recipients = catcher.messages().map((m) => m.to[0]);
    expect(recipients.length).toBeGreaterThanOrEqual(4);
    expect(new Set(recipients).size).toBe(recipients.length);
    expect(ra.body.sent + rb.body.sent).toBe(recipients.length);
    // Run again on either: nothing new.
    expect((await post(b.url, "/api/admin/jobs/reminders/run", admin)).body.sent).toBe(0);
    expect(catcher.messages()).toHaveLength(recipients.length);
  });

  it("twenty releases of one quarantined tool, split across both processes, give one release", async () => {
    const tool = await makeQuarantinedTool(database.db);
    const crib = await signIn(a.url, "crib");
    const results = await Promise.all(Array.from({ length: 20 }, (_, i) => post(i % 2 ? a.url : b.url, `/api/tools/${tool.assetTag}/release`, crib, { reason: `Inspected, no damage (${i})` })));
    const statuses = results.map((r) => r.status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s >= 500)).toEqual([]);
    expect(new Set(results.filter((r) => r.status !== 200).map((r) => r.body.error.code))).toEqual(new Set(["not_quarantined"]));
    const n = (await database.db.execute(sql`select count(*)::int as n from holds where tool_id = ${tool.id} and released_at is not null`)).rows[0] as { n: number };
    expect(n.n).toBe(1);
  });

  afterAll(async () => {
    await Promise.all([a?.stop(), b?.stop()]);
  });
});

describe("an app process killed in the middle of its work", () => {
  it("killed mid-import, the register holds none of the file; imported again, it holds every row once", async () => {
    const family = await makeFamily(database.db, { name: "Outside micrometer 0-1 in (killed import)" });
    const header = "Asset tag,Family,Description,Serial no,Unit,Range from,Range to,Resolution,Interval,Last calibrated";
    const csv = [header, ...Array.from({ length: 1500 }, (_, i) => `KILL-${String(i).padStart(5, "0")},${family.name},Outside micrometer 0-1 in,SN-K${i},in,0,1,0.0001,365,2026-03-01`)].join("\r\n") + "\r\n";
    const count = async () => Number(((await database.db.execute(sql`select count(*)::int as n from tools where asset_tag like 'KILL-%'`)).rows[0] as { n: number }).n);

    const p = await start();
    const quality = await signIn(p.url, "quality");
    // The import streams its progress; the process is killed once it is writing.
    const killedAt = await new Promise<string>((resolve, reject) => {
      const req = http.request(`${p.url}/api/imports/commit`, { method: "POST", headers: { "Content-Type": "application/json", Accept: "application/x-ndjson", Cookie: quality.cookie, "X-CSRF-Token": quality.token } }, (res) => {
        let buf = "";
        res.on("data", (d) => {
          buf += d;
          const importing = buf.split("\n").find((l) => l.includes('"phase":"importing"'));
          if (importing) {
            void p.kill().then(() => resolve(importing));
          }
        });
        res.on("error", () => undefined);
      });
      req.on("error", () => undefined);
      req.end(JSON.stringify({ csv }));
      setTimeout(() => reject(new Error("the import never reported progress")), 60_000);
    });
    expect(killedAt).toContain("importing");
    expect(await count()).toBe(0);

    const again = await start();
    const q2 = await signIn(again.url, "quality");
    const res = await post(again.url, "/api/imports/commit", q2, { csv });
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(201);
    expect(res.body.tools).toBe(1500);
    expect(await count()).toBe(1500);
    // A third try is refused row by row (already registered) and adds nothing.
    expect((await post(again.url, "/api/imports/commit", q2, { csv })).status).toBe(400);
    expect(await count()).toBe(1500);
  });

  it("killed mid-reminder-run, the next run sends what was left, and nobody's mailbox holds a digest twice", async () => {
    const today = calendarDate(new Date(), "America/Chicago");
    // Fresh recipients and tools for this run.
    const users = usersService({ db: database.db, clock: fixedClock(new Date()) });
    const holders: string[] = [];
    for (let i = 0; i < 6; i++) holders.push((await users.create({ email: `holder${i}@test.example`, name: `Holder ${i}`, role: "mechanic", password: TEST_PASSWORD }, null)).id);
    for (const [i, id] of holders.entries()) {
      await makeDueTool(database.db, { assetTag: `KILLREM-${i}`, dueAt: addDays(today, 6), issuedTo: id, issuedAt: new Date(Date.now() - 3_600_000).toISOString(), dueBackAt: new Date(Date.now() + 6 * 3_600_000).toISOString() });
    }
    catcher.clear();
    catcher.slowDown(400);
    const p = await start();
    const admin = await signIn(p.url, "admin");
    const run = post(p.url, "/api/admin/jobs/reminders/run", admin).catch(() => null);
    // Killed once two digests have reached the mail server; a third may be in flight.
    for (let i = 0; i < 200 && catcher.messages().length < 2; i++) await new Promise((r) => setTimeout(r, 50));
    await p.kill();
    await run;
    catcher.slowDown(0);
    const before = catcher.messages().length;
    expect(before).toBeGreaterThanOrEqual(2);
    expect(before).toBeLessThan(8);

    const again = await start();
    const admin2 = await signIn(again.url, "admin");
    const rerun = await post(again.url, "/api/admin/jobs/reminders/run", admin2);
    expect(rerun.status).toBe(200);
    const to = catcher.messages().map((m) => m.to[0]);
    for (let i = 0; i < 6; i++) expect(to.filter((x) => x === `holder${i}@test.example`), `holder${i}`).toHaveLength(1);
    expect(new Set(to).size).toBe(to.length);
    const unsent = (await database.db.execute(sql`select count(*)::int as n from reminder_log where status <> 'sent'`)).rows[0] as { n: number };
    expect(unsent.n).toBe(0);
    const interrupted = (await database.db.execute(sql`select count(*)::int as n from reminder_runs where status = 'failed' and error like 'Interrupted%'`)).rows[0] as { n: number };
    expect(interrupted.n).toBe(1);
  });
});
