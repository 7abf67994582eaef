import { describe, expect, it } from "vitest";
import type session from "express-session";
import { SessionStore, forgetSessionsOf } from "../../server/auth/session-store";

// The session store reuses a session it read for a few seconds (docs/decisions/015). Signing out, a password
// reset and a deactivation must still end the session at once on this instance, even when a request was reading
// that session from the database at the very moment it ended. Common practice, no source.

/** A stand-in for the sessions table: answers connect-pg-simple's statements, each held until released. */
function fakePool() {
  const rows = new Map<string, unknown>();
  const reads: { release: () => void }[] = [];
  let holdReads = false;
  return {
    rows,
    reads,
    hold(on: boolean) {
      holdReads = on;
    },
    selects: 0,
    async query(text: string, params: unknown[]) {
      if (/^SELECT sess/i.test(text)) {
        this.selects++;
        const sid = String(params[0]);
        const snapshot = rows.get(sid);
        if (holdReads) await new Promise<void>((release) => reads.push({ release }));
        return { rows: snapshot ? [{ sess: snapshot }] : [] };
      }
      if (/^DELETE/i.test(text)) rows.delete(String(params[0]));
      else if (/^INSERT/i.test(text)) rows.set(String(params[1] ?? params[0]), params[0]);
      return { rows: [] };
    },
  };
}

const sess = (userId: string) => ({ cookie: { expires: new Date(Date.now() + 3_600_000).toISOString() }, passport: { user: userId } }) as unknown as session.SessionData;
const get = (store: SessionStore, sid: string) => new Promise<session.SessionData | null | undefined>((resolve, reject) => store.get(sid, (err, s) => (err ? reject(err) : resolve(s))));
const destroy = (store: SessionStore, sid: string) => new Promise<void>((resolve) => store.destroy(sid, () => resolve()));

function storeOn(pool: ReturnType<typeof fakePool>) {
  return new SessionStore({ pool: pool as never, tableName: "session", createTableIfMissing: false, pruneSessionInterval: false });
}

describe("a signed-in session reused for a few seconds", () => {
  it("is read from the database once for a burst of requests", async () => {
    const pool = fakePool();
    pool.rows.set("s1", sess("u1"));
    const store = storeOn(pool);
    for (let i = 0; i < 5; i++) expect((await get(store, "s1")) as unknown).toMatchObject({ passport: { user: "u1" } });
    expect(pool.selects).toBe(1);
  });

  it("signing out ends it at once, even while another request was reading it", async () => {
    const pool = fakePool();
    pool.rows.set("s2", sess("u2"));
    const store = storeOn(pool);
    pool.hold(true);
    const inFlight = get(store, "s2");
    await new Promise((r) => setTimeout(r, 5));
    await destroy(store, "s2");
    pool.reads.forEach((r) => r.release());
    pool.hold(false);
    // The read that started before the sign-out answers what it saw; the next request sees the sign-out.
    expect(await inFlight).toBeTruthy();
    expect(await get(store, "s2")).toBeFalsy();
  });

  it("a password reset or deactivation drops every session of that person here at once", async () => {
    const pool = fakePool();
    pool.rows.set("s3", sess("u3"));
    pool.rows.set("s4", sess("u4"));
    const store = storeOn(pool);
    await get(store, "s3");
    await get(store, "s4");
    pool.rows.delete("s3"); // the reset deletes the stored sessions…
    forgetSessionsOf("u3"); // …and drops this instance's copies
    expect(await get(store, "s3")).toBeFalsy();
    expect((await get(store, "s4")) as unknown).toMatchObject({ passport: { user: "u4" } });
  });
});
