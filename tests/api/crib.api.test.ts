import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeCheckout, makeTool } from "../support/factories";
import { checkoutsOf, checksOf, holdsOf, makeOverdueTool, makeQuarantinedTool, makeUsableTool, refusalsOf } from "../support/factories-crib";

let t: TestApp;
beforeAll(async () => {
  // 10:00 in the shop (America/Chicago, CDT); end of shift 17:00 = 22:00 UTC.
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => {
  // Dropping the database (with force) may reach a pooled connection that is
  // still closing; its FATAL 57P01 is expected then, not a failure.
  t.pool.on("error", () => undefined);
  await t.close();
});

const issue = async (tag: string, who: object = { userEmail: t.people.mechanic.email }, role: "crib" | "admin" = "crib") =>
  (await t.agent(role)).post("/api/checkouts", { assetTag: tag, ...who });

describe("issuing tools at the crib", () => {
  it("a tool in calibration is issued to a mechanic, expected back at the end of the shift, and shows in custody and in their tools", async () => {
    const tool = await makeUsableTool(t.db);
    const res = await issue(tool.assetTag, { userEmail: t.people.mechanic.email, workOrder: "WO-DEMO-1", engineSerial: "HF-DEMO-77" });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      tool: { assetTag: tool.assetTag, status: "in_calibration" },
      person: { email: t.people.mechanic.email },
      issuedBy: "Test crib",
      workOrder: "WO-DEMO-1",
      engineSerial: "HF-DEMO-77",
      returnedAt: null,
      warnings: [],
    });
    // Default expected return: today's end of shift, 17:00 in the shop (settings.endOfShift).
    expect(res.body.dueBackAt).toBe("2026-06-15T22:00:00.000Z");

    const board = await (await t.agent("auditor")).get(`/api/checkouts?open=true&assetTag=${tool.assetTag}`);
    expect(board.body.total).toBe(1);
    expect(board.body.items[0].person.name).toBe("Test mechanic");

    const mine = await (await t.agent("mechanic")).get("/api/me/tools");
    expect(mine.body.items).toContainEqual(expect.objectContaining({ assetTag: tool.assetTag, relation: "issued", status: "in_calibration", dueAt: "2027-01-10" }));
  });

  it("a person can be named by the badge code scanned at the counter or by id", async () => {
    const { db, people } = t;
    const admin = await t.agent("admin");
    await admin.patch(`/api/users/${people.inspector.id}`, { badgeCode: "B-TEST-9" });
    const a = await makeUsableTool(db);
    const byBadge = await issue(a.assetTag, { badgeCode: "B-TEST-9" });
    expect(byBadge.status).toBe(201);
    expect(byBadge.body.person.id).toBe(people.inspector.id);
    const b = await makeUsableTool(db);
    const byId = await issue(b.assetTag, { userId: people.quality.id });
    expect(byId.status).toBe(201);
    expect(byId.body.person.id).toBe(people.quality.id);
  });

  it("an overdue tool cannot be checked out; the refusal says why in plain words and is recorded", async () => {
    const tool = await makeOverdueTool(t.db);
    const res = await issue(tool.assetTag);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_not_usable");
    expect(res.body.error.details.status).toBe("overdue");
    expect(res.body.error.message).toContain("overdue");
    expect(res.body.error.message).toContain("2026-06-01");
    expect(await checkoutsOf(t.db, tool.id)).toHaveLength(0);
    const refusals = await refusalsOf(t.db, tool.id);
    expect(refusals).toHaveLength(1);
    expect(refusals[0]).toMatchObject({ code: "tool_not_usable", userId: t.people.mechanic.id, refusedBy: t.people.crib.id });
  });

  it("a quarantined tool cannot be checked out", async () => {
    const tool = await makeQuarantinedTool(t.db, "Dropped on the shop floor");
    const res = await issue(tool.assetTag);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("tool_not_usable");
    expect(res.body.error.details.status).toBe("quarantined");
    expect(res.body.error.details.reasons[0]).toContain("Dropped on the shop floor");
  });

  it("a tool already out with someone cannot be issued again until it is returned", async () => {
    const tool = await makeUsableTool(t.db);
    expect((await issue(tool.assetTag)).status).toBe(201);
    const again = await issue(tool.assetTag, { userEmail: t.people.inspector.email });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("already_checked_out");
    expect(again.body.error.message).toContain("Test mechanic");
    expect(again.body.error.details.custodian.email).toBe(t.people.mechanic.email);
  });

  it("ten simultaneous issues of one tool give exactly one checkout and nine clean refusals", async () => {
    const tool = await makeUsableTool(t.db);
    const crib = await t.agent("crib");
    const answers = await Promise.all(Array.from({ length: 10 }, () => crib.post("/api/checkouts", { assetTag: tool.assetTag, userEmail: t.people.mechanic.email })));
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses).toEqual([201, 409, 409, 409, 409, 409, 409, 409, 409, 409]);
    for (const a of answers.filter((x) => x.status === 409)) expect(a.body.error.code).toBe("already_checked_out");
    expect((await checkoutsOf(t.db, tool.id)).filter((c) => !c.returnedAt)).toHaveLength(1);
  });

  it("a mechanic's personal tool is not issued from the crib, yet its owner sees it as theirs", async () => {
    const tool = await makeUsableTool(t.db, { ownerType: "personal", ownerUserId: t.people.mechanic.id });
    const res = await issue(tool.assetTag, { userEmail: t.people.inspector.email });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("personal_tool");
    const mine = await (await t.agent("mechanic")).get("/api/me/tools");
    expect(mine.body.items).toContainEqual(expect.objectContaining({ assetTag: tool.assetTag, relation: "own", status: "in_calibration", usable: true }));
  });

  it("a reference-only tool goes out only when the attendant confirms reference use, with a warning", async () => {
    const tool = await makeTool(t.db, { calibrationRequired: false, acceptanceUse: false });
    const refusedRes = await issue(tool.assetTag);
    expect(refusedRes.status).toBe(409);
    expect(refusedRes.body.error).toMatchObject({ code: "tool_not_usable", details: { status: "reference_only", confirm: "referenceUseOnly" } });
    const ok = await issue(tool.assetTag, { userEmail: t.people.mechanic.email, referenceUseOnly: true });
    expect(ok.status).toBe(201);
    expect(ok.body.warnings.join(" ")).toContain("never for acceptance readings");
  });

  it("the crib is warned when a tool falls due before it is expected back", async () => {
    const tool = await makeUsableTool(t.db, {}, { performedAt: new Date("2025-06-20T15:00:00Z"), nextDueAt: "2026-06-18" });
    const res = await issue(tool.assetTag, { userEmail: t.people.mechanic.email, dueBackAt: "2026-06-22T22:00:00Z" });
    expect(res.status).toBe(201);
    expect(res.body.warnings[0]).toMatch(/falls due for calibration on 2026-06-18, before it is expected back \(2026-06-22\)/);
  });

  it("an unknown tag or person is answered 404 and nothing is written; a missing person is a 400", async () => {
    const tool = await makeUsableTool(t.db);
    const noTool = await issue("NO-SUCH-TAG");
    expect(noTool.status).toBe(404);
    expect(noTool.body.error.code).toBe("tool_not_found");
    const noPerson = await issue(tool.assetTag, { userEmail: "nobody@test.example" });
    expect(noPerson.status).toBe(404);
    expect(noPerson.body.error.code).toBe("person_not_found");
    const missing = await (await t.agent("crib")).post("/api/checkouts", { assetTag: tool.assetTag });
    expect(missing.status).toBe(400);
    expect(missing.body.error.details[0].path).toEqual(["userEmail"]);
    const badDate = await issue(tool.assetTag, { userEmail: t.people.mechanic.email, dueBackAt: "tomorrow" });
    expect(badDate.status).toBe(400);
    expect(await checkoutsOf(t.db, tool.id)).toHaveLength(0);
    expect(await refusalsOf(t.db, tool.id)).toHaveLength(0);
  });
});

