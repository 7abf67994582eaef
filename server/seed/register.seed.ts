import PDFDocument from "pdfkit";
import type { SeedContext } from "./seed-context";
import { DEMO_LABEL } from "./seed-context";
import { fixedClock } from "../platform/clock";
import { familiesService } from "../modules/families/families.service";
import { labsService } from "../modules/labs/labs.service";
import { standardsService } from "../modules/standards/standards.service";
import { toolsService } from "../modules/tools/tools.service";
import { calibrationsService } from "../modules/calibrations/calibrations.service";
import { checksService } from "../modules/checks/checks.service";
import { changeLifecycle } from "../modules/tools/tool-lifecycle.repository";
import { onOutOfToleranceFinding } from "../modules/investigations/investigations.hooks";
import { closeInvestigation } from "../modules/investigations/investigations.service";
import { labShipments } from "../modules/shipments/shipments.table";
import { standardsRepository } from "../modules/standards/standards.repository";
import { getSettings } from "../modules/settings/settings.service";
import { CreateFamilySchema, type CreateFamilyInput } from "../../shared/families/families.schemas";
import { CreateToolSchema, type CreateToolInput } from "../../shared/tools/tools.schemas";
import { CreateStandardSchema, AddCertificateSchema, type CertificateInput } from "../../shared/standards/standards.schemas";
import { CreateLabSchema } from "../../shared/labs/labs.schemas";
import { CreateCalibrationSchema, CreateCheckSchema, type CalibrationPointInput } from "../../shared/calibrations/calibrations.schemas";
import { addDays, calendarDate } from "../../shared/common/dates";
import { dec } from "../../shared/common/decimal";
import { computeCalibration, type ComputeStandard } from "../../shared/calibrations/calibration-compute";
import type { DecisionRule } from "../../shared/calibrations/decision-rules";

// The register of the invented demo shop, Harrow Flats Engine Works: labs,
// reference standards with certificates, families, 60+ tools in every status
// and kind, and two years of calibration history with small as-found drift.
// Everything is invented demo data, relative to ctx.clock, written through the
// same services (and schemas) as the API, each with a clock set to the instant
// it happened. MIC-0104's as-found failure is left to the investigations seed.
// Every ILAC-G8 statement appears: most points pass, readings on a limit are
// conditional passes, and three dial indicators were found out of tolerance in
// the past year (one a conditional fail, from repeated readings), each adjusted
// and its investigation closed; so the dial indicators' interval test says
// "shorten" while the micrometers' says "keep".

const DAY = 86_400_000;
const HOUR = 3_600_000;
const NMI = "National Length Institute of Harrow (demo, invented)";
const ACCREDITOR = "Larchmont Accreditation Council (demo, invented)";
const INCH_MIC = [0.105, 0.21, 0.315, 0.42, 0.5, 0.605, 0.71, 0.815, 0.92, 1.0];
const MM_MIC = [2.5, 5.1, 7.7, 10.3, 12.9, 15.0, 17.6, 20.2, 22.8, 25.0];
const FEELER_LEAVES = [0.0015, 0.002, 0.003, 0.004, 0.005, 0.006, 0.007, 0.008, 0.009, 0.01, 0.012, 0.015, 0.02, 0.025];
/** Blocks of the demo inch set that build every demo check size (invented deviations, µin-sized). */
const INCH_BLOCKS = (
  [
    ["0.100", 0.000002], ["0.105", -0.000001], ["0.110", 0.000001], ["0.115", 0.000002], ["0.120", -0.000002], ["0.125", 0.000001], ["0.200", 0.000003], ["0.250", 0.000001],
    ["0.300", -0.000002], ["0.500", 0.000002], ["0.600", 0.000001], ["0.700", -0.000001], ["0.750", null], ["0.800", 0.000002], ["1.000", -0.000003], ["2.000", 0.000004], ["4.000", -0.000005],
  ] as const
).map(([label, deviation]) => ({ label, nominal: Number(label), deviation }));
/** Blocks of the demo metric set: each micrometer size from one or two blocks; 1.1 mm and 16.5 mm carry no certified value (used within grade 0). */
const MM_BLOCKS = (
  [
    ["1.1", null], ["1.2", 0.00004], ["1.3", -0.00003], ["1.4", 0.00002], ["2.5", 0.00003], ["2.7", -0.00002], ["5", 0.00006], ["5.1", -0.00004],
    ["9", 0.00005], ["10", 0.00005], ["11.5", -0.00006], ["15", 0.00007], ["16.5", null], ["19", -0.00005], ["21.5", 0.00008], ["25", -0.00008],
  ] as const
).map(([label, deviation]) => ({ label, nominal: Number(label), deviation }));

/** Deterministic noise, so every demo shop is seeded the same (mulberry32). */
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const hash = (s: string) => [...s].reduce((h, c) => (Math.imul(h, 31) + c.charCodeAt(0)) | 0, 7);

/** A one-page demo certificate, so the download links show something real. */
function demoPdf(lines: string[]): Promise<Buffer> {
  const doc = new PDFDocument({ size: "A4", margin: 56, info: { Title: lines[0] } });
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on("end", () => resolve(Buffer.concat(chunks))));
  doc.fontSize(16).text(lines[0]).moveDown();
  doc.fontSize(11);
  for (const l of lines.slice(1)) doc.text(l);
  doc.moveDown().fontSize(9).text(`${DEMO_LABEL}: not a real certificate; no real lab, institute or instrument is named.`);
  doc.end();
  return done;
}

type FamilyKey = "mic01" | "mic12" | "mic23" | "mic56" | "mic025mm" | "imic" | "tel" | "shg" | "flr" | "dia" | "cal" | "gbw" | "setw" | "bore";

