import type { DbOrTx } from "../../db/client";
import { notFound } from "../../http/errors";
import { jobsRepository, type JobSummaryRow } from "./jobs.repository";
import { limitTablesRepository } from "../limit-tables/limit-tables.repository";
import { toItemView } from "../limit-tables/limit-tables.service";
import { readingsRepository } from "../readings/readings.repository";
import { suspectReadingIds } from "../investigations/investigations.hooks";
import { clearanceAt, slotKey, temperatureCorrection, verdictText, type SheetReading } from "../../../shared/inspection/check-sheet";
import { judgeAgainstLimits } from "../../../shared/inspection/sizes";
import type { CheckSheet, JobSummary, SheetItem, SheetRow } from "../../../shared/jobs/jobs.schemas";
import type { ReadingView } from "../../../shared/readings/readings.schemas";
import type { LimitItemView } from "../../../shared/limit-tables/limit-tables.schemas";
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

/** Readings of a job as the sheet shows them; the verdict wording is worked out against the item's limits. */
async function readingViews(db: DbOrTx, rows: ReadingRows, items: Map<string, LimitItemView>): Promise<ReadingView[]> {
  const ids = rows.map((x) => x.r.id);
  const toolRows = await readingsRepository.toolsOfReadings(db, ids);
  const suspect = await suspectReadingIds(db, ids);
  const toolsBy = new Map<string, ReadingView["tools"]>();
  for (const t of toolRows) {
    const list = toolsBy.get(t.readingId) ?? [];
    list.push({ assetTag: t.assetTag, description: t.description, kind: t.kind, unit: t.unit, statusAtReading: t.statusAtReading as ToolStatus, dueAtReading: t.dueAtReading });
    toolsBy.set(t.readingId, list);
  }
  return rows.map(({ r, takerName, overriderName, goLeaf, noGoLeaf, supersededById }) => {
    const item = items.get(r.itemKey);
    const size = n(r.size);
    const judgement = item && size != null && (item.kind === "journal" || item.kind === "bore") ? judgeAgainstLimits({ value: r.size!, ...item }) : null;
    const flags = [...r.flags, ...(suspect.has(r.id) ? ["suspect"] : [])];
    return {
      id: r.id,
      itemKey: r.itemKey,
      index: r.index,
      values: r.values.map(Number),
      unit: r.unit,
      size,
      outOfRound: n(r.outOfRound),
      correction: size == null ? null : temperatureCorrection({ size: r.size!, partMaterial: r.partMaterial as MaterialKey | null, temperatureC: r.temperatureC, toolTemperatureC: r.toolTemperatureC }),
      goEntered: r.goEntered,
      noGoEntered: r.noGoEntered,
      goLeaf: goLeaf?.id ? { id: goLeaf.id, label: goLeaf.label, thickness: Number(goLeaf.nominal) } : null,
      noGoLeaf: noGoLeaf?.id ? { id: noGoLeaf.id, label: noGoLeaf.label, thickness: Number(noGoLeaf.nominal) } : null,
      visualResult: r.visualResult,
      finding: r.finding,
      verdict: r.verdict,
      verdictText:
        r.visualResult != null
          ? r.visualResult === "serviceable" ? "Serviceable" : "Reject"
          : r.goEntered != null
            ? r.verdict === "within_limits" ? "Within limits (go entered, no-go did not)" : "Outside limits"
            : item ? verdictText(item, judgement, r.verdict) : r.verdict,
      flags,
      tools: toolsBy.get(r.id) ?? [],
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
}

/** The check sheet of a job: every item × index with its current reading, size, clearance, verdict, flags and tools. */
export async function buildCheckSheet(db: DbOrTx, jobId: string): Promise<CheckSheet> {
  const summary = await jobsRepository.summary(db, jobId);
  if (!summary) throw notFound("job", jobId);
  // One after another: inside a transaction these share one connection.
  const table = (await limitTablesRepository.summary(db, summary.job.limitTableId))!;
  const itemRows = await limitTablesRepository.items(db, summary.job.limitTableId);
  const readingRows = await readingsRepository.ofJob(db, jobId);
  const signoffRows = await jobsRepository.signoffs(db, jobId);
  const items = itemRows.map(toItemView);
  const byKey = new Map(items.map((i) => [i.key, i]));
  const views = await readingViews(db, readingRows, byKey);

  const current = new Map<string, ReadingView>();
  const history = new Map<string, ReadingView[]>();
  for (const v of views) {
    const k = slotKey(v.itemKey, v.index);
    if (v.supersededById) history.set(k, [...(history.get(k) ?? []), v]);
    else current.set(k, v);
  }
  const find = (itemKey: string, index: number): SheetReading | undefined => current.get(slotKey(itemKey, index));

  const missing: CheckSheet["summary"]["missing"] = [];
  let places = 0;
  let outside = 0;
  let flagged = 0;
  const sheetItems: SheetItem[] = items.map((item) => {
    const rows: SheetRow[] = [];
    for (let index = 1; index <= item.repeat; index++) {
      const k = slotKey(item.key, index);
      if (item.kind === "clearance") {
        const c = clearanceAt(item, index, find);
        const sides = [item.boreKey && current.get(slotKey(item.boreKey, index)), item.journalKey && current.get(slotKey(item.journalKey, index))];
        const flags = [...new Set(sides.flatMap((s) => (s ? s.flags : [])))];
        rows.push({ index, reading: null, history: [], clearance: c.clearance, judgement: c.judgement, verdict: c.verdict, verdictText: verdictText(item, c.judgement, c.verdict), flags });
        if (c.verdict === "outside_limits") outside++;
        continue;
      }
      places++;
      const reading = current.get(k) ?? null;
      if (!reading) missing.push({ itemKey: item.key, index, label: item.label });
      if (reading?.verdict === "outside_limits") outside++;
      if (reading && reading.flags.length) flagged++;
      const judgement = reading?.size != null ? judgeAgainstLimits({ value: reading.size, ...item }) : null;
      rows.push({
        index,
        reading,
        history: history.get(k) ?? [],
        clearance: null,
        judgement,
        verdict: reading?.verdict ?? "pending",
        verdictText: reading?.verdictText ?? "Pending",
        flags: reading?.flags ?? [],
      });
    }
    return { ...item, rows };
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

  return {
    ...toJobSummary(summary),
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
    },
    items: sheetItems,
    signoffs,
    locked: summary.signed,
    changedSinceSignoff,
    summary: { places, recorded: places - missing.length, missing, outside, flagged },
    tools: [...toolsUsed.values()].sort((a, b) => a.assetTag.localeCompare(b.assetTag)),
  };
}
