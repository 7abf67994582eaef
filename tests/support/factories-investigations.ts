import { randomBytes } from "node:crypto";
import type { Db } from "../../server/db/client";
import { calibrationPoints, calibrationStandards, calibrations, intermediateChecks, jobSignoffs, jobs, limitItems, limitTables, readingTools, readings } from "../../server/db/schema";
import { sizeFromValues } from "../../shared/inspection/sizes";
import { dec } from "../../shared/common/decimal";

// Factories for arranging the evidence an investigation looks back over: limits tables, jobs, readings with
// their tools, sign-offs, calibrations with exact as-found points. What a test asserts goes through the API.
const uid = () => randomBytes(3).toString("hex").toUpperCase();

type ItemSpec = {
  key: string;
  label?: string;
  kind: "visual" | "journal" | "bore" | "clearance" | "feeler";
  min?: string;
  max?: string;
  serviceableMin?: string;
  serviceableMax?: string;
  boreKey?: string;
  journalKey?: string;
  repeat?: number;
};

/** Demo limits (invented) for a valve stem in its guide, in inches: the stem, the guide and their clearance. */
export const VALVE_ITEMS: ItemSpec[] = [
  { key: "stem", label: "Exhaust valve stem", kind: "journal", min: "0.4335", max: "0.4340" },
  { key: "guide", label: "Exhaust valve guide", kind: "bore", min: "0.4355", max: "0.4370" },
  { key: "stem_clearance", label: "Stem to guide clearance", kind: "clearance", min: "0.0015", max: "0.0035", boreKey: "guide", journalKey: "stem" },
  { key: "pin", label: "Rocker pin", kind: "journal", min: "0.1000", max: "0.1010" },
];

/**
 * The valve-sheet scenario of the investigation tests (demo values, invented): a micrometer known good in January and
 * found out of tolerance in June, eight valves a sheet, the stems and guides measured on each.
 */
export const VALVE_SCENARIO = {
  now: "2026-06-15T15:00:00Z",
  goodCal: "2026-01-10T15:00:00Z",
  findingAt: "2026-06-15T14:00:00Z",
  valves: 8,
  stems: ["0.4336", "0.4337", "0.4338", "0.4339", "0.4336", "0.4340", "0.4337", "0.4335"],
  guides: ["0.4362", "0.4369", "0.4356", "0.4365", "0.4370", "0.4358", "0.4363", "0.4367"],
} as const;

export async function makeLimitTable(db: Db, items: ItemSpec[] = VALVE_ITEMS, over: Partial<typeof limitTables.$inferInsert> = {}) {
  const [table] = await db
    .insert(limitTables)
    .values({ name: `Demo cylinder limits ${uid()}`, engineModel: "HF-360 (demo)", unit: "in", sourceDocument: "Demo overhaul manual", sourceRevision: "A", isDemo: true, ...over })
    .returning();
  const rows = await db
    .insert(limitItems)
    .values(items.map((i, seq) => ({ limitTableId: table.id, seq: seq + 1, label: i.label ?? i.key, repeat: i.repeat ?? 1, ...i })))
    .returning();
  return { table, items: rows };
}

export async function makeJob(db: Db, limitTableId: string, over: Partial<typeof jobs.$inferInsert> = {}) {
  const [job] = await db
    .insert(jobs)
    .values({ limitTableId, engineSerial: `HF-${uid()}`, engineModel: "HF-360 (demo)", workOrder: `WO-${uid()}`, openedAt: new Date("2026-01-02T14:00:00Z"), ...over })
    .returning();
  return job;
}

/**
 * A reading as the check sheet would have stored it, naming its tools. The size follows the trade rule
 * (journal: smallest value, bore: largest) unless given; the verdict must be given.
 */
