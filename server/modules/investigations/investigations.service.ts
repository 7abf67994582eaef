import type { Db, DbOrTx, Tx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { AppError, notFound, refused } from "../../http/errors";
import { recordAudit } from "../audit/audit.repository";
import { getSettings } from "../settings/settings.service";
import { dec, num } from "../../../shared/common/decimal";
import { convertLength } from "../../../shared/common/units";
import { rejudgeAffectedReading, type ReviewedReading, type ToolErrorPoint, type ToolErrors } from "../../../shared/investigations/affected-reading";
import { toItemView } from "../limit-tables/limit-tables.service";
import { evidenceOfRows } from "../readings/reading-evidence";
import { dependentItems, type ItemRules, type ReadingEvidence } from "../../../shared/inspection/judging";
import { rejudgeCalibration, type StandardError } from "../../../shared/investigations/cascade";
import type {
  AffectedItemsPage,
  AffectedItemsQuery,
  CreateDisposition,
  Disposition,
  InvestigationDetail,
  InvestigationItem,
  InvestigationListQuery,
  InvestigationSummary,
  RemeasureCandidate,
} from "../../../shared/investigations/investigations.schemas";
import { AffectedItemsQuerySchema, InvestigationListQuerySchema } from "../../../shared/investigations/investigations.schemas";
import type { dispositions } from "./investigations.table";
import * as repo from "./investigations.repository";
import { afterCommit, deliverNotices, recordNotices, sendAfterCommit } from "./investigations.notify";
import type { Finding, FindingDeps, StoredFinding } from "./investigations.types";

export type { StoredFinding } from "./investigations.types";

type ItemInsert = repo.ItemValues;

const n = (x: string | null | undefined) => (x == null ? null : Number(x));
const s = (x: number | null | undefined) => (x == null ? null : dec(x).toString());
const iso = (d: Date | null) => (d ? d.toISOString() : null);

const WINDOW_RULE =
  "From the last time the tool was known good (its last calibration before the finding that left it in tolerance — as-found in tolerance, or adjusted so that its as-left is — " +
  "or, where the shop's setting says so, its last passing intermediate check), inclusive, up to the finding, inclusive. Never known good: every reading before the finding.";

/** How many check sheets are loaded at a time while re-judging: bounded memory, a fixed number of queries per chunk. */
const JOBS_PER_CHUNK = 200;

/**
 * Re-judges readings taken with one tool whose error is `errors`, under the check sheet's rules: one item per reading.
 * One streaming pass over the check sheets they belong to: of each sheet, only the current readings at the places an
 * affected reading is judged with (the other sides of its clearances, the other stations of its tapers) are loaded,
 * grouped by place index, and every affected reading goes through the same pure shared function as the sheet itself
 * (shared/investigations/affected-reading.ts).
 */
async function rejudgeReadings(tx: DbOrTx, rs: repo.ReadingRow[], errors: ToolErrors, toolId: string): Promise<ItemInsert[]> {
  if (rs.length === 0) return [];
  const byJob = new Map<string, repo.ReadingRow[]>();
  for (const r of rs) {
    const list = byJob.get(r.jobId);
    if (list) list.push(r);
    else byJob.set(r.jobId, [r]);
  }
  const jobIds = [...byJob.keys()];
  const ctx = await repo.jobsWithTables(tx, jobIds);
  const jobById = new Map(ctx.jobs.map((j) => [j.id, j]));
  const tableById = new Map(ctx.tables.map((t) => [t.id, t]));
  // Each table's items as the judging rules read them, once per table.
  const rulesOf = new Map<string, ItemRules[]>();
  for (const it of ctx.items) {
    const list = rulesOf.get(it.limitTableId);
    if (list) list.push(toItemView(it));
    else rulesOf.set(it.limitTableId, [toItemView(it)]);
  }
  const label = (it: ItemRules, index: number) => `${it.label}${it.repeat > 1 ? ` no. ${index}` : ""}`;
  const out = new Map<string, ItemInsert>();

  // The places whose readings an affected reading of an item is judged with: its own, and the other sides of the
  // clearances and the other stations of the tapers it feeds (judgeRow reads nothing else).
  const sidesOf = new Map<string, string[]>();
  for (const [tableId, list] of rulesOf)
    for (const it of list) {
      const keys = new Set([it.key]);
      for (const d of dependentItems(list, it.key)) for (const k of [d.boreKey, d.journalKey, ...(d.stationKeys ?? [])]) if (k) keys.add(k);
      sidesOf.set(`${tableId}:${it.key}`, [...keys]);
    }

  for (let c = 0; c < jobIds.length; c += JOBS_PER_CHUNK) {
    const chunk = jobIds.slice(c, c + JOBS_PER_CHUNK);
    // The affected reading is itself the current reading of its own place; the other sides are read from the sheet.
    const places = new Map<string, { jobId: string; index: number; itemKey: string }>();
    for (const jobId of chunk)
      for (const r of byJob.get(jobId)!)
        for (const itemKey of sidesOf.get(`${jobById.get(jobId)!.limitTableId}:${r.itemKey}`) ?? [])
          if (itemKey !== r.itemKey) places.set(`${jobId}:${r.index}:${itemKey}`, { jobId, index: r.index, itemKey });
    const others = await repo.currentReadingsAtPlaces(tx, [...places.values()]);
    const sheet = { readings: others, toolsOf: await repo.toolsOfReadings(tx, [...others, ...chunk.flatMap((j) => byJob.get(j)!)].map((r) => r.id)) };
    // Evidence per table unit (a legacy feeler reading's leaves are converted into its table's unit).
    const evidence = new Map<string, ReadingEvidence>();
    const rowsByTable = new Map<string, repo.ReadingRow[]>();
    for (const r of [...sheet.readings, ...chunk.flatMap((j) => byJob.get(j)!)]) {
      const tableId = jobById.get(r.jobId)!.limitTableId;
      const list = rowsByTable.get(tableId);
      if (list) list.push(r);
      else rowsByTable.set(tableId, [r]);
    }
    for (const [tableId, rows] of rowsByTable) for (const [id, e] of await evidenceOfRows(tx, rows, tableById.get(tableId)!.unit)) evidence.set(id, e);
    const reviewed = (r: repo.ReadingRow): ReviewedReading => ({ ...evidence.get(r.id)!, id: r.id, toolIds: sheet.toolsOf.get(r.id) ?? [], recordedVerdict: r.verdict });
    // The sheet's readings by place index: the siblings of a reading are the other readings of its job and index.
    const atIndex = new Map<string, ReviewedReading[]>();
    for (const r of sheet.readings) {
      const key = `${r.jobId}:${r.index}`;
      const list = atIndex.get(key);
      if (list) list.push(reviewed(r));
      else atIndex.set(key, [reviewed(r)]);
    }
    for (const jobId of chunk) {
      const job = jobById.get(jobId)!;
      const table = tableById.get(job.limitTableId)!;
      const items = rulesOf.get(job.limitTableId) ?? [];
      const judgingCtx = { tableUnit: table.unit, tableExpansionPerK: n(table.expansionPerK) };
      for (const r of byJob.get(jobId)!) {
        const siblings = (atIndex.get(`${r.jobId}:${r.index}`) ?? []).filter((x) => x.id !== r.id);
        const j = rejudgeAffectedReading({ reading: reviewed(r), toolId, errors, siblings, items, ctx: judgingCtx, label });
        out.set(r.id, {
          readingId: r.id,
          toolId,
          verdictCouldChange: j.verdictCouldChange,
          basis: j.basis,
          marginBefore: s(j.marginBefore),
          marginAfter: s(j.marginAfter),
          correctedValue: s(j.correctedValue),
          rejudged: { quantity: j.quantity, measuredValue: j.measuredValue, bandLow: j.bandLow, bandHigh: j.bandHigh, verdictNow: j.verdictNow, places: j.places },
          copied: { jobId: r.jobId, sheetSerial: job.engineSerial, takenBy: r.takenBy, takenAt: r.takenAt, placeIndex: r.index, recordedVerdict: r.verdict },
        });
      }
    }
  }
  // In the order the readings were taken, as before.
  return rs.map((r) => out.get(r.id)!);
}

function pointsOf(rows: { nominal: string; errorAsFound: string; uncertainty: string | null; elementId: string | null }[]): ToolErrorPoint[] {
  return rows.map((p) => ({ nominal: Number(p.nominal), error: Number(p.errorAsFound), uncertainty: n(p.uncertainty), elementId: p.elementId }));
}

/** Opens the investigation of a finding on a tool, inside the caller's transaction. */
export async function openToolInvestigation(tx: Tx, deps: FindingDeps, finding: Finding): Promise<{ investigationId: string }> {
  const tool = await repo.findTool(tx, finding.toolId);
  if (!tool) throw new Error(`investigation: tool ${finding.toolId} missing`);
  const settings = await getSettings(tx, deps.timeZone);
  const good = await repo.lastKnownGood(tx, {
    toolId: tool.id,
    before: finding.at,
    excludeCalibrationId: finding.kind === "as_found_failure" ? finding.calibrationId : null,
    excludeCheckId: finding.kind === "check_failure" ? finding.checkId : null,
    countPassingChecks: settings.windowStartsAtPassingCheck,
  });
  const windowStart = good?.at ?? null;

  let points: ToolErrorPoint[] | null = null;
  let mpes: (number | null)[] = [];
  let summary: string;
  let label: string;
  if (finding.kind === "as_found_failure") {
    const rows = await repo.calibrationPointsOf(tx, finding.calibrationId);
    points = pointsOf(rows);
    mpes = rows.map((p) => n(p.mpe));
    const failed = rows.filter((p) => !p.asFoundInTolerance);
    label = "as-found out of tolerance";
    summary = `${tool.assetTag} (${tool.description}) was found out of tolerance at calibration: ${failed
      .map((p) => `${dec(p.errorAsFound).gt(0) ? "+" : ""}${p.errorAsFound} ${tool.unit} at ${p.nominal} ${tool.unit} (permissible ±${p.mpe})`)
      .join("; ")}.`;
  } else if (finding.kind === "check_failure") {
    const check = await tx.query.intermediateChecks.findFirst({ where: (c, { eq }) => eq(c.id, finding.checkId) });
    if (!check) throw new Error(`investigation: check ${finding.checkId} missing`);
    points = [{ nominal: Number(check.nominal), error: Number(check.deviation), uncertainty: null }];
    mpes = [n(check.tolerance)];
    label = "failed intermediate check";
    summary = `${tool.assetTag} (${tool.description}) failed an intermediate check: ${dec(check.deviation).gt(0) ? "+" : ""}${check.deviation} ${tool.unit} at ${check.nominal} ${tool.unit} (permissible ±${check.tolerance}).`;
  } else {
    // A lost tool's error is unknown; a damaged one's too, unless a calibration since the damage found its as-found.
    const later = finding.kind === "damaged" ? await repo.firstCalibrationFrom(tx, tool.id, finding.at) : null;
    if (later) {
      const rows = await repo.calibrationPointsOf(tx, later.id);
      points = pointsOf(rows);
      mpes = rows.map((p) => n(p.mpe));
    }
    label = finding.kind === "lost" ? "lost" : "returned damaged";
    summary =
      finding.kind === "lost"
        ? `${tool.assetTag} (${tool.description}) was marked lost; its error is unknown, so every reading it took since it was last known good could have been judged differently.`
        : `${tool.assetTag} (${tool.description}) was returned damaged; ${later ? "the as-found of its next calibration gives its error" : "its error is unknown until a calibration finds its as-found"}.`;
  }

  const errors: ToolErrors = { unit: tool.unit, points, range: { min: Number(tool.rangeMin), max: Number(tool.rangeMax) } };
  // A window of a few hundred readings is re-judged here; a larger one after the finding commits (gatherReadings), so
  // that recording the finding never waits on thousands of readings.
  const inline = (await repo.countReadingsWithTool(tx, tool.id, windowStart, finding.at, (deps.inlineReadings ?? INLINE_READINGS) + 1)) <= (deps.inlineReadings ?? INLINE_READINGS);
  const items = inline ? await rejudgeReadings(tx, await repo.readingsWithTool(tx, tool.id, windowStart, finding.at), errors, tool.id) : null;
  const stored: StoredFinding = {
    subject: `${tool.assetTag} (${label})`,
    summary,
    unit: tool.unit,
    errors: points ? points.map((p, i) => ({ nominal: p.nominal, error: p.error, uncertainty: p.uncertainty, mpe: mpes[i] ?? null })) : null,
    windowRule: WINDOW_RULE,
    note: null,
    checkoutId: finding.kind === "damaged" ? finding.checkoutId : null,
    knownGood: good ? { source: good.source, id: good.id, at: good.at.toISOString() } : null,
    notifications: null,
  };
  const inv = await repo.insertInvestigation(tx, {
    toolId: tool.id,
    trigger: finding.kind,
    calibrationId: finding.kind === "as_found_failure" ? finding.calibrationId : null,
    checkId: finding.kind === "check_failure" ? finding.checkId : null,
    openedAt: deps.clock.now(),
    openedBy: finding.actorId,
    windowStart,
    windowEnd: finding.at,
    finding: stored,
    gathering: items === null,
    rejudgedWith: errors,
  });
  if (items) return finishOpening(tx, deps, inv, items, finding.actorId);
  await recordAudit(tx, { actorId: finding.actorId, action: "investigation.open", entityType: "investigation", entityId: inv.id, after: openedAudit(inv, null), at: deps.clock.now() });
  gatherAfterCommit(tx, deps, inv.id);
  return { investigationId: inv.id };
}

/** How many readings an opening re-judges in the finding's own transaction; more are gathered after it commits. */
export const INLINE_READINGS = 500;

const openedAudit = (inv: repo.InvestigationRow, items: ItemInsert[] | null) => ({
  trigger: inv.trigger,
  toolId: inv.toolId,
  standardId: inv.standardId,
  windowStart: iso(inv.windowStart),
  windowEnd: iso(inv.windowEnd),
  ...(items ? { items: items.length, couldChange: items.filter((i) => i.verdictCouldChange).length } : { gathering: true }),
});

/**
 * Once the opening transaction has committed, gathers the investigation's affected readings on the same connection
 * (as sendAfterCommit delivers notices), then sends its notices. A rolled-back opening has nothing to gather; one the
 * process did not finish (a crash, a lost connection) is gathered by the minute's sweep (gatherPendingInvestigations).
 */
function gatherAfterCommit(tx: Tx, deps: FindingDeps, investigationId: string) {
  afterCommit(
    tx,
    async (db) => {
      if ((await gatherReadings(db, deps, investigationId)) && deps.mailer) await deliverNotices(db, deps.mailer, deps.clock, investigationId);
    },
    (err) => deps.logger?.warn({ err, investigationId }, "investigation: gathering its affected readings failed; the minute's sweep gathers them"),
  );
}

/**
 * Re-judges and writes the affected readings of an investigation that is still gathering, in one transaction that
 * holds its row: a second gatherer (another instance, the sweep) skips it, and a failure leaves it gathering, to be
 * gathered again. True when this call wrote them.
 */
export async function gatherReadings(db: Db, deps: Pick<FindingDeps, "clock">, investigationId: string): Promise<boolean> {
  return db.transaction(async (tx) => {
    const inv = await repo.claimGathering(tx, investigationId);
    if (!inv || !inv.toolId) return false;
    const rs = await repo.readingsWithTool(tx, inv.toolId, inv.windowStart, inv.windowEnd);
    const items = await rejudgeReadings(tx, rs, inv.rejudgedWith as ToolErrors, inv.toolId);
    await repo.insertItems(tx, inv.id, items);
    const done = await repo.updateInvestigation(tx, inv.id, { gathering: false });
    await recordAudit(tx, {
      actorId: null,
      action: "investigation.gathered",
      entityType: "investigation",
      entityId: inv.id,
      after: { items: items.length, couldChange: items.filter((i) => i.verdictCouldChange).length },
      at: deps.clock.now(),
    });
    await recordNotices(tx, done.id, done.finding as StoredFinding);
    return true;
  });
}

/** Gathers every investigation still gathering (a sweep for the ones a crash left behind), oldest first; how many. */
export async function gatherPendingInvestigations(db: Db, deps: Pick<FindingDeps, "clock" | "mailer">): Promise<number> {
  let gathered = 0;
  for (const id of await repo.gatheringIds(db)) {
    if (!(await gatherReadings(db, deps, id))) continue;
    gathered++;
    if (deps.mailer) await deliverNotices(db, deps.mailer, deps.clock, id);
  }
  return gathered;
}

async function finishOpening(tx: Tx, deps: FindingDeps, inv: repo.InvestigationRow, items: ItemInsert[], actorId: string | null) {
  await repo.insertItems(tx, inv.id, items);
  await recordAudit(tx, { actorId, action: "investigation.open", entityType: "investigation", entityId: inv.id, after: openedAudit(inv, items), at: deps.clock.now() });
  await recordNotices(tx, inv.id, inv.finding as StoredFinding);
  sendAfterCommit(tx, deps.mailer, deps.clock, inv.id);
  return { investigationId: inv.id };
}

/**
 * Opens the investigation of a finding on a reference standard: every calibration performed with it since its
 * last certificate before the finding is re-judged with its error, and every tool whose verdict could change is
 * carried in with the readings it took while that calibration vouched for it.
 */
export async function openStandardInvestigation(
  db: Db,
  deps: FindingDeps,
  args: { standardId: string; foundAt: Date; errors: { nominal: number; error: number; uncertainty?: number }[]; note?: string; actorId: string },
): Promise<{ investigationId: string }> {
  return db.transaction(async (tx) => {
    const std = await repo.findStandard(tx, args.standardId);
    if (!std) throw notFound("standard", args.standardId);
    if (args.foundAt > deps.clock.now()) throw new AppError("found_in_future", 400, "A finding cannot be dated in the future.");
    const windowStart = await repo.standardKnownGoodSince(tx, std.id, args.foundAt, deps.timeZone);
    const cals = await repo.calibrationsWithStandard(tx, std.id, windowStart, args.foundAt);
    const items: ItemInsert[] = [];
    const seen = new Set<string>();
    for (const { calibration: cal, tool } of cals) {
      const pts = await repo.calibrationPointsOf(tx, cal.id);
      if (pts.length === 0) continue;
      const stdErrors: StandardError[] = args.errors.map((e) => ({
        nominal: num(convertLength(e.nominal, std.unit, tool.unit)),
        error: num(convertLength(e.error, std.unit, tool.unit)),
        uncertainty: e.uncertainty == null ? null : num(convertLength(e.uncertainty, std.unit, tool.unit)),
      }));
      const rj = rejudgeCalibration(
        pts.map((p) => ({ nominal: Number(p.nominal), reference: Number(p.reference), asFound: Number(p.asFound), asLeft: n(p.asLeft), mpe: Number(p.mpe), uncertainty: n(p.uncertainty) })),
        stdErrors,
        cal.decisionRule,
        tool.unit,
      );
      items.push({
        calibrationId: cal.id,
        toolId: tool.id,
        verdictCouldChange: rj.verdictCouldChange,
        basis: `Calibration of ${tool.assetTag} on ${cal.performedAt.toISOString().slice(0, 10)} with ${std.assetTag}. ${rj.basis}`,
        marginBefore: s(rj.marginBefore),
        marginAfter: s(rj.marginAfter),
        correctedValue: s(rj.correctedValue),
        copied: { jobId: null, sheetSerial: null, takenBy: null, takenAt: cal.performedAt, placeIndex: null, recordedVerdict: null },
      });
      if (!rj.verdictCouldChange) continue;
      // The calibration vouched for the tool until its next one; the readings of that stretch are re-judged with the tool's true as-left error.
      const next = await repo.nextCalibrationAfter(tx, tool.id, cal.performedAt);
      const end = next ? new Date(next.getTime() - 1) : deps.clock.now();
      const rs = (await repo.readingsWithTool(tx, tool.id, cal.performedAt, end)).filter((r) => !seen.has(`${r.id}:${tool.id}`));
      rs.forEach((r) => seen.add(`${r.id}:${tool.id}`));
      items.push(...(await rejudgeReadings(tx, rs, { unit: tool.unit, points: rj.toolErrorsAsLeft, range: { min: Number(tool.rangeMin), max: Number(tool.rangeMax) } }, tool.id)));
    }
    const couldChangeCals = items.filter((i) => i.calibrationId && i.verdictCouldChange).length;
    const stored: StoredFinding = {
      subject: `${std.assetTag} (reference standard out of tolerance)`,
      summary:
        `Reference standard ${std.assetTag} (${std.name}) was found off: ${args.errors.map((e) => `${e.error > 0 ? "+" : ""}${dec(e.error).toString()} ${std.unit} at ${dec(e.nominal).toString()} ${std.unit}`).join("; ")}. ` +
        `${cals.length} calibration(s) were performed with it in the window; ${couldChangeCals} could have had a different verdict.`,
      unit: std.unit,
      errors: args.errors.map((e) => ({ nominal: e.nominal, error: e.error, uncertainty: e.uncertainty ?? null, mpe: null })),
      windowRule: "From the day the standard's last certificate before the finding was issued (shop time zone), inclusive, up to the finding, inclusive.",
      note: args.note ?? null,
      checkoutId: null,
      knownGood: windowStart ? { source: "certificate", id: null, at: windowStart.toISOString() } : null,
      notifications: null,
    };
    const inv = await repo.insertInvestigation(tx, {
      standardId: std.id,
      trigger: "as_found_failure",
      openedAt: deps.clock.now(),
      openedBy: args.actorId,
      windowStart,
      windowEnd: args.foundAt,
      finding: stored,
    });
    return finishOpening(tx, deps, inv, items, args.actorId);
  });
}

/** The list: api.md's fields, plus counts for the screens. */
export async function listInvestigations(db: DbOrTx, query: InvestigationListQuery): Promise<{ items: InvestigationSummary[]; total: number }> {
  const q = InvestigationListQuerySchema.parse(query);
  const { total, rows } = await repo.listInvestigations(db, q);
  const { readingsOf, counts } = await repo.itemSummaries(db, rows.map((r) => r.inv.id));
  const items = rows.map((r) => summaryOf(r, readingsOf.get(r.inv.id) ?? [], counts.get(r.inv.id)));
  return { items, total };
}

function summaryOf(
  r: { inv: repo.InvestigationRow; toolAssetTag: string | null; toolDescription: string | null; standardAssetTag: string | null; standardName: string | null },
  affectedReadings: { readingId: string; jobId: string; verdictCouldChange: boolean }[],
  c: { items: number; couldChange: number; undisposed: number } | undefined,
): InvestigationSummary {
  return {
    id: r.inv.id,
    toolAssetTag: r.toolAssetTag ?? r.standardAssetTag,
    status: r.inv.status,
    windowStart: iso(r.inv.windowStart),
    windowEnd: r.inv.windowEnd.toISOString(),
    affectedReadings,
    trigger: r.inv.trigger,
    standardAssetTag: r.standardAssetTag,
    description: r.toolDescription ?? r.standardName ?? "",
    openedAt: r.inv.openedAt.toISOString(),
    closedAt: iso(r.inv.closedAt),
    affectedCount: c?.items ?? 0,
    couldChangeCount: c?.couldChange ?? 0,
    undisposedCount: c?.undisposed ?? 0,
    gathering: r.inv.gathering,
  };
}

/** One investigation: its finding, window and totals by verdict; its items are read a page at a time (listItems). */
export async function getInvestigation(db: DbOrTx, id: string): Promise<InvestigationDetail> {
  const inv = await repo.findInvestigation(db, id);
  if (!inv) throw notFound("investigation", id);
  const tool = inv.toolId ? await repo.findTool(db, inv.toolId) : null;
  const std = inv.standardId ? await repo.findStandard(db, inv.standardId) : null;
  const totals = await repo.itemTotals(db, id);
  const { affectedReadings: _omitted, ...summary } = summaryOf(
    { inv, toolAssetTag: tool?.assetTag ?? null, toolDescription: tool?.description ?? null, standardAssetTag: std?.assetTag ?? null, standardName: std?.name ?? null },
    [],
    totals,
  );
  const f = inv.finding as StoredFinding;
  return {
    ...summary,
    tool: tool ? { assetTag: tool.assetTag, description: tool.description, unit: tool.unit } : null,
    standard: std ? { assetTag: std.assetTag, name: std.name, unit: std.unit } : null,
    calibrationId: inv.calibrationId,
    checkId: inv.checkId,
    checkoutId: f.checkoutId ?? null,
    openedBy: await repo.userName(db, inv.openedBy),
    closedBy: await repo.userName(db, inv.closedBy),
    closingSummary: inv.closingSummary,
    finding: { summary: f.summary, unit: f.unit, errors: f.errors, windowRule: f.windowRule, note: f.note, notifications: f.notifications },
    totals,
    jobs: await repo.itemJobs(db, id),
  };
}

/** One page of an investigation's affected items, sorted and filtered in the database, with totals over the filter. */
export async function listItems(db: DbOrTx, id: string, query: AffectedItemsQuery): Promise<AffectedItemsPage> {
  const q = AffectedItemsQuerySchema.parse(query);
  // The page is read beside the check that the investigation exists (an unknown one has no items); its totals, which
  // are kept per process, only once it is known to exist.
  const [inv, rows] = await Promise.all([repo.findInvestigation(db, id), repo.itemPage(db, id, q)]);
  if (!inv) throw notFound("investigation", id);
  const [totals, items] = await Promise.all([repo.itemTotals(db, id, q), itemViews(db, rows)]);
  return { items, total: totals.items, totals };
}

/** Every affected item, a page at a time in the table's default order (for the report). */
export async function* allItems(db: DbOrTx, id: string, pageSize = 500): AsyncGenerator<InvestigationItem[]> {
  for (let page = 1; ; page++) {
    const rows = await repo.itemPage(db, id, { page, pageSize });
    if (rows.length === 0) return;
    yield await itemViews(db, rows);
    if (rows.length < pageSize) return;
  }
}

async function itemViews(db: DbOrTx, rows: Awaited<ReturnType<typeof repo.itemPage>>): Promise<InvestigationItem[]> {
  const dispOf = new Map<string, Disposition[]>();
  for (const { d: x, byName } of await repo.dispositionsOfItems(db, rows.map((r) => r.item.id))) {
    const list = dispOf.get(x.investigationItemId) ?? [];
    list.push(dispositionView(x, byName));
    dispOf.set(x.investigationItemId, list);
  }
  return rows.map(({ item, toolAssetTag, reading, job, itemLabel, takenByName, calibration }) => {
    const history = dispOf.get(item.id) ?? [];
    const superseded = new Set(history.map((d) => d.supersedesId).filter((x): x is string => !!x));
    const current = [...history].reverse().find((d) => !superseded.has(d.id)) ?? null;
    return {
      id: item.id,
      kind: item.readingId ? "reading" : "calibration",
      toolAssetTag,
      readingId: item.readingId,
      calibrationId: item.calibrationId,
      job: job ? { id: job.id, engineSerial: job.engineSerial, engineModel: job.engineModel, workOrder: job.workOrder } : null,
      itemKey: reading?.itemKey ?? null,
      itemLabel: reading ? (itemLabel ?? reading.itemKey) : calibration ? "Calibration (as-found error)" : null,
      index: reading?.index ?? null,
      unit: reading?.unit ?? null,
      values: (reading?.values ?? []).map(Number),
      quantity: rejudgedOf(item).quantity ?? (reading ? "size" : null),
      measuredValue: rejudgedOf(item).measuredValue ?? (reading ? n(reading.size) : null),
      bandLow: rejudgedOf(item).bandLow ?? null,
      bandHigh: rejudgedOf(item).bandHigh ?? null,
      places: rejudgedOf(item).places ?? [],
      originalVerdict: reading?.verdict ?? (calibration ? calibration.result : null),
      correctedValue: n(item.correctedValue),
      marginBefore: n(item.marginBefore),
      marginAfter: n(item.marginAfter),
      verdictCouldChange: item.verdictCouldChange,
      basis: item.basis,
      takenAt: reading ? reading.takenAt.toISOString() : calibration ? calibration.performedAt.toISOString() : null,
      takenBy: takenByName ?? calibration?.performedByName ?? null,
      override: !!reading?.overrideReason,
      disposition: current,
      dispositions: history,
    };
  });
}

/** What an item's re-judging kept (items opened before it was kept have none). */
function rejudgedOf(item: { rejudged: unknown }): Partial<StoredRejudged> {
  return (item.rejudged as StoredRejudged | null) ?? {};
}

interface StoredRejudged {
  quantity: string;
  measuredValue: number | null;
  bandLow: number | null;
  bandHigh: number | null;
  verdictNow: string;
  places: InvestigationItem["places"];
}

function dispositionView(x: typeof dispositions.$inferSelect, byName: string): Disposition {
  return {
    id: x.id,
    itemId: x.investigationItemId,
    kind: x.kind,
    rationale: x.rationale,
    decidedBy: { id: x.decidedBy, name: byName },
    decidedAt: x.decidedAt.toISOString(),
    notifiedWhom: x.notifiedWhom,
    notifiedHow: x.notifiedHow,
    notifiedAt: iso(x.notifiedAt),
    remeasureReadingId: x.remeasureReadingId,
    supersedesId: x.supersedesId,
  };
}

function assertOpen(inv: repo.InvestigationRow) {
  if (inv.status === "closed") throw refused("investigation_closed", "This investigation is closed; a closed investigation is kept as it was and takes no more dispositions.");
  assertGathered(inv);
}

/**
 * Refuses at once while the readings are being gathered, before taking the investigation's lock (the gathering holds
 * it until it commits). An investigation never goes back to gathering, so one found gathered stays so.
 */
async function refuseWhileGathering(db: DbOrTx, id: string) {
  const inv = await repo.findInvestigation(db, id);
  if (inv) assertGathered(inv);
}

/** Nothing is decided on an investigation whose affected readings are still being gathered. */
export function assertGathered(inv: Pick<repo.InvestigationRow, "gathering">) {
  if (inv.gathering) throw refused("investigation_gathering", "The affected readings of this investigation are still being gathered; try again in a moment.");
}

/** True when `newer` corrects `older`, directly or through a chain of corrections. */
async function corrects(tx: DbOrTx, newer: repo.ReadingRow, olderId: string): Promise<boolean> {
  let cur: repo.ReadingRow | null = newer;
  for (let hops = 0; cur && cur.supersedesId && hops < 50; hops++) {
    if (cur.supersedesId === olderId) return true;
    cur = await repo.findReading(tx, cur.supersedesId);
  }
  return false;
}

/**
 * What a remeasurement of an affected reading can be: the later readings of the same place (job, item, index) on
 * the same check sheet, newest first.
 */
export async function remeasureCandidates(db: DbOrTx, id: string, itemId: string): Promise<RemeasureCandidate[]> {
  const item = await repo.findItem(db, id, itemId);
  if (!item) throw notFound("investigation item", itemId);
  if (!item.readingId) return [];
  const affected = await repo.findReading(db, item.readingId);
  if (!affected) return [];
  const rows = await repo.laterReadingsOfPlace(db, { jobId: affected.jobId, itemKey: affected.itemKey, index: affected.index, after: affected.takenAt, excludeId: affected.id });
  const out: RemeasureCandidate[] = [];
  for (const { reading: r, takenByName, toolAssetTags } of rows) {
    out.push({
      id: r.id,
      takenAt: r.takenAt.toISOString(),
      takenBy: takenByName,
      values: r.values.map(Number),
      unit: r.unit,
      size: n(r.size),
      verdict: r.verdict,
      toolAssetTags,
      correctsAffected: await corrects(db, r, affected.id),
    });
  }
  return out;
}

/**
 * Records a disposition for some items (or every item of one job) of an open investigation: all of them or none.
 * Dispositions are evidence: an item that already has one gets a new row superseding it (the old one stays, and the
 * audit line says what it was).
 */
export async function addDispositions(db: Db, clock: Clock, id: string, input: CreateDisposition, actor: { id: string; name: string }) {
  return db.transaction(async (tx) => {
    await refuseWhileGathering(tx, id);
    const inv = await repo.lockInvestigation(tx, id);
    if (!inv) throw notFound("investigation", id);
    assertOpen(inv);
    let items: repo.InvestigationItemRow[];
    if (input.jobId) {
      items = await repo.itemsOfJob(tx, id, input.jobId);
      if (items.length === 0) throw refused("job_not_in_investigation", "No reading of that job is affected by this investigation.");
    } else {
      const all = await repo.itemsOf(tx, id);
      const wanted = new Set(input.itemIds);
      items = all.filter((i) => wanted.has(i.id));
      if (items.length !== wanted.size) {
        const known = new Set(items.map((i) => i.id));
        throw refused("items_not_in_investigation", "Some of the items named are not affected items of this investigation.", { itemIds: [...wanted].filter((x) => !known.has(x)) });
      }
    }
    const now = clock.now();
    const remeasureReadingId = input.kind === "remeasure" ? (input.remeasureReadingId ?? null) : null;
    if (input.kind === "remeasure") {
      const item = items[0];
      if (!item.readingId) throw refused("remeasure_needs_reading", "Only an affected reading can be remeasured; a calibration in a cascade is answered otherwise.");
      const affected = await repo.findReading(tx, item.readingId);
      const newer = await repo.findReading(tx, remeasureReadingId!);
      const samePlace = !!affected && !!newer && newer.jobId === affected.jobId && newer.itemKey === affected.itemKey && newer.index === affected.index;
      if (!affected || !newer || newer.id === affected.id || !samePlace || newer.takenAt <= affected.takenAt) {
        throw refused("remeasure_not_later_reading", "The remeasurement must be a later reading of the same place on the same check sheet (record it on the check sheet, then pick it here).");
      }
    }
    const current = await repo.currentDispositions(tx, items.map((i) => i.id));
    const rows = await repo.insertDispositions(
      tx,
      items.map((i) => ({
        investigationItemId: i.id,
        investigationId: i.investigationId,
        kind: input.kind,
        rationale: input.rationale,
        decidedBy: actor.id,
        decidedAt: now,
        notifiedWhom: input.kind === "notify_owner" ? (input.notifiedWhom ?? null) : null,
        notifiedHow: input.kind === "notify_owner" ? (input.notifiedHow ?? null) : null,
        notifiedAt: input.kind === "notify_owner" ? (input.notifiedAt ? new Date(input.notifiedAt) : now) : null,
        remeasureReadingId,
        supersedesId: current.get(i.id)?.id ?? null,
      })),
    );
    const replaced = [...current.values()];
    await recordAudit(tx, {
      actorId: actor.id,
      action: "investigation.disposition",
      entityType: "investigation",
      entityId: id,
      before: replaced.length ? { dispositions: replaced.map((d) => ({ id: d.id, itemId: d.investigationItemId, kind: d.kind, rationale: d.rationale })) } : undefined,
      after: {
        kind: input.kind,
        rationale: input.rationale,
        itemIds: items.map((i) => i.id),
        jobId: input.jobId ?? null,
        notifiedWhom: input.kind === "notify_owner" ? (input.notifiedWhom ?? null) : null,
        notifiedHow: input.kind === "notify_owner" ? (input.notifiedHow ?? null) : null,
        remeasureReadingId,
        supersedes: replaced.map((d) => d.id),
      },
      at: now,
    });
    return { dispositions: rows.map((r) => dispositionView(r, actor.name)) };
  });
}

/** Closes an investigation with a summary, once every affected item has a disposition; after that it only reads. */
export async function closeInvestigation(db: Db, clock: Clock, id: string, summary: string, actorId: string) {
  return db.transaction(async (tx) => {
    await refuseWhileGathering(tx, id);
    const inv = await repo.lockInvestigation(tx, id);
    if (!inv) throw notFound("investigation", id);
    assertOpen(inv);
    const missing = await repo.itemIdsWithoutDisposition(tx, id);
    if (missing.length) {
      throw refused("dispositions_missing", `${missing.length} affected item(s) still need a disposition before the investigation can close.`, { itemIds: missing });
    }
    const now = clock.now();
    const after = await repo.updateInvestigation(tx, id, { status: "closed", closedAt: now, closedBy: actorId, closingSummary: summary });
    await recordAudit(tx, { actorId, action: "investigation.close", entityType: "investigation", entityId: id, before: { status: "open" }, after: { status: "closed", summary }, at: now });
    return { id: after.id, status: after.status, closedAt: now.toISOString(), closingSummary: summary };
  });
}

