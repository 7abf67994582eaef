import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import zlib from "node:zlib";
import { createTestApp, type TestAgent, type TestApp } from "../support/test-app";
import { makeLab, makeFamily, makeTool } from "../support/factories";
import { makeUsableTool } from "../support/factories-crib";
import { calibrationBody, micrometerBench } from "../support/factories-register";
import { makeLimitTable } from "../support/factories-investigations";
import { stateDigest } from "../support/state-digest";

// A client's mistake (or a probe) is answered 4xx with api.md's error shape and changes nothing: never a
// 500, never a silent success.

let t: TestApp;
let admin: TestAgent;
let quality: TestAgent;
let crib: TestAgent;
beforeAll(async () => {
  t = await createTestApp();
  admin = await t.agent("admin");
  quality = await t.agent("quality");
  crib = await t.agent("crib");
});
afterAll(async () => t?.close());

type Res = { status: number; body: { error?: { code?: unknown; message?: unknown } } };
/** 4xx with { error: { code, message } }; returns the code. */
function refusedWith(res: Res, status: number) {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(typeof res.body.error?.code).toBe("string");
  expect(typeof res.body.error?.message).toBe("string");
  return res.body.error!.code as string;
}
const rows = async (table: string) => Number(((await t.db.execute(sql.raw(`select count(*)::int as n from "${table}"`))).rows[0] as { n: number }).n);
const family = { name: "Outside micrometer 0-1 in", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365 };

describe("what the request is made of", () => {
  it("a NUL character in any text, search or address is 400, and nothing is written", async () => {
    const before = await stateDigest(t.db);
    refusedWith(await quality.post("/api/families", { ...family, name: "Mic\u0000rometer" }), 400);
    refusedWith(await quality.post("/api/families", { ...family, checkPoints: [0.5], name: "x", notes: { deep: ["a\u0000b"] } }), 400);
    refusedWith(await quality.get("/api/tools?q=%00"), 400);
    refusedWith(await quality.get("/api/tools/MIC%00-1"), 400);
    expect(await stateDigest(t.db)).toEqual(before);
  });

  it("JSON in another charset than UTF-8 is 415, an unknown Content-Encoding 415, a body that is not gzip though it says so 400", async () => {
    const body = JSON.stringify(family);
    expect(refusedWith(await quality.raw.post("/api/families").set("X-CSRF-Token", quality.token()).set("Content-Type", "application/json; charset=latin1").send(body), 415)).toBe("unsupported_charset");
    expect(refusedWith(await quality.raw.post("/api/families").set("X-CSRF-Token", quality.token()).set("Content-Type", "application/json").set("Content-Encoding", "x-snappy").send(body), 415)).toBe("unsupported_content_encoding");
    const notGzip = await quality.raw.post("/api/families").set("X-CSRF-Token", quality.token()).set("Content-Type", "application/json").set("Content-Encoding", "gzip").send(body);
    expect(notGzip.status).toBeGreaterThanOrEqual(400);
    expect(notGzip.status).toBeLessThan(500);
    // The same body, really gzipped, is read.
    const gz = await quality.raw.post("/api/families").set("X-CSRF-Token", quality.token()).set("Content-Type", "application/json").set("Content-Encoding", "gzip").serialize((b: Buffer) => b as unknown as string).send(zlib.gzipSync(JSON.stringify({ ...family, name: "Gzipped family" })));
    expect(gz.status, JSON.stringify(gz.body)).toBe(201);
  });

  it("an address with broken percent-encoding is 400", async () => {
    expect(refusedWith(await quality.get("/api/tools/%E0%A4%A"), 400)).toBe("malformed_url");
    refusedWith(await quality.get("/api/tools/%E0%A4%A/status"), 400);
  });

  it("a body sent as text instead of JSON is 415, not read as an empty object", async () => {
    const before = await rows("audit_events");
    const res = await admin.raw.patch("/api/settings").set("X-CSRF-Token", admin.token()).set("Content-Type", "text/plain").send("shopName=Harrow");
    expect(refusedWith(res, 415)).toBe("unsupported_media_type");
    expect(await rows("audit_events")).toBe(before);
  });

  it("numbers no tool reads and dates no record holds are 400: 1e308, 1e-320, the year 1, 30 February", async () => {
    const before = await stateDigest(t.db);
    refusedWith(await quality.post("/api/families", { ...family, name: "Huge", mpe: 1e308 }), 400);
    refusedWith(await quality.post("/api/families", { ...family, name: "Tiny", mpe: 1e-320 }), 400);
    const { tool, standard } = await micrometerBench(t.db);
    const mid = await stateDigest(t.db);
    refusedWith(await quality.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.5, asFound: 0.5, uncertainty: 1e-320 }] })), 400);
    refusedWith(await quality.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { points: [{ nominal: 0.5, asFound: 1e308 }] })), 400);
    refusedWith(await quality.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { performedAt: "0001-01-01T00:00:00Z" })), 400);
    const cert = { number: "X-1", lab: "Demo lab", issuedAt: "0001-01-01", dueAt: "2027-01-05", expandedUncertainty: 0.000004, coverageFactor: 2 };
    refusedWith(await quality.post("/api/standards", { assetTag: "GBS-X1", name: "Gauge blocks", kind: "gauge_block_set", unit: "in", certificate: cert }), 400);
    refusedWith(await quality.post("/api/standards", { assetTag: "GBS-X2", name: "Gauge blocks", kind: "gauge_block_set", unit: "in", certificate: { ...cert, issuedAt: "2026-02-30" } }), 400);
    refusedWith(await quality.post("/api/standards", { assetTag: "GBS-X3", name: "Gauge blocks", kind: "gauge_block_set", unit: "in", certificate: { ...cert, issuedAt: "2026-01-05", coverageFactor: 1e308 } }), 400);
    expect(await stateDigest(t.db)).toEqual(mid);
    expect(before).not.toEqual(mid);
  });
});

