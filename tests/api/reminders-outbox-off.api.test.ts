import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";

// A server that sends through a real mail service has no local catcher to read.
let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());

describe("the outbox where mail goes to a real mail service", () => {
  it("says there is no outbox here and why, instead of failing", async () => {
    const admin = await t.agent("admin");
    for (const path of ["/api/admin/outbox", "/api/admin/outbox/0"]) {
      const res = await admin.get(path);
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe("outbox_unavailable");
      expect(res.body.error.message).toMatch(/real mail service/);
    }
  });
});
