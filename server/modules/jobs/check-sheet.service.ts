import type { DbOrTx } from "../../db/client";
import { notFound } from "../../http/errors";
import { jobsRepository, type JobSummaryRow } from "./jobs.repository";
import { limitTablesRepository } from "../limit-tables/limit-tables.repository";
import { itemViewsOf } from "../limit-tables/limit-tables.service";
import { readingsRepository } from "../readings/readings.repository";
import { evidenceOfRow, evidenceOfRows } from "../readings/reading-evidence";
import { JUDGING_RULES_VERSION, judgeReading, judgeRow, shownOnly, slotKey, type Judged, type JudgingContext, type PlaceView, type ReadingEvidence } from "../../../shared/inspection/judging";
import type { CheckSheet, JobSummary, SheetItem, SheetReading, SheetRow } from "../../../shared/jobs/jobs.schemas";
import type { LeafView, ReadingView } from "../../../shared/readings/readings.schemas";
import type { LimitItemView } from "../../../shared/limit-tables/limit-tables.schemas";
import { stackAsLeaf, type LeafStack } from "../../../shared/inspection/feeler";
import type { ToolStatus } from "../../../shared/tools/tool-status";
import type { MaterialKey } from "../../../shared/common/units";

const n = (v: string | null) => (v == null ? null : Number(v));

export function toJobSummary(r: JobSummaryRow): JobSummary {
  const j = r.job;
  return {
    id: j.id,
    engineSerial: j.engineSerial,
    engineModel: j.engineModel,
    workOrder: j.workOrder,
    limitTableId: j.limitTableId,
    limitTableName: r.tableName,
    limitTableVersion: r.tableVersion,
    openedAt: j.openedAt.toISOString(),
    openedBy: j.openedBy && r.openerName ? { id: j.openedBy, name: r.openerName } : null,
    status: r.signed ? "signed" : "open",
    readingCount: Number(r.readingCount),
    signedAt: r.signedAt ? new Date(r.signedAt).toISOString() : null,
  };
}

type ReadingRows = Awaited<ReturnType<typeof readingsRepository.ofJob>>;

const stackView = (st: LeafStack | null): LeafView | null => (st ? stackAsLeaf(st) : null);

/**
 * Readings of a job as the sheet shows them: as recorded, with the tools' status stored at the reading, and judged
 * under the current rules — the stored judgement when there is one (every reading is judged when recorded, and the
 * re-judging job judges older ones under new rules); only a reading not judged yet is judged here.
 */
async function readingViews(
  db: DbOrTx,
  rows: ReadingRows,
  items: Map<string, LimitItemView>,
  ctx: JudgingContext,
): Promise<{ views: SheetReading[]; places: Map<string, PlaceView>; judged: Map<string, Judged>; judgedHere: number }> {
  const unjudged = rows.filter((x) => !x.judgedView).map((x) => x.r);
  const evidence = unjudged.length ? await evidenceOfRows(db, unjudged, ctx.tableUnit) : new Map<string, ReadingEvidence>();
  const judged = new Map<string, Judged>();
  // Each reading's judged place is kept beside it, not in it: a current reading's place is its row's (sent once).
  const places = new Map<string, PlaceView>();
  const views = rows.map(({ r, takerName, overriderName, supersededById, tools, suspect, judgedAt, judgedView }): SheetReading => {
    const item = items.get(r.itemKey);
    const readable = !!item && item.kind !== "clearance" && item.kind !== "taper";
    const j: Judged | null = !readable ? null : judgedView ? shownOnly(judgedView as PlaceView) : judgeReading(item, evidence.get(r.id) ?? evidenceOfRow(r), ctx);
    if (j) judged.set(r.id, j);
    const place = j?.view ?? { kind: "pending" as const, itemKey: r.itemKey, index: r.index, verdict: "pending" as const, band: null, margin: null, text: `The item "${r.itemKey}" is not on this table` };
    places.set(r.id, place);
    const flags = [...r.flags, ...(suspect ? ["suspect"] : [])];
    const f = r.feelerCheck ? { ...r.feelerCheck, goEntered: r.goEntered, noGoEntered: r.noGoEntered } : feelerOfPlace(place);
    return {
      id: r.id,
      itemKey: r.itemKey,
      index: r.index,
      values: r.values.map(Number),
      unit: r.unit,
      size: n(r.size),
      outOfRound: n(r.outOfRound),
      goEntered: r.goEntered,
      noGoEntered: r.noGoEntered,
      goLeaf: stackView(f?.go ?? null),
      noGoLeaf: stackView(f?.noGo ?? null),
      feeler: f,
      visualResult: r.visualResult,
      finding: r.finding,
      recordedVerdict: r.verdict,
      verdict: place.verdict,
      verdictText: place.text,
      judgedAt: judgedAt ? judgedAt.toISOString() : null,
      flags,
      tools: tools.map((t) => ({ ...t, statusAtReading: t.statusAtReading as ToolStatus })),
      takenBy: r.takenBy && takerName ? { id: r.takenBy, name: takerName } : null,
      takenAt: r.takenAt.toISOString(),
      temperatureC: n(r.temperatureC),
      toolTemperatureC: n(r.toolTemperatureC),
      partMaterial: (r.partMaterial as MaterialKey | null) ?? null,
      supersedesId: r.supersedesId,
      supersedeReason: r.supersedeReason,
      supersededById: supersededById ?? null,
      overrideReason: r.overrideReason,
      overrideBy: r.overrideBy && overriderName ? { id: r.overrideBy, name: overriderName } : null,
    };
  });
  return { views, places, judged, judgedHere: unjudged.length };
}

