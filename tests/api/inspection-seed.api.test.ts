import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, memoryMailer, type TestApp } from "../support/test-app";
import { makeCheckout, makeFamily, makeTool, makeCalibration, makeFeelerSet } from "../support/factories";
import { seedInspection } from "../../server/seed/inspection.seed";
import type { SeedContext } from "../../server/seed/seed-context";
import type { UserRow } from "../../server/modules/users/users.repository";
import { calibrationPoints, users } from "../../server/db/schema";
import { eq } from "drizzle-orm";

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
    // The demo inspector signs with the number on her record (users.seed gives it; the test app's people have none).
    await t.db.update(users).set({ certificateNumber: "IA-DEMO-40817" }).where(eq(users.id, t.people.inspector.id));
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

    // The signed sheet shows a place caught by each judging rule (demo values).
    const place = (sheet: any, key: string, index: number) => sheet.items.find((i: { key: string }) => i.key === key).rows.find((r: { index: number }) => r.index === index);
    // Every two-point reading: pin no. 2 read 0.8751 in one direction, over the 0.8750 maximum, though its size 0.8746 is inside.
    expect(place(signed, "pin_dia", 2).place).toMatchObject({ verdict: "outside_limits", size: 0.8746, directions: [{ beyond: { side: "max", by: 0.0001 } }, { beyond: null }] });
    // Both fits: pin no. 4's loosest fit passes, its tightest (0.8752 − 0.8750 = 0.0002) is under the 0.0003 minimum.
    expect(place(signed, "pin_clearance", 4).place).toMatchObject({ verdict: "outside_limits", loosest: { verdict: "within_limits" }, tightest: { value: 0.0002, verdict: "outside_limits" } });
    // Out-of-round: cylinder no. 3 top, 5.2519 − 5.2504 = 0.0015 over 0.0012; taper: cylinder no. 5, 0.0016 over 0.0012.
    expect(place(signed, "barrel_bore_top", 3).place).toMatchObject({ outOfRound: 0.0015, outOfRoundVerdict: "outside_limits", verdict: "outside_limits" });
    expect(place(signed, "barrel_taper", 5).place).toMatchObject({ kind: "taper", taper: 0.0016, verdict: "outside_limits" });
    // 20 °C: piston no. 6 read 0.8753 at 30 °C is under the 0.8752 minimum at 20 °C (aluminium, 21.5 µm/(m·K)).
    const warm = place(signed, "pin_bore", 6).place;
    expect(warm).toMatchObject({ verdict: "outside_limits", rawSize: 0.8754, thermal: { partTemperatureC: 30, toolTemperatureC: 20, source: "item" } });
    expect(warm.directions[0]).toMatchObject({ raw: 0.8753, verdict: "outside_limits" });
    // Radial: rocker no. 9's tightest 0.0005 diametral is 0.00025 radial, under 0.0003; no. 7's 0.0021 diametral is 0.00105 radial, serviceable.
    expect(place(signed, "rocker_clearance", 9).place).toMatchObject({ basis: "radial", verdict: "outside_limits", tightest: { value: 0.00025, diametral: 0.0005 } });
    expect(place(signed, "rocker_clearance", 7).place).toMatchObject({ basis: "radial", verdict: "within_limits", band: "serviceable", loosest: { value: 0.00105 } });
    // Feeler leaves: recorded under the earlier rules (go under the minimum), judged again and no longer within.
    const ring = place(signed, "ring_side_top", 1);
    expect(ring).toMatchObject({ verdict: "outside_limits", judgedDifferently: true, reading: { recordedVerdict: "within_limits", feeler: { go: { leaves: [{ label: "0.003" }] } } } });
    expect(signed.summary.judgedDifferently).toBe(3 * 6);
    // Today's second ring is a measured gap: FLR-0101 cannot make a go and a no-go inside 0.0030–0.0033.
    expect(place(open, "ring_side_second", 1).place).toMatchObject({ kind: "feeler", mode: "measured_gap", verdict: "within_limits" });
    expect(place(open, "ring_side_top", 1).place).toMatchObject({ mode: "go_no_go", verdict: "within_limits" });

    // Every demo reading was taken after its tools were issued to the mechanic: "not issued to the reader" is on the one
    // reading deliberately taken with the bench micrometer MIC-0104 (today's pin no. 1), and on no other.
    const notIssued = (sheet: any) =>
      sheet.items.flatMap((i: any) => i.rows.filter((r: any) => r.reading?.flags.includes("not_in_custody")).map((r: any) => `${i.key} ${r.index} ${r.reading.tools.map((x: any) => x.assetTag).join("+")}`));
    expect(notIssued(signed)).toEqual([]);
    expect(notIssued(open)).toEqual(["pin_dia 1 MIC-0104"]);
    // The signature carries the number on the inspector's record.
    expect(signed.signoffs[0]).toMatchObject({ certificateNumber: "IA-DEMO-40817", inspector: { name: "Test inspector" } });
  });
});