describe("returning tools", () => {
  it("a tool returned in good condition is back in the crib and can go out again; a second return is refused", async () => {
    const tool = await makeUsableTool(t.db);
    const out = await issue(tool.assetTag);
    const crib = await t.agent("crib");
    const back = await crib.post(`/api/checkouts/${out.body.id}/return`, { condition: "ok" });
    expect(back.status).toBe(200);
    expect(back.body).toMatchObject({ returnCondition: "ok", returnedBy: "Test crib", quarantined: false, tool: { status: "in_calibration" } });
    expect((await crib.post(`/api/checkouts/${out.body.id}/return`, { condition: "ok" })).body.error.code).toBe("already_returned");
    expect((await issue(tool.assetTag)).status).toBe(201);
  });

  it("a tool returned damaged is quarantined at once, with the note and photo kept", async () => {
    const tool = await makeUsableTool(t.db);
    const out = await issue(tool.assetTag);
    const crib = await t.agent("crib");
    const photo = Buffer.from("89504e470d0a1a0a0000000d49484452", "hex");
    const back = await crib.upload(`/api/checkouts/${out.body.id}/return`, "photo", photo, "anvil.png", { condition: "damaged", note: "Anvil face chipped" });
    expect(back.status).toBe(200);
    expect(back.body).toMatchObject({ returnCondition: "damaged", returnNote: "Anvil face chipped", quarantined: true, hasPhoto: true, tool: { status: "quarantined", usable: false } });
    expect(back.body.investigationId).toEqual(expect.any(String));
    const held = await holdsOf(t.db, tool.id);
    expect(held[0].reason).toContain("Anvil face chipped");
    const img = await crib.get(`/api/checkouts/${out.body.id}/photo`);
    expect(img.status).toBe(200);
    expect(img.headers["content-type"]).toBe("image/png");
    const again = await issue(tool.assetTag);
    expect(again.body.error).toMatchObject({ code: "tool_not_usable", details: { status: "quarantined" } });
  });

  it("a zero check on return is recorded as an intermediate check; a failed one takes the tool out of use", async () => {
    const good = await makeUsableTool(t.db);
    const crib = await t.agent("crib");
    const a = await issue(good.assetTag);
    // Family check tolerance ±0.0001 in; a reading of exactly +0.0001 is on the limit and passes.
    const ok = await crib.post(`/api/checkouts/${a.body.id}/return`, { condition: "ok", zeroCheck: { nominal: 0, reading: 0.0001 } });
    expect(ok.body.zeroCheck).toMatchObject({ passed: true, deviation: 0.0001 });
    expect((await checksOf(t.db, good.id))[0]).toMatchObject({ context: "return_zero_check", passed: true });

    const bad = await makeUsableTool(t.db);
    const b = await issue(bad.assetTag);
    const failed = await crib.post(`/api/checkouts/${b.body.id}/return`, { condition: "ok", zeroCheck: { nominal: 0, reading: 0.0003 } });
    expect(failed.body.zeroCheck).toMatchObject({ passed: false, deviation: 0.0003 });
    expect(failed.body.tool.status).toBe("out_of_tolerance");
    expect((await issue(bad.assetTag)).body.error.details.status).toBe("out_of_tolerance");
  });

  it("a return with a bad condition or a file that is not an image is refused and the tool stays out", async () => {
    const tool = await makeUsableTool(t.db);
    const out = await issue(tool.assetTag);
    const crib = await t.agent("crib");
    expect((await crib.post(`/api/checkouts/${out.body.id}/return`, { condition: "bent" })).status).toBe(400);
    expect((await crib.upload(`/api/checkouts/${out.body.id}/return`, "photo", Buffer.from("not an image"), "notes.txt", { condition: "ok" })).status).toBe(400);
    expect((await crib.post("/api/checkouts/not-a-uuid/return", { condition: "ok" })).status).toBe(400);
    expect((await crib.post("/api/checkouts/00000000-0000-4000-8000-000000000000/return", { condition: "ok" })).status).toBe(404);
    expect((await checkoutsOf(t.db, tool.id))[0].returnedAt).toBeNull();
  });
});

