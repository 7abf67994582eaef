import { and, eq, inArray, isNull } from "drizzle-orm";
import type { SeedContext } from "./seed-context";
import { fixedClock } from "../platform/clock";
import { tools, checkouts, setElements } from "../db/schema";
import { limitTablesService } from "../modules/limit-tables/limit-tables.service";
import { jobsService } from "../modules/jobs/jobs.service";
import { readingsService } from "../modules/readings/readings.service";
import { readingsRepository } from "../modules/readings/readings.repository";
import { judgeStoredReadings } from "../modules/readings/reading-judgements.service";
import { recordAudit } from "../modules/audit/audit.repository";
import { statusContext, statusesFor } from "../modules/tools/tool-status.service";
import { CreateLimitTableSchema, type LimitItemInput } from "../../shared/limit-tables/limit-tables.schemas";
import { CreateReadingSchema, type CreateReadingInput } from "../../shared/readings/readings.schemas";
import type { SessionUser } from "../http/route";
import type { UserRow } from "../modules/users/users.repository";

// An invented engine (Harrow HF-360, flat six) and an invented table of limits for its cylinder and valve-train
// section. Every number here is made up for the demonstration and labelled demo in the product.
const CYL = 6;
const VALVES = 12; // six cylinders × intake and exhaust
const STEEL = 0.0000115; // per kelvin (NIST J. Res.; ISO 3650, from memory)
const CAST_ALUMINIUM = 0.0000215; // 356.0 cast (Callister App. B): the piston

export const HF360_ITEMS: LimitItemInput[] = [
  { key: "barrel_visual", label: "Cylinder barrel: scoring, corrosion, cracked fins", section: "Cylinder barrel", kind: "visual", repeat: CYL },
  { key: "barrel_bore_top", label: "Barrel bore, top of ring travel", section: "Cylinder barrel", kind: "bore", min: 5.25, max: 5.252, serviceableMax: 5.256, outOfRoundMax: 0.0012, repeat: CYL, toolKinds: ["telescoping_gauge", "inside_micrometer"], note: "Read thrust-to-thrust (direction 1) and pin-to-pin (direction 2), the same way at both stations." },
  { key: "barrel_bore_bottom", label: "Barrel bore, bottom of ring travel", section: "Cylinder barrel", kind: "bore", min: 5.25, max: 5.252, serviceableMax: 5.256, outOfRoundMax: 0.0012, repeat: CYL, toolKinds: ["telescoping_gauge", "inside_micrometer"] },
  { key: "barrel_taper", label: "Barrel taper (top − bottom of ring travel)", section: "Cylinder barrel", kind: "taper", stationKeys: ["barrel_bore_top", "barrel_bore_bottom"], max: 0.0012, repeat: CYL },
  { key: "pin_dia", label: "Piston pin dia.", section: "Piston and pin", kind: "journal", min: 0.8745, max: 0.875, serviceableMin: 0.874, repeat: CYL, toolKinds: ["outside_micrometer"] },
  { key: "pin_bore", label: "Piston pin bore (aluminium piston)", section: "Piston and pin", kind: "bore", min: 0.8752, max: 0.8758, serviceableMax: 0.8763, expansionPerK: CAST_ALUMINIUM, repeat: CYL, toolKinds: ["telescoping_gauge", "small_hole_gauge", "inside_micrometer"], note: "Measure the piston cold; a warm piston is judged at 20 °C when its temperature is recorded." },
  { key: "pin_clearance", label: "Pin to piston clearance", section: "Piston and pin", kind: "clearance", boreKey: "pin_bore", journalKey: "pin_dia", min: 0.0003, max: 0.0013, serviceableMax: 0.002, repeat: CYL },
  { key: "stem_dia", label: "Valve stem dia. (odd = intake, even = exhaust)", section: "Valves and guides", kind: "journal", min: 0.4335, max: 0.434, serviceableMin: 0.4328, repeat: VALVES, toolKinds: ["outside_micrometer"] },
  { key: "guide_bore", label: "Valve guide bore", section: "Valves and guides", kind: "bore", min: 0.436, max: 0.437, serviceableMax: 0.4385, repeat: VALVES, toolKinds: ["small_hole_gauge", "inside_micrometer"] },
  { key: "stem_guide_clearance", label: "Stem to guide clearance", section: "Valves and guides", kind: "clearance", boreKey: "guide_bore", journalKey: "stem_dia", min: 0.002, max: 0.0035, serviceableMax: 0.005, repeat: VALVES },
  { key: "rocker_shaft", label: "Rocker shaft at the rocker seat", section: "Valves and guides", kind: "journal", min: 0.749, max: 0.7495, serviceableMin: 0.7485, repeat: VALVES, toolKinds: ["outside_micrometer"] },
  { key: "rocker_bushing", label: "Rocker arm bushing", section: "Valves and guides", kind: "bore", min: 0.75, max: 0.7506, serviceableMax: 0.7512, repeat: VALVES, toolKinds: ["telescoping_gauge", "inside_micrometer"] },
  { key: "rocker_clearance", label: "Rocker bushing to shaft clearance", section: "Valves and guides", kind: "clearance", boreKey: "rocker_bushing", journalKey: "rocker_shaft", radial: true, min: 0.0003, max: 0.0008, serviceableMax: 0.0012, repeat: VALVES, note: "The manual gives this clearance radial (per side)." },
  { key: "valve_face_visual", label: "Valve faces and seats", section: "Valves and guides", kind: "visual", repeat: 1 },
  { key: "ring_gap_top", label: "Top compression ring end gap (in barrel)", section: "Rings", kind: "feeler", min: 0.018, max: 0.023, repeat: CYL },
  { key: "ring_side_top", label: "Top compression ring side clearance", section: "Rings", kind: "feeler", min: 0.0045, max: 0.0065, repeat: CYL },
  { key: "ring_side_second", label: "Second ring side clearance", section: "Rings", kind: "feeler", min: 0.003, max: 0.0033, repeat: CYL, note: "A narrow band: most sets cannot make a go and a no-go inside it; record the thickest leaf that enters." },
];

