import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import request from "supertest";
import { SessionStore } from "../../server/auth/session-store";
import { createTestApp, type TestApp } from "../support/test-app";
import { makePinSheet } from "../support/factories-inspection";

// A reading recorded while the session and the person were read moments ago is taken before the app's middleware
// (server/http/quick-get.ts) and run by the route's own runner. It must answer exactly as the whole way does: the same
// judgement, the same refusals (role, CSRF token, malformed or incomplete input), and never for a session that has
// ended. Common practice, no source: what a signed-in web app owes; the judging itself is tested elsewhere.
let t: TestApp;
let sheet: Awaited<ReturnType<typeof makePinSheet>>;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  sheet = await makePinSheet(t.db, t.people.mechanic.id);
});
afterAll(async () => t.close());

const sessionCookieOf = (res: request.Response) => String(res.headers["set-cookie"] ?? "").match(/tenthwise\.sid=[^;]+/)?.[0] ?? "";
const steadyHeaders = (res: request.Response) =>
  Object.fromEntries(Object.entries(res.headers).filter(([k]) => !["date", "etag", "set-cookie", "content-length", "connection", "keep-alive"].includes(k)));
const readingsUrl = () => `/api/jobs/${sheet.job.id}/readings`;

describe("a reading recorded with the kept session", () => {
  it("is judged, stored and answered as the first reading was, with the same headers and rolling cookie, without reading the session", async () => {
    const m = await t.agent("mechanic");
    const reads = vi.spyOn(SessionStore.prototype, "get");
    // Piston pin 1.1240–1.1250 in: both readings are within limits.
    const first = await m.post(readingsUrl(), { itemKey: "pin", index: 1, values: [1.1245, 1.1246], toolAssetTags: [sheet.mic.assetTag] });
    const readsForFirst = reads.mock.calls.length;
    const second = await m.post(readingsUrl(), { itemKey: "pin", index: 2, values: [1.1247, 1.1246], toolAssetTags: [sheet.mic.assetTag] });
    const readsForSecond = reads.mock.calls.length - readsForFirst;
    reads.mockRestore();
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    expect(readsForFirst).toBeGreaterThanOrEqual(1);
    expect(readsForSecond).toBe(0);
    expect(second.status, JSON.stringify(second.body)).toBe(201);
    expect(first.body.verdict).toBe("within_limits");
    expect(second.body.verdict).toBe("within_limits");
    expect(second.body.size).toBeCloseTo(1.1246, 6);
    expect(second.body.outOfRound).toBeCloseTo(0.0001, 6);
    expect(steadyHeaders(second)).toEqual(steadyHeaders(first));
    expect(sessionCookieOf(second)).toBe(sessionCookieOf(first));
    // Both on the sheet.
    const sheetNow = await m.get(`/api/jobs/${sheet.job.id}`);
    expect(sheetNow.status).toBe(200);
    expect(JSON.stringify(sheetNow.body)).toContain(second.body.id);
    // A place already read is refused the same way on the front path: a correction goes with a reason.
    const again = await m.post(readingsUrl(), { itemKey: "pin", index: 2, values: [1.1245, 1.1245], toolAssetTags: [sheet.mic.assetTag] });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("reading_exists");
  });

  it("without the session's CSRF token, or with another session's, is refused 403 and nothing is stored", async () => {
    const m = await t.agent("mechanic");
    const other = await t.agent("mechanic");
    const used = await m.post(readingsUrl(), { itemKey: "pin_bore", index: 1, values: [1.127, 1.1271], toolAssetTags: [sheet.tel.assetTag, sheet.mic.assetTag] });
    expect(used.status, JSON.stringify(used.body)).toBe(201);
    const cookie = sessionCookieOf(used);
    const body = { itemKey: "pin_bore", index: 2, values: [1.127, 1.1271], toolAssetTags: [sheet.tel.assetTag, sheet.mic.assetTag] };
    const none = await request(t.app).post(readingsUrl()).set("Cookie", cookie).send(body);
    expect(none.status).toBe(403);
    expect(none.body.error.code).toBe("csrf_token_invalid");
    const foreign = await request(t.app).post(readingsUrl()).set("Cookie", cookie).set("X-CSRF-Token", other.token()).send(body);
    expect(foreign.status).toBe(403);
    expect(foreign.body.error.code).toBe("csrf_token_invalid");
    // The place is still free.
    const ok = await request(t.app).post(readingsUrl()).set("Cookie", cookie).set("X-CSRF-Token", m.token()).send(body);
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
  });

  it("refuses what the whole way refuses: a role that may not record, malformed JSON, a missing value, a NUL, an unknown sheet", async () => {
    const auditor = await t.agent("auditor");
    await auditor.get("/api/tools/locations");
    const denied = await auditor.post(readingsUrl(), { itemKey: "pin", index: 1, values: [1.1245, 1.1246], toolAssetTags: [sheet.mic.assetTag] });
    expect(denied.status).toBe(403);
    expect(denied.body.error.code).toBe("role_not_allowed");

    const m = await t.agent("mechanic");
    await m.get("/api/tools/locations");
    const malformed = await m.raw.post(readingsUrl()).set("X-CSRF-Token", m.token()).set("Content-Type", "application/json").send('{"itemKey": "pin",');
    expect(malformed.status).toBe(400);
    expect(malformed.headers["x-content-type-options"]).toBe("nosniff");
    const short = await m.post(readingsUrl(), { itemKey: "pin", index: 1, values: [1.1245], toolAssetTags: [sheet.mic.assetTag] });
    expect(short.status).toBe(400);
    expect(short.body.error.code).toBe("invalid_input");
    const nul = await m.post(readingsUrl(), { itemKey: "pin\u0000", index: 1, values: [1.1245, 1.1246], toolAssetTags: [sheet.mic.assetTag] });
    expect(nul.status).toBe(400);
    const unknown = await m.post("/api/jobs/00000000-0000-4000-8000-000000000000/readings", { itemKey: "pin", index: 1, values: [1.1245, 1.1246], toolAssetTags: [sheet.mic.assetTag] });
    expect(unknown.status).toBe(404);
  });

  it("a signed-out session records nothing, even moments after its last reading", async () => {
    const m = await t.agent("mechanic");
    await m.get("/api/tools/locations");
    const token = m.token();
    const used = await m.get("/api/tools/locations");
    const cookie = sessionCookieOf(used);
    expect((await m.post("/api/auth/logout")).status).toBe(204);
    const after = await request(t.app)
      .post(readingsUrl())
      .set("Cookie", cookie)
      .set("X-CSRF-Token", token)
      .send({ itemKey: "pin", index: 1, values: [1.1245, 1.1246], toolAssetTags: [sheet.mic.assetTag] });
    expect([401, 403]).toContain(after.status);
  });
});
