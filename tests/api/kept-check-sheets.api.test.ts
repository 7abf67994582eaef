import { afterAll, beforeAll, describe, expect, it } from "vitest";
import zlib from "node:zlib";
import pg from "pg";
import { eq } from "drizzle-orm";
import request from "supertest";
import pino from "pino";
import { createTestApp, TEST_PASSWORD, type TestApp, type TestAgent } from "../support/test-app";
import { createApp } from "../../server/app";
import { makePinSheet, pinAndBoreItems } from "../support/factories-inspection";
import { makeReading } from "../support/factories-investigations";
import { users } from "../../server/db/schema";
import { buildCheckSheet } from "../../server/modules/jobs/check-sheet.service";
import { keptSheets } from "../../server/modules/jobs/kept-sheets";

// A check sheet is answered from a kept copy while nothing it shows has changed (docs/decisions/020). What the
// inspector sees must never lag a change: after each change below, the sheet as answered equals the sheet built
// afresh from the records, and shows the change. Demo limits and values (invented); clearance = bore − journal
// (common practice, no source).

let t: TestApp;
/** Statements sent by this process while counting (every pg client). */
const sent: string[] = [];
let counting = false;
const original = pg.Client.prototype.query;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  await t.db.update(users).set({ certificateNumber: "IA-KEPT-1" }).where(eq(users.id, t.people.inspector.id));
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  (pg.Client.prototype as any).query = function (this: pg.Client, ...args: any[]) {
    if (counting) sent.push(String(typeof args[0] === "string" ? args[0] : args[0]?.text));
    // eslint-disable-next-line @typescript-eslint/no-explicit-any
    return (original as any).apply(this, args);
  };
});
afterAll(async () => {
  pg.Client.prototype.query = original;
  await t.close();
});