interface ToolSpec {
  tag: string;
  family: FamilyKey;
  description: string;
  range: [number, number];
  location: string;
  maker?: string;
  model?: string;
  owner?: Pick<CreateToolInput, "ownerType" | "ownerUserId" | "ownerName">;
  calibrationRequired?: boolean;
  elements?: { label: string; nominal: number; grade?: string }[];
  /** Days before now of each in-house calibration, oldest first. */
  history?: number[];
  /** Standards used (asset tags); default by family. */
  standards?: string[];
  intervalDays?: number;
  limited?: { min: number; max: number; note: string };
  notes?: string;
  /** As-found findings out of tolerance, by the calibration's days-ago: the point and what it read (repeat readings give a mean). */
  findings?: Record<number, { nominal: number; readings: number[]; note: string }>;
  /** Decision rule of the latest calibration (default simple). */
  lastRule?: DecisionRule;
}

export async function seedRegister(ctx: SeedContext): Promise<void> {
  const { db, config } = ctx;
  const now = ctx.clock.now();
  const tz = (await getSettings(db, config.SHOP_TIME_ZONE)).shopTimeZone;
  const today = calendarDate(now, tz);
  const quality = ctx.users.quality;
  const crib = ctx.users.crib;
  const ago = (days: number, hours = 0) => new Date(now.getTime() - days * DAY - hours * HOUR);
  const dateAgo = (days: number) => addDays(today, -days);
  const deps = (at: Date) => ({ db, clock: fixedClock(at), mailer: ctx.mailer, storage: ctx.storage, defaultTimeZone: config.SHOP_TIME_ZONE });
  const storeFile = async (prefix: string, lines: string[]) => (ctx.storage ? ctx.storage.put(prefix, await demoPdf(lines), "application/pdf", `${lines[0].replace(/\W+/g, "-")}.pdf`) : null);

  // Outside labs: one accredited well into next year, one whose accreditation runs out within the warning window.
  const labs = labsService(deps(ago(900)));
  const meridian = await labs.create(
    CreateLabSchema.parse({ name: "Meridian Dimensional Lab", accreditationBody: ACCREDITOR, accreditationNumber: "LAC-DEMO-0417", scope: "Dimensional: gauge blocks, setting standards, micrometers, dial indicators (demo scope)", accreditationExpiresAt: addDays(today, 420), contact: "bench@meridian-lab.example (demo)" }),
    quality.id,
  );
  const kestrel = await labs.create(
    CreateLabSchema.parse({ name: "Kestrel Metrology", accreditationBody: ACCREDITOR, accreditationNumber: "LAC-DEMO-0588", scope: "Dimensional: dial indicators, feeler gauges (demo scope)", accreditationExpiresAt: addDays(today, 20), contact: "+1 555 0100 (demo)" }),
    quality.id,
  );

  // Reference standards: three yearly certificates each, covering the whole two-year history and beyond today.
  const certPeriods = [900, 535, 170].map((d) => ({ issuedAt: dateAgo(d), dueAt: addDays(dateAgo(d), 365) }));
  const stdSpecs: { tag: string; name: string; kind: "gauge_block_set" | "setting_standard" | "check_block"; unit: "in" | "mm"; nominal?: number; grade?: string; U: number; certified?: number; elements?: { label: string; nominal: number; deviation: number | null }[] }[] = [
    { tag: "GBS-01", name: "Gauge block set, inch, grade 0 (demo)", kind: "gauge_block_set", unit: "in", grade: "0", U: 0.000004, elements: INCH_BLOCKS },
    { tag: "GBS-02", name: "Gauge block set, metric, grade 0 (demo)", kind: "gauge_block_set", unit: "mm", grade: "0", U: 0.0001, elements: MM_BLOCKS },
    { tag: "SET-01", name: "Setting standard 1 in (demo)", kind: "setting_standard", unit: "in", nominal: 1, U: 0.000006, certified: 1.000012 },
    { tag: "SET-02", name: "Setting standard 25 mm (demo)", kind: "setting_standard", unit: "mm", nominal: 25, U: 0.00015, certified: 25.0003 },
    { tag: "SET-03", name: "Setting standard 5 in (demo)", kind: "setting_standard", unit: "in", nominal: 5, U: 0.00001, certified: 5.000018 },
    { tag: "CHK-01", name: "Check block 0.500 in (demo)", kind: "check_block", unit: "in", nominal: 0.5, U: 0.000006, certified: 0.500004 },
  ];
  const standardIds: Record<string, string> = {};
  for (const s of stdSpecs) {
    const certificate = (i: number): CertificateInput => ({
      number: `MDL-DEMO-${s.tag}-${i + 1}`,
      lab: meridian.name,
      labId: meridian.id,
      issuedAt: certPeriods[i].issuedAt,
      dueAt: certPeriods[i].dueAt,
      expandedUncertainty: s.U,
      coverageFactor: 2,
      accreditationBody: ACCREDITOR,
      scope: meridian.scope ?? undefined,
      nationalInstitute: NMI,
      certifiedValue: s.certified ?? null,
      elementValues: s.elements,
    });
    const service = standardsService(deps(ago(900)));
    const created = await service.create(
      CreateStandardSchema.parse({ assetTag: s.tag, name: s.name, kind: s.kind, unit: s.unit, nominal: s.nominal ?? null, grade: s.grade, location: "Calibration room, cabinet 1", certificate: certificate(0) }),
      quality.id,
    );
    standardIds[s.tag] = created.id;
    for (const i of [1, 2]) await standardsService(deps(new Date(Date.parse(`${certPeriods[i].issuedAt}T18:00:00Z`)))).addCertificate(created.id, AddCertificateSchema.parse(certificate(i)), quality.id);
    if (ctx.storage) {
      const certs = await standardsRepository.certificatesOf(db, [created.id]);
      for (const c of certs) {
        const key = await storeFile("standard-certificates", [`Certificate of calibration ${c.number}`, `Standard: ${s.tag} ${s.name}`, `Issued ${c.issuedAt}, due ${c.dueAt}`, `Expanded uncertainty U = ${s.U} ${s.unit} (k = 2)`, `Issued by ${meridian.name}, accredited by ${ACCREDITOR}`, `Traceable to ${NMI}`]);
        if (key) await standardsRepository.setCertificateFile(db, c.id, key);
      }
    }
  }

  // The standards as the calibration computation takes them, to shape the demo readings against their certified values.
  const computeStandards: Record<string, ComputeStandard> = Object.fromEntries(
    stdSpecs.map((sp) => [
      sp.tag,
      {
        assetTag: sp.tag,
        kind: sp.kind,
        unit: sp.unit,
        grade: sp.grade ?? null,
        certificateNumber: null,
        expandedUncertainty: sp.U,
        coverageFactor: 2,
        degreesOfFreedom: null,
        nominal: sp.nominal ?? null,
        certifiedValue: sp.certified ?? null,
        elements: (sp.elements ?? []).map((e) => ({ label: e.label, nominal: e.nominal, deviation: e.deviation })),
      } satisfies ComputeStandard,
    ]),
  );

  // Families with their defaults (limits invented for the demo; micrometer MPE after ASME B89.1.13 and JIS B 7502, from memory).
  const famSpecs: Record<FamilyKey, CreateFamilyInput> = {
    mic01: { name: "Outside micrometer 0-1 in", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365, mpe: 0.0001, checkPoints: INCH_MIC, resolution: 0.0001, checkTolerance: 0.0001 },
    mic12: { name: "Outside micrometer 1-2 in", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365, mpe: 0.0001, checkPoints: [1, 1.25, 1.5, 1.75, 2], resolution: 0.0001, checkTolerance: 0.0001 },
    mic23: { name: "Outside micrometer 2-3 in, usage-limited", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365, mpe: 0.0001, checkPoints: [2, 2.25, 2.5, 2.75, 3], resolution: 0.0001, usageLimit: 60 },
    mic56: { name: "Outside micrometer 5-6 in", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365, mpe: 0.00015, checkPoints: [5, 5.25, 5.5, 5.75, 6], resolution: 0.0001, checkTolerance: 0.00015 },
    mic025mm: { name: "Outside micrometer 0-25 mm", kind: "outside_micrometer", unit: "mm", defaultIntervalDays: 365, mpe: 0.002, checkPoints: MM_MIC, resolution: 0.001, checkTolerance: 0.002 },
    imic: { name: "Inside micrometer 2-12 in", kind: "inside_micrometer", unit: "in", defaultIntervalDays: 365, mpe: 0.0002, checkPoints: [2, 4, 6], resolution: 0.0001 },
    tel: { name: "Telescoping gauge set", kind: "telescoping_gauge", unit: "in", defaultIntervalDays: 365, mpe: 0.0002, resolution: 0.0001, checkTolerance: 0.0002 },
    shg: { name: "Small-hole gauge set", kind: "small_hole_gauge", unit: "in", defaultIntervalDays: 365, mpe: 0.0002, resolution: 0.0001 },
    flr: { name: "Feeler set, inch leaves", kind: "feeler_set", unit: "in", defaultIntervalDays: 180, mpe: 0.0002, resolution: 0.0001 },
    dia: { name: "Dial indicator 0-1 in", kind: "dial_indicator", unit: "in", defaultIntervalDays: 365, mpe: 0.0002, checkPoints: [0.1, 0.25, 0.5, 0.75, 1], resolution: 0.0001, checkTolerance: 0.0002 },
    cal: { name: "Dial caliper 0-6 in", kind: "caliper", unit: "in", defaultIntervalDays: 365, mpe: 0.001, checkPoints: [1, 2, 4, 6], resolution: 0.001 },
    gbw: { name: "Working gauge block set, inch", kind: "gauge_block_set", unit: "in", defaultIntervalDays: 730, mpe: 0.00001, resolution: 0.000001 },
    setw: { name: "Working setting standard 2 in", kind: "setting_standard", unit: "in", defaultIntervalDays: 730, mpe: 0.00002, checkPoints: [2], resolution: 0.000001 },
    bore: { name: "Dial bore gauge 2-6 in", kind: "other", unit: "in", defaultIntervalDays: 365, mpe: 0.0002, checkPoints: [2, 4, 6], resolution: 0.0001 },
  };
  const families = familiesService({ db });
  const familyIds = {} as Record<FamilyKey, string>;
  for (const [key, f] of Object.entries(famSpecs) as [FamilyKey, CreateFamilyInput][]) {
    familyIds[key] = (await families.create(CreateFamilySchema.parse(f), quality.id)).id;
  }

  const tel = (n: number) => [
    { label: "T1 5/16-1/2 in", nominal: 0.5 },
    { label: "T2 1/2-3/4 in", nominal: 0.75 },
    { label: "T3 3/4-1 1/4 in", nominal: 1.25 },
    { label: "T4 1 1/4-2 1/8 in", nominal: 2.125 },
    { label: "T5 2 1/8-3 1/2 in", nominal: 3.5 },
    { label: "T6 3 1/2-6 in", nominal: 6 },
  ].slice(0, n);
  const shg = [
    { label: "S1 0.125-0.200 in", nominal: 0.2 },
    { label: "S2 0.200-0.300 in", nominal: 0.3 },
    { label: "S3 0.300-0.400 in", nominal: 0.4 },
    { label: "S4 0.400-0.500 in", nominal: 0.5 },
  ];
  const leaves = FEELER_LEAVES.map((n) => ({ label: n.toFixed(n < 0.002 ? 4 : 3), nominal: n }));
  const blocks = [0.1, 0.25, 0.5, 1, 2, 4].map((n) => ({ label: n.toFixed(3), nominal: n, grade: "2" }));
  const mech = ctx.users.mechanic;
  const mech2 = ctx.people.mechanic2;
  const mech3 = ctx.people.mechanic3;
  const CORVANE = "Corvane Instruments";
  const OSTRAVA = "Ostrava Gauge Co.";
  const PELLAM = "Pellam & Strood";

  // In calibration: last calibrated 40-300 days ago on a yearly interval. Two years of history unless told otherwise.
  const yearly = (last: number) => [last + 730, last + 365, last].filter((d) => d <= 880);
  const specs: ToolSpec[] = [
    { tag: "MIC-0101", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Crib drawer A1", maker: CORVANE, model: "CV-25 (demo)", history: yearly(120) },
    { tag: "MIC-0102", family: "mic12", description: "Outside micrometer 1-2 in", range: [1, 2], location: "Crib drawer A1", maker: CORVANE, model: "CV-50 (demo)", history: yearly(95), standards: ["SET-01", "GBS-01"] },
    { tag: "MIC-0103", family: "mic01", description: "Outside micrometer 0-1 in, ratchet stop", range: [0, 1], location: "Crib drawer A1", maker: OSTRAVA, history: yearly(210) },
    { tag: "MIC-0104", family: "mic01", description: "Outside micrometer 0-1 in, carbide faces", range: [0, 1], location: "Crib drawer A1", maker: CORVANE, model: "CV-25C (demo)", history: yearly(160) },
    { tag: "MIC-0105", family: "mic56", description: "Outside micrometer 5-6 in (reads telescoping gauges on the barrel bore)", range: [5, 6], location: "Crib drawer A4", maker: OSTRAVA, model: "OG-150 (demo)", history: yearly(75), standards: ["SET-03", "GBS-01"] },
    { tag: "MIC-0106", family: "mic01", description: "Outside micrometer 0-1 in, friction thimble", range: [0, 1], location: "Bench 1", maker: PELLAM, history: yearly(60) },
    { tag: "MIC-0107", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Bench 2", maker: CORVANE, history: yearly(352) },
    { tag: "MIC-0108", family: "mic01", description: "Outside micrometer 0-1 in, blade anvils", range: [0, 1], location: "Bench 3", maker: OSTRAVA, history: yearly(280) },
    { tag: "MIC-0109", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Crib drawer A2", maker: PELLAM, history: yearly(30) },
    { tag: "MIC-0110", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Crib drawer A2", maker: CORVANE, history: [745, 380], notes: "Recall sent; not yet returned for calibration (demo)." },
    { tag: "MIC-0111", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Quarantine shelf", maker: OSTRAVA, history: yearly(140) },
    { tag: "MIC-0112", family: "mic01", description: "Outside micrometer 0-1 in, new stock", range: [0, 1], location: "Receiving", maker: CORVANE, model: "CV-25 (demo)", history: [] },
    { tag: "MIC-0113", family: "mic01", description: "Outside micrometer 0-1 in, worn spindle", range: [0, 1], location: "Crib drawer A3", maker: PELLAM, history: [600, 235], limited: { min: 0, max: 0.5, note: "Spindle worn above 0.5 in; use on small diameters only (demo)." } },
    { tag: "MIC-0114", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Long-term store", maker: OSTRAVA, history: [700, 400] },
    { tag: "MIC-0115", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Unknown", maker: CORVANE, history: yearly(190) },
    { tag: "MIC-0116", family: "mic01", description: "Outside micrometer 0-1 in, cracked frame", range: [0, 1], location: "Scrap bin", maker: PELLAM, history: [720] },
    { tag: "MIC-0117", family: "mic01", description: "Outside micrometer 0-1 in", range: [0, 1], location: "Bench 2", maker: CORVANE, history: yearly(100) },
    { tag: "MIC-0120", family: "mic12", description: "Outside micrometer 1-2 in", range: [1, 2], location: "Crib drawer A4", maker: CORVANE, history: yearly(130), standards: ["SET-01", "GBS-01"] },
    { tag: "MIC-0121", family: "mic12", description: "Outside micrometer 1-2 in", range: [1, 2], location: "Bench 1", maker: OSTRAVA, history: yearly(45), standards: ["SET-01", "GBS-01"] },
    { tag: "MIC-0122", family: "mic12", description: "Outside micrometer 1-2 in", range: [1, 2], location: "Bench 3", maker: PELLAM, history: yearly(340), standards: ["SET-01", "GBS-01"] },
    { tag: "MIC-0123", family: "mic12", description: "Outside micrometer 1-2 in", range: [1, 2], location: "Crib drawer A4", maker: CORVANE, history: yearly(250), standards: ["SET-01", "GBS-01"] },
    { tag: "MIC-0130", family: "mic23", description: "Outside micrometer 2-3 in", range: [2, 3], location: "Crib drawer A5", maker: OSTRAVA, history: yearly(90) },
    { tag: "MIC-0131", family: "mic23", description: "Outside micrometer 2-3 in", range: [2, 3], location: "Crib drawer A5", maker: CORVANE, history: yearly(200) },
    { tag: "MIC-0132", family: "mic23", description: "Outside micrometer 2-3 in", range: [2, 3], location: "Bench 4", maker: PELLAM, history: yearly(20) },
    { tag: "MIC-0201", family: "mic025mm", description: "Outside micrometer 0-25 mm", range: [0, 25], location: "Crib drawer B1", maker: OSTRAVA, model: "OG-25M (demo)", history: yearly(345), standards: ["GBS-02", "SET-02"], lastRule: "guarded" },
    { tag: "MIC-0202", family: "mic025mm", description: "Outside micrometer 0-25 mm", range: [0, 25], location: "Crib drawer B1", maker: CORVANE, history: yearly(110), standards: ["GBS-02", "SET-02"] },
    { tag: "MIC-0203", family: "mic025mm", description: "Outside micrometer 0-25 mm, digital", range: [0, 25], location: "Bench 2", maker: OSTRAVA, history: yearly(170), standards: ["GBS-02", "SET-02"] },
    { tag: "MIC-0204", family: "mic025mm", description: "Outside micrometer 0-25 mm", range: [0, 25], location: "Bench 4", maker: PELLAM, history: [760, 395], standards: ["GBS-02", "SET-02"] },
    { tag: "MIC-0205", family: "mic025mm", description: "Outside micrometer 0-25 mm", range: [0, 25], location: "Crib drawer B1", maker: CORVANE, history: yearly(65), standards: ["GBS-02", "SET-02"] },
    { tag: "MIC-0206", family: "mic025mm", description: "Outside micrometer 0-25 mm", range: [0, 25], location: "Crib drawer B2", maker: OSTRAVA, history: yearly(300), standards: ["GBS-02", "SET-02"] },
    { tag: "IMC-0101", family: "imic", description: "Inside micrometer set 2-12 in", range: [2, 12], location: "Crib cabinet C1", maker: OSTRAVA, history: yearly(150), standards: ["SET-03", "GBS-01"] },
    { tag: "IMC-0102", family: "imic", description: "Inside micrometer set 2-12 in, new stock", range: [2, 12], location: "Receiving", maker: CORVANE, history: [] },
    { tag: "BGE-0101", family: "bore", description: "Dial bore gauge 2-6 in", range: [2, 6], location: "Crib cabinet C1", maker: PELLAM, history: yearly(80), standards: ["SET-03", "GBS-01"] },
    { tag: "TEL-0101", family: "tel", description: "Telescoping gauge set 0.3125-6 in (transfer tool, read with a micrometer)", range: [0.3125, 6], location: "Crib drawer C2", maker: OSTRAVA, elements: tel(6), history: yearly(85) },
    { tag: "TEL-0102", family: "tel", description: "Telescoping gauge set 0.3125-6 in", range: [0.3125, 6], location: "Bench 1", maker: CORVANE, elements: tel(6), history: yearly(230) },
    { tag: "TEL-0103", family: "tel", description: "Telescoping gauge set 0.3125-2.125 in", range: [0.3125, 2.125], location: "Long-term store", maker: PELLAM, elements: tel(4), history: [650] },
    { tag: "SHG-0101", family: "shg", description: "Small-hole gauge set 0.125-0.5 in", range: [0.125, 0.5], location: "Crib drawer C3", maker: OSTRAVA, elements: shg, history: yearly(110) },
    { tag: "SHG-0102", family: "shg", description: "Small-hole gauge set 0.125-0.5 in", range: [0.125, 0.5], location: "Bench 3", maker: CORVANE, elements: shg, history: yearly(325) },
    { tag: "SHG-0103", family: "shg", description: "Small-hole gauge set 0.125-0.5 in", range: [0.125, 0.5], location: "Crib drawer C3", maker: PELLAM, elements: shg, history: yearly(15) },
    { tag: "FLR-0101", family: "flr", description: "Feeler set 0.0015-0.025 in, identified leaves", range: [0.0015, 0.025], location: "Crib drawer C4", maker: OSTRAVA, elements: leaves, history: [725, 545, 365, 185, 45] },
    { tag: "FLR-0102", family: "flr", description: "Feeler set 0.0015-0.025 in", range: [0.0015, 0.025], location: "Bench 2", maker: CORVANE, elements: leaves, history: [700, 520, 340, 160] },
    { tag: "FLR-0103", family: "flr", description: "Feeler set 0.0015-0.025 in", range: [0.0015, 0.025], location: "Bench 4", maker: PELLAM, elements: leaves, history: [560, 380, 200] },
    { tag: "DIA-0101", family: "dia", description: "Dial indicator 0-1 in, 0.0001 in", range: [0, 1], location: "Crib cabinet C2", maker: CORVANE, model: "CV-DI1 (demo)", history: [] },
    { tag: "DIA-0102", family: "dia", description: "Dial indicator 0-1 in, 0.0001 in", range: [0, 1], location: "Away at lab", maker: OSTRAVA, history: [] },
    { tag: "DIA-0103", family: "dia", description: "Dial indicator 0-1 in, 0.0001 in", range: [0, 1], location: "Crib receiving shelf", maker: PELLAM, history: [] },
    {
      tag: "DIA-0104",
      family: "dia",
      description: "Dial indicator 0-1 in",
      range: [0, 1],
      location: "Bench 1",
      maker: CORVANE,
      history: yearly(55),
      // Three readings at 0.500 in average +0.00023 in on ± 0.0002 in: out of tolerance, but within U of the limit (conditional fail).
      findings: { 420: { nominal: 0.5, readings: [0.5002, 0.5003, 0.5002], note: "Reads high near mid-travel; rack cleaned and re-set (demo)." } },
    },
    { tag: "DIA-0105", family: "dia", description: "Dial indicator 0-1 in", range: [0, 1], location: "Bench 2", maker: OSTRAVA, history: yearly(348) },
    {
      tag: "DIA-0106",
      family: "dia",
      description: "Dial indicator 0-1 in",
      range: [0, 1],
      location: "Bench 3",
      maker: PELLAM,
      history: yearly(190),
      findings: { 190: { nominal: 0.25, readings: [0.2504], note: "Sticky at a quarter travel; bezel and pinion cleaned, re-set (demo)." } },
    },
    { tag: "DIA-0107", family: "dia", description: "Dial indicator 0-1 in", range: [0, 1], location: "Crib cabinet C2", maker: CORVANE, history: yearly(260) },
    {
      tag: "DIA-0108",
      family: "dia",
      description: "Dial indicator 0-1 in",
      range: [0, 1],
      location: "Crib cabinet C2",
      maker: OSTRAVA,
      history: yearly(35),
      findings: { 400: { nominal: 0.75, readings: [0.7497], note: "Reads low at three-quarter travel after a drop at the bench; re-set (demo)." } },
    },
    { tag: "CAL-0101", family: "cal", description: "Dial caliper 0-6 in (reference only)", range: [0, 6], location: "Crib drawer D1", maker: PELLAM, calibrationRequired: false },
    { tag: "CAL-0102", family: "cal", description: "Dial caliper 0-6 in (reference only)", range: [0, 6], location: "Bench 1", maker: CORVANE, calibrationRequired: false },
    { tag: "CAL-0103", family: "cal", description: "Dial caliper 0-6 in (reference only)", range: [0, 6], location: "Bench 4", maker: OSTRAVA, calibrationRequired: false },
    { tag: "GBW-01", family: "gbw", description: "Working gauge block set, inch, grade 2", range: [0.1, 4], location: "Calibration room, cabinet 2", maker: OSTRAVA, elements: blocks, history: [640, 275] },
    { tag: "SET-W-01", family: "setw", description: "Working setting standard 2 in", range: [2, 2], location: "Calibration room, cabinet 2", maker: CORVANE, history: [590, 225], standards: ["GBS-01"] },
    { tag: "MIC-P-01", family: "mic01", description: "Outside micrometer 0-1 in (Dagny Forsell's own)", range: [0, 1], location: "Mechanic's toolbox", maker: CORVANE, owner: { ownerType: "personal", ownerUserId: mech.id }, history: yearly(70) },
    { tag: "MIC-P-02", family: "mic01", description: "Outside micrometer 0-1 in (Ezra Okonkwo-Lind's own)", range: [0, 1], location: "Mechanic's toolbox", maker: OSTRAVA, owner: { ownerType: "personal", ownerUserId: mech2.id }, history: yearly(180) },
    { tag: "MIC-P-03", family: "mic12", description: "Outside micrometer 1-2 in (Vashti Penrose's own)", range: [1, 2], location: "Mechanic's toolbox", maker: PELLAM, owner: { ownerType: "personal", ownerUserId: mech3.id }, history: yearly(330), standards: ["SET-01", "GBS-01"] },
    { tag: "DIA-P-01", family: "dia", description: "Dial indicator 0-1 in (Ezra Okonkwo-Lind's own)", range: [0, 1], location: "Mechanic's toolbox", maker: CORVANE, owner: { ownerType: "personal", ownerUserId: mech2.id }, history: yearly(240) },
    { tag: "MIC-C-01", family: "mic01", description: "Outside micrometer 0-1 in (customer's, sent with engine)", range: [0, 1], location: "Customer shelf", maker: PELLAM, owner: { ownerType: "customer", ownerName: "Bellweather Air Services (demo customer)" }, history: [150] },
    { tag: "MIC-L-01", family: "mic12", description: "Outside micrometer 1-2 in (loaner from Meridian, demo)", range: [1, 2], location: "Crib drawer A4", maker: OSTRAVA, owner: { ownerType: "loaner", ownerName: "Meridian Dimensional Lab" }, history: [25], standards: ["SET-01", "GBS-01"] },
  ];

  const toolIds: Record<string, string> = {};
  const lastCalibrationIds: Record<string, string> = {};
  const registeredAt = ago(890);
  for (const s of specs) {
    const f = famSpecs[s.family];
    const tool = await toolsService(deps(s.history?.length === 0 ? ago(6) : registeredAt)).create(
      CreateToolSchema.parse({
        assetTag: s.tag,
        familyId: familyIds[s.family],
        description: s.description,
        serialNumber: `${s.tag.replace(/-/g, "")}-${(hash(s.tag) >>> 0).toString(36).slice(0, 5).toUpperCase()}`,
        maker: s.maker,
        model: s.model,
        unit: f.unit,
        rangeMin: s.range[0],
        rangeMax: s.range[1],
        resolution: f.resolution,
        intervalDays: s.intervalDays ?? f.defaultIntervalDays,
        location: s.location,
        ownerType: s.owner?.ownerType ?? "shop",
        ownerUserId: s.owner?.ownerUserId,
        ownerName: s.owner?.ownerName,
        calibrationRequired: s.calibrationRequired ?? true,
        acceptanceUse: s.calibrationRequired ?? true,
        elements: s.elements,
        notes: [s.notes, `${DEMO_LABEL}.`].filter(Boolean).join(" "),
      }),
      crib.id,
    );
    toolIds[s.tag] = tool.id;

    // History: the same tool drifts a little each year (up to one resolution step each way), and is re-set to zero at the limit.
    const rand = prng(hash(s.tag));
    const mpe = dec(f.mpe!);
    const res = dec(f.resolution!);
    const steps = Math.max(1, mpe.div(res).floor().toNumber());
    const drift = (rand() - 0.5) * 1.6; // steps per calibration
    const nominals = tool.elements.length ? tool.elements.map((e) => ({ nominal: e.nominal, elementId: e.id })) : (f.checkPoints as number[]).map((n) => ({ nominal: n, elementId: null }));
    const stdTags = s.standards ?? (f.unit === "mm" ? ["GBS-02"] : ["GBS-01"]);
    const stds = stdTags.map((tag) => standardIds[tag]);
    const history = s.history ?? [];
    let offset = 0;
    for (const [k, daysAgo] of history.entries()) {
      const performedAt = ago(daysAgo, 5 - (hash(s.tag + k) & 3));
      const last = k === history.length - 1;
      const limited = s.limited && last ? s.limited : null;
      const finding = s.findings?.[daysAgo] ?? null;
      const rule: DecisionRule = last && !limited ? (s.lastRule ?? (s.family === "mic01" ? "guarded" : "simple")) : "simple";
      const temperatureC = 20 + Math.round((rand() - 0.3) * 10) / 10;
      const context = { rule, unit: f.unit, resolution: Number(f.resolution), familyMpe: f.mpe, temperatureC, temperatureVariationC: 0.5, standards: stdTags.map((t) => computeStandards[t]) };
      let points: CalibrationPointInput[] = nominals
        .filter((p) => !limited || (p.nominal >= limited.min && p.nominal <= limited.max))
        .map((p, i) => {
          const noise = Math.round((rand() - 0.5) * 1.2);
          const e = Math.max(-steps, Math.min(steps, Math.round(offset + drift * k * (0.6 + 0.4 * Math.sin(i)) + noise)));
          return { nominal: p.nominal, asFound: dec(p.nominal).plus(res.times(e)).toNumber(), elementId: p.elementId };
        });
      // The indication is against the certified value of the blocks: a reading one step out on a block that is itself a few
      // microinches off would be out of tolerance, which these routine records are not. Such points read one step nearer.
      const preview = computeCalibration({ ...context, rule: "simple", adjusted: false, points });
      points = points.map((p, i) => {
        const q = preview.points[i];
        if (q.asFoundInTolerance) return p;
        return { ...p, asFound: dec(p.asFound).minus(res.times(Math.sign(q.errorAsFound))).toNumber() };
      });
      if (finding) {
        const mean = finding.readings.reduce((a, b) => a.plus(dec(b)), dec(0)).div(finding.readings.length);
        points = points.map((p) =>
          p.nominal === finding.nominal ? { ...p, asFound: mean.toDecimalPlaces(6).toNumber(), repeatReadings: finding.readings.length > 1 ? finding.readings : undefined } : p,
        );
      } else if (last && points.length > 1) {
        // The latest record reads one point several times, so the budget shows repeatability (Type A). Under the guarded
        // rule the readings repeat exactly: one step of scatter on a 0.0001 in micrometer would, with so few readings, make U
        // exceed the MPE (few degrees of freedom, large k) and nothing could be released.
        const mid = Math.floor(points.length / 2);
        const p = points[mid];
        const step = dec(p.asFound).plus(res).toNumber();
        points[mid] = { ...p, repeatReadings: rule === "simple" ? [p.asFound, p.asFound, step, p.asFound] : [p.asFound, p.asFound, p.asFound] };
      }
      // Re-set where a point sits on its limit, where the decision rule would not release it, or after a finding.
      const judged = computeCalibration({ ...context, adjusted: false, points });
      const reset = judged.points.map((q) => !!finding || (k > 0 && steps > 0 && dec(q.errorAsFound).abs().gte(mpe)) || q.verdict === "fail");
      const adjusted = reset.some(Boolean);
      if (adjusted) points = points.map((p, i) => ({ ...p, asLeft: reset[i] ? p.nominal : p.asFound }));
      const cal = await calibrationsService(deps(new Date(performedAt.getTime() + 2 * HOUR))).create(
        s.tag,
        CreateCalibrationSchema.parse({
          performedAt: performedAt.toISOString(),
          temperatureC,
          temperatureVariationC: 0.5,
          humidityPct: 38 + Math.round(rand() * 12),
          standardIds: stds,
          decisionRule: rule,
          adjusted,
          points,
          limitedRange: limited,
          notes: [finding ? finding.note : adjusted ? "Re-set to zero at the points found on or near the limit." : "Routine calibration.", limited ? limited.note : "", "(demo)"].filter(Boolean).join(" "),
        }),
        quality.id,
      );
      if (cal.investigationId) {
        // The finding was investigated at the time: no reading had been taken with the tool in its window.
        await closeInvestigation(db, fixedClock(new Date(performedAt.getTime() + 3 * DAY)), cal.investigationId, `${finding?.note ?? "Found out of tolerance."} No reading in the window; closed (demo).`, quality.id);
      }
      if (adjusted) offset = 0;
      lastCalibrationIds[s.tag] = cal.id;
    }
  }

  // FLR-0101: the 0.004 in leaf was kinked and rejected at its last calibration.
  const flr = await toolsService(deps(ago(44))).detail("FLR-0101");
  const kinked = flr.elements.find((e) => e.nominal === 0.004)!;
  await toolsService(deps(ago(44))).rejectElement("FLR-0101", kinked.id, "Leaf kinked near the tip; removed from use (demo).", quality.id);

  // Outside-lab records: DIA-0101 reviewed and in calibration; DIA-0103 back with a certificate awaiting review.
  const outside = async (tag: string, lab: { id: string; name: string }, daysAgo: number, review: boolean) => {
    const performedAt = ago(daysAgo, 3);
    const number = `${lab.name.startsWith("Meridian") ? "MDL" : "KM"}-DEMO-${tag}-${daysAgo}`;
    // Uploaded as the upload route would, so the record may name the key it was issued.
    const certificateLines = [`Certificate of calibration ${number}`, `Instrument: ${tag}, dial indicator 0-1 in (demo)`, `Calibrated ${calendarDate(performedAt, tz)} by ${lab.name}`, `Accredited by ${ACCREDITOR}; traceable to ${NMI}`];
    const certificatePdf = await demoPdf(certificateLines);
    const fileKey = ctx.storage
      ? (await calibrationsService(deps(new Date(performedAt.getTime() + 25 * HOUR))).uploadCertificate({ buffer: certificatePdf, fileName: `${number}.pdf`, contentType: "application/pdf", size: certificatePdf.length }, quality.id)).fileKey
      : null;
    const cal = await calibrationsService(deps(new Date(performedAt.getTime() + 26 * HOUR))).create(
      tag,
      CreateCalibrationSchema.parse({
        performedAt: performedAt.toISOString(),
        source: "outside_lab",
        labId: lab.id,
        certificateNumber: number,
        certificateFileKey: fileKey,
        performedByName: `${lab.name} technician (demo)`,
        temperatureC: 20.1,
        humidityPct: 45,
        decisionRule: "simple",
        points: [0.1, 0.25, 0.5, 0.75, 1].map((n, i) => ({ nominal: n, asFound: dec(n).plus(dec("0.0001").times(i % 3 === 1 ? 1 : 0)).toNumber(), uncertainty: 0.00004 })),
        notes: `Certificate from ${lab.name} (demo).`,
      }),
      quality.id,
    );
    if (review) {
      await calibrationsService(deps(new Date(performedAt.getTime() + 3 * DAY))).review(
        cal.id,
        { accepted: true, findings: "Certificate complete: as-found and as-left data, uncertainty stated, accreditation in scope and valid. Accepted (demo)." },
        quality.id,
      );
    }
    lastCalibrationIds[tag] = cal.id;
    return cal;
  };
  await outside("DIA-0101", meridian, 390, true);
  await outside("DIA-0101", meridian, 30, true);
  await outside("DIA-0102", meridian, 350, true);
  await outside("DIA-0103", kestrel, 368, true);
  const awaiting = await outside("DIA-0103", kestrel, 4, false);
  await db.insert(labShipments).values([
    // DIA-0103 went to Kestrel and came back with its certificate, not yet reviewed.
    { toolId: toolIds["DIA-0103"], labId: kestrel.id, shippedAt: ago(12), shippedBy: crib.id, purchaseOrder: "PO-DEMO-4460", expectedBackAt: dateAgo(1), receivedAt: ago(1, 2), receivedBy: crib.id, calibrationId: awaiting.id },
    // DIA-0102 is away at Meridian now.
    { toolId: toolIds["DIA-0102"], labId: meridian.id, shippedAt: ago(8), shippedBy: crib.id, purchaseOrder: "PO-DEMO-4471", expectedBackAt: addDays(today, 9) },
  ]);

  // Holds and lifecycle: MIC-0111 dropped, MIC-0114 stored, MIC-0115 lost, MIC-0116 retired, TEL-0103 stored, CAL-0103 retired.
  await toolsService(deps(ago(2, 4))).quarantine("MIC-0111", "Dropped from bench 2 onto the concrete floor; thimble feels rough (demo).", crib.id);
  const lifecycle = async (tag: string, lifecycleTo: "inactive" | "lost" | "retired", daysAgo: number, reason: string) => {
    const at = ago(daysAgo);
    await db.transaction(async (tx) => {
      await changeLifecycle(tx, { toolId: toolIds[tag], lifecycle: lifecycleTo, reason, actorId: crib.id, at });
      // Losing a tool puts the work it measured in question, as the crib's "lost" does.
      if (lifecycleTo === "lost") await onOutOfToleranceFinding(tx, { clock: fixedClock(at), mailer: ctx.mailer, timeZone: tz }, { kind: "lost", toolId: toolIds[tag], at, actorId: crib.id });
    });
  };
  await lifecycle("MIC-0114", "inactive", 300, "Spare; stored in the long-term cabinet (demo).");
  await lifecycle("TEL-0103", "inactive", 200, "Incomplete set; stored until the missing gauges are replaced (demo).");
  await lifecycle("MIC-0115", "lost", 9, "Not returned after the night shift on bench 4; searched the hangar (demo).");
  await lifecycle("MIC-0116", "retired", 400, "Frame cracked; beyond economical repair (demo).");
  await lifecycle("CAL-0103", "retired", 150, "Rack worn; replaced by CAL-0102 (demo).");

  // Intermediate checks against CHK-01: routine passes, and MIC-0117's failure yesterday (out of tolerance at once).
  for (const [tag, daysAgo, reading] of [["MIC-0101", 3, 0.5], ["MIC-0104", 5, 0.5001], ["MIC-0106", 2, 0.5], ["MIC-0117", 20, 0.5]] as const) {
    await checksService(deps(ago(daysAgo, 6))).create(tag, CreateCheckSchema.parse({ nominal: 0.5, reading, standardId: standardIds["CHK-01"], note: "Pre-use check on CHK-01 (demo)." }), mech.id);
  }
  await checksService(deps(ago(1, 5))).create(
    "MIC-0117",
    CreateCheckSchema.parse({ nominal: 0.5, reading: 0.5004, standardId: standardIds["CHK-01"], note: "Reads 0.5004 on the 0.500 check block after a knock; handed to the crib (demo)." }),
    mech3.id,
  );

  ctx.shared.toolIds = toolIds;
  ctx.shared.standardIds = standardIds;
  ctx.shared.familyIds = familyIds;
  ctx.shared.labIds = { [meridian.name]: meridian.id, [kestrel.name]: kestrel.id };
  ctx.shared.lastCalibrationIds = lastCalibrationIds;
}
