import { inArray } from "drizzle-orm";
import type { SeedContext } from "./seed-context";
import { fixedClock } from "../platform/clock";
import { tools, checkouts } from "../db/schema";
import { limitTablesService } from "../modules/limit-tables/limit-tables.service";
import { jobsService } from "../modules/jobs/jobs.service";
import { readingsService } from "../modules/readings/readings.service";
import { statusContext, statusesFor } from "../modules/tools/tool-status.service";
import { CreateLimitTableSchema, type LimitItemInput } from "../../shared/limit-tables/limit-tables.schemas";
import { CreateReadingSchema, type CreateReadingInput } from "../../shared/readings/readings.schemas";
import type { SessionUser } from "../http/route";
import type { UserRow } from "../modules/users/users.repository";

// An invented engine (Harrow HF-360, flat six) and an invented table of limits for its cylinder and valve-train
// section. Every number here is made up for the demonstration and labelled demo in the product.
const CYL = 6;
const VALVES = 12; // six cylinders × intake and exhaust

export const HF360_ITEMS: LimitItemInput[] = [
  { key: "barrel_visual", label: "Cylinder barrel: scoring, corrosion, cracked fins", section: "Cylinder barrel", kind: "visual", repeat: CYL },
  { key: "barrel_bore_top", label: "Barrel bore, top of ring travel", section: "Cylinder barrel", kind: "bore", min: 5.25, max: 5.252, serviceableMax: 5.256, repeat: CYL, toolKinds: ["telescoping_gauge", "inside_micrometer"], note: "Taper = top − bottom of ring travel; out-of-round shows on each reading." },
  { key: "barrel_bore_bottom", label: "Barrel bore, bottom of ring travel", section: "Cylinder barrel", kind: "bore", min: 5.25, max: 5.252, serviceableMax: 5.256, repeat: CYL, toolKinds: ["telescoping_gauge", "inside_micrometer"] },
  { key: "pin_dia", label: "Piston pin dia.", section: "Piston and pin", kind: "journal", min: 0.8745, max: 0.875, serviceableMin: 0.874, repeat: CYL, toolKinds: ["outside_micrometer"] },
  { key: "pin_bore", label: "Piston pin bore", section: "Piston and pin", kind: "bore", min: 0.8752, max: 0.8758, serviceableMax: 0.8763, repeat: CYL, toolKinds: ["telescoping_gauge", "small_hole_gauge", "inside_micrometer"] },
  { key: "pin_clearance", label: "Pin to piston clearance", section: "Piston and pin", kind: "clearance", boreKey: "pin_bore", journalKey: "pin_dia", min: 0.0002, max: 0.0013, serviceableMax: 0.002, repeat: CYL },
  { key: "stem_dia", label: "Valve stem dia. (odd = intake, even = exhaust)", section: "Valves and guides", kind: "journal", min: 0.4335, max: 0.434, serviceableMin: 0.4328, repeat: VALVES, toolKinds: ["outside_micrometer"] },
  { key: "guide_bore", label: "Valve guide bore", section: "Valves and guides", kind: "bore", min: 0.436, max: 0.437, serviceableMax: 0.4385, repeat: VALVES, toolKinds: ["small_hole_gauge", "inside_micrometer"] },
  { key: "stem_guide_clearance", label: "Stem to guide clearance", section: "Valves and guides", kind: "clearance", boreKey: "guide_bore", journalKey: "stem_dia", min: 0.002, max: 0.0035, serviceableMax: 0.005, repeat: VALVES },
  { key: "valve_face_visual", label: "Valve faces and seats", section: "Valves and guides", kind: "visual", repeat: 1 },
  { key: "ring_gap_top", label: "Top compression ring end gap (in barrel)", section: "Rings", kind: "feeler", min: 0.018, max: 0.023, repeat: CYL },
  { key: "ring_side_top", label: "Top compression ring side clearance", section: "Rings", kind: "feeler", min: 0.0045, max: 0.0065, repeat: CYL },
];