describe("files are named only as the upload routes issued them", () => {
  const PDF = Buffer.from("%PDF-1.4\n% demo certificate (invented)\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n");

  it("a certificate key pointing outside the calibration certificates, or at another record's file, is refused; an issued key is used once", async () => {
    const { tool, standard } = await micrometerBench(t.db);
    const std = await quality.get(`/api/standards/${standard.id}`);
    const certId = std.body.certificates[0].id as string;
    const stdFile = await quality.upload(`/api/standards/${standard.id}/certificates/${certId}/file`, "file", PDF, "std.pdf");
    expect(stdFile.status).toBe(201);
    const stdKey = (await t.db.execute(sql`select file_key from standard_certificates where id = ${certId}`)).rows[0] as { file_key: string };
    const sneaky = `calibration-certificates/../${stdKey.file_key}`;
    expect(refusedWith(await quality.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { certificateFileKey: sneaky })), 400)).toBe("unknown_file");
    expect(refusedWith(await quality.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { certificateFileKey: "calibration-certificates/typed-by-hand.pdf" })), 400)).toBe("unknown_file");

    const upload = await quality.upload("/api/calibrations/certificate-files", "file", PDF, "cal.pdf");
    expect(upload.status).toBe(201);
    const first = await quality.post(`/api/tools/${tool.assetTag}/calibrations`, calibrationBody([standard.id], { certificateFileKey: upload.body.fileKey }));
    expect(first.status).toBe(201);
    expect(first.body.hasCertificateFile).toBe(true);
    const other = await makeTool(t.db, { familyId: tool.familyId });
    expect(refusedWith(await quality.post(`/api/tools/${other.assetTag}/calibrations`, calibrationBody([standard.id], { certificateFileKey: upload.body.fileKey })), 400)).toBe("unknown_file");
    // A standard's certificate keeps the file it was given.
    expect(refusedWith(await quality.upload(`/api/standards/${standard.id}/certificates/${certId}/file`, "file", PDF, "again.pdf"), 409)).toBe("certificate_file_attached");
  });

  it("a return photo that is HTML declared as image/png is refused, and the tool stays out", async () => {
    const tool = await makeUsableTool(t.db);
    const out = await crib.post("/api/checkouts", { assetTag: tool.assetTag, userEmail: "mechanic@test.example" });
    expect(out.status).toBe(201);
    const html = Buffer.from("<!doctype html><script>alert(1)</script>");
    const res = await crib.raw.post(`/api/checkouts/${out.body.id}/return`).set("X-CSRF-Token", crib.token()).field("condition", "ok").attach("photo", html, { filename: "photo.png", contentType: "image/png" });
    refusedWith(res, 400);
    expect((await crib.get(`/api/checkouts/${out.body.id}`)).body.returnedAt).toBeNull();
    const png = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(32)]);
    const ok = await crib.raw.post(`/api/checkouts/${out.body.id}/return`).set("X-CSRF-Token", crib.token()).field("condition", "ok").attach("photo", png, { filename: "photo.png", contentType: "image/png" });
    expect(ok.status).toBe(200);
    expect(ok.body.hasPhoto).toBe(true);
  });
});

