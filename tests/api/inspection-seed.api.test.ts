import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, memoryMailer, type TestApp } from "../support/test-app";
import { makeCheckout, makeFamily, makeTool, makeCalibration, makeFeelerSet } from "../support/factories";
import { seedInspection } from "../../server/seed/inspection.seed";
import type { SeedContext } from "../../server/seed/seed-context";
import type { UserRow } from "../../server/modules/users/users.repository";
import { calibrationPoints } from "../../server/db/schema";

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
});
afterAll(async () => t.close());

/** The demo tools the register seed makes, as far as the inspection part uses them. */
async function registerTools() {
  const cal = (id: string) => makeCalibration(t.db, id, { performedAt: new Date("2026-02-01T15:00:00Z"), nextDueAt: "2027-02-01" });
  const mic = await makeFamily(t.db, { name: "Outside micrometers (demo)" });
  for (const [tag, min, max] of [["MIC-0101", "0", "1"], ["MIC-0104", "0", "1"], ["MIC-0105", "5", "6"]] as const) {
    await cal((await makeTool(t.db, { familyId: mic.id, assetTag: tag, rangeMin: min, rangeMax: max })).id);
  }
  const tel = await makeFamily(t.db, { name: "Telescoping gauges (demo)", kind: "telescoping_gauge" });
  await cal((await makeTool(t.db, { familyId: tel.id, assetTag: "TEL-0101", rangeMin: "0.3125", rangeMax: "6" })).id);
  const shg = await makeFamily(t.db, { name: "Small-hole gauges (demo)", kind: "small_hole_gauge" });
  const shgTool = await makeTool(t.db, { familyId: shg.id, assetTag: "SHG-0101", rangeMin: "0.125", rangeMax: "0.5" });
  await cal(shgTool.id);
  const leaves = ["0.0015", "0.002", "0.003", "0.004", "0.005", "0.006", "0.007", "0.008", "0.009", "0.010", "0.012", "0.015", "0.020", "0.025"];
  const { tool: flr, elements } = await makeFeelerSet(t.db, leaves, { assetTag: "FLR-0101" });
  const c = await cal(flr.id);
  await t.db.insert(calibrationPoints).values(
    elements.map((e, i) => ({ calibrationId: c.id, seq: 10 + i, elementId: e.id, nominal: e.nominal, reference: e.nominal, asFound: e.nominal, errorAsFound: "0", mpe: "0.0002", asFoundInTolerance: e.label !== "0.004", verdict: e.label === "0.004" ? ("fail" as const) : ("pass" as const) })),
  );
  const mic0101 = (await t.db.query.tools.findFirst({ where: (x, { eq }) => eq(x.assetTag, "MIC-0101") }))!;
  await makeCheckout(t.db, mic0101.id, t.people.mechanic.id, { issuedAt: new Date("2026-06-15T12:00:00Z") });
  await makeCheckout(t.db, shgTool.id, t.people.mechanic.id, { issuedAt: new Date("2026-06-15T12:00:00Z") });
}

describe("the demo inspection", () => {
  it("seeds an invented limits table, a job fully measured and signed three weeks ago, and one half measured today with a flagged reading", async () => {
    await registerTools();
    const u = (role: keyof typeof t.people) => ({ ...t.people[role], certificateNumber: role === "inspector" ? "IA-DEMO-40817" : null }) as unknown as UserRow;
    const ctx: SeedContext = {
      db: t.db,
      clock: t.clock,
      config: t.config,
      mailer: memoryMailer(),
      storage: null,
      users: { admin: u("admin"), quality: u("quality"), inspector: u("inspector"), crib: u("crib"), mechanic: u("mechanic"), auditor: u("auditor") },
      people: {},
      shared: {},
    };
    await seedInspection(ctx);
    const { signedJobId, openJobId } = ctx.shared as { signedJobId: string; openJobId: string };
    const a = await t.agent("auditor");
    const signed = (await a.get(`/api/jobs/${signedJobId}`)).body;
    expect(signed).toMatchObject({ status: "signed", locked: true, limitTable: { isDemo: true } });
    expect(signed.summary.missing).toEqual([]);
    expect(signed.summary.outside).toBeGreaterThan(0);
    expect(signed.tools.map((x: { assetTag: string }) => x.assetTag)).toEqual(expect.arrayContaining(["MIC-0104", "TEL-0101", "MIC-0105", "SHG-0101", "MIC-0101", "FLR-0101"]));
    const open = (await a.get(`/api/jobs/${openJobId}`)).body;
    expect(open.status).toBe("open");
    expect(open.summary.recorded).toBeGreaterThan(0);
    expect(open.summary.missing.length).toBeGreaterThan(0);
    expect(open.summary.flagged).toBeGreaterThan(0);
    expect(open.tools.map((x: { assetTag: string }) => x.assetTag)).toContain("MIC-0104");
  });
});