/** The sheet as a person's screen gets it, with how many statements answering it took. */
async function sheetOf(a: TestAgent, jobId: string) {
  sent.length = 0;
  counting = true;
  try {
    const res = await a.get(`/api/jobs/${jobId}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return { body: res.body, statements: sent.length, etag: res.headers.etag as string | undefined };
  } finally {
    counting = false;
  }
}

/** The sheet built afresh from the records, as JSON travels. */
const fresh = async (jobId: string) => JSON.parse(JSON.stringify(await buildCheckSheet(t.db, jobId)));

/** Asks twice: both answers equal a fresh build, and the second is the kept copy (one statement: the stamp). */
async function answeredAndKept(a: TestAgent, jobId: string) {
  const first = await sheetOf(a, jobId);
  expect(first.body).toEqual(await fresh(jobId));
  const again = await sheetOf(a, jobId);
  expect(again.body).toEqual(first.body);
  expect(again.statements).toBe(1);
  return again.body;
}

const row = (sheet: { items: { key: string; rows: { index: number }[] }[] }, key: string, index = 1) =>
  sheet.items.find((i) => i.key === key)!.rows.find((r) => r.index === index)! as any;

const pinSheet = () => makePinSheet(t.db, t.people.mechanic.id);

describe("a check sheet kept between requests never shows less than the records hold", () => {
  it("readings, a correction, a renamed mechanic, an edited tool, a revised limits table, a sign-off, and a tool lost then its investigation closed: each shows at the next request", async () => {
    const { table, job, mic, tel } = await pinSheet();
    const m = await t.agent("mechanic");
    const i = await t.agent("inspector");
    const q = await t.agent("quality");
    const admin = await t.agent("admin");

    // An empty sheet, then the first journal.
    expect((await answeredAndKept(i, job.id)).readingCount).toBe(0);
    const pin = await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] });
    expect(pin.status, JSON.stringify(pin.body)).toBe(201);
    let sheet = await answeredAndKept(i, job.id);
    expect(row(sheet, "pin").reading).toMatchObject({ id: pin.body.id, size: 1.1247 });

    // The bore completes the clearance: 1.1273 − 1.1247 = 0.0026 in.
    expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", values: [1.1271, 1.1273], toolAssetTags: [tel.assetTag, mic.assetTag] })).status).toBe(201);
    sheet = await answeredAndKept(i, job.id);
    expect(row(sheet, "pin_clearance").clearance).toBeCloseTo(0.0026, 10);

    // A correction replaces the journal: 1.1273 − 1.1248 = 0.0025 in.
    const fix = await m.post(`/api/readings/${pin.body.id}/supersede`, { reason: "Anvil was not wiped; measured again", values: [1.125, 1.1248], toolAssetTags: [mic.assetTag] });
    expect(fix.status, JSON.stringify(fix.body)).toBe(201);
    sheet = await answeredAndKept(i, job.id);
    expect(row(sheet, "pin").reading).toMatchObject({ id: fix.body.id, supersedesId: pin.body.id });
    expect(row(sheet, "pin").history).toHaveLength(1);
    expect(row(sheet, "pin_clearance").clearance).toBeCloseTo(0.0025, 10);

    // The mechanic's name is corrected by the admin.
    expect((await admin.patch(`/api/users/${t.people.mechanic.id}`, { name: "Renamed mechanic" })).status).toBe(200);
    sheet = await answeredAndKept(i, job.id);
    expect(row(sheet, "pin").reading.takenBy).toMatchObject({ name: "Renamed mechanic" });

    // The micrometer's description is edited.
    expect((await q.patch(`/api/tools/${mic.assetTag}`, { description: "Outside micrometer 1–2 in (re-labelled)" })).status).toBe(200);
    sheet = await answeredAndKept(i, job.id);
    expect(sheet.tools.find((x: { assetTag: string }) => x.assetTag === mic.assetTag).description).toBe("Outside micrometer 1–2 in (re-labelled)");

    // The limits table is revised: the sheet keeps its version and says it is superseded.
    const revised = await q.post(`/api/limit-tables/${table.id}/revisions`, {
      name: table.name,
      engineModel: table.engineModel,
      unit: table.unit,
      sourceDocument: table.sourceDocument,
      sourceRevision: "B",
      isDemo: true,
      items: pinAndBoreItems,
    });
    expect(revised.status, JSON.stringify(revised.body)).toBe(201);
    sheet = await answeredAndKept(i, job.id);
    expect(sheet.limitTable).toMatchObject({ id: table.id, supersededById: revised.body.id });

    // The second places, then the inspector signs: the sheet is locked.
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.1249, 1.1248], toolAssetTags: [mic.assetTag] });
    await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin_bore", index: 2, values: [1.127, 1.1272], toolAssetTags: [tel.assetTag, mic.assetTag] });
    expect((await answeredAndKept(i, job.id)).locked).toBe(false);
    const signed = await i.post(`/api/jobs/${job.id}/sign`, { certificateNumber: "IA-KEPT-1" });
    expect(signed.status, JSON.stringify(signed.body)).toBe(200);
    sheet = await answeredAndKept(i, job.id);
    expect(sheet).toMatchObject({ locked: true, status: "signed" });
    expect(sheet.signoffs).toHaveLength(1);

    // The micrometer is reported lost: every reading it took since it was last known good is suspect at once.
    const crib = await t.agent("crib");
    const lost = await crib.post(`/api/tools/${mic.assetTag}/lost`, { reason: "Not returned at shift end; not found in the bay" });
    expect(lost.status, JSON.stringify(lost.body)).toBe(200);
    sheet = await answeredAndKept(i, job.id);
    expect(row(sheet, "pin").reading.flags).toContain("suspect");
    expect(row(sheet, "pin_bore", 2).reading.flags).toContain("suspect");

    // Closed with a disposition for the sheet: the readings are no longer suspect.
    const open = await q.get(`/api/investigations?status=open&toolAssetTag=${mic.assetTag}`);
    expect(open.body).toHaveLength(1);
    const inv = open.body[0].id as string;
    expect((await q.post(`/api/investigations/${inv}/dispositions`, { jobId: job.id, kind: "no_impact", rationale: "Pins and bores measured again with another micrometer: unchanged." })).status).toBe(201);
    expect((await q.post(`/api/investigations/${inv}/close`, { summary: "No impact on this sheet." })).status).toBe(200);
    sheet = await answeredAndKept(i, job.id);
    expect(row(sheet, "pin").reading.flags).not.toContain("suspect");
  });

  it("a sheet with a reading not yet judged under the current rules is judged at every request, not kept", async () => {
    const { job, mic } = await pinSheet();
    const r = await makeReading(t.db, { jobId: job.id, itemKey: "pin", values: ["1.1250", "1.1247"], takenAt: "2026-06-15T14:00:00Z", takenBy: t.people.mechanic.id, toolIds: [mic.id] });
    const i = await t.agent("inspector");
    const first = await sheetOf(i, job.id);
    expect(first.body).toEqual(await fresh(job.id));
    expect(row(first.body, "pin").reading.id).toBe(r.id);
    const again = await sheetOf(i, job.id);
    expect(again.statements).toBeGreaterThan(1);
    expect(again.body).toEqual(first.body);
  });

  it("the kept sheet travels compressed as the browser asks, and a browser holding it gets 304 Not Modified", async () => {
    const { job, mic } = await pinSheet();
    const m = await t.agent("mechanic");
    expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] })).status).toBe(201);
    const want = await fresh(job.id);
    const first = await sheetOf(m, job.id);
    expect(first.etag).toMatch(/^W\/"/);
    for (const encoding of ["br", "gzip"] as const) {
      const res = await m.raw
        .get(`/api/jobs/${job.id}`)
        .set("Accept-Encoding", encoding)
        .buffer(true)
        .parse((r, done) => {
          const chunks: Buffer[] = [];
          r.on("data", (c: Buffer) => chunks.push(c));
          r.on("end", () => done(null, Buffer.concat(chunks)));
        });
      expect(res.status).toBe(200);
      expect(res.headers["content-encoding"]).toBe(encoding);
      expect(res.headers.vary).toMatch(/Accept-Encoding/i);
      const raw = res.body as Buffer;
      // The test client may already have decoded it (as a browser does); if not, it is decoded here.
      const text = (raw[0] === 0x7b ? raw : encoding === "br" ? zlib.brotliDecompressSync(raw) : zlib.gunzipSync(raw)).toString();
      expect(JSON.parse(text)).toEqual(want);
    }
    const notModified = await m.raw.get(`/api/jobs/${job.id}`).set("If-None-Match", first.etag!);
    expect(notModified.status).toBe(304);
    // A new reading changes the validator: the browser's copy is stale and the sheet comes whole.
    expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", index: 2, values: [1.1249, 1.1248], toolAssetTags: [mic.assetTag] })).status).toBe(201);
    const changed = await m.raw.get(`/api/jobs/${job.id}`).set("If-None-Match", first.etag!);
    expect(changed.status).toBe(200);
    expect(changed.body.readingCount).toBe(2);
  });

  it("two app processes on one database: a reading recorded through one shows at once on the sheet the other kept", async () => {
    const { job, mic } = await pinSheet();
    // A second app on the same database, with its own kept answers (as a second process behind a load balancer).
    const other = createApp({ db: t.db, pool: t.pool, config: t.config, clock: t.clock, mailer: t.mailer, storage: t.storage, logger: pino({ level: "silent" }), clientDir: "/nonexistent" });
    const b = request.agent(other);
    const token = (await b.get("/api/auth/csrf")).body.token as string;
    expect((await b.post("/api/auth/login").set("X-CSRF-Token", token).send({ email: t.people.inspector.email, password: TEST_PASSWORD })).status).toBe(200);
    const before = await b.get(`/api/jobs/${job.id}`);
    expect(before.body.readingCount).toBe(0);
    expect((await b.get(`/api/jobs/${job.id}`)).body).toEqual(before.body);

    const m = await t.agent("mechanic");
    expect((await m.post(`/api/jobs/${job.id}/readings`, { itemKey: "pin", values: [1.125, 1.1247], toolAssetTags: [mic.assetTag] })).status).toBe(201);
    const after = await b.get(`/api/jobs/${job.id}`);
    expect(after.body.readingCount).toBe(1);
    expect(after.body).toEqual(await fresh(job.id));
  });

  it("an unknown sheet is 404 and a malformed id 400, kept or not", async () => {
    const i = await t.agent("inspector");
    expect((await i.get(`/api/jobs/00000000-0000-4000-8000-000000000000`)).status).toBe(404);
    expect((await i.get(`/api/jobs/not-a-job`)).status).toBe(400);
  });

  it("kept answers stay within their memory bound: the least recently asked sheet goes first", async () => {
    const jobs = [];
    for (let n = 0; n < 5; n++) jobs.push((await pinSheet()).job.id);
    const oneSheet = Math.max(...(await Promise.all(jobs.map(async (id) => Buffer.byteLength(JSON.stringify(await buildCheckSheet(t.db, id)))))));
    // Room for four empty sheets, not five.
    const kept = keptSheets(4 * (oneSheet + 400));
    for (const id of jobs.slice(0, 4)) await kept.answer(t.db, id);
    expect(kept.size).toBe(4);
    // The first is asked again (now the most recent); the fifth pushes out the second, asked longest ago.
    expect((await kept.answer(t.db, jobs[0])).kept).toBe(true);
    await kept.answer(t.db, jobs[4]);
    expect(kept.size).toBe(4);
    expect((await kept.answer(t.db, jobs[0])).kept).toBe(true);
    expect((await kept.answer(t.db, jobs[4])).kept).toBe(true);
    expect((await kept.answer(t.db, jobs[1])).kept).toBe(false);
  });
});
