import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, TEST_PASSWORD, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());

describe("signing in and out", () => {
  it("a person signs in with e-mail and password, sees who they are, and signs out", async () => {
    const a = await t.agent();
    const login = await a.post("/api/auth/login", { email: "quality@test.example", password: TEST_PASSWORD });
    expect(login.status).toBe(200);
    expect(login.body.user).toMatchObject({ email: "quality@test.example", role: "quality", name: "Test quality" });
    expect(login.body.user.passwordHash).toBeUndefined();
    const cookie = String(login.headers["set-cookie"]);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);

    const me = await a.raw.get("/api/auth/me");
    expect(me.body.user.role).toBe("quality");

    const out = await a.raw.post("/api/auth/logout").set("X-CSRF-Token", login.body.csrfToken);
    expect(out.status).toBe(204);
    expect((await a.raw.get("/api/auth/me")).status).toBe(401);
  });

  it("a wrong password is refused with 401 and no session", async () => {
    const a = await t.agent();
    const res = await a.post("/api/auth/login", { email: "quality@test.example", password: "not-the-password" });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("bad_credentials");
    expect((await a.get("/api/auth/me")).status).toBe(401);
  });

  it("the session is regenerated at sign-in, so a planted session id is useless", async () => {
    const a = await t.agent();
    const before = String((await a.raw.get("/api/auth/csrf")).headers["set-cookie"] ?? "");
    const login = await a.post("/api/auth/login", { email: "crib@test.example", password: TEST_PASSWORD });
    const after = String(login.headers["set-cookie"]);
    const sid = (s: string) => s.match(/tenthwise\.sid=([^;]+)/)?.[1];
    expect(sid(after)).toBeDefined();
    expect(sid(after)).not.toBe(sid(before));
  });

  it("a state-changing request without the CSRF token is refused with 403", async () => {
    const a = await t.agent("admin");
    const res = await a.raw.post("/api/users").send({ email: "x@test.example", name: "X", role: "mechanic", password: "long-enough-pw" });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("csrf_token_invalid");
    const list = await a.get("/api/users?q=x@test.example");
    expect(list.body.total).toBe(0);
  });

  it("a deactivated person cannot sign in and loses the session they had", async () => {
    const admin = await t.agent("admin");
    const created = await admin.post("/api/users", { email: "leaver@test.example", name: "Lee Leaver", role: "mechanic", password: "leaver-password-1" });
    expect(created.status).toBe(201);
    const leaver = await t.agent();
    const login = await leaver.post("/api/auth/login", { email: "leaver@test.example", password: "leaver-password-1" });
    expect(login.status).toBe(200);
    expect((await leaver.raw.get("/api/auth/me")).status).toBe(200);

    const off = await admin.patch(`/api/users/${created.body.id}`, { active: false });
    expect(off.status).toBe(200);
    expect(off.body.active).toBe(false);
    expect((await leaver.raw.get("/api/auth/me")).status).toBe(401);
    const again = await (await t.agent()).post("/api/auth/login", { email: "leaver@test.example", password: "leaver-password-1" });
    expect(again.status).toBe(401);
  });

  it("an admin resets a password: the old one stops working, the new one works, and the session signed in with the old one ends at once", async () => {
    const admin = await t.agent("admin");
    const created = await admin.post("/api/users", { email: "forgetful@test.example", name: "Fern Getful", role: "inspector", password: "first-password-1" });
    const before = await t.agent();
    expect((await before.post("/api/auth/login", { email: "forgetful@test.example", password: "first-password-1" })).status).toBe(200);
    expect((await before.raw.get("/api/auth/me")).status).toBe(200);
    expect((await admin.post(`/api/users/${created.body.id}/password`, { password: "second-password-2" })).status).toBe(204);
    expect((await before.raw.get("/api/auth/me")).status).toBe(401);
    expect((await (await t.agent()).post("/api/auth/login", { email: "forgetful@test.example", password: "first-password-1" })).status).toBe(401);
    expect((await (await t.agent()).post("/api/auth/login", { email: "forgetful@test.example", password: "second-password-2" })).status).toBe(200);
  });

  it("repeated failed sign-ins are throttled", async () => {
    const admin = await t.agent("admin");
    await admin.post("/api/users", { email: "typo@test.example", name: "Ty Po", role: "mechanic", password: "typo-password-1" });
    const a = await t.agent();
    let last = 0;
    for (let i = 0; i < 11; i++) {
      last = (await a.post("/api/auth/login", { email: "typo@test.example", password: `wrong-${i}` })).status;
    }
    expect(last).toBe(429);
    // Even the right password waits out the throttle.
    expect((await a.post("/api/auth/login", { email: "typo@test.example", password: "typo-password-1" })).status).toBe(429);
  });
});

describe("bad input and unknown routes", () => {
  it("a user with a missing e-mail is refused with the field named, and nobody is created", async () => {
    const admin = await t.agent("admin");
    const before = (await admin.get("/api/users")).body.total;
    const res = await admin.post("/api/users", { name: "No Mail", role: "mechanic", password: "long-enough-pw" });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_input");
    expect(res.body.error.details[0].path).toEqual(["email"]);
    expect((await admin.get("/api/users")).body.total).toBe(before);
  });

  it("an unknown role is refused", async () => {
    const admin = await t.agent("admin");
    const res = await admin.post("/api/users", { email: "r@test.example", name: "R", role: "foreman", password: "long-enough-pw" });
    expect(res.status).toBe(400);
  });

  it("malformed JSON is a 400, not a server error", async () => {
    const a = await t.agent("admin");
    const res = await a.raw.post("/api/users").set("X-CSRF-Token", a.token()).set("content-type", "application/json").send("{not json");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_json");
  });

  it("an unknown route under /api answers JSON 404", async () => {
    const res = await (await t.agent("admin")).get("/api/no-such-thing");
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("route_not_found");
  });

  it("health says the database is up and the OpenAPI document lists the sign-in route", async () => {
    const a = await t.agent();
    expect((await a.get("/api/health")).body).toEqual({ ok: true, db: "up" });
    const doc = (await a.get("/api/openapi.json")).body;
    expect(doc.openapi).toBe("3.1.0");
    expect(doc.paths["/api/auth/login"].post.requestBody.content["application/json"].schema.properties.email).toBeDefined();
  });
});

describe("who may manage users", () => {
  roleMatrix(() => t, [
    { method: "get", path: "/api/users", allowed: ["admin"] },
    { method: "post", path: "/api/users", body: { email: "matrix@test.example", name: "M", role: "mechanic", password: "long-enough-pw" }, allowed: ["admin"] },
    { method: "patch", label: "/api/users/:id", path: (x) => `/api/users/${x.people.mechanic.id}`, body: { name: "Test mechanic" }, allowed: ["admin"] },
    { method: "get", path: "/api/people?q=test", allowed: ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] },
    { method: "get", path: "/api/settings", allowed: ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] },
    { method: "patch", path: "/api/settings", body: { dueSoonDays: 30 }, allowed: ["admin"] },
  ]);
});