/** A feeler check recorded before the leaves were kept with the reading (rules 1): the leaves as its judged place names them. */
function feelerOfPlace(place: PlaceView): ReadingView["feeler"] {
  if (place.kind !== "feeler") return null;
  return { mode: place.mode, go: place.go, noGo: place.noGo, goEntered: place.goEntered, noGoEntered: place.noGoEntered, gap: place.gap, why: place.why };
}

/**
 * Flags shared by every reading of an item are the item's: shown once on it, not on each place. Needs at least two
 * readings (or an item with one place), so a lone first reading keeps its flags where it is.
 */
export function sharedFlags(flagLists: string[][], places: number): string[] {
  if (flagLists.length === 0 || (flagLists.length < 2 && places > 1)) return [];
  const [first, ...rest] = flagLists;
  return [...new Set(first)].filter((f) => rest.every((l) => l.includes(f)));
}

/** The judgement object of earlier answers: verdict, band, least margin and the deciding limits. */
function judgementOf(item: LimitItemView, place: SheetRow["place"]): SheetRow["judgement"] {
  if (place.verdict === "pending" || place.band == null) return null;
  const lo = [item.min, item.serviceableMin].filter((x): x is number => x != null);
  const hi = [item.max, item.serviceableMax].filter((x): x is number => x != null);
  return {
    verdict: place.verdict,
    band: place.band,
    marginToNearestLimit: place.margin ?? 0,
    decidingLimits: { min: lo.length ? Math.min(...lo) : null, max: hi.length ? Math.max(...hi) : null },
  };
}

/** The check sheet of a job: every item × index with its current reading, judged under the current rules, with flags and tools. */
export async function buildCheckSheet(db: DbOrTx, jobId: string): Promise<CheckSheet> {
  return (await assembleCheckSheet(db, jobId)).sheet;
}

/**
 * The check sheet, and how many of its readings were judged here rather than read with their stored judgement
 * (readings not yet judged under the current rules: judged from evidence read now, so not an answer to keep).
 */
