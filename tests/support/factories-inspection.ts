import type { Db } from "../../server/db/client";
import { fixedClock } from "../../server/platform/clock";
import { calibrationPoints, jobs, setElements } from "../../server/db/schema";
import { limitTablesService } from "../../server/modules/limit-tables/limit-tables.service";
import { CreateLimitTableSchema, type CreateLimitTableInput, type LimitItemInput } from "../../shared/limit-tables/limit-tables.schemas";
import type { ToolKind } from "../../shared/families/families.schemas";
import { makeCalibration, makeCheckout, makeFamily, makeFeelerSet, makeTool } from "./factories";

// Factories for the inspection tests: limits tables, tools in calibration, jobs.
let n = 0;
const next = () => `${Date.now().toString(36).slice(-4)}${++n}`.toUpperCase();

/** A limits table through the same service (and schema) the API uses. */
export async function makeLimitTable(db: Db, over: Partial<CreateLimitTableInput> & { items: LimitItemInput[] }) {
  const input = CreateLimitTableSchema.parse({
    name: `Cylinder section ${next()}`,
    engineModel: "Test flat-four (invented)",
    unit: "in",
    sourceDocument: "Invented overhaul manual, table of limits",
    sourceRevision: "A",
    isDemo: true,
    ...over,
  });
  return limitTablesService({ db, clock: fixedClock("2026-06-01T12:00:00Z") }).create(input, null);
}

/** The pin-and-bore pair of the shop-practice example: inch limits, clearance 0.0010–0.0045 in (demo limits), serviceable 0.0050. */
export const pinAndBoreItems: LimitItemInput[] = [
  { key: "pin", label: "Piston pin dia.", section: "Piston and pin", kind: "journal", min: 1.124, max: 1.125, directions: 2, repeat: 2, toolKinds: ["outside_micrometer"] },
  { key: "pin_bore", label: "Piston pin bore", section: "Piston and pin", kind: "bore", min: 1.1265, max: 1.128, serviceableMax: 1.1295, directions: 2, repeat: 2, toolKinds: ["telescoping_gauge", "small_hole_gauge", "inside_micrometer"] },
  { key: "pin_clearance", label: "Pin to piston clearance", section: "Piston and pin", kind: "clearance", boreKey: "pin_bore", journalKey: "pin", min: 0.001, max: 0.0045, serviceableMax: 0.005, repeat: 2 },
];

/** A tool of the given kind, calibrated on 2026-05-01 and due 2027-04-30 (in calibration on the tests' 2026-06-15). */
export async function makeToolInCalibration(
  db: Db,
  opts: { kind?: ToolKind; unit?: "in" | "mm"; rangeMin?: string; rangeMax?: string; resolution?: string; ownerUserId?: string; nextDueAt?: string; performedAt?: string } = {},
) {
  const kind = opts.kind ?? "outside_micrometer";
  const unit = opts.unit ?? "in";
  const fam = await makeFamily(db, { kind, unit, name: `${kind} ${unit} ${next()}` });
  const tool = await makeTool(db, {
    familyId: fam.id,
    assetTag: `${kind.slice(0, 3).toUpperCase()}-${next()}`,
    description: `${kind.replace(/_/g, " ")} ${opts.rangeMin ?? "1"}–${opts.rangeMax ?? "2"} ${unit}`,
    unit,
    rangeMin: opts.rangeMin ?? "1",
    rangeMax: opts.rangeMax ?? "2",
    resolution: opts.resolution ?? (unit === "in" ? "0.0001" : "0.001"),
    ownerType: opts.ownerUserId ? "personal" : "shop",
    ownerUserId: opts.ownerUserId ?? null,
  });
  await makeCalibration(db, tool.id, { performedAt: new Date(opts.performedAt ?? "2026-05-01T15:00:00Z"), nextDueAt: opts.nextDueAt ?? "2027-04-30" });
  return tool;
}

/** A feeler set in calibration; `rejected` leaves failed its last calibration, `calibrated` gives measured thicknesses. */
export async function makeFeelerSetInCalibration(db: Db, leaves: string[], opts: { rejected?: string[]; calibrated?: Record<string, string> } = {}) {
  const { tool, elements } = await makeFeelerSet(db, leaves, { assetTag: `FLR-${next()}` });
  const cal = await makeCalibration(db, tool.id, { performedAt: new Date("2026-05-01T15:00:00Z"), nextDueAt: "2027-04-30" }, [{ nominal: leaves[0], asFound: leaves[0] }]);
  await db.insert(calibrationPoints).values(
    elements.map((e: typeof setElements.$inferSelect, i: number) => {
      const measured = opts.calibrated?.[e.label] ?? e.nominal;
      const fail = opts.rejected?.includes(e.label) ?? false;
      return {
        calibrationId: cal.id,
        seq: 100 + i,
        elementId: e.id,
        nominal: e.nominal,
        reference: e.nominal,
        asFound: measured,
        errorAsFound: "0",
        mpe: "0.0002",
        asFoundInTolerance: !fail,
        verdict: fail ? ("fail" as const) : ("pass" as const),
      };
    }),
  );
  return { tool, elements };
}

/** A job straight in the database (the API test of opening a job goes through POST /api/jobs). */
export async function makeJob(db: Db, limitTableId: string, openedBy: string, over: Partial<typeof jobs.$inferInsert> = {}) {
  const [row] = await db
    .insert(jobs)
    .values({ limitTableId, engineSerial: `SN-${next()}`, engineModel: "Test flat-four (invented)", openedBy, openedAt: new Date("2026-06-15T14:00:00Z"), ...over })
    .returning();
  return row;
}

/** A pin-and-bore sheet opened by a mechanic, with a 1–2 in micrometer and a telescoping gauge, both issued to them. */
export async function makePinSheet(db: Db, mechanicId: string) {
  const table = await makeLimitTable(db, { items: pinAndBoreItems });
  const job = await makeJob(db, table.id, mechanicId);
  const mic = await makeToolInCalibration(db, { rangeMin: "1", rangeMax: "2" });
  const tel = await makeToolInCalibration(db, { kind: "telescoping_gauge", rangeMin: "0.3125", rangeMax: "6" });
  await makeCheckout(db, mic.id, mechanicId);
  await makeCheckout(db, tel.id, mechanicId);
  return { table, job, mic, tel };
}
