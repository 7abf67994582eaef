import { afterAll, beforeAll, describe, expect, it } from "vitest";
import pg from "pg";
import request from "supertest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeCalibration, makeTool } from "../support/factories";
import { makeJob, makeLimitTable, makeToolInCalibration, pinAndBoreItems } from "../support/factories-inspection";

// What one request costs the database, whatever the size of the register: the statements a signed-in
// person's request sends, counted on the wire (every pg client of this process).
let t: TestApp;
const seen: string[] = [];
/** The name each counted statement went by (a named prepared statement is planned once per connection), or "". */
const names: string[] = [];
let counting = false;
const original = pg.Client.prototype.query;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  (pg.Client.prototype as any).query = function (this: pg.Client, ...args: any[]) {
    const text = String(typeof args[0] === "string" ? args[0] : args[0]?.text).replace(/\s+/g, " ");
    // A sign-in's release of its login throttle is sent after its answer, so it may land while a later request is
    // counted: it belongs to the sign-in, not to what is measured.
    if (counting && !/^\s*update login_throttle /.test(text)) {
      seen.push(text);
      names.push(typeof args[0] === "object" && args[0]?.name ? String(args[0].name) : "");
    }
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
  names.length = 0;
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
    // Sent by one name every time (a prepared statement: planned once per connection, not on every lookup).
    expect(new Set(names).size).toBe(1);
    expect(names[0]).toMatch(/^tw_[0-9a-f]{24}$/);

    // Planned once, answered afresh: the tool quarantined between two lookups shows quarantined at once.
    const crib = await t.agent("crib");
    const held = await crib.post("/api/tools/RC-0001/quarantine").send({ reason: "Dropped on the bench" });
    expect(held.status, JSON.stringify(held.body)).toBe(200);
    const after = await m.get("/api/tools/RC-0001/status");
    expect(after.body).toMatchObject({ status: "quarantined", usable: false });
    const released = await crib.post("/api/tools/RC-0001/release").send({ reason: "Checked against the gauge block: within tolerance" });
    expect(released.status, JSON.stringify(released.body)).toBe(200);
    expect((await m.get("/api/tools/RC-0001/status")).body).toMatchObject({ status: "in_calibration", usable: true });

    // A tag scanned or typed in another case still finds the tool (a second statement, on an index); an unknown one is a 404.
    const lower = await m.get("/api/tools/rc-0001/status");
    expect(lower.status).toBe(200);
    expect(lower.body).toMatchObject({ assetTag: "RC-0001", status: "in_calibration" });
    const unknown = await m.get("/api/tools/RC-9999/status");
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe("tool_not_found");
  });

  it("recording a reading sends two statements, whatever the sheet holds: the sheet with the tools and their status, and the reading with its tools, judgement and audit line written under the sheet's and the place's locks", async () => {
    const table = await makeLimitTable(t.db, { items: pinAndBoreItems });
    const job = await makeJob(t.db, table.id, t.people.mechanic.id);
    const mic = await makeToolInCalibration(t.db, { kind: "outside_micrometer" });
    const m = await t.agent("mechanic");
    const first = await m.post(`/api/jobs/${job.id}/readings`).send({ itemKey: "pin", index: 1, values: [1.1245, 1.1246], toolAssetTags: [mic.assetTag] });
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    const sent = await statementsOf(async () => {
      const res = await m.post(`/api/jobs/${job.id}/readings`).send({ itemKey: "pin", index: 2, values: [1.1244, 1.1245], toolAssetTags: [mic.assetTag.toLowerCase()] });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body.verdict).toBe("within_limits");
    });
    expect(sent, sent.map((q) => q.slice(0, 160)).join("\n")).toHaveLength(2);
    // No transaction of several statements: the write is one statement, and its place's guard takes the locks.
    expect(sent.some((q) => /^(begin|commit)/i.test(q))).toBe(false);
    expect(sent[0]).toMatch(/tool_states/i);
    expect(sent[1]).toMatch(/tenthwise_reading_place/i);
    // Each goes by name: planned once per connection, not for every reading.
    expect(names.map(Boolean)).toEqual([true, true]);

    // The tools the reading names are stored with their status at the reading, as read in that first statement.
    const sheet = await m.get(`/api/jobs/${job.id}`);
    const row = sheet.body.items.find((i: { key: string }) => i.key === "pin").rows.find((r: { index: number }) => r.index === 2);
    expect(row.reading.tools).toEqual([expect.objectContaining({ assetTag: mic.assetTag, statusAtReading: "in_calibration", dueAtReading: "2027-04-30" })]);

    // The bore of the same index completes the pin's clearance: the pin's reading comes back from the write, so
    // still two statements, and the answer gives the clearance (1.1272 − 1.1244 = 0.0028 in, inside 0.0010–0.0045).
    const gauge = await makeToolInCalibration(t.db, { kind: "telescoping_gauge" });
    const bore = await statementsOf(async () => {
      const res = await m.post(`/api/jobs/${job.id}/readings`).send({ itemKey: "pin_bore", index: 2, values: [1.1271, 1.1272], toolAssetTags: [gauge.assetTag, mic.assetTag] });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body.clearance).toBeCloseTo(0.0028, 10);
      expect(res.body.completes).toEqual([expect.objectContaining({ label: "Pin to piston clearance no. 2" })]);
    });
    expect(bore, bore.map((q) => q.slice(0, 160)).join("\n")).toHaveLength(2);

    // Correcting the pin's reading, with a reason: the reading corrected, the sheet with the tools, whether it was
    // corrected already, the correction with the bore's reading: four statements.
    const pin2 = (await m.get(`/api/jobs/${job.id}`)).body.items.find((i: { key: string }) => i.key === "pin").rows.find((r: { index: number }) => r.index === 2).reading;
    const correction = await statementsOf(async () => {
      const res = await m.post(`/api/readings/${pin2.id}/supersede`).send({ values: [1.1243, 1.1244], toolAssetTags: [mic.assetTag], reason: "Read the wrong thimble line." });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body.clearance).toBeCloseTo(0.0029, 10);
    });
    expect(correction, correction.map((q) => q.slice(0, 160)).join("\n")).toHaveLength(4);

    // A tool no one has registered is refused, and nothing is recorded.
    const unknown = await m.post(`/api/jobs/${job.id}/readings`).send({ itemKey: "pin_bore", index: 1, values: [1.127, 1.1271], toolAssetTags: ["NO-SUCH-TOOL"] });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe("tool_not_found");
    const after = await m.get(`/api/jobs/${job.id}`);
    expect(after.body.readingCount).toBe(3);
  });

  it("a page of the register is one statement, whatever the page holds: the page with each tool's status and the count", async () => {
    // Overdue tools (due date before 2026-06-15, the test's today) and tools in calibration.
    for (let i = 0; i < 6; i++) {
      const tool = await makeTool(t.db, { assetTag: `RC-3${String(i).padStart(3, "0")}` });
      await makeCalibration(t.db, tool.id, { performedAt: new Date("2025-05-01T15:00:00Z"), nextDueAt: `2026-05-${String(10 + i).padStart(2, "0")}` });
    }
    for (let i = 0; i < 4; i++) {
      const tool = await makeTool(t.db, { assetTag: `RC-4${String(i).padStart(3, "0")}` });
      await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-03-01T15:00:00Z"), nextDueAt: "2027-03-01" });
    }
    const q = await t.agent("quality");
    const path = "/api/tools?status=overdue&sort=dueAt&pageSize=4";
    await q.get(path);
    let page: { items: { assetTag: string; status: string; dueAt: string; usable: boolean }[]; total: number } | undefined;
    const sent = await statementsOf(async () => {
      const res = await q.get(path);
      expect(res.status).toBe(200);
      page = res.body;
    });
    // Overdue first by due date, each with its status and why it may not be used: the four most overdue of six.
    expect(page!.total).toBe(6);
    expect(page!.items.map((x) => [x.assetTag, x.status, x.dueAt, x.usable])).toEqual([
      ["RC-3000", "overdue", "2026-05-10", false],
      ["RC-3001", "overdue", "2026-05-11", false],
      ["RC-3002", "overdue", "2026-05-12", false],
      ["RC-3003", "overdue", "2026-05-13", false],
    ]);
    expect(sent, sent.map((x) => x.slice(0, 160)).join("\n")).toHaveLength(1);
    expect(sent.filter((x) => /tool_states/.test(x))).toHaveLength(1);
    // By name: planned once per connection.
    expect(names.every((n) => /^tw_[0-9a-f]{24}$/.test(n))).toBe(true);
    // A page past the end holds no tool and still says how many there are (its count asked on its own).
    const past = await q.get("/api/tools?status=overdue&sort=dueAt&pageSize=4&page=3");
    expect(past.status).toBe(200);
    expect(past.body.items).toEqual([]);
    expect(past.body.total).toBe(6);
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
    // Sent whole, with its length (one write, not a stream of chunks).
    expect(Number(res.headers["content-length"])).toBeGreaterThan(0);
    expect(res.headers["transfer-encoding"]).toBeUndefined();
    expect(res.headers.vary).toMatch(/Accept-Encoding/);
    // A browser offers brotli too, and gets it.
    const br = await m.get("/api/tools?pageSize=50").set("Accept-Encoding", "gzip, deflate, br");
    expect(br.status).toBe(200);
    expect(br.headers["content-encoding"]).toBe("br");
    expect(br.body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(res.body.items.map((x: { assetTag: string }) => x.assetTag));
    // A client that accepts neither gets the same answer plain; a HEAD has no body to compress.
    const plain = await m.get("/api/tools?pageSize=50").set("Accept-Encoding", "identity");
    expect(plain.headers["content-encoding"]).toBeUndefined();
    expect(plain.body.items.length).toBe(res.body.items.length);
    // A large answer (the whole register as CSV, not JSON) still travels compressed, as a stream.
    const csv = await m.get("/api/tools?format=csv").set("Accept-Encoding", "gzip");
    expect(csv.status).toBe(200);
    expect(csv.headers["content-encoding"]).toBe("gzip");
    expect(csv.text).toContain("RC-1039");
  });
});