describe("custody board", () => {
  it("tools not back by the end of the shift are listed as overdue, paged, and searchable by person", async () => {
    const tool = await makeUsableTool(t.db);
    const other = await makeUsableTool(t.db);
    await makeCheckout(t.db, tool.id, t.people.auditor.id, { issuedAt: new Date("2026-06-14T13:00:00Z"), dueBackAt: new Date("2026-06-14T22:00:00Z") });
    await makeCheckout(t.db, other.id, t.people.auditor.id, { issuedAt: new Date("2026-06-15T13:00:00Z"), dueBackAt: new Date("2026-06-15T22:00:00Z") });
    const a = await t.agent("mechanic");
    const overdue = await a.get(`/api/checkouts?open=true&overdue=true&userId=${t.people.auditor.id}`);
    expect(overdue.body.items.map((c: { tool: { assetTag: string } }) => c.tool.assetTag)).toEqual([tool.assetTag]);
    expect(overdue.body.items[0].notBackInTime).toBe(true);
    const byName = await a.get(`/api/checkouts?open=true&q=Test%20auditor&pageSize=1`);
    expect(byName.body.total).toBe(2);
    expect(byName.body.items).toHaveLength(1);
    expect((await a.get("/api/checkouts?pageSize=0")).status).toBe(400);
  });
});