const DAY = 86_400_000;
const sessionUser = (u: UserRow): SessionUser => ({ id: u.id, email: u.email, name: u.name, role: u.role });
const r4 = (x: number) => Number(x.toFixed(4));

/**
 * Values invented to look like a worn but mostly serviceable engine; `n` varies them place by place. The signed job
 * (`job: "signed"`) carries one place caught by each judging rule: a pin read over its maximum in one direction (no. 2),
 * a pin fit too tight at its tightest pairing (no. 4), a barrel out of round (no. 3) and one tapered (no. 5), a warm
 * piston's pin bore under its minimum at 20 °C (no. 6), a rocker bushing under its radial minimum (no. 9) — and one
 * accepted on its radial limits that diametral figures would have rejected (no. 7). Guide no. 8 is worn out.
 */
function readingFor(key: string, n: number, job: "signed" | "open"): CreateReadingInput | null {
  const w = ((n * 7) % 5) / 10_000; // 0–0.0004 of wear, repeatable
  const signed = job === "signed";
  switch (key) {
    case "barrel_visual":
      return { itemKey: key, index: n, visualResult: "serviceable", finding: n === 4 ? "Light vertical scratches, within the manual's description" : undefined };
    case "barrel_bore_top": {
      const values = signed && n === 3 ? [5.2519, 5.2504] : signed && n === 5 ? [5.2519, 5.2517] : [r4(5.2512 + w), r4(5.2509 + w)];
      return { itemKey: key, index: n, values, toolAssetTags: ["TEL-0101", "MIC-0105"] };
    }
    case "barrel_bore_bottom": {
      const values = signed && n === 3 ? [5.2512, 5.2503] : signed && n === 5 ? [5.2503, 5.2502] : [r4(5.2504 + w / 2), r4(5.2503 + w / 2)];
      return { itemKey: key, index: n, values, toolAssetTags: ["TEL-0101", "MIC-0105"] };
    }
    case "pin_dia": {
      const values = signed && n === 2 ? [0.8751, 0.8746] : signed && n === 4 ? [0.875, 0.8746] : [r4(0.8749 - w / 2), r4(0.8748 - w / 2)];
      return { itemKey: key, index: n, values, toolAssetTags: [n % 2 ? "MIC-0104" : "MIC-0101"] };
    }
    case "pin_bore": {
      if (signed && n === 4) return { itemKey: key, index: n, values: [0.8752, 0.8757], toolAssetTags: ["TEL-0101", "MIC-0101"] };
      // Piston no. 6 came warm from the washer: 30 °C, read with a gauge and micrometer at 20 °C.
      if (signed && n === 6) return { itemKey: key, index: n, values: [0.8753, 0.8754], toolAssetTags: ["TEL-0101", "MIC-0101"], temperatureC: 30, toolTemperatureC: 20 };
      const warm = !signed && n === 2 ? { temperatureC: 24 } : {};
      return { itemKey: key, index: n, values: [r4(0.8754 + w), r4(0.8755 + w)], toolAssetTags: ["TEL-0101", "MIC-0101"], ...warm };
    }
    case "stem_dia": {
      // Exhaust stem no. 6 is worn into its serviceable band, well clear of every limit.
      const values = signed && n === 6 ? [0.4334, 0.4333] : [r4(0.4338 - w / 2), r4(0.4337 - w / 2)];
      return { itemKey: key, index: n, values, toolAssetTags: [n % 3 === 0 ? "MIC-0104" : "MIC-0101"] };
    }
    case "guide_bore":
      // Exhaust guide no. 8 is worn past the serviceable limit: the sheet shows it outside limits.
      return { itemKey: key, index: n, values: n === 8 ? [0.4391, 0.4388] : [r4(0.4364 + w), r4(0.4366 + w)], toolAssetTags: ["SHG-0101", "MIC-0101"] };
    case "rocker_shaft": {
      const values = n === 7 ? [0.749, 0.7491] : signed && n === 9 ? [0.7495, 0.7494] : [r4(0.7494 - w / 2), r4(0.7493 - w / 2)];
      return { itemKey: key, index: n, values, toolAssetTags: ["MIC-0101"] };
    }
    case "rocker_bushing": {
      const values = n === 7 ? [0.7511, 0.7509] : signed && n === 9 ? [0.75, 0.7501] : [r4(0.7503 + w / 2), r4(0.7504 + w / 2)];
      return { itemKey: key, index: n, values, toolAssetTags: ["TEL-0101", "MIC-0101"] };
    }
    case "valve_face_visual":
      return { itemKey: key, index: n, visualResult: "serviceable" };
    case "ring_gap_top":
    case "ring_side_top":
      return { itemKey: key, index: n, toolAssetTags: ["FLR-0101"], goEntered: true, noGoEntered: false };
    default:
      return null;
  }
}

