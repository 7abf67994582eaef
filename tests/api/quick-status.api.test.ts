import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { Writable } from "node:stream";
import request from "supertest";
import etag from "etag";
import { pino } from "pino";
import { createApp } from "../../server/app";
import { SessionStore } from "../../server/auth/session-store";
import { createTestApp, TEST_PASSWORD, type TestApp } from "../support/test-app";
import { makeCalibration, makeTool } from "../support/factories";

// A tool's status asked again and again (a mechanic with a gauge in hand) is answered before the app's middleware
// when the session and the person were read moments ago (server/http/quick-get.ts). It must answer exactly as the
// whole way does, and never for a session that has ended. Common practice, no source: what a signed-in web app owes.
let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  const tool = await makeTool(t.db, { assetTag: "QS-0001" });
  await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-03-01T15:00:00Z"), nextDueAt: "2027-03-01" });
});
afterAll(async () => t.close());

/** The session cookie as the client holds it, from an agent's last answer that set it. */
const sessionCookieOf = (res: request.Response) => String(res.headers["set-cookie"] ?? "").match(/tenthwise\.sid=[^;]+/)?.[0] ?? "";
/** The headers of an answer that do not change from one answer to the next. */
const steadyHeaders = (res: request.Response) =>
  Object.fromEntries(Object.entries(res.headers).filter(([k]) => !["date", "etag", "set-cookie", "content-length", "connection", "keep-alive"].includes(k)));