describe("inputs no shop would mean", () => {
  it("a reminder schedule with a seconds field, or the same lead time twice, is refused; an empty or unchanged settings change writes no audit line", async () => {
    const before = await rows("audit_events");
    expect(refusedWith(await admin.patch("/api/settings", { reminderCron: "*/5 * * * * *" }), 400)).toBe("invalid_input");
    expect(refusedWith(await admin.patch("/api/settings", { reminderStages: [7, 7, 7] }), 400)).toBe("invalid_input");
    expect(refusedWith(await admin.patch("/api/settings", {}), 400)).toBe("invalid_input");
    const current = (await admin.get("/api/settings")).body;
    const same = await admin.patch("/api/settings", { shopName: current.shopName });
    expect(same.status).toBe(200);
    expect(await rows("audit_events")).toBe(before);
    expect((await admin.patch("/api/settings", { reminderCron: "30 5 * * 1-5" })).status).toBe(200);
    expect(await rows("audit_events")).toBe(before + 1);
  });

  it("an intermediate check at a nominal the tool cannot read (500 on a 0–1 in micrometer) is refused", async () => {
    const tool = await makeUsableTool(t.db);
    const before = await rows("intermediate_checks");
    const res = await crib.post(`/api/tools/${tool.assetTag}/checks`, { nominal: 500, reading: 500 });
    expect(refusedWith(res, 400)).toBe("check_outside_range");
    expect(await rows("intermediate_checks")).toBe(before);
    expect((await crib.post(`/api/tools/${tool.assetTag}/checks`, { nominal: 0.5, reading: 0.5 })).status).toBe(201);
  });

  it("a tool whose resolution is larger than its whole range is refused", async () => {
    const fam = await makeFamily(t.db);
    const res = await crib.post("/api/tools", { assetTag: "MIC-RES-1", familyId: fam.id, description: "x", serialNumber: "y", unit: "in", rangeMin: 0, rangeMax: 1, resolution: 50, intervalDays: 365 });
    expect(refusedWith(res, 400)).toBe("invalid_input");
  });

  it("a shipment expected back before it was shipped (in 2020) is refused", async () => {
    const tool = await makeUsableTool(t.db);
    const lab = await makeLab(t.db);
    const res = await crib.post("/api/shipments", { assetTags: [tool.assetTag], labId: lab.id, expectedBackAt: "2020-01-15" });
    refusedWith(res, 400);
    expect((await crib.post("/api/shipments", { assetTags: [tool.assetTag], labId: lab.id, expectedBackAt: "2026-07-15" })).status).toBe(201);
  });

  it("a new check sheet on a limits table that has been revised is refused; the current revision is named", async () => {
    const { table } = await makeLimitTable(t.db);
    const body = { name: table.name, engineModel: table.engineModel, unit: "in", sourceDocument: "Demo overhaul manual", sourceRevision: "B", items: [{ key: "pin", label: "Piston pin", kind: "journal", min: 0.9, max: 1.0 }] };
    const revised = await quality.post(`/api/limit-tables/${table.id}/revisions`, body);
    expect(revised.status).toBe(201);
    const res = await quality.post("/api/jobs", { limitTableId: table.id, engineSerial: "HF-OLD-1" });
    expect(refusedWith(res, 409)).toBe("table_superseded");
    expect((res.body.error as { details?: { currentId?: string } }).details?.currentId).toBe(revised.body.id);
    expect((await quality.post("/api/jobs", { limitTableId: revised.body.id, engineSerial: "HF-NEW-1" })).status).toBe(201);
  });

  it("asking for a CSRF token without signing in stores no session", async () => {
    const before = await rows("session");
    for (let i = 0; i < 5; i++) {
      const anonymous = await t.agent();
      expect(typeof anonymous.token()).toBe("string");
    }
    expect(await rows("session")).toBe(before);
  });
});
