import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import request from "supertest";
import bcrypt from "bcryptjs";
import { sql } from "drizzle-orm";
import { pino } from "pino";
import { createTestApp, TEST_PASSWORD, type TestApp } from "../support/test-app";
import { createApp } from "../../server/app";

// Sign-in as an attacker would probe it: who exists must not show (same work for known and unknown
// e-mails), guessing is slowed per address across e-mails as well as per e-mail — on every instance
// alike — and weak passwords are refused when an admin sets one.

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ env: { LOGIN_RATE_LIMIT: "4", LOGIN_ADDRESS_RATE_LIMIT: "10" } });
});
afterAll(async () => t?.close());

async function signIn(app: Parameters<typeof request.agent>[0], email: string, password: string) {
  const a = request.agent(app);
  const token = (await a.get("/api/auth/csrf")).body.token as string;
  return a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email, password });
}

const cost = (hash: string) => Number(hash.split("$")[2]);

describe("sign-in failures do not tell who exists", () => {
  it("an unknown e-mail costs the same bcrypt work as a known one with a wrong password (same cost factor, one comparison each)", async () => {
    const spy = vi.spyOn(bcrypt, "compare");
    const unknown = await signIn(t.app, "nobody-here@test.example", "whatever-password-1");
    const known = await signIn(t.app, "auditor@test.example", "whatever-password-1");
    expect(unknown.status).toBe(401);
    expect(known.status).toBe(401);
    expect(unknown.body.error.code).toBe(known.body.error.code);
    expect(unknown.body.error.message).toBe(known.body.error.message);
    expect(spy).toHaveBeenCalledTimes(2);
    const [[, unknownHash], [, knownHash]] = spy.mock.calls as [string, string][];
    const real = ((await t.db.execute(sql`select password_hash from users where email = 'auditor@test.example'`)).rows[0] as { password_hash: string }).password_hash;
    expect(knownHash).toBe(real);
    expect(cost(unknownHash)).toBe(cost(real));
    expect(bcrypt.getRounds(unknownHash)).toBe(bcrypt.getRounds(real));
  });

  it("an e-mail typed with spaces around it and in capitals signs in", async () => {
    const res = await signIn(t.app, "  Crib@Test.Example ", TEST_PASSWORD);
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe("crib@test.example");
  });
});

describe("weak passwords are refused", () => {
  it("a common password, a repeated letter and the person's own e-mail are refused; a few unrelated words are accepted", async () => {
    const admin = await t.agent("admin");
    const before = Number(((await t.db.execute(sql`select count(*)::int as n from users`)).rows[0] as { n: number }).n);
    for (const password of ["aaaaaaaaaa", "password123", "qwertyuiop", "newhire@test.example"]) {
      const res = await admin.post("/api/users", { email: "newhire@test.example", name: "New Hire", role: "mechanic", password });
      expect(res.status, password).toBe(400);
      expect(res.body.error.code).toBe("weak_password");
      expect(res.body.error.details[0].path).toEqual(["password"]);
    }
    expect(Number(((await t.db.execute(sql`select count(*)::int as n from users`)).rows[0] as { n: number }).n)).toBe(before);
    const ok = await admin.post("/api/users", { email: "newhire@test.example", name: "New Hire", role: "mechanic", password: "lathe-harbor-violet-42" });
    expect(ok.status).toBe(201);
    const reset = await admin.post(`/api/users/${ok.body.id}/password`, { password: "newhire@test.example" });
    expect(reset.status).toBe(400);
    expect(reset.body.error.code).toBe("weak_password");
  });
});

describe("guessing is slowed, on every instance alike", () => {
  it("failed sign-ins against one e-mail are limited per address and e-mail, counted in the database so a second instance sees them", async () => {
    // A second app process on the same database: its limiter reads the same counts.
    const other = createApp({ ...t.app.deps, logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await signIn(i % 2 ? other : t.app, "inspector@test.example", `wrong-guess-${i}`)).status);
    expect(statuses).toEqual([401, 401, 401, 401, 429]);
    const blocked = await signIn(other, "inspector@test.example", TEST_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe("too_many_attempts");
  });

  it("failed sign-ins from one address against many e-mails are limited too", async () => {
    await t.db.execute(sql`delete from login_throttle`);
    const statuses: number[] = [];
    for (let i = 0; i < 12; i++) statuses.push((await signIn(t.app, `guess-${i}@test.example`, "wrong-guess")).status);
    expect(statuses.slice(0, 10)).toEqual(Array(10).fill(401));
    expect(statuses.slice(10)).toEqual([429, 429]);
    // The right password of a real person is also held back from this address until the window ends.
    expect((await signIn(t.app, "quality@test.example", TEST_PASSWORD)).status).toBe(429);
  });
});
