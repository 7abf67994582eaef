import { randomBytes } from "node:crypto";
import type { Db } from "../../server/db/client";
import { makeCalibration, makeFamily, makeTool } from "./factories";
import { holds, investigations, investigationItems, jobs, limitTables, readings, jobSignoffs } from "../../server/db/schema";
import { addDays } from "../../shared/common/dates";

// Factories for the quality overview's tests: calibration histories for interval
// reviews, drift series, open jobs and investigations. They write straight to the
// database; what a test asserts goes through the API.
const uid = () => randomBytes(3).toString("hex").toUpperCase();
const noonUtc = (date: string) => new Date(`${date}T12:00:00Z`);

/**
 * A family whose tools were each calibrated once (first calibration, as found
 * `firstAsFound`) and recalibrated one interval later, `inTolerance` of them found
 * in tolerance as found and `outOfTolerance` found out.
 */
export async function makeRecalibratedFamily(
  db: Db,
  opts: { intervalDays?: number; inTolerance: number; outOfTolerance: number; firstAsFoundInTolerance?: boolean; firstDate?: string },
) {
  const intervalDays = opts.intervalDays ?? 365;
  const family = await makeFamily(db, { defaultIntervalDays: intervalDays, name: `Outside micrometer 1-2 in ${uid()}` });
  const first = opts.firstDate ?? "2024-05-02";
  const second = addDays(first, intervalDays);
  const tools = [];
  const n = opts.inTolerance + opts.outOfTolerance;
  for (let i = 0; i < n; i++) {
    const tool = await makeTool(db, { familyId: family.id, intervalDays });
    const firstOk = opts.firstAsFoundInTolerance ?? false;
    const firstCal = await makeCalibration(db, tool.id, {
      performedAt: noonUtc(first),
      nextDueAt: second,
      intervalDays,
      asFoundInTolerance: firstOk,
      result: firstOk ? "pass" : "adjusted",
    });
    const ok = i < opts.inTolerance;
    const recal = await makeCalibration(db, tool.id, {
      performedAt: noonUtc(second),
      nextDueAt: addDays(second, intervalDays),
      intervalDays,
      asFoundInTolerance: ok,
      result: ok ? "pass" : "adjusted",
    });
    tools.push({ tool, firstCal, recal });
  }
  return { family, tools };
}

/** A tool calibrated on the given dates with the given as-found readings at one check point (nominal 0.500 in, MPE 0.0001 in). */
export async function makeDriftingTool(db: Db, series: { date: string; asFound: string }[], intervalDays = 365) {
  const tool = await makeTool(db, { intervalDays });
  for (const s of series) {
    await makeCalibration(db, tool.id, { performedAt: noonUtc(s.date), nextDueAt: addDays(s.date, intervalDays), intervalDays }, [{ nominal: "0.500", asFound: s.asFound }]);
  }
  return tool;
}

export async function makeHold(db: Db, toolId: string, placedAt: Date, reason = "Dropped on the floor") {
  const [h] = await db.insert(holds).values({ toolId, placedAt, reason }).returning();
  return h;
}

/** A check sheet (job) on a minimal limits table, optionally with readings and a sign-off. */
export async function makeJob(db: Db, opts: { openedBy?: string; readingsBy?: string; readings?: number; signedBy?: string; at?: Date } = {}) {
  const at = opts.at ?? new Date("2026-06-10T15:00:00Z");
  const [table] = await db.insert(limitTables).values({ name: `Demo limits ${uid()}`, engineModel: "HF-360 (demo)", unit: "in", sourceDocument: "Demo manual", sourceRevision: "A", isDemo: true }).returning();
  const [job] = await db.insert(jobs).values({ limitTableId: table.id, engineSerial: `HF-${uid()}`, engineModel: "HF-360 (demo)", openedBy: opts.openedBy ?? null, openedAt: at }).returning();
  for (let i = 0; i < (opts.readings ?? 0); i++) {
    await db.insert(readings).values({ jobId: job.id, itemKey: "pin_dia", index: i + 1, values: ["0.9990", "0.9991"], unit: "in", size: "0.9990", verdict: "within_limits", takenBy: opts.readingsBy ?? null, takenAt: at });
  }
  if (opts.signedBy) await db.insert(jobSignoffs).values({ jobId: job.id, inspectorId: opts.signedBy, certificateNumber: "IA-DEMO-1", signedAt: at });
  return job;
}

/** An open investigation on a tool with `pending` affected items that have no disposition yet. */
export async function makeOpenInvestigation(db: Db, toolId: string, pending = 1) {
  const [inv] = await db
    .insert(investigations)
    .values({ toolId, trigger: "as_found_failure", openedAt: new Date("2026-06-01T15:00:00Z"), windowEnd: new Date("2026-06-01T15:00:00Z") })
    .returning();
  for (let i = 0; i < pending; i++) await db.insert(investigationItems).values({ investigationId: inv.id, toolId, verdictCouldChange: true, basis: "demo" });
  return inv;
}
