import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeCheckout, makeLab } from "../support/factories";
import { makeOverdueTool, makeQuarantinedTool, makeUsableTool } from "../support/factories-crib";

const pdfParse = createRequire(import.meta.url)("pdf-parse/lib/pdf-parse.js") as (data: Buffer) => Promise<{ text: string; numpages: number }>;

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z", env: { PUBLIC_URL: "https://tenthwise.example" } });
});
afterAll(async () => {
  // Dropping the database (with force) may reach a pooled connection that is
  // still closing; its FATAL 57P01 is expected then, not a failure.
  t.pool.on("error", () => undefined);
  await t.close();
});

/** supertest collects a binary body as a Buffer with this parser. */
const binary = (res: NodeJS.ReadableStream, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on("data", (c: Buffer) => chunks.push(c));
  res.on("end", () => cb(null, Buffer.concat(chunks)));
};

describe("outside calibration shipments", () => {
  it("several tools shipped to a lab are away at calibration, cannot be issued, and come back on receipt", async () => {
    const lab = await makeLab(t.db, { name: "Meridian Dimensional Lab (test)" });
    const a = await makeOverdueTool(t.db);
    const b = await makeUsableTool(t.db);
    const crib = await t.agent("crib");
    const shipped = await crib.post("/api/shipments", { assetTags: [a.assetTag, b.assetTag], labId: lab.id, purchaseOrder: "PO-DEMO-311", expectedBackAt: "2026-06-29" });
    expect(shipped.status).toBe(201);
    expect(shipped.body.items).toHaveLength(2);
    expect(shipped.body.items[0]).toMatchObject({ tool: { assetTag: a.assetTag }, lab: { name: lab.name }, purchaseOrder: "PO-DEMO-311", expectedBackAt: "2026-06-29", shippedBy: "Test crib", receivedAt: null });

    const refusedIssue = await crib.post("/api/checkouts", { assetTag: b.assetTag, userEmail: t.people.mechanic.email });
    expect(refusedIssue.body.error).toMatchObject({ code: "tool_not_usable", details: { status: "at_calibration" } });
    expect(refusedIssue.body.error.message).toContain(lab.name);

    const open = await (await t.agent("auditor")).get(`/api/shipments?open=true&labId=${lab.id}`);
    expect(open.body.total).toBe(2);

    const again = await crib.post("/api/shipments", { assetTags: [b.assetTag], labId: lab.id });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("already_at_lab");

    const back = await crib.post(`/api/shipments/${shipped.body.items[1].id}/receive`, {});
    expect(back.status).toBe(200);
    expect(back.body.receivedBy).toBe("Test crib");
    expect((await crib.post(`/api/shipments/${shipped.body.items[1].id}/receive`, {})).body.error.code).toBe("already_received");
    expect((await crib.post("/api/checkouts", { assetTag: b.assetTag, userEmail: t.people.mechanic.email })).status).toBe(201);
    expect((await (await t.agent("auditor")).get(`/api/shipments?open=true&labId=${lab.id}`)).body.total).toBe(1);
  });

  it("a tool out with a mechanic is not shipped, and none of the lot is", async () => {
    const lab = await makeLab(t.db);
    const out = await makeUsableTool(t.db);
    const inCrib = await makeUsableTool(t.db);
    await makeCheckout(t.db, out.id, t.people.mechanic.id, { issuedAt: new Date("2026-06-15T14:00:00Z") });
    const res = await (await t.agent("quality")).post("/api/shipments", { assetTags: [inCrib.assetTag, out.assetTag], labId: lab.id });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_checked_out");
    expect(res.body.error.message).toContain("Test mechanic");
    expect((await (await t.agent("quality")).get(`/api/shipments?labId=${lab.id}`)).body.total).toBe(0);
  });

  it("unknown tools, an unknown lab and empty lists are refused with nothing written", async () => {
    const lab = await makeLab(t.db);
    const tool = await makeUsableTool(t.db);
    const crib = await t.agent("crib");
    const missing = await crib.post("/api/shipments", { assetTags: [tool.assetTag, "NOPE-1"], labId: lab.id });
    expect(missing.status).toBe(404);
    expect(missing.body.error.details.missing).toEqual(["NOPE-1"]);
    expect((await crib.post("/api/shipments", { assetTags: [tool.assetTag], labId: "00000000-0000-4000-8000-000000000000" })).status).toBe(404);
    expect((await crib.post("/api/shipments", { assetTags: [], labId: lab.id })).status).toBe(400);
    expect((await crib.post("/api/shipments", { assetTags: [tool.assetTag, tool.assetTag], labId: lab.id })).status).toBe(400);
    expect((await crib.get(`/api/shipments?labId=${lab.id}`)).body.total).toBe(0);
  });
});

