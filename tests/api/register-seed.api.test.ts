import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { createTestApp, type TestApp } from "../support/test-app";
import { seedUsers } from "../../server/seed/users.seed";
import { seedRegister } from "../../server/seed/register.seed";
import type { SeedContext } from "../../server/seed/seed-context";

// The demo register other parts of the demo rely on (the brief's demo tags), seeded on its own.
let t: TestApp;
let shared: Record<string, unknown>;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  const people = await seedUsers(t.db, "demo-password-123");
  const ctx: SeedContext = {
    db: t.db,
    clock: t.clock,
    config: t.config,
    mailer: t.mailer,
    storage: t.storage,
    people,
    users: { admin: people.admin, quality: people.quality, inspector: people.inspector, crib: people.crib, mechanic: people.mechanic, auditor: people.auditor },
    shared: {},
  };
  await seedRegister(ctx);
  shared = ctx.shared;
}, 120_000);
afterAll(async () => t.close());

const EXPECTED: Record<string, string> = {
  "MIC-0101": "in_calibration",
  "MIC-0102": "in_calibration",
  "MIC-0104": "in_calibration",
  "MIC-0105": "in_calibration",
  "MIC-0201": "due_soon",
  "MIC-0110": "overdue",
  "MIC-0111": "quarantined",
  "MIC-0112": "never_calibrated",
  "MIC-0113": "limited",
  "MIC-0114": "inactive",
  "MIC-0115": "lost",
  "MIC-0116": "retired",
  "MIC-0117": "out_of_tolerance",
  "DIA-0101": "in_calibration",
  "DIA-0102": "at_calibration",
  "TEL-0101": "in_calibration",
  "SHG-0101": "in_calibration",
  "FLR-0101": "in_calibration",
  "CAL-0101": "reference_only",
  "MIC-P-01": "in_calibration",
  "MIC-P-02": "in_calibration",
};

