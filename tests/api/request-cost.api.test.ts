import { afterAll, beforeAll, describe, expect, it } from "vitest";
import pg from "pg";
import request from "supertest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCalibration, makeTool } from "../support/factories";

// What one request costs the database, whatever the size of the register: the statements a signed-in
// person's request sends, counted on the wire (every pg client of this process).
let t: TestApp;
const seen: string[] = [];
let counting = false;
const original = pg.Client.prototype.query;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  (pg.Client.prototype as any).query = function (this: pg.Client, ...args: any[]) {
    if (counting) seen.push(String(typeof args[0] === "string" ? args[0] : args[0]?.text).replace(/\s+/g, " ").slice(0, 160));
    // eslint-disable-next-line @typescript-eslint/no-explicit-any
    return (original as any).apply(this, args);
  };
});
afterAll(async () => {
  pg.Client.prototype.query = original;
  await t.close();
});

async function statementsOf(run: () => Promise<unknown>) {
  seen.length = 0;
  counting = true;
  try {
    await run();
  } finally {
    counting = false;
  }
  return [...seen];
}

const touchesSession = (q: string) => /^(update|insert into) "session"/i.test(q.trim());
const readsUser = (q: string) => /from "users"/i.test(q) && !/join users/i.test(q);
const readsSettings = (q: string) => /from "settings"/i.test(q);

describe("what a request costs the database, whatever the register holds", () => {
  it("a mechanic looking up a tool's status again and again: the session, the person and the shop settings are read once, not on every request, and the session is not rewritten", async () => {
    const tool = await makeTool(t.db, { assetTag: "RC-0001" });
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-03-01T15:00:00Z"), nextDueAt: "2027-03-01" });
    const m = await t.agent("mechanic");
    await m.get("/api/tools/RC-0001/status");
    const sent = await statementsOf(async () => {
      for (let i = 0; i < 5; i++) {
        const res = await m.get("/api/tools/RC-0001/status");
        expect(res.status).toBe(200);
        expect(res.body.status).toBe("in_calibration");
      }
    });
    expect(sent.filter(touchesSession)).toEqual([]);
    expect(sent.filter(readsUser)).toEqual([]);
    expect(sent.filter(readsSettings)).toEqual([]);
    // Each request still reads its session (a signed-out session is signed out everywhere at once).
    expect(sent.filter((q) => /from "session"/i.test(q))).toEqual([]);
    // One status lookup is one statement: the tool with its status, by tag.
    expect(sent).toHaveLength(5);

    // A tag scanned or typed in another case still finds the tool (a second statement, on an index); an unknown one is a 404.
    const lower = await m.get("/api/tools/rc-0001/status");
    expect(lower.status).toBe(200);
    expect(lower.body).toMatchObject({ assetTag: "RC-0001", status: "in_calibration" });
    const unknown = await m.get("/api/tools/RC-9999/status");
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe("tool_not_found");
  });

  it("a change of role takes effect on the person's next request; deactivating someone signs them out at once", async () => {
    const tool = await makeTool(t.db, { assetTag: "RC-0002" });
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-03-01T15:00:00Z"), nextDueAt: "2027-03-01" });
    const admin = await t.agent("admin");
    const created = await admin.post("/api/users", { email: "moved@test.example", name: "Moved Person", role: "mechanic", password: "correct-horse-battery-staple-9" });
    expect(created.status).toBe(201);
    const a = request.agent(t.app);
    const token = (await a.get("/api/auth/csrf")).body.token as string;
    expect((await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: "moved@test.example", password: "correct-horse-battery-staple-9" })).status).toBe(200);
    expect((await a.get("/api/auth/me")).body.user.role).toBe("mechanic");
    expect((await admin.patch(`/api/users/${created.body.id}`, { role: "inspector" })).status).toBe(200);
    expect((await a.get("/api/auth/me")).body.user.role).toBe("inspector");
    expect((await admin.patch(`/api/users/${created.body.id}`, { active: false })).status).toBe(200);
    expect((await a.get("/api/tools/RC-0002/status")).status).toBe(401);
  });

  it("a change of the shop's settings is used by the next request", async () => {
    const admin = await t.agent("admin");
    const m = await t.agent("mechanic");
    expect((await m.get("/api/settings")).body.dueSoonDays).toBe(30);
    expect((await admin.patch("/api/settings", { dueSoonDays: 45 })).status).toBe(200);
    expect((await m.get("/api/settings")).body.dueSoonDays).toBe(45);
    await admin.patch("/api/settings", { dueSoonDays: 30 });
  });

  it("answers travel compressed when the client accepts it", async () => {
    for (let i = 0; i < 40; i++) await makeTool(t.db, { assetTag: `RC-1${String(i).padStart(3, "0")}` });
    const m = await t.agent("mechanic");
    const res = await m.get("/api/tools?pageSize=50").set("Accept-Encoding", "gzip");
    expect(res.status).toBe(200);
    expect(res.headers["content-encoding"]).toBe("gzip");
    expect(res.body.items.length).toBeGreaterThan(10);
    // A browser offers brotli too, and gets it.
    const br = await m.get("/api/tools?pageSize=50").set("Accept-Encoding", "gzip, deflate, br");
    expect(br.status).toBe(200);
    expect(br.headers["content-encoding"]).toBe("br");
  });
});