describe("a status lookup answered from the kept session", () => {
  it("carries the same answer, security headers and rolling session cookie as the first lookup, which read the session", async () => {
    const m = await t.agent("mechanic");
    const reads = vi.spyOn(SessionStore.prototype, "get");
    const first = await m.get("/api/tools/QS-0001/status");
    const readsForFirst = reads.mock.calls.length;
    const second = await m.get("/api/tools/QS-0001/status");
    const readsForSecond = reads.mock.calls.length - readsForFirst;
    reads.mockRestore();
    expect(first.status).toBe(200);
    expect(readsForFirst).toBe(1);
    // The second did not go through the session middleware at all.
    expect(readsForSecond).toBe(0);
    expect(second.status).toBe(200);
    expect(second.body).toEqual({ ...first.body, at: second.body.at });
    expect(second.body).toMatchObject({ assetTag: "QS-0001", status: "in_calibration", usable: true, dueAt: "2027-03-01" });
    expect(steadyHeaders(second)).toEqual(steadyHeaders(first));
    // Each answer's validator is Express's weak ETag of its own body (the etag package's form: W/"<length in hex>-<hash>").
    for (const res of [first, second]) {
      expect(res.headers["etag"]).toBe(etag(res.text, { weak: true }));
      expect(res.headers["content-length"]).toBe(String(Buffer.byteLength(res.text)));
    }
    expect(second.headers["content-security-policy"]).toContain("default-src 'self'");
    expect(second.headers["x-frame-options"]).toBe("SAMEORIGIN");
    // The same session, its expiry moved on: twelve hours from now, as at every answer.
    expect(sessionCookieOf(second)).toBe(sessionCookieOf(first));
    const cookie = String(second.headers["set-cookie"]);
    expect(cookie).toMatch(/; Path=\/; Expires=[^;]+; HttpOnly; SameSite=Lax$/);
    const expires = Date.parse(cookie.match(/Expires=([^;]+)/)![1]);
    expect(Math.abs(expires - (Date.now() + 12 * 3600_000))).toBeLessThan(60_000);
  });

  it("an unknown tag is 404 tool not found, a tag differing only in case finds the tool, and a NUL in the tag is refused", async () => {
    const m = await t.agent("mechanic");
    await m.get("/api/tools/QS-0001/status");
    const missing = await m.get("/api/tools/QS-9999/status");
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe("tool_not_found");
    expect(missing.headers["x-content-type-options"]).toBe("nosniff");
    const lower = await m.get("/api/tools/qs-0001/status");
    expect(lower.status).toBe(200);
    expect(lower.body.assetTag).toBe("QS-0001");
    const nul = await m.get("/api/tools/QS-0001%00/status");
    expect(nul.status).toBe(400);
  });

  it("a signed-out session is refused at once, even moments after it was last used", async () => {
    const m = await t.agent("mechanic");
    const used = await m.get("/api/tools/QS-0001/status");
    expect((await m.get("/api/tools/QS-0001/status")).status).toBe(200);
    const cookie = sessionCookieOf(used);
    expect((await m.post("/api/auth/logout")).status).toBe(204);
    const after = await request(t.app).get("/api/tools/QS-0001/status").set("Cookie", cookie);
    expect(after.status).toBe(401);
  });

  it("a deactivated person's status lookups stop at once, and so do those of a person whose password an admin reset", async () => {
    const admin = await t.agent("admin");
    const leaver = await admin.post("/api/users", { email: "quick-leaver@test.example", name: "Quinn Leaver", role: "mechanic", password: "leaver-password-1" });
    const reset = await admin.post("/api/users", { email: "quick-reset@test.example", name: "Rhys Reset", role: "mechanic", password: "reset-password-1" });
    expect(leaver.status).toBe(201);
    expect(reset.status).toBe(201);
    const signIn = async (email: string, password: string) => {
      const a = await t.agent();
      expect((await a.post("/api/auth/login", { email, password })).status).toBe(200);
      expect((await a.get("/api/tools/QS-0001/status")).status).toBe(200);
      expect((await a.get("/api/tools/QS-0001/status")).status).toBe(200);
      return a;
    };
    const l = await signIn("quick-leaver@test.example", "leaver-password-1");
    const r = await signIn("quick-reset@test.example", "reset-password-1");
    expect((await admin.patch(`/api/users/${leaver.body.id}`, { active: false })).status).toBe(200);
    expect((await l.get("/api/tools/QS-0001/status")).status).toBe(401);
    expect((await admin.post(`/api/users/${reset.body.id}/password`, { password: "reset-password-2" })).status).toBe(204);
    expect((await r.get("/api/tools/QS-0001/status")).status).toBe(401);
  });

  it("a session cookie with a forged signature, or none, is 401 not signed in", async () => {
    const m = await t.agent("mechanic");
    const used = await m.get("/api/tools/QS-0001/status");
    await m.get("/api/tools/QS-0001/status");
    const cookie = sessionCookieOf(used);
    const forged = cookie.replace(/\.[^.]+$/, ".AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA");
    expect(forged).not.toBe(cookie);
    const res = await request(t.app).get("/api/tools/QS-0001/status").set("Cookie", forged);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("not_signed_in");
    expect((await request(t.app).get("/api/tools/QS-0001/status")).status).toBe(401);
  });

  it("leaves the same request-log line as any request: method, path, status, time and who asked", async () => {
    const lines: Record<string, unknown>[] = [];
    const sink = new Writable({
      write(chunk, _enc, cb) {
        for (const l of String(chunk).split("\n")) if (l.trim()) lines.push(JSON.parse(l));
        cb();
      },
    });
    const app = createApp({ ...t.app.deps, logger: pino({ level: "info" }, sink), clientDir: "/nonexistent" });
    const a = request.agent(app);
    const token = (await a.get("/api/auth/csrf")).body.token;
    expect((await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: t.people.mechanic.email, password: TEST_PASSWORD })).status).toBe(200);
    for (let i = 0; i < 3; i++) expect((await a.get("/api/tools/QS-0001/status")).status).toBe(200);
    const statusLines = lines.filter((l) => l.path === "/api/tools/QS-0001/status");
    expect(statusLines).toHaveLength(3);
    for (const line of statusLines) {
      expect(line).toMatchObject({ level: 30, method: "GET", status: 200, userId: t.people.mechanic.id });
      expect(line.msg).toMatch(/^GET \/api\/tools\/QS-0001\/status 200 [\d.]+ ms$/);
    }
    // Each request its own id.
    expect(new Set(lines.map((l) => l.reqId)).size).toBe(lines.length);
  });
});
