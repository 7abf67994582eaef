import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeFamily, makeTool } from "../support/factories";

let t: TestApp;
let familyName: string;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  familyName = (await makeFamily(t.db, { name: "Outside micrometer 0-1 in (import)", defaultIntervalDays: 365 })).name;
  await makeTool(t.db, { assetTag: "OLD-0001" });
});
afterAll(() => t.close());

const HEADER = "Asset tag,Family,Description,Serial no,Unit,Range from,Range to,Resolution,Interval,Maker,Last calibrated";
const goodRow = (i: number) =>
  `IMP-${String(i).padStart(5, "0")},${familyName},Outside micrometer 0-1 in,SN-${i},in,0,1,0.0001,${i % 2 ? 180 : ""},Ostrava Gauge Co. (demo),${i % 3 ? "2026-03-01" : ""}`;
const csvOf = (rows: string[]) => [HEADER, ...rows].join("\r\n") + "\r\n";

async function counts() {
  const r = await t.db.execute(sql`select (select count(*)::int from tools) as tools, (select count(*)::int from calibrations) as cals, (select count(*)::int from audit_events where action = 'register.import') as imports`);
  return r.rows[0] as { tools: number; cals: number; imports: number };
}

describe("importing an existing register from CSV", () => {
  it("a dry run of a few thousand rows lists every bad row by its row number, and importing that file writes nothing", async () => {
    const rows = Array.from({ length: 3000 }, (_, i) => goodRow(i + 1));
    rows[9] = rows[3]; // row 11 repeats row 5's asset tag
    rows[99] = rows[99].replace(/^IMP-00100/, "OLD-0001"); // row 101: already in the register
    rows[499] = rows[499].replace(familyName, "Bore gauge nobody registered"); // row 501
    rows[1999] = rows[1999].replace(",0.0001,", ",0.000x,"); // row 2001: not a number
    rows[2499] = rows[2499].replace(/,[^,]*$/, ",2026-02-30"); // row 2501: no such date
    const csv = csvOf(rows);
    const quality = await t.agent("quality");
    const before = await counts();

    const dry = await quality.upload("/api/imports/dry-run", "file", Buffer.from(csv, "utf8"), "register.csv");
    expect(dry.status).toBe(200);
    expect(dry.body.rows).toBe(3000);
    expect(dry.body.missingFields).toEqual([]);
    expect(dry.body.mapping).toMatchObject({ assetTag: "Asset tag", serialNumber: "Serial no", lastCalibratedAt: "Last calibrated", intervalDays: "Interval" });
    const byRow = Object.fromEntries(dry.body.errors.map((e: { row: number; code: string }) => [e.row, e.code]));
    expect(byRow).toEqual({ 11: "duplicate_in_file", 101: "already_registered", 501: "unknown_family", 2001: "invalid_value", 2501: "invalid_value" });
    expect(dry.body.validRows).toBe(2995);
    expect(await counts()).toEqual(before);

    const commit = await quality.upload("/api/imports/commit", "file", Buffer.from(csv, "utf8"), "register.csv");
    expect(commit.status).toBe(400);
    expect(commit.body.error.code).toBe("import_rows_invalid");
    expect(commit.body.error.details.errorCount).toBe(5);
    expect(await counts()).toEqual(before);
  });

  it("a good file imports every tool in one go, with last calibration dates as imported history due by the tool's interval", async () => {
    const rows = Array.from({ length: 1200 }, (_, i) => goodRow(i + 1));
    const quality = await t.agent("quality");
    const before = await counts();
    const res = await quality.post("/api/imports/commit", { csv: csvOf(rows) });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ tools: 1200, familiesCreated: 0, calibrations: 800 });
    const after = await counts();
    expect(after.tools - before.tools).toBe(1200);
    expect(after.cals - before.cals).toBe(800);
    expect(after.imports).toBe(before.imports + 1);

    // IMP-00001: interval 180 from the file; calibrated 2026-03-01 → due 2026-08-28 (api.md: date + interval).
    const hist = await quality.get("/api/exports/history.csv");
    const line = hist.text.split("\r\n").find((l) => l.includes(",IMP-00001,"))!;
    expect(line).toContain("2026-08-28");
    expect(line).toContain("imported from previous register");
    // IMP-00002 takes the family's 365 days; IMP-00003 had no date: never calibrated.
    const reg = (await quality.get("/api/exports/register.csv")).text.split("\r\n");
    const cells = (tag: string) => reg.find((l) => l.startsWith(`${tag},`))!.split(",");
    expect(cells("IMP-00002")[10]).toBe("365");
    expect(cells("IMP-00001")[14]).toBe("in_calibration");
    expect(cells("IMP-00003")[14]).toBe("never_calibrated");

    const audit = await quality.get("/api/audit?entityType=import");
    expect(audit.body.items[0]).toMatchObject({ action: "register.import", actorId: t.people.quality.id, after: { tools: 1200, calibrations: 800 } });
  });

  it("imported history is not counted as an end-of-period observation by the interval review", async () => {
    const fam = (await t.db.execute(sql`select id from families where name = ${familyName}`)).rows[0] as { id: string };
    const res = await (await t.agent("quality")).get(`/api/families/${fam.id}/interval-analysis`);
    expect(res.body.calibrations).toBe(0);
  });

  it("a file that is not UTF-8 is refused with a clear message and nothing is written", async () => {
    const latin1 = Buffer.from(csvOf(["LAT-0001," + familyName + ",Mikrometer Außen 0-25,SN-1,mm,0,25,0.001,365,Corvane Instruments (demo),"]), "latin1");
    const before = await counts();
    const res = await (await t.agent("quality")).upload("/api/imports/dry-run", "file", latin1, "register.csv");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("csv_not_utf8");
    expect(res.body.error.message).toMatch(/UTF-8/);
    expect(await counts()).toEqual(before);
  });

  it("missing columns are reported before any row, and a commit without them is refused", async () => {
    const csv = "Tag,Family,Description\r\nMISS-1," + familyName + ",Outside micrometer\r\n";
    const quality = await t.agent("quality");
    const dry = await quality.post("/api/imports/dry-run", { csv });
    expect(dry.status).toBe(200);
    expect(dry.body.missingFields).toEqual(expect.arrayContaining(["serialNumber", "unit", "rangeMin", "rangeMax", "resolution"]));
    expect(dry.body.errors[0]).toMatchObject({ row: 1, code: "missing_column" });
    const commit = await quality.post("/api/imports/commit", { csv });
    expect(commit.status).toBe(400);
    expect(commit.body.error.code).toBe("import_rows_invalid");
  });

  it("new families are created from the file only when asked, with their kind and interval", async () => {
    const csv = ["Asset tag,Family,Kind,Description,Serial,Unit,Min,Max,Resolution,Interval", "NEW-0001,Bore gauge 2-6 in (demo),other,Bore gauge,BG-1,in,2,6,0.0001,180"].join("\n");
    const quality = await t.agent("quality");
    const refused = await quality.post("/api/imports/dry-run", { csv });
    expect(refused.body.errors[0]).toMatchObject({ row: 2, code: "unknown_family" });
    const res = await quality.post("/api/imports/commit", { csv, createMissingFamilies: true });
    expect(res.status).toBe(201);
    expect(res.body).toEqual({ tools: 1, familiesCreated: 1, calibrations: 0 });
  });

  it("an explicit column mapping overrides the guess", async () => {
    const csv = ["Gauge,Group,What,S/N,U,Lo,Hi,Grad", `MAP-0001,${familyName},Outside micrometer,SN-9,in,0,1,0.0001`].join("\n");
    const mapping = { assetTag: "Gauge", family: "Group", description: "What", serialNumber: "S/N", unit: "U", rangeMin: "Lo", rangeMax: "Hi", resolution: "Grad" };
    const res = await (await t.agent("admin")).upload("/api/imports/dry-run", "file", Buffer.from(csv), "map.csv", { mapping: JSON.stringify(mapping) });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ validRows: 1, errorCount: 0, mapping });
  });

  it("streams progress lines and then the result when asked for NDJSON", async () => {
    const quality = await t.agent("quality");
    const res = await quality.raw
      .post("/api/imports/dry-run")
      .set("X-CSRF-Token", quality.token())
      .set("Accept", "application/x-ndjson")
      .send({ csv: csvOf(Array.from({ length: 2000 }, (_, i) => goodRow(i + 50_000))) });
    const lines = res.text.trim().split("\n").map((l) => JSON.parse(l));
    expect(lines.some((l) => l.progress?.phase === "validating")).toBe(true);
    expect(lines[lines.length - 1].result.validRows).toBe(2000);
  });
});
