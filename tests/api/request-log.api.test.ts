import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Writable } from "node:stream";
import request from "supertest";
import { pino } from "pino";
import { createApp } from "../../server/app";
import { createTestApp, TEST_PASSWORD, type TestApp } from "../support/test-app";

// The server log an operator reads: one line per request at info — method, path, status, time and who
// asked — and the headers only when debugging, with credentials never written.
let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t?.close());

/** An app on the same database whose log lines are kept, parsed, at the given level. */
function loggedApp(level: "info" | "debug") {
  const lines: Record<string, unknown>[] = [];
  const sink = new Writable({
    write(chunk, _enc, cb) {
      for (const l of String(chunk).split("\n")) if (l.trim()) lines.push(JSON.parse(l));
      cb();
    },
  });
  const app = createApp({ ...t.app.deps, logger: pino({ level }, sink), clientDir: "/nonexistent" });
  return { app, lines };
}

async function signedInSettings(app: Parameters<typeof request.agent>[0]) {
  const a = request.agent(app);
  const token = (await a.get("/api/auth/csrf")).body.token;
  const login = await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: t.people.quality.email, password: TEST_PASSWORD });
  expect(login.status).toBe(200);
  const res = await a.get("/api/settings?view=full").set("User-Agent", "shop-floor-tablet/1.0");
  expect(res.status).toBe(200);
}

describe("request log", () => {
  it("at info, a signed-in request leaves one line with method, path, status, time and the person's id, and no headers", async () => {
    const { app, lines } = loggedApp("info");
    await signedInSettings(app);
    const settingsLines = lines.filter((l) => l.path === "/api/settings");
    expect(settingsLines).toHaveLength(1);
    const line = settingsLines[0];
    expect(line).toMatchObject({ level: 30, method: "GET", path: "/api/settings", status: 200, userId: t.people.quality.id });
    expect(typeof line.ms).toBe("number");
    expect(line.msg).toMatch(/^GET \/api\/settings 200 [\d.]+ ms$/);
    // Nothing of the headers at info: no user agent, no cookie, no header object at all.
    const all = JSON.stringify(lines);
    expect(all).not.toContain("shop-floor-tablet");
    expect(all).not.toContain("tenthwise.sid");
    expect(all).not.toMatch(/headers/i);
    // Every line is one request: the sign-in's and the token's too, each once.
    expect(lines.filter((l) => l.path === "/api/auth/login")).toHaveLength(1);
    expect(lines.filter((l) => l.path === "/api/auth/csrf")).toHaveLength(1);
  });

  it("at debug, the details line carries the headers with the session cookie and CSRF token redacted", async () => {
    const { app, lines } = loggedApp("debug");
    await signedInSettings(app);
    const details = lines.filter((l) => l.msg === "request details" && l.path === "/api/settings");
    expect(details).toHaveLength(1);
    const d = details[0] as { requestHeaders: Record<string, string>; query: Record<string, string> };
    expect(d.requestHeaders["user-agent"]).toBe("shop-floor-tablet/1.0");
    expect(d.requestHeaders.cookie).toBe("[redacted]");
    expect(d.query).toEqual({ view: "full" });
    expect(JSON.stringify(lines)).not.toMatch(/tenthwise\.sid=/);
    const login = lines.find((l) => l.msg === "request details" && l.path === "/api/auth/login") as { requestHeaders: Record<string, string> };
    expect(login.requestHeaders["x-csrf-token"]).toBe("[redacted]");
  });
});