// The signed job's feeler checks were recorded before leaves were chosen inside the limits (judging rules 1): the go
// one leaf under the minimum, the no-go one over the maximum. They are kept as recorded and judged again.
const RULES_1_LEAVES: Record<string, { go: string; noGo: string }> = {
  ring_gap_top: { go: "0.015", noGo: "0.025" },
  ring_side_top: { go: "0.003", noGo: "0.007" },
  ring_side_second: { go: "0.002", noGo: "0.005" },
};

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
      expansionPerK: STEEL,
      items: HF360_ITEMS,
    }),
    quality.id,
  );

  // The past job: the crib had issued every tool the sheet names to the mechanic that morning, an hour before the first
  // reading, and took them back at the end of the shift — so none of its readings is flagged "not issued to the reader".
  const shift = { issuedAt: new Date(past.getTime() - 60 * 60_000), dueBackAt: new Date(past.getTime() + 8 * 3600_000), returnedAt: new Date(past.getTime() + 7 * 3600_000) };
  await db.insert(checkouts).values(
    found.map((f) => ({ toolId: f.id, userId: mechanic.id, issuedBy: ctx.users.crib.id, ...shift, returnedBy: ctx.users.crib.id, returnCondition: "ok" as const, engineSerial: "HF360-D-40217", workOrder: "WO-DEMO-2291" })),
  );

  const pastClock = fixedClock(past);
  const done = await jobsService({ db, clock: pastClock }).create({ limitTableId: table.id, engineSerial: "HF360-D-40217", workOrder: "WO-DEMO-2291" }, mechanic);
  const pastReadings = readingsService({ db, clock: pastClock, config });
  const flr = found.find((f) => f.assetTag === "FLR-0101")!;
  const flrLeaves = await db.select().from(setElements).where(eq(setElements.toolId, flr.id));
  for (const item of HF360_ITEMS) {
    for (let i = 1; i <= (item.repeat ?? 1); i++) {
      pastClock.set(new Date(pastClock.now().getTime() + 2 * 60_000));
      if (item.kind === "feeler") {
        await recordUnderRules1(item.key, i, pastClock.now());
        continue;
      }
      const input = readingFor(item.key, i, "signed");
      if (!input) continue;
      await pastReadings.create(done.id, CreateReadingSchema.parse(input), mechanic);
    }
  }

  /** A feeler check as the sheet recorded it under judging rules 1: go entered, no-go did not, so "within limits". */
  async function recordUnderRules1(itemKey: string, index: number, at: Date) {
    const pick = RULES_1_LEAVES[itemKey];
    const go = flrLeaves.find((l) => l.label === pick.go);
    const noGo = flrLeaves.find((l) => l.label === pick.noGo);
    if (!go || !noGo) throw new Error(`Inspection seed: FLR-0101 has no leaf ${!go ? pick.go : pick.noGo}`);
    const st = (await statusesFor(db, [flr.id], at, sctx)).get(flr.id)!;
    const row = await readingsRepository.insert(
      db,
      { jobId: done.id, itemKey, index, values: [], unit: "in", goEntered: true, noGoEntered: false, goLeafId: go.id, noGoLeafId: noGo.id, verdict: "within_limits", flags: [], takenBy: mechanic.id, takenAt: at },
      [{ toolId: flr.id, position: 1, statusAtReading: st.status, dueAtReading: st.dueAt, takenAt: at }],
    );
    await recordAudit(db, { actorId: mechanic.id, action: "reading.create", entityType: "reading", entityId: row.id, after: { jobId: done.id, itemKey, index, tools: ["FLR-0101"], go: pick.go, noGo: pick.noGo }, at });
  }
  pastClock.set(new Date(past.getTime() + 6 * 3600_000));
  // The inspector signs with the certificate number on her record, as the sign-off requires.
  const certificateNumber = ctx.users.inspector.certificateNumber;
  if (!certificateNumber) throw new Error("Inspection seed: the demo inspector has no certificate number on record");
  await jobsService({ db, clock: pastClock }).sign(
    done.id,
    {
      certificateNumber,
      note:
        "Rejected and replaced under WO-DEMO-2291 (demo): exhaust guide no. 8 (worn beyond serviceable); piston pin no. 2 (over size in one direction) and no. 4 (fit too tight); " +
        "cylinder no. 3 (out of round) and no. 5 (taper); piston no. 6 (pin bore under size at 20 °C); rocker bushing no. 9 (radial clearance under minimum).",
    },
    inspector,
  );

  // Today's job, half measured: pins and some stems so far; MIC-0104 is on the bench but was never issued to the mechanic.
  // The readings start after the crib issued today's tools to the mechanic (the crib seed's morning issue), so only the
  // reading taken on the bench micrometer carries "not issued to the reader".
  const issuedToday = await db
    .select({ issuedAt: checkouts.issuedAt })
    .from(checkouts)
    .where(and(inArray(checkouts.toolId, found.filter((f) => ["MIC-0101", "SHG-0101"].includes(f.assetTag)).map((f) => f.id)), eq(checkouts.userId, mechanic.id), isNull(checkouts.returnedAt)));
  const lastIssue = Math.max(0, ...issuedToday.map((c) => c.issuedAt.getTime()));
  // The gauge and the feeler set for today's bores and rings go out with them, so their readings are the mechanic's too.
  const morningOut = issuedToday.length ? (await db.select().from(checkouts).where(and(eq(checkouts.userId, mechanic.id), isNull(checkouts.returnedAt), eq(checkouts.issuedAt, new Date(lastIssue)))))[0] : undefined;
  if (morningOut) {
    await db.insert(checkouts).values(
      found
        .filter((f) => ["TEL-0101", "FLR-0101"].includes(f.assetTag))
        .map((f) => ({ toolId: f.id, userId: mechanic.id, issuedBy: morningOut.issuedBy, issuedAt: morningOut.issuedAt, dueBackAt: morningOut.dueBackAt, workOrder: "WO-DEMO-2307", engineSerial: "HF360-D-40388" })),
    );
  }
  const todayStart = Math.max(now.getTime() - 3 * 3600_000, Math.min(lastIssue + 5 * 60_000, now.getTime() - 30 * 60_000));
  // Fourteen readings between the start and now, evenly spaced (four minutes apart when there is time for it).
  const step = Math.min(4 * 60_000, Math.floor((now.getTime() - todayStart) / 16));
  const todayClock = fixedClock(new Date(todayStart));
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
    ["rocker_shaft", 7],
    ["rocker_bushing", 7],
    ["ring_side_top", 1],
  ];
  for (const [key, i] of todo) {
    todayClock.set(new Date(todayClock.now().getTime() + step));
    const input = readingFor(key, i, "open")!;
    // Today the crib has MIC-0101 and SHG-0101 out to the mechanic; pin no. 1 is read on MIC-0104 from the bench (flagged not_in_custody).
    const tagsToday = input.toolAssetTags?.map((t) => (t === "MIC-0104" && !(key === "pin_dia" && i === 1) ? "MIC-0101" : t === "MIC-0105" ? "MIC-0101" : t));
    await todayReadings.create(open.id, CreateReadingSchema.parse({ ...input, toolAssetTags: tagsToday }), mechanic);
  }
  // The second ring's narrow band: FLR-0101 cannot make a go and a no-go inside it, so the gap is measured — the thickest leaf that enters.
  const second = await todayReadings.leavesFor(open.id, "ring_side_second", "FLR-0101");
  if (second.mode !== "measured_gap") throw new Error(`Inspection seed: FLR-0101 was expected to need a measured gap on the second ring: ${JSON.stringify(second)}`);
  const entering = [...second.leaves].filter((l) => l.thickness <= 0.0033).at(-1);
  if (!entering) throw new Error("Inspection seed: FLR-0101 has no leaf thin enough for the second ring");
  todayClock.set(new Date(todayClock.now().getTime() + step));
  await todayReadings.create(open.id, CreateReadingSchema.parse({ itemKey: "ring_side_second", index: 1, toolAssetTags: ["FLR-0101"], gapLeafIds: [entering.id] }), mechanic);

  // The readings recorded under judging rules 1 are judged under the current rules, as an upgraded shop's are.
  await judgeStoredReadings({ db, clock: ctx.clock });

  ctx.shared.inspection = { limitTableId: table.id, signedJobId: done.id, openJobId: open.id };
  ctx.shared.signedJobId = done.id;
  ctx.shared.openJobId = open.id;
}