describe("lost and found", () => {
  it("a tool reported lost cannot be issued; its last holder stays on record; found again it is held until verified", async () => {
    const tool = await makeUsableTool(t.db);
    const out = await issue(tool.assetTag);
    const crib = await t.agent("crib");
    const lost = await crib.post(`/api/tools/${tool.assetTag}/lost`, { reason: "Not returned; not found at the bench" });
    expect(lost.status).toBe(200);
    expect(lost.body).toMatchObject({ lifecycle: "lost", status: "lost", custodian: { checkoutId: out.body.id, email: t.people.mechanic.email } });
    // A lost tool's readings can no longer be vouched for: the investigation opens with the report.
    expect(lost.body.investigationId).toEqual(expect.any(String));
    expect((await checkoutsOf(t.db, tool.id)).find((c) => c.id === out.body.id)!.returnedAt).toBeNull();
    expect((await crib.post(`/api/tools/${tool.assetTag}/lost`, { reason: "again" })).status).toBe(409);

    const found = await crib.post(`/api/tools/${tool.assetTag}/found`, { reason: "Found in the cylinder bay drawer" });
    expect(found.status).toBe(200);
    expect(found.body).toMatchObject({ lifecycle: "active", status: "quarantined" });
    expect(found.body.reasons[0]).toContain("verify with a check or calibration before use");
    expect((await checkoutsOf(t.db, tool.id))[0].returnedAt).not.toBeNull();
    expect((await issue(tool.assetTag)).body.error.details.status).toBe("quarantined");
  });

  it("a tool that is not lost cannot be found; a reason is needed", async () => {
    const tool = await makeUsableTool(t.db);
    const crib = await t.agent("crib");
    expect((await crib.post(`/api/tools/${tool.assetTag}/found`, { reason: "here it is" })).body.error.code).toBe("tool_not_lost");
    expect((await crib.post(`/api/tools/${tool.assetTag}/lost`, {})).status).toBe(400);
    expect((await crib.post(`/api/tools/NO-SUCH/lost`, { reason: "gone" })).status).toBe(404);
  });
});

describe("who may use the crib routes", () => {
  const everyone = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
  const freshTool = async (x: TestApp) => (await makeUsableTool(x.db)).assetTag;
  const openCheckout = async (x: TestApp) => {
    const tool = await makeUsableTool(x.db);
    return (await makeCheckout(x.db, tool.id, x.people.mechanic.id, { issuedAt: new Date("2026-06-15T14:00:00Z") })).id;
  };
  roleMatrix(() => t, [
    { method: "post", path: "/api/checkouts", body: async (x) => ({ assetTag: await freshTool(x), userEmail: x.people.mechanic.email }), allowed: ["crib", "admin"] },
    { method: "post", label: "/api/checkouts/:id/return", path: async (x) => `/api/checkouts/${await openCheckout(x)}/return`, body: { condition: "ok" }, allowed: ["crib", "admin"] },
    { method: "get", path: "/api/checkouts?open=true", allowed: everyone },
    { method: "get", label: "/api/checkouts/:id", path: async (x) => `/api/checkouts/${await openCheckout(x)}`, allowed: everyone },
    { method: "get", label: "/api/checkouts/:id/photo", path: async (x) => `/api/checkouts/${await openCheckout(x)}/photo`, allowed: everyone },
    { method: "get", path: "/api/me/tools", allowed: everyone },
    { method: "post", label: "/api/tools/:assetTag/lost", path: async (x) => `/api/tools/${await freshTool(x)}/lost`, body: { reason: "Missing from the board" }, allowed: ["crib", "quality", "admin"] },
    { method: "post", label: "/api/tools/:assetTag/found", path: async (x) => `/api/tools/${await freshTool(x)}/found`, body: { reason: "Found it" }, allowed: ["crib", "quality", "admin"] },
  ]);
});