describe("labels and tags", () => {
  it("a calibration label sheet is a PDF carrying each tool's asset tag, calibration date, due date and who calibrated it", async () => {
    const a = await makeUsableTool(t.db, {}, { performedAt: new Date("2026-01-10T15:00:00Z"), nextDueAt: "2027-01-10" });
    const b = await makeUsableTool(t.db, {}, { performedAt: new Date("2026-03-02T15:00:00Z"), nextDueAt: "2026-09-01" });
    const res = await (await t.agent("crib")).raw.get(`/api/labels/calibration.pdf?assetTags=${a.assetTag},${b.assetTag}`).buffer(true).parse(binary as never);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    const { text } = await pdfParse(res.body as Buffer);
    expect(text).toContain(a.assetTag);
    expect(text).toContain("Due 2027-01-10");
    expect(text).toContain("Calibrated 2026-01-10");
    expect(text).toContain(b.assetTag);
    expect(text).toContain("Due 2026-09-01");
    expect(text).toContain("Demo Technician");
    expect(text).toContain("appropriately certificated persons");
  });

  it("the label's QR code opens the tool's status page at its short address", async () => {
    const a = await makeUsableTool(t.db);
    const res = await (await t.agent("quality")).get(`/api/labels/calibration?assetTags=${a.assetTag}`);
    expect(res.body.items[0]).toMatchObject({ assetTag: a.assetTag, statusUrl: `https://tenthwise.example/t/${a.assetTag}`, dueAt: "2027-01-10" });
    expect(res.body.items[0].qr).toMatch(/^data:image\/png;base64,/);
  });

  it("a do-not-use tag names the tool and the reason; a usable tool gets none", async () => {
    const held = await makeQuarantinedTool(t.db, "Spindle binds near 0.8 in");
    const crib = await t.agent("crib");
    const res = await crib.raw.get(`/api/labels/do-not-use.pdf?assetTag=${held.assetTag}`).buffer(true).parse(binary as never);
    expect(res.status).toBe(200);
    const { text } = await pdfParse(res.body as Buffer);
    expect(text).toContain("DO NOT USE");
    expect(text).toContain(held.assetTag);
    expect(text).toContain("Spindle binds near 0.8 in");
    const usable = await makeUsableTool(t.db);
    const refusedTag = await crib.get(`/api/labels/do-not-use.pdf?assetTag=${usable.assetTag}`);
    expect(refusedTag.status).toBe(409);
    expect(refusedTag.body.error.code).toBe("tool_usable");
  });

  it("labels for unknown tools or no tools are refused", async () => {
    const crib = await t.agent("crib");
    expect((await crib.get("/api/labels/calibration.pdf?assetTags=NOPE-9")).status).toBe(404);
    expect((await crib.get("/api/labels/calibration.pdf")).status).toBe(400);
    expect((await crib.get("/api/labels/do-not-use.pdf")).status).toBe(400);
  });
});

describe("who may ship tools and print labels", () => {
  const everyone = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
  const openShipment = async (x: TestApp) => {
    const lab = await makeLab(x.db);
    const tool = await makeUsableTool(x.db);
    const crib = await x.agent("crib");
    return (await crib.post("/api/shipments", { assetTags: [tool.assetTag], labId: lab.id })).body.items[0].id as string;
  };
  roleMatrix(() => t, [
    { method: "post", path: "/api/shipments", body: async (x) => ({ assetTags: [(await makeUsableTool(x.db)).assetTag], labId: (await makeLab(x.db)).id }), allowed: ["crib", "quality", "admin"] },
    { method: "post", label: "/api/shipments/:id/receive", path: async (x) => `/api/shipments/${await openShipment(x)}/receive`, body: {}, allowed: ["crib", "quality", "admin"] },
    { method: "get", path: "/api/shipments?open=true", allowed: everyone },
    { method: "get", path: "/api/shipments/labs", allowed: everyone },
    { method: "get", label: "/api/labels/calibration.pdf", path: async (x) => `/api/labels/calibration.pdf?assetTags=${(await makeUsableTool(x.db)).assetTag}`, allowed: ["crib", "quality", "admin"] },
    { method: "get", label: "/api/labels/calibration", path: async (x) => `/api/labels/calibration?assetTags=${(await makeUsableTool(x.db)).assetTag}`, allowed: ["crib", "quality", "admin"] },
    { method: "get", label: "/api/labels/do-not-use.pdf", path: async (x) => `/api/labels/do-not-use.pdf?assetTag=${(await makeQuarantinedTool(x.db)).assetTag}`, allowed: ["crib", "quality", "admin"] },
    { method: "get", label: "/api/labels/do-not-use", path: async (x) => `/api/labels/do-not-use?assetTag=${(await makeQuarantinedTool(x.db)).assetTag}`, allowed: ["crib", "quality", "admin"] },
  ]);
});