const DAY = 86_400_000;
const sessionUser = (u: UserRow): SessionUser => ({ id: u.id, email: u.email, name: u.name, role: u.role });
const r4 = (x: number) => Number(x.toFixed(4));

/** Values invented to look like a worn but mostly serviceable engine; `n` varies them place by place. */
function readingFor(key: string, n: number): CreateReadingInput | null {
  const w = ((n * 7) % 5) / 10_000; // 0–0.0004 of wear, repeatable
  switch (key) {
    case "barrel_visual":
      return { itemKey: key, index: n, visualResult: "serviceable", finding: n === 4 ? "Light vertical scratches, within the manual's description" : undefined };
    case "barrel_bore_top":
      return { itemKey: key, index: n, values: [r4(5.2512 + w), r4(5.2509 + w)], toolAssetTags: ["TEL-0101", "MIC-0105"] };
    case "barrel_bore_bottom":
      return { itemKey: key, index: n, values: [r4(5.2504 + w / 2), r4(5.2503 + w / 2)], toolAssetTags: ["TEL-0101", "MIC-0105"] };
    case "pin_dia":
      return { itemKey: key, index: n, values: [r4(0.8749 - w / 2), r4(0.8748 - w / 2)], toolAssetTags: [n % 2 ? "MIC-0104" : "MIC-0101"] };
    case "pin_bore":
      return { itemKey: key, index: n, values: [r4(0.8754 + w), r4(0.8755 + w)], toolAssetTags: ["TEL-0101", "MIC-0101"] };
    case "stem_dia":
      return { itemKey: key, index: n, values: [r4(0.4338 - w / 2), r4(0.4337 - w / 2)], toolAssetTags: [n % 3 === 0 ? "MIC-0104" : "MIC-0101"] };
    case "guide_bore":
      // Exhaust guide no. 8 is worn past the serviceable limit: the sheet shows it outside limits.
      return { itemKey: key, index: n, values: n === 8 ? [0.4391, 0.4388] : [r4(0.4364 + w), r4(0.4366 + w)], toolAssetTags: ["SHG-0101", "MIC-0101"] };
    case "valve_face_visual":
      return { itemKey: key, index: n, visualResult: "serviceable" };
    case "ring_gap_top":
    case "ring_side_top":
      return { itemKey: key, index: n, toolAssetTags: ["FLR-0101"], goEntered: true, noGoEntered: false };
    default:
      return null;
  }
}

