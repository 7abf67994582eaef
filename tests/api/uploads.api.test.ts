import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeTool } from "../support/factories";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t?.close());

describe("uploads that cannot be read", () => {
  it("a tool photo sent in the wrong form field is refused with 400 and the tool keeps no photo", async () => {
    const tool = await makeTool(t.db);
    const crib = await t.agent("crib");
    const res = await crib.upload(`/api/tools/${tool.assetTag}/photo`, "picture", Buffer.from([0x89, 0x50, 0x4e, 0x47]), "bench.png");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_upload");
    expect((await crib.get(`/api/tools/${tool.assetTag}`)).body.hasPhoto).toBe(false);
  });
});
