import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import request from "supertest";
import { sql } from "drizzle-orm";
import { pino } from "pino";
import { startOwnCluster } from "../support/cluster";
import { prepareDatabase } from "../../server/db/roles";
import { createDb } from "../../server/db/client";
import { createApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { fixedClock } from "../../server/platform/clock";
import { usersService } from "../../server/modules/users/users.service";
import { memoryMailer, memoryStorage, TEST_PASSWORD } from "../support/test-app";

// PostgreSQL stopped, then restarted under load, under a running app: the app never exits, answers 503
// with the documented error while the database is away, and serves again as soon as it is back, with
// the same sessions — without a restart of its own. Every write it acknowledged is there, once.

let cluster: Awaited<ReturnType<typeof startOwnCluster>>;
let db: ReturnType<typeof createDb>;
let server: Server;
let url: string;
const connectionErrors: string[] = [];

beforeAll(async () => {
  cluster = await startOwnCluster();
  const { runtimeUrl } = await prepareDatabase({ adminUrl: cluster.adminUrl, database: "tenthwise" });
  db = createDb(runtimeUrl, { max: 6, connectTimeoutMs: 1500, onConnectionError: (e) => connectionErrors.push((e as { code?: string }).code ?? e.message) });
  const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: runtimeUrl, SESSION_SECRET: "restart-test-session-secret", LOG_LEVEL: "silent", CRON_ENABLED: "false" });
  const clock = fixedClock("2026-06-15T15:00:00Z");
  await usersService({ db: db.db, clock }).create({ email: "quality@test.example", name: "Test quality", role: "quality", password: TEST_PASSWORD }, null);
  const app = createApp({ db: db.db, pool: db.pool, config, clock, mailer: memoryMailer(), storage: memoryStorage(), logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
  server = await new Promise((resolve) => {
    const s = app.listen(0, "127.0.0.1", () => resolve(s));
  });
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
}, 120_000);

afterAll(async () => {
  server?.closeAllConnections();
  await new Promise((r) => server?.close(r));
  await db?.pool.end().catch(() => undefined);
  await cluster?.destroy();
});

async function signedIn() {
  const a = request.agent(url);
  const token = (await a.get("/api/auth/csrf")).body.token as string;
  const res = await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: "quality@test.example", password: TEST_PASSWORD });
  expect(res.status).toBe(200);
  return { a, token: res.body.csrfToken as string };
}

/** Asks until the answer is 200, at most `tries` times half a second apart; returns how many it took. */
async function untilHealthy(tries = 60) {
  for (let i = 1; i <= tries; i++) {
    if ((await request(url).get("/api/health")).status === 200) return i;
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error("the app did not serve again after the database came back");
}

describe("the database goes away and comes back", () => {
  it("while PostgreSQL is stopped every request is a 503 with the documented error; once it is back the app serves again, same session, no restart", async () => {
    const { a, token } = await signedIn();
    expect((await a.get("/api/tools")).status).toBe(200);
    cluster.stop();
    const health = await request(url).get("/api/health");
    expect(health.status).toBe(503);
    expect(health.body).toMatchObject({ ok: false, db: "down", error: { code: "database_unavailable" } });
    for (const res of [await a.get("/api/tools"), await a.post("/api/families").set("X-CSRF-Token", token).send({ name: "While down", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365 })]) {
      expect(res.status).toBe(503);
      expect(res.body.error.code).toBe("database_unavailable");
      expect(typeof res.body.error.message).toBe("string");
      expect(res.headers["retry-after"]).toBeDefined();
    }
    cluster.start();
    await untilHealthy();
    const tools = await a.get("/api/tools");
    expect(tools.status).toBe(200);
    const n = await db.db.execute(sql`select count(*)::int as n from families where name = 'While down'`);
    expect(n.rows[0]).toEqual({ n: 0 });
  });

  it("restarted under a load of reads and writes: only 200, 201 or 503, every acknowledged write is stored once, and service is restored", async () => {
    const { a, token } = await signedIn();
    const statuses: number[] = [];
    const acknowledged: string[] = [];
    let restarted = false;
    let wave = 0;
    const restart = new Promise<void>((resolve) =>
      setTimeout(() => {
        cluster.restart();
        restarted = true;
        resolve();
      }, 300),
    );
    // Waves of 8 reads and 2 writes, until the restart is over and five more waves have been served.
    let after = 0;
    while (after < 5 && wave < 400) {
      wave++;
      const names = [`Load ${wave}a`, `Load ${wave}b`];
      const results = await Promise.all([
        ...Array.from({ length: 4 }, () => a.get("/api/tools?pageSize=5")),
        ...Array.from({ length: 4 }, () => request(url).get("/api/health")),
        ...names.map((name) => a.post("/api/families").set("X-CSRF-Token", token).send({ name, kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365 })),
      ]);
      results.forEach((r) => statuses.push(r.status));
      results.slice(8).forEach((r, i) => {
        if (r.status === 201) acknowledged.push(names[i]);
      });
      if (restarted && results.every((r) => r.status < 300)) after++;
    }
    await restart;
    expect(statuses.filter((s) => ![200, 201, 503].includes(s))).toEqual([]);
    expect(after).toBe(5);
    const stored = (await db.db.execute(sql`select name from families where name like 'Load %'`)).rows.map((r) => (r as { name: string }).name);
    for (const name of acknowledged) expect(stored.filter((s) => s === name), name).toHaveLength(1);
    expect(new Set(stored).size).toBe(stored.length);
    expect(connectionErrors.length).toBeGreaterThan(0);
  });
});