export async function makeReading(
  db: Db,
  args: {
    jobId: string;
    itemKey: string;
    kind?: "journal" | "bore";
    values?: string[];
    size?: string | null;
    index?: number;
    verdict?: "within_limits" | "outside_limits" | "pending";
    takenAt: Date | string;
    takenBy?: string | null;
    toolIds: string[];
    overrideReason?: string;
    overrideBy?: string;
    supersedesId?: string;
    unit?: "in" | "mm";
  },
) {
  const takenAt = new Date(args.takenAt);
  const values = args.values ?? [];
  const size = args.size !== undefined ? args.size : values.length && args.kind ? String(sizeFromValues(args.kind, values).size) : null;
  const [reading] = await db
    .insert(readings)
    .values({
      jobId: args.jobId,
      itemKey: args.itemKey,
      index: args.index ?? 1,
      values,
      unit: args.unit ?? "in",
      size,
      verdict: args.verdict ?? "within_limits",
      flags: args.overrideReason ? ["override"] : [],
      takenBy: args.takenBy ?? null,
      takenAt,
      overrideReason: args.overrideReason ?? null,
      overrideBy: args.overrideBy ?? null,
      supersedesId: args.supersedesId ?? null,
      supersedeReason: args.supersedesId ? "Corrected entry" : null,
    })
    .returning();
  if (args.toolIds.length) {
    await db.insert(readingTools).values(args.toolIds.map((toolId, i) => ({ readingId: reading.id, toolId, position: i + 1, statusAtReading: "in_calibration", takenAt })));
  }
  return reading;
}

export async function signJob(db: Db, jobId: string, inspectorId: string, at: Date | string) {
  const [row] = await db.insert(jobSignoffs).values({ jobId, inspectorId, certificateNumber: "IA-TEST-1", signedAt: new Date(at) }).returning();
  return row;
}

/**
 * A calibration with exact as-found points (decimal strings); result and in-tolerance follow from the points
 * against ± mpe unless given. Errors are computed as exact decimals by PostgreSQL.
 */
export async function makeExactCalibration(
  db: Db,
  toolId: string,
  args: {
    performedAt: Date | string;
    points: { nominal: string; asFound: string; asLeft?: string; mpe?: string; uncertainty?: string }[];
    result?: "pass" | "adjusted" | "fail" | "limited";
    standardIds?: string[];
    decisionRule?: "simple" | "guarded";
    performedBy?: string;
  },
) {
  const judged = args.points.map((p) => {
    const mpe = p.mpe ?? "0.0001";
    const err = (x: string) => subtract(x, p.nominal);
    const errorAsFound = err(p.asFound);
    const inTol = Math.abs(Number(errorAsFound)) <= Number(mpe);
    return { ...p, mpe, errorAsFound, errorAsLeft: p.asLeft ? err(p.asLeft) : null, inTol };
  });
  const asFoundInTolerance = judged.every((p) => p.inTol);
  const result = args.result ?? (asFoundInTolerance ? "pass" : judged.every((p) => p.asLeft) ? "adjusted" : "fail");
  const [cal] = await db
    .insert(calibrations)
    .values({
      toolId,
      performedAt: new Date(args.performedAt),
      performedBy: args.performedBy ?? null,
      performedByName: "Test calibrator",
      decisionRule: args.decisionRule ?? "simple",
      result,
      asFoundInTolerance,
      intervalDays: 365,
      nextDueAt: "2027-06-15",
    })
    .returning();
  await db.insert(calibrationPoints).values(
    judged.map((p, i) => ({
      calibrationId: cal.id,
      seq: i + 1,
      nominal: p.nominal,
      reference: p.nominal,
      asFound: p.asFound,
      asLeft: p.asLeft ?? null,
      errorAsFound: p.errorAsFound,
      errorAsLeft: p.errorAsLeft,
      mpe: p.mpe,
      uncertainty: p.uncertainty ?? null,
      asFoundInTolerance: p.inTol,
      verdict: (p.asLeft ? Math.abs(Number(p.errorAsLeft)) <= Number(p.mpe) : p.inTol) ? ("pass" as const) : ("fail" as const),
    })),
  );
  if (args.standardIds?.length) await db.insert(calibrationStandards).values(args.standardIds.map((standardId) => ({ calibrationId: cal.id, standardId })));
  return cal;
}

export async function makeCheck(db: Db, toolId: string, args: { performedAt: Date | string; nominal: string; reading: string; tolerance?: string }) {
  const deviation = subtract(args.reading, args.nominal);
  const tolerance = args.tolerance ?? "0.0001";
  const [row] = await db
    .insert(intermediateChecks)
    .values({ toolId, performedAt: new Date(args.performedAt), nominal: args.nominal, reading: args.reading, deviation, tolerance, passed: Math.abs(Number(deviation)) <= Number(tolerance) })
    .returning();
  return row;
}

/** a − b on decimal strings, exactly. */
const subtract = (a: string, b: string) => dec(a).minus(dec(b)).toString();