describe("the demo register", () => {
  it("holds the demo tags in the states the demo relies on", async () => {
    const a = await t.agent("auditor");
    const got: Record<string, string> = {};
    for (const tag of Object.keys(EXPECTED)) got[tag] = (await a.get(`/api/tools/${tag}/status`)).body.status;
    expect(got).toEqual(EXPECTED);
    const dia3 = (await a.get("/api/tools/DIA-0103/status")).body;
    expect(dia3.reasons.join(" ")).toMatch(/Kestrel Metrology .* awaiting review/);
    expect(Object.keys(shared.toolIds as object)).toContain("MIC-0104");
  });

  it("every demo micrometer sits in the family of its own range: MIC-0102 (1-2 in) is calibrated at 1-2 in sizes, never 0-1 in", async () => {
    const a = await t.agent("auditor");
    const mic = (await a.get("/api/tools?kind=outside_micrometer&pageSize=500")).body.items as { assetTag: string; rangeMin: number; rangeMax: number; unit: string; familyId: string }[];
    const families = new Map(((await a.get("/api/families?pageSize=500")).body.items as { id: string; name: string }[]).map((f) => [f.id, f.name]));
    const mic0102 = mic.find((m) => m.assetTag === "MIC-0102")!;
    expect(families.get(mic0102.familyId)).toBe("Outside micrometer 1-2 in");
    for (const m of mic) {
      const range = m.unit === "in" ? `${m.rangeMin}-${m.rangeMax} in` : `${m.rangeMin}-${m.rangeMax} mm`;
      expect(families.get(m.familyId), m.assetTag).toContain(`Outside micrometer ${range}`);
    }
    const [last] = (await a.get("/api/tools/MIC-0102/calibrations")).body.items as { points: { nominal: number }[] }[];
    const sizes = last.points.map((p) => p.nominal);
    expect(Math.min(...sizes)).toBeGreaterThanOrEqual(1);
    expect(Math.max(...sizes)).toBeLessThanOrEqual(2);
  });

  it("has at least 60 tools, every status and every kind", async () => {
    const a = await t.agent("auditor");
    const all = (await a.get("/api/tools?pageSize=500")).body;
    expect(all.total).toBeGreaterThanOrEqual(60);
    const statuses = new Set(all.items.map((x: { status: string }) => x.status));
    for (const s of ["in_calibration", "due_soon", "limited", "overdue", "out_of_tolerance", "quarantined", "at_calibration", "never_calibrated", "inactive", "lost", "retired", "reference_only"]) expect(statuses, s).toContain(s);
    const kinds = new Set(all.items.map((x: { kind: string }) => x.kind));
    expect(kinds.size).toBe(10);
  });

  it("keeps two years of calibration history with small drift, all traceable to GBS-01's certificate", async () => {
    const a = await t.agent("auditor");
    const cals = (await a.get("/api/tools/MIC-0101/calibrations")).body;
    expect(cals.total).toBe(3);
    const oldest = cals.items[cals.total - 1];
    expect(Date.parse("2026-06-15T15:00:00Z") - Date.parse(oldest.performedAt)).toBeGreaterThan(700 * 86_400_000);
    for (const c of cals.items) for (const p of c.points) expect(Math.abs(p.errorAsFound)).toBeLessThanOrEqual(0.0001);
    const chain = (await a.get("/api/tools/MIC-0101/chain")).body;
    expect(chain.standards[0]).toMatchObject({ assetTag: "GBS-01", certificate: { nationalInstitute: expect.stringMatching(/demo/), lab: { name: "Meridian Dimensional Lab" } } });
    expect(chain.gaps).toEqual([]);
    const flr = (await a.get("/api/tools/FLR-0101")).body;
    expect(flr.elements.filter((e: { usable: boolean }) => !e.usable).map((e: { nominal: number }) => e.nominal)).toEqual([0.004]);
    const labs = (await a.get("/api/labs")).body.items.map((l: { name: string; accreditation: string }) => [l.name, l.accreditation]);
    expect(labs).toEqual([["Kestrel Metrology", "expiring_soon"], ["Meridian Dimensional Lab", "valid"]]);
  });

  it("shows every ILAC-G8 statement at least once, a guarded release after adjustment, and budgets built from certified blocks", async () => {
    const r = await t.db.execute(sql`select as_found_statement as s, count(*)::int as n from calibration_points where as_found_statement is not null group by 1`);
    const seen = Object.fromEntries((r.rows as { s: string; n: number }[]).map((x) => [x.s, x.n]));
    for (const s of ["pass", "conditional_pass", "conditional_fail", "fail"]) expect(seen[s], s).toBeGreaterThan(0);
    const a = await t.agent("quality");
    const [latest] = (await a.get("/api/tools/MIC-0201/calibrations")).body.items;
    expect(latest.decisionRule).toBe("guarded");
    const p77 = latest.points.find((p: { nominal: number }) => p.nominal === 7.7);
    expect(p77.referenceParts.map((x: { element: string }) => x.element).sort()).toEqual(["2.7", "5"]);
    expect(p77.budget.components.filter((c: { kind: string }) => c.kind === "standard")).toHaveLength(2);
    const p176 = latest.points.find((p: { nominal: number }) => p.nominal === 17.6);
    expect(p176.budget.components.filter((c: { kind: string }) => c.kind === "standard_grade")).toHaveLength(2);
    const dia4 = (await a.get("/api/tools/DIA-0104/calibrations")).body.items.find((c: { asFoundStatement: string }) => c.asFoundStatement === "conditional_fail");
    expect(dia4).toMatchObject({ asFoundInTolerance: false, adjusted: true, result: "adjusted" });
    const review = await a.get("/api/calibrations/conditional-results?current=false&statement=conditional_fail");
    expect(review.body.items.map((i: { assetTag: string }) => i.assetTag)).toContain("DIA-0104");
  });

  it("the interval review shows a family whose interval is kept and one whose interval should change (NCSL RP-1 method A3)", async () => {
    const families = (await (await t.agent("quality")).get("/api/intervals/families")).body as { name: string; decision: string; inTolerance: number; recalibrations: number; recommendedIntervalDays: number | null }[];
    const mic = families.find((f) => f.name === "Outside micrometer 0-1 in")!;
    expect(mic.decision).toBe("keep");
    const dia = families.find((f) => f.name === "Dial indicator 0-1 in")!;
    expect(dia).toMatchObject({ decision: "shorten", inTolerance: 7, recalibrations: 10 });
    // 365 · ln 0.95 / ln 0.7 = 52.5 d (arithmetic on the NCSL RP-1 exponential model, from memory)
    expect(dia.recommendedIntervalDays).toBe(52.5);
    const closed = await (await t.agent("auditor")).get("/api/investigations?toolAssetTag=DIA-0104");
    expect(closed.body.map((i: { status: string }) => i.status)).toEqual(["closed"]);
  });
});