export async function assembleCheckSheet(db: DbOrTx, jobId: string): Promise<{ sheet: CheckSheet; judgedHere: number }> {
  // The sheet counts its current readings from the rows it reads anyway, not with a second pass over them.
  const summary = await jobsRepository.summary(db, jobId, { count: false });
  if (!summary) throw notFound("job", jobId);
  // One after another: inside a transaction these share one connection.
  const table = (await limitTablesRepository.summary(db, summary.job.limitTableId))!;
  const items = (await itemViewsOf(db, summary.job.limitTableId)) as LimitItemView[];
  const readingRows = await readingsRepository.ofJob(db, jobId, JUDGING_RULES_VERSION);
  const signoffRows = await jobsRepository.signoffs(db, jobId);
  const byKey = new Map(items.map((i) => [i.key, i]));
  const ctx: JudgingContext = { tableUnit: table.table.unit, tableExpansionPerK: n(table.table.expansionPerK) };
  const { views, places: placeOf, judged, judgedHere } = await readingViews(db, readingRows, byKey, ctx);

  const current = new Map<string, SheetReading>();
  // A superseded reading keeps its judged place with it (the row's place is the current reading's).
  const history = new Map<string, ReadingView[]>();
  for (const v of views) {
    const k = slotKey(v.itemKey, v.index);
    if (v.supersededById) history.set(k, [...(history.get(k) ?? []), { ...v, place: placeOf.get(v.id)! }]);
    else current.set(k, v);
  }
  // Fits and tapers are worked out from their sides' judged places; no reading is judged twice.
  const judgedAt = (itemKey: string, index: number) => {
    const v = current.get(slotKey(itemKey, index));
    return v ? judged.get(v.id) : undefined;
  };
  const noEvidence = () => undefined;

  const missing: CheckSheet["summary"]["missing"] = [];
  let places = 0;
  let outside = 0;
  let flagged = 0;
  let judgedDifferently = 0;
  const sheetItems: SheetItem[] = items.map((item) => {
    const rows: SheetRow[] = [];
    const readingFlags: string[][] = [];
    for (let index = 1; index <= item.repeat; index++) {
      const k = slotKey(item.key, index);
      if (item.kind === "clearance" || item.kind === "taper") {
        const place = judgeRow(items, item, index, noEvidence, ctx, judgedAt).view;
        const sideKeys = item.kind === "clearance" ? [item.boreKey, item.journalKey] : (item.stationKeys ?? []);
        const sides = sideKeys.map((key) => (key ? current.get(slotKey(key, index)) : undefined));
        const flags = [...new Set(sides.flatMap((s) => (s ? s.flags : [])))];
        if (sides.some(Boolean)) readingFlags.push(flags);
        rows.push({
          index,
          reading: null,
          history: [],
          clearance: place.kind === "fit" ? place.loosest.value : null,
          judgement: judgementOf(item, place),
          verdict: place.verdict,
          verdictText: place.text,
          place,
          judgedDifferently: false,
          flags,
        });
        if (place.verdict === "outside_limits") outside++;
        continue;
      }
      places++;
      const reading = current.get(k) ?? null;
      if (!reading) missing.push({ itemKey: item.key, index, label: item.label });
      if (reading?.verdict === "outside_limits") outside++;
      if (reading && reading.flags.length) flagged++;
      if (reading) readingFlags.push(reading.flags);
      const differs = !!reading && reading.recordedVerdict !== "pending" && reading.verdict !== "pending" && reading.recordedVerdict !== reading.verdict;
      if (differs) judgedDifferently++;
      const place = reading ? placeOf.get(reading.id)! : { kind: "pending" as const, itemKey: item.key, index, verdict: "pending" as const, band: null, margin: null, text: "Pending" };
      rows.push({
        index,
        reading,
        history: history.get(k) ?? [],
        clearance: null,
        judgement: judgementOf(item, place),
        verdict: place.verdict,
        verdictText: place.text,
        place,
        judgedDifferently: differs,
        flags: reading?.flags ?? [],
      });
    }
    // A flag every reading of the item carries is shown once, on the item; the rows keep the rest.
    const itemFlags = sharedFlags(readingFlags, item.repeat);
    if (itemFlags.length) for (const row of rows) row.flags = row.flags.filter((f) => !itemFlags.includes(f));
    return { ...item, flags: itemFlags, rows };
  });

  const signoffs = signoffRows.map(({ s, inspectorName }) => ({
    id: s.id,
    inspector: { id: s.inspectorId, name: inspectorName },
    certificateNumber: s.certificateNumber,
    signedAt: s.signedAt.toISOString(),
    note: s.note,
  }));
  const last = signoffRows.at(-1)?.s.signedAt;
  const changedSinceSignoff = !!last && views.some((v) => Date.parse(v.takenAt) > last.getTime());

  // Every tool on the sheet once, with its status and due date at the reading that last used it.
  const toolsUsed = new Map<string, CheckSheet["tools"][number]>();
  for (const v of views.filter((x) => !x.supersededById)) {
    for (const t of v.tools) {
      const prev = toolsUsed.get(t.assetTag);
      toolsUsed.set(t.assetTag, { assetTag: t.assetTag, description: t.description, statusAtReading: t.statusAtReading, dueAtReading: t.dueAtReading, readings: (prev?.readings ?? 0) + 1 });
    }
  }

  const sheet: CheckSheet = {
    ...toJobSummary(summary),
    readingCount: views.reduce((n, v) => (v.supersededById ? n : n + 1), 0),
    limitTable: {
      id: table.table.id,
      name: table.table.name,
      engineModel: table.table.engineModel,
      unit: table.table.unit,
      sourceDocument: table.table.sourceDocument,
      sourceRevision: table.table.sourceRevision,
      version: table.table.version,
      isDemo: table.table.isDemo,
      supersededById: table.supersededById ?? null,
      expansionPerK: n(table.table.expansionPerK),
    },
    items: sheetItems,
    signoffs,
    locked: summary.signed,
    changedSinceSignoff,
    summary: { places, recorded: places - missing.length, missing, outside, flagged, judgedDifferently, rulesVersion: JUDGING_RULES_VERSION },
    tools: [...toolsUsed.values()].sort((a, b) => a.assetTag.localeCompare(b.assetTag)),
  };
  return { sheet, judgedHere };
}