export async function seedInspection(ctx: SeedContext): Promise<void> {
  const { db, config } = ctx;
  const now = ctx.clock.now();
  const quality = sessionUser(ctx.users.quality);
  const mechanic = sessionUser(ctx.users.mechanic);
  const inspector = sessionUser(ctx.users.inspector);

  const tags = ["MIC-0101", "MIC-0104", "MIC-0105", "TEL-0101", "SHG-0101", "FLR-0101"];
  const found = await db.select().from(tools).where(inArray(tools.assetTag, tags));
  const missing = tags.filter((t) => !found.some((f) => f.assetTag === t));
  if (missing.length) throw new Error(`Inspection seed needs the register's demo tools: ${missing.join(", ")} missing`);

  const past = new Date(now.getTime() - 21 * DAY);
  past.setUTCHours(14, 30, 0, 0);
  const sctx = await statusContext(db, config.SHOP_TIME_ZONE);
  const usedAt: [Date, string, string[]][] = [
    [past, "three weeks ago", tags],
    [now, "now", tags.filter((t) => t !== "MIC-0105")],
  ];
  for (const [when, label, needed] of usedAt) {
    const st = await statusesFor(db, found.filter((f) => needed.includes(f.assetTag)).map((f) => f.id), when, sctx);
    const bad = [...st.values()].filter((s) => !s.usableForAcceptance);
    if (bad.length) throw new Error(`Inspection seed: tools not usable ${label}: ${bad.map((b) => `${b.assetTag} (${b.status})`).join(", ")}`);
  }

  const tableClock = fixedClock(new Date(now.getTime() - 120 * DAY));
  const table = await limitTablesService({ db, clock: tableClock }).create(
    CreateLimitTableSchema.parse({
      name: "HF-360 cylinder and valve train — table of limits (demo)",
      engineModel: "Harrow HF-360 (demo, invented)",
      unit: "in",
      sourceDocument: "HF-360 overhaul manual (invented), section 7 table of limits",
      sourceRevision: "D-3 (demo)",
      isDemo: true,
      items: HF360_ITEMS,
    }),
    quality.id,
  );

  // The past job: the crib had issued the bench tools to the mechanic that morning and took them back at the end of the shift.
  const shift = { issuedAt: new Date(past.getTime() - 60 * 60_000), dueBackAt: new Date(past.getTime() + 8 * 3600_000), returnedAt: new Date(past.getTime() + 7 * 3600_000) };
  await db.insert(checkouts).values(
    found.filter((f) => ["MIC-0104", "MIC-0105", "TEL-0101", "FLR-0101"].includes(f.assetTag)).map((f) => ({ toolId: f.id, userId: mechanic.id, issuedBy: ctx.users.crib.id, ...shift, returnedBy: ctx.users.crib.id, returnCondition: "ok" as const, engineSerial: "HF360-D-40217", workOrder: "WO-DEMO-2291" })),
  );

  const pastClock = fixedClock(past);
  const done = await jobsService({ db, clock: pastClock }).create({ limitTableId: table.id, engineSerial: "HF360-D-40217", workOrder: "WO-DEMO-2291" }, mechanic);
  const pastReadings = readingsService({ db, clock: pastClock, config });
  for (const item of HF360_ITEMS) {
    for (let i = 1; i <= (item.repeat ?? 1); i++) {
      const input = readingFor(item.key, i);
      if (!input) continue;
      pastClock.set(new Date(pastClock.now().getTime() + 2 * 60_000));
      await pastReadings.create(done.id, CreateReadingSchema.parse(input), mechanic);
    }
  }
  pastClock.set(new Date(past.getTime() + 6 * 3600_000));
  await jobsService({ db, clock: pastClock }).sign(done.id, { certificateNumber: ctx.users.inspector.certificateNumber ?? "IA-DEMO-40817", note: "Exhaust guide no. 8 beyond serviceable limit: guide replaced under WO-DEMO-2291 (demo)." }, inspector);

  // Today's job, half measured: pins and some stems so far; MIC-0104 is on the bench but was never issued to the mechanic.
  const todayClock = fixedClock(new Date(now.getTime() - 3 * 3600_000));
  const open = await jobsService({ db, clock: todayClock }).create({ limitTableId: table.id, engineSerial: "HF360-D-40388", workOrder: "WO-DEMO-2307" }, mechanic);
  const todayReadings = readingsService({ db, clock: todayClock, config });
  const todo: [string, number][] = [
    ["barrel_visual", 1],
    ["barrel_visual", 2],
    ["pin_dia", 1],
    ["pin_bore", 1],
    ["pin_dia", 2],
    ["pin_bore", 2],
    ["stem_dia", 1],
    ["guide_bore", 1],
    ["stem_dia", 2],
    ["ring_side_top", 1],
  ];
  for (const [key, i] of todo) {
    todayClock.set(new Date(todayClock.now().getTime() + 4 * 60_000));
    const input = readingFor(key, i)!;
    // Today the crib has MIC-0101 and SHG-0101 out to the mechanic; pin no. 1 is read on MIC-0104 from the bench (flagged not_in_custody).
    const tagsToday = input.toolAssetTags?.map((t) => (t === "MIC-0104" && !(key === "pin_dia" && i === 1) ? "MIC-0101" : t === "MIC-0105" ? "MIC-0101" : t));
    await todayReadings.create(open.id, CreateReadingSchema.parse({ ...input, toolAssetTags: tagsToday }), mechanic);
  }

  ctx.shared.inspection = { limitTableId: table.id, signedJobId: done.id, openJobId: open.id };
  ctx.shared.signedJobId = done.id;
  ctx.shared.openJobId = open.id;
}
