import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import Papa from "papaparse";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeCalibration, makeCheckout, makeFamily, makeFeelerSet, makeLab, makeStandard, makeTool } from "../support/factories";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => t.close());

const ALL = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
const PDF = Buffer.from("%PDF-1.4\n% demo certificate (invented)\n%%EOF\n");
const count = async (table: string) => Number(((await t.db.execute(sql.raw(`select count(*)::int as n from ${table}`))).rows[0] as { n: number }).n);

describe("tool families", () => {
  it("quality creates a family with its defaults and check plan; anyone reads it back", async () => {
    const q = await t.agent("quality");
    const res = await q.post("/api/families", {
      name: "Outside micrometer 0-25 mm",
      kind: "outside_micrometer",
      unit: "mm",
      defaultIntervalDays: 365,
      mpe: 0.002, // ± 2 µm, JIS B 7502 (from memory)
      checkPoints: [2.5, 5.1, 7.7, 10.3, 12.9, 15.0, 17.6, 20.2, 22.8, 25.0], // common practice (from memory)
      usageLimit: 200,
      resolution: 0.001,
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ kind: "outside_micrometer", unit: "mm", mpe: 0.002, usageLimit: 200, toolCount: 0 });
    expect(res.body.checkPoints).toEqual([2.5, 5.1, 7.7, 10.3, 12.9, 15, 17.6, 20.2, 22.8, 25]);
    const got = await (await t.agent("mechanic")).get(`/api/families/${res.body.id}`);
    expect(got.body.name).toBe("Outside micrometer 0-25 mm");
    const list = await (await t.agent("auditor")).get("/api/families?q=0-25");
    expect(list.body.items.map((f: { id: string }) => f.id)).toContain(res.body.id);
  });

  it("a family name is used once (409 family_name_taken); an unknown kind is bad input and nothing is written", async () => {
    const q = await t.agent("quality");
    await q.post("/api/families", { name: "Feeler set inch", kind: "feeler_set", unit: "in", defaultIntervalDays: 180 });
    const again = await q.post("/api/families", { name: "feeler set INCH", kind: "feeler_set", unit: "in", defaultIntervalDays: 180 });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("family_name_taken");
    const before = await count("families");
    const bad = await q.post("/api/families", { name: "Sonic gauge", kind: "sonic_gauge", unit: "in", defaultIntervalDays: 180 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toEqual(["kind"]);
    expect(await count("families")).toBe(before);
  });
});

describe("registering tools", () => {
  it("crib registers a tool with the api.md fields; it starts never calibrated and unusable", async () => {
    const family = await makeFamily(t.db, { name: "Outside micrometer 0-1 in (register)" });
    const crib = await t.agent("crib");
    const res = await crib.post("/api/tools", {
      assetTag: "MIC-9001",
      familyId: family.id,
      description: "Outside micrometer 0-1 in (demo)",
      serialNumber: "CV-DEMO-55120",
      unit: "in",
      rangeMin: 0,
      rangeMax: 1,
      resolution: 0.0001,
      intervalDays: 365,
      maker: "Corvane Instruments",
      location: "Crib drawer A3",
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ assetTag: "MIC-9001", status: "never_calibrated", usable: false, dueAt: null, custodian: null, lastCalibration: null, maker: "Corvane Instruments", family: { id: family.id } });
    const dup = await crib.post("/api/tools", { assetTag: "mic-9001", familyId: family.id, description: "x", serialNumber: "y", unit: "in", rangeMin: 0, rangeMax: 1, resolution: 0.0001, intervalDays: 365 });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe("asset_tag_taken");
  });

  it("a tool in a family of the other unit, or of a family that does not exist, is refused as bad input and nothing is written", async () => {
    const family = await makeFamily(t.db, { name: "Inch family (unit check)" });
    const crib = await t.agent("crib");
    const base = { assetTag: "MIC-9002", familyId: family.id, description: "Micrometer", serialNumber: "S-1", unit: "mm", rangeMin: 0, rangeMax: 25, resolution: 0.001, intervalDays: 365 };
    const before = await count("tools");
    expect((await crib.post("/api/tools", base)).body.error.code).toBe("unit_mismatch");
    expect((await crib.post("/api/tools", { ...base, unit: "in", familyId: "00000000-0000-4000-8000-000000000000" })).body.error.code).toBe("unknown_family");
    const range = await crib.post("/api/tools", { ...base, unit: "in", rangeMin: 2, rangeMax: 1 });
    expect(range.status).toBe(400);
    expect(range.body.error.details[0].path).toEqual(["rangeMax"]);
    expect(await count("tools")).toBe(before);
  });

  it("a caliper that needs no calibration is reference only and never for acceptance readings", async () => {
    const family = await makeFamily(t.db, { name: "Caliper (register)", kind: "caliper", mpe: "0.001" });
    const res = await (await t.agent("quality")).post("/api/tools", {
      assetTag: "CAL-9001", familyId: family.id, description: "Dial caliper 0-6 in", serialNumber: "OG-1", unit: "in", rangeMin: 0, rangeMax: 6, resolution: 0.001, intervalDays: 365, calibrationRequired: false, acceptanceUse: true,
    });
    expect(res.body).toMatchObject({ status: "reference_only", acceptanceUse: false, usable: true, usableForAcceptance: false });
  });

  it("a mechanic's own tool names its owner", async () => {
    const family = await makeFamily(t.db, { name: "Personal micrometers (register)" });
    const crib = await t.agent("crib");
    const base = { assetTag: "MIC-P-91", familyId: family.id, description: "Own micrometer", serialNumber: "P-91", unit: "in", rangeMin: 0, rangeMax: 1, resolution: 0.0001, intervalDays: 365, ownerType: "personal" };
    expect((await crib.post("/api/tools", base)).status).toBe(400);
    const ok = await crib.post("/api/tools", { ...base, ownerUserId: t.people.mechanic.id });
    expect(ok.body).toMatchObject({ ownerType: "personal", ownerUserId: t.people.mechanic.id, ownerUserName: "Test mechanic" });
  });

  it("a feeler set is registered with its leaves; a rejected leaf is marked and cannot be rejected twice", async () => {
    const family = await makeFamily(t.db, { name: "Feeler sets (register)", kind: "feeler_set", mpe: "0.0002", checkPoints: [] });
    const q = await t.agent("quality");
    const leaves = [0.0015, 0.002, 0.003, 0.004, 0.005].map((n) => ({ label: n.toFixed(4), nominal: n }));
    const res = await q.post("/api/tools", { assetTag: "FLR-9001", familyId: family.id, description: "Feeler set", serialNumber: "OG-FS-1", unit: "in", rangeMin: 0.0015, rangeMax: 0.005, resolution: 0.0001, intervalDays: 180, elements: leaves });
    expect(res.status).toBe(201);
    expect(res.body.elements.map((e: { nominal: number }) => e.nominal)).toEqual([0.0015, 0.002, 0.003, 0.004, 0.005]);
    const leaf = res.body.elements.find((e: { label: string }) => e.label === "0.0040");
    const rej = await q.post(`/api/tools/FLR-9001/elements/${leaf.id}/reject`, { reason: "Kinked near the tip" });
    expect(rej.status).toBe(200);
    expect(rej.body).toMatchObject({ usable: false, rejectedReason: "Kinked near the tip" });
    expect((await q.post(`/api/tools/FLR-9001/elements/${leaf.id}/reject`, { reason: "again" })).body.error.code).toBe("element_already_rejected");
    const els = await (await t.agent("mechanic")).get("/api/tools/FLR-9001/elements");
    expect(els.body.filter((e: { usable: boolean }) => e.usable)).toHaveLength(4);
  });

  it("details that are not evidence can be changed, and the change is in the audit trail", async () => {
    const tool = await makeTool(t.db, { assetTag: "MIC-9003" });
    const res = await (await t.agent("crib")).patch("/api/tools/MIC-9003", { location: "Bench 4", intervalDays: 180 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ location: "Bench 4", intervalDays: 180 });
    const audit = await t.db.execute(sql`select action, before, after from audit_events where entity_id = 'MIC-9003' and action = 'tool.update'`);
    expect(audit.rows[0]).toMatchObject({ before: { location: null, intervalDays: 365 }, after: { location: "Bench 4", intervalDays: 180 } });
    const range = await (await t.agent("crib")).patch("/api/tools/MIC-9003", { rangeMax: 2 });
    expect(range.status).toBe(400);
    expect(tool.id).toBeDefined();
  });

  it("a tool page shows status, due date, who holds it and the last calibration", async () => {
    const tool = await makeTool(t.db, { assetTag: "MIC-9004" });
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-03-01T15:00:00Z"), nextDueAt: "2027-03-01" });
    await makeCheckout(t.db, tool.id, t.people.mechanic.id);
    const res = await (await t.agent("inspector")).get("/api/tools/MIC-9004");
    expect(res.body).toMatchObject({
      status: "in_calibration",
      usable: true,
      dueAt: "2027-03-01",
      custodian: { userId: t.people.mechanic.id, name: "Test mechanic" },
      lastCalibration: { result: "pass", nextDueAt: "2027-03-01" },
    });
    expect((await (await t.agent("inspector")).get("/api/tools/NOPE-0000")).status).toBe(404);
  });
});

describe("inactive and retired tools", () => {
  it("an inactive tool must be calibrated before use; a retired tool never comes back", async () => {
    const tool = await makeTool(t.db, { assetTag: "MIC-9005" });
    await makeCalibration(t.db, tool.id, { performedAt: new Date("2026-03-01T15:00:00Z"), nextDueAt: "2027-03-01" });
    const crib = await t.agent("crib");
    const off = await crib.post("/api/tools/MIC-9005/lifecycle", { lifecycle: "inactive", reason: "Stored for the winter" });
    expect(off.body).toMatchObject({ status: "inactive", usable: false });
    const retired = await crib.post("/api/tools/MIC-9005/lifecycle", { lifecycle: "retired", reason: "Anvil face chipped beyond repair" });
    expect(retired.body.status).toBe("retired");
    const back = await crib.post("/api/tools/MIC-9005/lifecycle", { lifecycle: "active", reason: "changed my mind" });
    expect(back.status).toBe(409);
    expect(back.body.error.code).toBe("tool_retired");
    expect((await crib.post("/api/tools/MIC-9005/lifecycle", { lifecycle: "lost", reason: "x" })).status).toBe(400);
    // The past is kept: a week ago the tool was in calibration.
    const past = await crib.get(`/api/tools/MIC-9005/status?at=${encodeURIComponent("2026-06-08T12:00:00Z")}`);
    expect(past.body.status).toBe("in_calibration");
  });
});

describe("the register list", () => {
  const tags: Record<string, string> = {};
  beforeAll(async () => {
    const family = await makeFamily(t.db, { name: "List family", kind: "dial_indicator", mpe: "0.0002" });
    const other = await makeFamily(t.db, { name: "List other family" });
    const mk = async (tag: string, over: Parameters<typeof makeTool>[1] = {}) => {
      const tool = await makeTool(t.db, { assetTag: tag, familyId: family.id, description: `Dial indicator ${tag}`, ...over });
      tags[tag] = tool.id;
      return tool;
    };
    await mk("LST-01", { location: "Crib" });
    await makeCalibration(t.db, tags["LST-01"], { performedAt: new Date("2026-01-10T15:00:00Z"), nextDueAt: "2027-01-10" });
    await mk("LST-02", { location: "Crib" });
    await makeCalibration(t.db, tags["LST-02"], { performedAt: new Date("2025-06-01T15:00:00Z"), nextDueAt: "2026-06-01" }); // overdue
    await mk("LST-03", { location: "Bench 2" });
    await makeCalibration(t.db, tags["LST-03"], { performedAt: new Date("2025-07-01T15:00:00Z"), nextDueAt: "2026-07-01" }); // due soon
    await mk("LST-04", { location: "Bench 2", maker: "Ostrava Gauge Co." }); // never calibrated
    await makeCheckout(t.db, tags["LST-03"], t.people.inspector.id);
    await makeTool(t.db, { assetTag: "LST-99", familyId: other.id, description: "=2+3 other family" });
  });

  it("filters by status on the server, with the total of the filtered list", async () => {
    const a = await t.agent("mechanic");
    const res = await a.get("/api/tools?status=overdue,due_soon&q=LST");
    expect(res.body.total).toBe(2);
    expect(res.body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-02", "LST-03"]);
    const usable = await a.get("/api/tools?q=LST-0&usable=true");
    expect(usable.body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-01", "LST-03"]);
  });

  it("filters by family, location, maker text and custodian", async () => {
    const a = await t.agent("auditor");
    const fam = (await a.get("/api/tools?q=LST-9")).body.items[0].familyId;
    expect((await a.get(`/api/tools?familyId=${fam}`)).body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-99"]);
    expect((await a.get("/api/tools?location=bench%202")).body.total).toBe(2);
    expect((await a.get("/api/tools?q=ostrava")).body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-04"]);
    const held = await a.get(`/api/tools?custodianId=${t.people.inspector.id}`);
    expect(held.body.items.map((x: { assetTag: string; custodian: { name: string } }) => [x.assetTag, x.custodian.name])).toEqual([["LST-03", "Test inspector"]]);
  });

  it("sorts by due date with never-calibrated tools last, and pages", async () => {
    const a = await t.agent("mechanic");
    const asc = await a.get("/api/tools?q=LST-0&sort=dueAt");
    expect(asc.body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-02", "LST-03", "LST-01", "LST-04"]);
    const desc = await a.get("/api/tools?q=LST-0&sort=-dueAt");
    expect(desc.body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-01", "LST-03", "LST-02", "LST-04"]);
    const page2 = await a.get("/api/tools?q=LST&sort=-assetTag&page=2&pageSize=2");
    expect(page2.body.total).toBe(5);
    expect(page2.body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LST-03", "LST-02"]);
    expect((await a.get("/api/tools?sort=colour")).status).toBe(400);
    expect((await a.get("/api/tools?status=broken")).status).toBe(400);
    expect((await a.get("/api/tools?pageSize=100000")).status).toBe(400);
  });

  it("exports the current view as CSV (every page, same filters and sort), with formula-like text made inert", async () => {
    const res = await (await t.agent("auditor")).get("/api/tools?q=LST&sort=status&format=csv&pageSize=1");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/text\/csv/);
    const rows = Papa.parse<Record<string, string>>(res.text, { header: true, skipEmptyLines: true }).data;
    expect(rows).toHaveLength(5);
    expect(rows.map((r) => r.status)).toEqual(["in_calibration", "due_soon", "overdue", "never_calibrated", "never_calibrated"]);
    expect(rows.find((r) => r.assetTag === "LST-99")!.description).toBe("'=2+3 other family");
    expect(rows.find((r) => r.assetTag === "LST-03")!.custodian).toBe("Test inspector");
  });
});

describe("due-date filters for dashboard links", () => {
  const tags = (body: { items: { assetTag: string }[] }) => body.items.map((x) => x.assetTag);
  beforeAll(async () => {
    const family = await makeFamily(t.db, { name: "Due filter family" });
    const due = async (tag: string, nextDueAt: string, over: Partial<Parameters<typeof makeCalibration>[2]> = {}) => {
      const tool = await makeTool(t.db, { assetTag: tag, familyId: family.id, location: "Due shelf" });
      await makeCalibration(t.db, tool.id, { performedAt: new Date("2025-09-01T15:00:00Z"), nextDueAt, ...over });
      return tool;
    };
    await due("DUE-TODAY", "2026-06-15");
    await due("DUE-DAY10", "2026-06-25");
    await due("DUE-DAY11", "2026-06-26");
    await due("DUE-LIMITED", "2026-06-20", { result: "limited", limitedMin: "0", limitedMax: "0.5" });
    await due("DUE-HELD", "2026-06-18");
    await due("DUE-OVERDUE", "2026-06-10");
    await makeTool(t.db, { assetTag: "DUE-NEVER", familyId: family.id });
    const hold = await (await t.agent("crib")).post("/api/tools/DUE-HELD/quarantine", { reason: "Dropped on the bench" });
    expect(hold.body.status).toBe("quarantined");
  });

  it("tools due within 10 days: the ones still in calibration (incl. limited) due from today through day 10 of the shop's calendar, not the quarantined or overdue ones", async () => {
    // 22:00 on 15 June in Chicago is already 16 June in UTC: the shop's calendar decides what "today" is.
    t.clock.set("2026-06-16T03:00:00Z");
    try {
      const a = await t.agent("mechanic");
      const res = await a.get("/api/tools?q=DUE-&dueWithinDays=10&sort=dueAt");
      expect(res.status).toBe(200);
      expect(tags(res.body)).toEqual(["DUE-TODAY", "DUE-LIMITED", "DUE-DAY10"]);
      expect(res.body.total).toBe(3);
      expect(res.body.items.map((x: { status: string }) => x.status)).toEqual(["due_soon", "limited", "due_soon"]);
      expect(tags((await a.get("/api/tools?q=DUE-&dueWithinDays=0")).body)).toEqual(["DUE-TODAY"]);
      const csv = await a.get("/api/tools?q=DUE-&dueWithinDays=10&format=csv");
      expect(Papa.parse<Record<string, string>>(csv.text, { header: true, skipEmptyLines: true }).data.map((r) => r.assetTag)).toEqual(["DUE-DAY10", "DUE-LIMITED", "DUE-TODAY"]);
    } finally {
      t.clock.set("2026-06-15T15:00:00Z");
    }
  });

  it("with the clock set back to before a tool was quarantined, the list shows it as it stood then, and as held again once the clock is right", async () => {
    // The hold was recorded at 15:00 UTC; at 12:00 the tool was still in calibration, due in three days.
    t.clock.set("2026-06-15T12:00:00Z");
    try {
      const a = await t.agent("quality");
      const res = await a.get("/api/tools?q=DUE-HELD");
      expect(res.status).toBe(200);
      expect(res.body.items.map((x: { assetTag: string; status: string }) => [x.assetTag, x.status])).toEqual([["DUE-HELD", "due_soon"]]);
      expect(res.body.total).toBe(1);
    } finally {
      t.clock.set("2026-06-15T15:00:00Z");
    }
    const now = await (await t.agent("quality")).get("/api/tools?q=DUE-HELD");
    expect(now.body.items.map((x: { status: string }) => x.status)).toEqual(["quarantined"]);
  });

  it("a due-date range lists every tool due in it, both ends included, whatever its status, on the list and in the CSV", async () => {
    const a = await t.agent("auditor");
    const res = await a.get("/api/tools?q=DUE-&dueFrom=2026-06-10&dueTo=2026-06-18&sort=dueAt");
    expect(tags(res.body)).toEqual(["DUE-OVERDUE", "DUE-TODAY", "DUE-HELD"]);
    expect(tags((await a.get("/api/tools?q=DUE-&dueFrom=2026-06-20")).body)).toEqual(["DUE-DAY10", "DUE-DAY11", "DUE-LIMITED"]);
    expect(tags((await a.get("/api/tools?q=DUE-&dueTo=2026-06-10")).body)).toEqual(["DUE-OVERDUE"]);
    const csv = await a.get("/api/tools?q=DUE-&dueFrom=2026-06-10&dueTo=2026-06-18&format=csv");
    expect(Papa.parse<Record<string, string>>(csv.text, { header: true, skipEmptyLines: true }).data.map((r) => r.assetTag)).toEqual(["DUE-HELD", "DUE-OVERDUE", "DUE-TODAY"]);
  });

  it("a due filter that is not a number of days or a calendar date, or a range that ends before it starts, is bad input (400)", async () => {
    const a = await t.agent("mechanic");
    for (const q of ["dueWithinDays=soon", "dueWithinDays=-3", "dueWithinDays=2.5", "dueWithinDays=", "dueFrom=2026-02-30", "dueTo=15/06/2026", "dueFrom=2026-07-01&dueTo=2026-06-01"]) {
      const res = await a.get(`/api/tools?${q}`);
      expect(res.status, q).toBe(400);
      expect(res.body.error.details.length, q).toBeGreaterThan(0);
    }
  });
});

describe("the location filter", () => {
  it("offers every location named in the register once, sorted, whoever asks", async () => {
    const family = await makeFamily(t.db, { name: "Location family" });
    await makeTool(t.db, { assetTag: "LOC-01", familyId: family.id, location: "Crib drawer Z9" });
    await makeTool(t.db, { assetTag: "LOC-02", familyId: family.id, location: "crib drawer z9" });
    await makeTool(t.db, { assetTag: "LOC-03", familyId: family.id, location: "Annex rack" });
    await makeTool(t.db, { assetTag: "LOC-04", familyId: family.id });
    const res = await (await t.agent("mechanic")).get("/api/tools/locations");
    expect(res.status).toBe(200);
    const items: string[] = res.body.items;
    expect(items.filter((l) => l.toLowerCase() === "crib drawer z9")).toHaveLength(1);
    expect(items).toContain("Annex rack");
    expect(items.every((l) => l.trim() !== "")).toBe(true);
    expect(items).toEqual([...items].sort((x, y) => x.localeCompare(y, "en", { sensitivity: "base" })));
    // Choosing one lists the tools there, whatever the case it was typed in.
    expect((await (await t.agent("mechanic")).get("/api/tools?location=Crib%20drawer%20Z9")).body.items.map((x: { assetTag: string }) => x.assetTag)).toEqual(["LOC-01", "LOC-02"]);
  });
});

describe("reference standards and labs", () => {
  it("quality registers a standard with its certificate; it is in calibration today and its certificate file can be uploaded and downloaded", async () => {
    const q = await t.agent("quality");
    const lab = await q.post("/api/labs", { name: "Meridian Dimensional Lab (register)", accreditationBody: "Demo Accreditation Board", accreditationNumber: "DAB-0417", accreditationExpiresAt: "2027-12-31" });
    expect(lab.status).toBe(201);
    expect(lab.body.accreditation).toBe("valid");
    const res = await q.post("/api/standards", {
      assetTag: "GBS-91",
      name: "Gauge block set, inch, grade 0",
      kind: "gauge_block_set",
      unit: "in",
      certificate: { number: "MDL-DEMO-1001", lab: "Meridian Dimensional Lab (register)", labId: lab.body.id, issuedAt: "2026-01-05", dueAt: "2027-01-05", expandedUncertainty: 0.000004, coverageFactor: 2, nationalInstitute: "Demo National Measurement Institute", elementValues: [{ label: "0.500", nominal: 0.5, deviation: 0.000002 }] },
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ assetTag: "GBS-91", inCalibration: true, dueAt: "2027-01-05", certificate: { number: "MDL-DEMO-1001", hasFile: false } });
    const certId = res.body.certificate.id;
    const up = await q.upload(`/api/standards/${res.body.id}/certificates/${certId}/file`, "file", PDF, "gbs-91.pdf");
    expect(up.status).toBe(201);
    expect(up.body.hasFile).toBe(true);
    const file = await (await t.agent("auditor")).get(up.body.fileUrl);
    expect(file.status).toBe(200);
    expect(Buffer.from(file.body).subarray(0, 5).toString()).toBe("%PDF-");
  });

  it("a standard whose certificate has run out is listed as not in calibration; a new certificate brings it back", async () => {
    const { standard } = await makeStandard(t.db, { assetTag: "SET-91" }, { issuedAt: "2025-05-01", dueAt: "2026-05-01" });
    const a = await t.agent("quality");
    const out = await a.get("/api/standards?inCalibration=false&q=SET-91");
    expect(out.body.items.map((s: { assetTag: string }) => s.assetTag)).toEqual(["SET-91"]);
    const cert = await a.post(`/api/standards/${standard.id}/certificates`, { number: "KM-DEMO-77", lab: "Kestrel Metrology", issuedAt: "2026-06-10", dueAt: "2027-06-10", expandedUncertainty: 0.00001, coverageFactor: 2 });
    expect(cert.status).toBe(201);
    const detail = await a.get(`/api/standards/${standard.id}`);
    expect(detail.body).toMatchObject({ inCalibration: true, dueAt: "2027-06-10" });
    expect(detail.body.certificates).toHaveLength(2);
    const backwards = await a.post(`/api/standards/${standard.id}/certificates`, { number: "X", lab: "Y", issuedAt: "2026-06-10", dueAt: "2026-06-01", expandedUncertainty: 0.00001, coverageFactor: 2 });
    expect(backwards.status).toBe(400);
  });

  it("a lab whose accreditation runs out within the warning window is shown as expiring soon", async () => {
    await makeLab(t.db, { name: "Kestrel Metrology (register)", accreditationExpiresAt: "2026-07-01" });
    const res = await (await t.agent("crib")).get("/api/labs?q=Kestrel");
    expect(res.body.items[0]).toMatchObject({ name: "Kestrel Metrology (register)", accreditation: "expiring_soon" });
  });
});

describe("OpenAPI", () => {
  it("lists the register routes with their schemas", async () => {
    const doc = (await (await t.agent()).get("/api/openapi.json")).body;
    for (const p of ["/api/families", "/api/families/{id}", "/api/tools", "/api/tools/locations", "/api/tools/{assetTag}", "/api/tools/{assetTag}/status", "/api/tools/{assetTag}/quarantine", "/api/tools/{assetTag}/release", "/api/tools/{assetTag}/lifecycle", "/api/tools/{assetTag}/elements", "/api/standards", "/api/standards/{id}", "/api/standards/{id}/certificates", "/api/labs"]) {
      expect(doc.paths[p], p).toBeDefined();
    }
    expect(doc.paths["/api/tools"].post.requestBody.content["application/json"].schema.required).toEqual(
      expect.arrayContaining(["assetTag", "familyId", "description", "serialNumber", "unit", "rangeMin", "rangeMax", "resolution", "intervalDays"]),
    );
  });
});

describe("who may change the register", () => {
  let famId = "";
  let stdId = "";
  let certId = "";
  let elementId = "";
  beforeAll(async () => {
    famId = (await makeFamily(t.db, { name: "Matrix family" })).id;
    await makeTool(t.db, { assetTag: "MATRIX-01", familyId: famId });
    const s = await makeStandard(t.db, { assetTag: "MATRIX-STD" });
    stdId = s.standard.id;
    certId = s.certificate.id;
    elementId = (await makeFeelerSet(t.db, ["0.002", "0.003"], { assetTag: "MATRIX-FLR" })).elements[0].id;
  });
  let n = 0;
  const uniq = () => `M${++n}`;
  roleMatrix(() => t, [
    { method: "get", path: "/api/families", allowed: ALL },
    { method: "post", path: "/api/families", body: () => ({ name: `Matrix fam ${uniq()}`, kind: "other", unit: "in", defaultIntervalDays: 365 }), allowed: ["quality", "admin"] },
    { method: "get", label: "/api/families/:id", path: () => `/api/families/${famId}`, allowed: ALL },
    { method: "patch", label: "/api/families/:id", path: () => `/api/families/${famId}`, body: { defaultIntervalDays: 365 }, allowed: ["quality", "admin"] },
    { method: "get", path: "/api/tools", allowed: ALL },
    { method: "get", path: "/api/tools/locations", allowed: ALL },
    { method: "post", path: "/api/tools", body: () => ({ assetTag: `MX-${uniq()}`, familyId: famId, description: "Matrix", serialNumber: "S", unit: "in", rangeMin: 0, rangeMax: 1, resolution: 0.0001, intervalDays: 365 }), allowed: ["crib", "quality", "admin"] },
    { method: "get", path: "/api/tools/MATRIX-01", allowed: ALL },
    { method: "patch", path: "/api/tools/MATRIX-01", body: { location: "Matrix shelf" }, allowed: ["crib", "quality", "admin"] },
    { method: "get", path: "/api/tools/MATRIX-01/status", allowed: ALL },
    { method: "post", path: "/api/tools/MATRIX-01/quarantine", body: { reason: "Matrix hold" }, allowed: ["crib", "quality", "admin"] },
    { method: "post", path: "/api/tools/MATRIX-01/release", body: { reason: "Matrix release" }, allowed: ["crib", "quality", "admin"] },
    { method: "post", path: "/api/tools/MATRIX-01/lifecycle", body: { lifecycle: "active", reason: "Matrix" }, allowed: ["crib", "quality", "admin"] },
    { method: "get", path: "/api/tools/MATRIX-FLR/elements", allowed: ALL },
    { method: "post", label: "/api/tools/:assetTag/elements/:elementId/reject", path: () => `/api/tools/MATRIX-FLR/elements/${elementId}/reject`, body: { reason: "Matrix reject" }, allowed: ["crib", "quality", "admin"] },
    { method: "post", path: "/api/tools/MATRIX-01/photo", allowed: ["crib", "quality", "admin"] },
    { method: "get", path: "/api/tools/MATRIX-01/photo", allowed: ALL },
    { method: "get", path: "/api/standards", allowed: ALL },
    {
      method: "post",
      path: "/api/standards",
      body: () => ({ assetTag: `STD-${uniq()}`, name: "Matrix standard", kind: "check_block", unit: "in", certificate: { number: "C", lab: "L", issuedAt: "2026-01-01", dueAt: "2027-01-01", expandedUncertainty: 0.00001, coverageFactor: 2 } }),
      allowed: ["quality", "admin"],
    },
    { method: "get", label: "/api/standards/:id", path: () => `/api/standards/${stdId}`, allowed: ALL },
    { method: "post", label: "/api/standards/:id/certificates", path: () => `/api/standards/${stdId}/certificates`, body: { number: "C2", lab: "L", issuedAt: "2026-01-01", dueAt: "2027-01-01", expandedUncertainty: 0.00001, coverageFactor: 2 }, allowed: ["quality", "admin"] },
    { method: "post", label: "/api/standards/:id/certificates/:certificateId/file", path: () => `/api/standards/${stdId}/certificates/${certId}/file`, allowed: ["quality", "admin"] },
    { method: "get", label: "/api/standards/:id/certificates/:certificateId/file", path: () => `/api/standards/${stdId}/certificates/${certId}/file`, allowed: ALL },
    { method: "get", path: "/api/labs", allowed: ALL },
    { method: "post", path: "/api/labs", body: () => ({ name: `Matrix lab ${uniq()}` }), allowed: ["quality", "admin"] },
  ]);
});
