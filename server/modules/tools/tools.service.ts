import Papa from "papaparse";
import { toolsRepository, cursorCodec, SQL_SORTS, type SetElementRow, type SqlSortKey, type ToolListRow, type ToolRow } from "./tools.repository";
import { gatherStatusesAt, statusByTag, statusContext, statusesOfRows, statusOf, type StatusContext, type ToolStatusView } from "./tool-status.service";
import { statusNow } from "./tool-states.sql";
import { changeLifecycle, lockTool, openHold, placeHold, releaseHold } from "./tool-lifecycle.repository";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound, refused } from "../../http/errors";
import { recordStoredFile } from "../files/files.repository";
import { getFamilyRow, toFamily } from "../families/families.service";
import { familiesRepository } from "../families/families.repository";
import { TOOL_STATUSES, isUsableStatus } from "../../../shared/tools/tool-status";
import {
  STILL_IN_CALIBRATION,
  TOOL_CSV_COLUMNS,
  type CreateTool,
  type LifecycleChange,
  type SetElement,
  type ToolActionResult,
  type ToolDetail,
  type ToolListQuery,
  type ToolPage,
  type ToolStatusResponse,
  type ToolSummary,
  type UpdateTool,
} from "../../../shared/tools/tools.schemas";
import type { Page } from "../../../shared/common/lists.schemas";
import { addDays, calendarDate } from "../../../shared/common/dates";
import { fromDb, fromDbOrNull, isoOrNull, toDb, toDbOrNull, unknownReference, type RegisterDeps } from "./register.common";
import type { DbOrTx } from "../../db/client";

/** A tool by asset tag, or 404 naming the tag. */
export async function getToolRow(db: DbOrTx, assetTag: string): Promise<ToolRow> {
  const tool = await toolsRepository.findByTag(db, assetTag);
  if (!tool) throw notFound("tool", assetTag);
  return tool;
}

function statusPart(v: ToolStatusView) {
  return {
    status: v.status,
    usable: v.usable,
    usableForAcceptance: v.usableForAcceptance,
    reasons: v.reasons,
    dueAt: v.dueAt,
    daysToDue: v.daysToDue,
    usesRemaining: v.usesRemaining,
    custodian: v.custodian,
  };
}

export function toToolSummary(r: ToolListRow, v: ToolStatusView): ToolSummary {
  const t = r.tool;
  return {
    id: t.id,
    assetTag: t.assetTag,
    description: t.description,
    familyId: t.familyId,
    familyName: r.familyName,
    kind: r.kind,
    unit: t.unit,
    rangeMin: fromDb(t.rangeMin),
    rangeMax: fromDb(t.rangeMax),
    resolution: fromDb(t.resolution),
    serialNumber: t.serialNumber,
    maker: t.maker,
    model: t.model,
    location: t.location,
    ownerType: t.ownerType,
    ownerUserId: t.ownerUserId,
    ownerName: t.ownerName,
    intervalDays: t.intervalDays,
    lifecycle: t.lifecycle,
    calibrationRequired: t.calibrationRequired,
    acceptanceUse: t.acceptanceUse,
    ...statusPart(v),
  };
}

export function toSetElement(e: SetElementRow): SetElement {
  return {
    id: e.id,
    label: e.label,
    nominal: fromDb(e.nominal),
    grade: e.grade,
    certifiedDeviation: fromDbOrNull(e.certifiedDeviation),
    rejectedAt: isoOrNull(e.rejectedAt),
    rejectedReason: e.rejectedReason,
    usable: e.rejectedAt == null,
  };
}

const STATUS_ORDER = new Map(TOOL_STATUSES.map((s, i) => [s, i]));

/** Values of the derived sort keys; ties keep asset-tag order (the candidates come sorted by tag). */
const DERIVED_SORTS: Record<"status" | "dueAt" | "custodian", (t: ToolSummary) => string | number | null> = {
  status: (t) => STATUS_ORDER.get(t.status)!,
  dueAt: (t) => t.dueAt,
  custodian: (t) => t.custodian?.name.toLowerCase() ?? null,
};

/** Compares two sort values in the given direction, blanks last either way. */
function compareValues(a: string | number | null, b: string | number | null, desc: boolean) {
  if (a === b) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  return (a < b ? -1 : 1) * (desc ? -1 : 1);
}

/** CSV text of register rows, with cells that a spreadsheet would run as formulas made inert. */
export function toolsCsv(rows: ToolSummary[]): string {
  const cell = (v: unknown) => (typeof v === "string" && /^[=+\-@\t\r]/.test(v) ? `'${v}` : v ?? "");
  return Papa.unparse({
    fields: [...TOOL_CSV_COLUMNS],
    data: rows.map((r) =>
      TOOL_CSV_COLUMNS.map((c) => cell(c === "custodian" ? (r.custodian?.name ?? "") : (r as unknown as Record<string, unknown>)[c])),
    ),
  });
}

/**
 * The due-date filters as one test of a row, or null when none is asked for. dueWithinDays: still in
 * calibration and due from today through today + N (shop calendar dates); dueFrom/dueTo: due in that range.
 */
function dueFilterOf(query: Pick<ToolListQuery, "dueWithinDays" | "dueFrom" | "dueTo">, today: string): ((t: ToolSummary) => boolean) | null {
  const { dueWithinDays, dueFrom, dueTo } = query;
  if (dueWithinDays === undefined && !dueFrom && !dueTo) return null;
  const until = dueWithinDays === undefined ? null : addDays(today, dueWithinDays);
  const stillIn = new Set<string>(STILL_IN_CALIBRATION);
  return (t) =>
    t.dueAt != null &&
    (until == null || (stillIn.has(t.status) && t.dueAt >= today && t.dueAt <= until)) &&
    (!dueFrom || t.dueAt >= dueFrom) &&
    (!dueTo || t.dueAt <= dueTo);
}

export function toolsService(deps: RegisterDeps) {
  const { db, clock, defaultTimeZone } = deps;
  const ctx = () => statusContext(db, defaultTimeZone);

  async function actionResult(tool: ToolRow): Promise<ToolActionResult> {
    const v = await statusOf(db, tool.id, clock.now(), await ctx());
    return { assetTag: tool.assetTag, status: v.status, usable: v.usable, reasons: v.reasons };
  }

  async function detail(assetTag: string): Promise<ToolDetail> {
    const tool = await getToolRow(db, assetTag);
    const family = await getFamilyRow(db, tool.familyId);
    const [v, elements, hold, events, familyTools, owners] = await Promise.all([
      ctx().then((c) => statusOf(db, tool.id, clock.now(), c)),
      toolsRepository.elementsOf(db, tool.id),
      openHold(db, tool.id),
      toolsRepository.lifecycleEvents(db, tool.id),
      familiesRepository.countTools(db, family.id),
      toolsRepository.userNames(db, tool.ownerUserId ? [tool.ownerUserId] : []),
    ]);
    return {
      ...toToolSummary({ tool, familyName: family.name, kind: family.kind }, v),
      usageLimit: tool.usageLimit,
      ownerUserName: tool.ownerUserId ? (owners.get(tool.ownerUserId) ?? null) : null,
      notes: tool.notes,
      hasPhoto: !!tool.photoKey,
      createdAt: tool.createdAt.toISOString(),
      lastCalibration: v.lastCalibration,
      family: toFamily(family, familyTools),
      elements: elements.map(toSetElement),
      openHold: hold ? { id: hold.id, reason: hold.reason, placedAt: hold.placedAt.toISOString(), placedBy: hold.placedBy } : null,
      lifecycleEvents: events.map((e) => ({ at: e.at.toISOString(), lifecycle: e.lifecycle, reason: e.reason, byName: e.byName })),
    };
  }

  /**
   * The register, filtered, sorted and paged on the server: one SQL statement and a count, with the
   * status read from tool_states on the shop's date (docs/decisions/013), so "overdue, by due date,
   * page 50" is an index scan; the page's statuses and reasons then come from the one derivation, on the
   * columns each row of the page carries (no second statement).
   * ?after= pages by keyset. When some tool has a record dated after now (a clock set back), the
   * statuses of the candidates are derived in full instead (listDerived).
   */
  async function list(query: ToolListQuery, opts: { all?: boolean } = {}): Promise<ToolPage> {
    const now = clock.now();
    const c = await ctx();
    const desc = query.sort.startsWith("-");
    const key = desc ? query.sort.slice(1) : query.sort;
    const wantUsable = query.usable === undefined ? null : TOOL_STATUSES.filter((st) => isUsableStatus(st) === query.usable);
    const statuses = query.status?.length ? (wantUsable ? query.status.filter((st) => wantUsable.includes(st)) : query.status) : wantUsable ?? undefined;
    const after = query.after ? cursorCodec.decode(query.after) : undefined;
    if (after === null) throw new AppError("bad_cursor", 400, "This page link is not from this list; start again from the first page.");
    // Whether the clock was set back is asked with the page's count (it is rare): the page read for nothing then, a
    // statement saved every other time.
    const { rows, total, clockSetBack } = await toolsRepository.registerPage(
      db,
      {
        ...query,
        statuses,
        dueWithin: query.dueWithinDays === undefined ? undefined : { days: query.dueWithinDays, stillIn: STILL_IN_CALIBRATION },
        dueFrom: query.dueFrom,
        dueTo: query.dueTo,
      },
      { key, desc },
      statusNow(now, c),
      now,
      opts.all ? null : { page: query.page, pageSize: query.pageSize, after },
    );
    if (clockSetBack) return listDerived(query, now, c, opts);
    const views = await statusesOfRows(db, rows.map((r) => r.state), now, c);
    const items = rows.map((r) => toToolSummary(r, views.get(r.tool.id)!));
    const last = rows.at(-1);
    const nextCursor = !opts.all && last && rows.length === query.pageSize ? cursorCodec.encode(last.sortValue, last.tool.assetTag) : null;
    return { items, total, nextCursor };
  }

  /**
   * The register with every candidate's status derived at `now` from the records as they stood then:
   * filters SQL can apply narrow the candidates, statuses are computed for the whole candidate set,
   * then filtered, sorted and paged in memory.
   */
  async function listDerived(query: ToolListQuery, now: Date, c: StatusContext, opts: { all?: boolean }): Promise<ToolPage> {
    const desc = query.sort.startsWith("-");
    const key = (desc ? query.sort.slice(1) : query.sort) as keyof typeof DERIVED_SORTS | SqlSortKey;
    const dueFilter = dueFilterOf(query, calendarDate(now, c.timeZone));
    const sqlKey = key in SQL_SORTS ? (key as SqlSortKey) : null;
    let rows = await toolsRepository.candidates(db, query, sqlKey ? { key: sqlKey, desc } : undefined);
    const statuses = await gatherStatusesAt(db, rows.map((r) => r.tool.id), now, c);
    let items = rows.map((r) => toToolSummary(r, statuses.get(r.tool.id)!));
    rows = [];
    if (query.status?.length) items = items.filter((t) => query.status!.includes(t.status));
    if (query.usable !== undefined) items = items.filter((t) => t.usable === query.usable);
    if (dueFilter) items = items.filter(dueFilter);
    if (!sqlKey) {
      const value = DERIVED_SORTS[key as keyof typeof DERIVED_SORTS];
      // Array.prototype.sort is stable: equal keys keep asset-tag order in both directions.
      items.sort((a, b) => compareValues(value(a), value(b), desc));
    }
    const total = items.length;
    if (!opts.all) items = items.slice((query.page - 1) * query.pageSize, query.page * query.pageSize);
    return { items, total, nextCursor: null };
  }

  return {
    list,
    detail,

    /** Every location named in the register, once each (case aside), sorted: the choices of the location filter. */
    async locations() {
      const seen = new Map<string, string>();
      for (const l of await toolsRepository.locations(db)) if (!seen.has(l.toLowerCase())) seen.set(l.toLowerCase(), l);
      return { items: [...seen.values()] };
    },

    /** The whole current view (filters and sort, every page) as CSV. */
    async csv(query: ToolListQuery) {
      const { items } = await list(query, { all: true });
      return toolsCsv(items);
    },

    async status(assetTag: string, at?: string): Promise<ToolStatusResponse> {
      const when = at ? new Date(at) : clock.now();
      const found = await statusByTag(db, assetTag, when, await ctx());
      if (!found) throw notFound("tool", assetTag);
      const { view: v, description, unit } = found;
      return { assetTag: v.assetTag, at: when.toISOString(), description, unit: unit as ToolStatusResponse["unit"], lastCalibration: v.lastCalibration, ...statusPart(v) };
    },

    async create(input: CreateTool, actorId: string | null): Promise<ToolDetail> {
      await db.transaction(async (tx) => {
        const family = await familiesRepository.findById(tx, input.familyId);
        if (!family) throw unknownReference("family", input.familyId);
        if (family.unit !== input.unit) {
          throw new AppError("unit_mismatch", 400, `The family "${family.name}" is in ${family.unit}; register the tool in ${family.unit} or choose a ${input.unit} family.`);
        }
        if (input.ownerUserId && !(await toolsRepository.userExists(tx, input.ownerUserId))) throw unknownReference("user", input.ownerUserId);
        if (await toolsRepository.tagTaken(tx, input.assetTag)) throw refused("asset_tag_taken", `Asset tag ${input.assetTag} is already in use.`);
        const tool = await toolsRepository.insert(tx, {
          assetTag: input.assetTag,
          familyId: input.familyId,
          description: input.description,
          maker: input.maker ?? null,
          model: input.model ?? null,
          serialNumber: input.serialNumber,
          unit: input.unit,
          rangeMin: toDb(input.rangeMin),
          rangeMax: toDb(input.rangeMax),
          resolution: toDb(input.resolution),
          intervalDays: input.intervalDays,
          usageLimit: input.usageLimit ?? family.usageLimit ?? null,
          location: input.location ?? null,
          ownerType: input.ownerType,
          ownerUserId: input.ownerUserId ?? null,
          ownerName: input.ownerName ?? null,
          calibrationRequired: input.calibrationRequired,
          // A tool that needs no calibration is for reference only, never for acceptance readings.
          acceptanceUse: input.calibrationRequired && input.acceptanceUse,
          notes: input.notes ?? null,
        });
        const elements = await toolsRepository.insertElements(
          tx,
          (input.elements ?? []).map((e) => ({ toolId: tool.id, label: e.label, nominal: toDb(e.nominal), grade: e.grade ?? null, certifiedDeviation: toDbOrNull(e.certifiedDeviation) })),
        );
        await recordAudit(tx, { actorId, action: "tool.create", entityType: "tool", entityId: tool.assetTag, after: { tool, elements }, at: clock.now() });
      });
      return detail(input.assetTag);
    },

    async update(assetTag: string, patch: UpdateTool, actorId: string | null): Promise<ToolDetail> {
      await db.transaction(async (tx) => {
        const before = await getToolRow(tx, assetTag);
        if (patch.ownerUserId && !(await toolsRepository.userExists(tx, patch.ownerUserId))) throw unknownReference("user", patch.ownerUserId);
        const ownerType = patch.ownerType ?? before.ownerType;
        const ownerUserId = patch.ownerUserId !== undefined ? patch.ownerUserId : before.ownerUserId;
        if (ownerType === "personal" && !ownerUserId) throw new AppError("owner_required", 400, "A mechanic's own tool names its owner.");
        const calibrationRequired = patch.calibrationRequired ?? before.calibrationRequired;
        const values = {
          ...patch,
          acceptanceUse: calibrationRequired && (patch.acceptanceUse ?? before.acceptanceUse),
        };
        const after = await toolsRepository.update(tx, before.id, values);
        const changed = Object.fromEntries(Object.keys(values).map((k) => [k, (before as Record<string, unknown>)[k]]));
        await recordAudit(tx, { actorId, action: "tool.update", entityType: "tool", entityId: before.assetTag, before: changed, after: Object.fromEntries(Object.keys(values).map((k) => [k, (after as Record<string, unknown>)[k]])), at: clock.now() });
      });
      return detail(assetTag);
    },

    async quarantine(assetTag: string, reason: string, actorId: string | null) {
      const tool = await getToolRow(db, assetTag);
      if (tool.lifecycle === "retired") throw refused("tool_retired", `${tool.assetTag} is retired; it is out of use already.`);
      await db.transaction((tx) => placeHold(tx, { toolId: tool.id, reason, actorId, at: clock.now() }));
      return actionResult(tool);
    },

    async release(assetTag: string, reason: string, actorId: string | null) {
      const tool = await getToolRow(db, assetTag);
      const now = clock.now();
      await db.transaction(async (tx) => {
        // One release at a time per tool; the status is read on this transaction's connection (never the pool's).
        await lockTool(tx, tool.id);
        if (!(await openHold(tx, tool.id))) throw refused("not_quarantined", `${tool.assetTag} is not quarantined.`);
        // Found out of tolerance (failed calibration, or a failed check since the last one): only a passing calibration clears it.
        const v = await statusOf(tx, tool.id, now, await statusContext(tx, defaultTimeZone));
        const last = v.lastCalibration;
        const failedCheck = await toolsRepository.failedCheckSince(tx, tool.id, last ? new Date(last.performedAt) : null);
        if (last?.result === "fail" || failedCheck) {
          throw refused(
            "calibration_required",
            `${tool.assetTag} was found out of tolerance${failedCheck ? ` at an intermediate check on ${failedCheck.performedAt.toISOString().slice(0, 10)}` : " at its last calibration"}; record a passing calibration before releasing it.`,
          );
        }
        await releaseHold(tx, { toolId: tool.id, reason, actorId, at: now });
      });
      return actionResult(tool);
    },

    async changeLifecycle(assetTag: string, body: LifecycleChange, actorId: string | null) {
      const tool = await getToolRow(db, assetTag);
      if (tool.lifecycle === "lost") throw refused("tool_lost", `${tool.assetTag} is reported lost; record it as found at the crib first.`);
      await db.transaction((tx) => changeLifecycle(tx, { toolId: tool.id, lifecycle: body.lifecycle, reason: body.reason, actorId, at: clock.now() }));
      return actionResult(tool);
    },

    async elements(assetTag: string) {
      const tool = await getToolRow(db, assetTag);
      return (await toolsRepository.elementsOf(db, tool.id)).map(toSetElement);
    },

    async rejectElement(assetTag: string, elementId: string, reason: string, actorId: string | null): Promise<SetElement> {
      const tool = await getToolRow(db, assetTag);
      return db.transaction(async (tx) => {
        const el = await toolsRepository.findElement(tx, tool.id, elementId);
        if (!el) throw notFound("element", elementId);
        if (el.rejectedAt) throw refused("element_already_rejected", `${el.label} of ${tool.assetTag} was rejected already.`);
        const at = clock.now();
        const after = await toolsRepository.rejectElement(tx, el.id, at, reason);
        await recordAudit(tx, { actorId, action: "tool.element.reject", entityType: "set_element", entityId: el.id, before: el, after, at });
        return toSetElement(after);
      });
    },

    async attachPhoto(assetTag: string, file: { buffer: Buffer; fileName: string; contentType: string }, actorId: string | null) {
      if (!deps.storage) throw new AppError("storage_unavailable", 503, "File storage is not available.");
      if (file.contentType === "application/pdf") throw new AppError("unsupported_file_type", 400, "A tool photo is an image (PNG, JPEG or WebP).");
      const tool = await getToolRow(db, assetTag);
      const key = await deps.storage.put("tool-photos", file.buffer, file.contentType, file.fileName);
      await db.transaction(async (tx) => {
        const at = clock.now();
        await recordStoredFile(tx, { key, purpose: "tool_photo", contentType: file.contentType, size: file.buffer.length, fileName: file.fileName, uploadedBy: actorId, uploadedAt: at, claimedBy: `tool:${tool.id}`, claimedAt: at });
        await toolsRepository.update(tx, tool.id, { photoKey: key });
        await recordAudit(tx, { actorId, action: "tool.photo", entityType: "tool", entityId: tool.assetTag, before: { photoKey: tool.photoKey }, after: { photoKey: key }, at: clock.now() });
      });
      return detail(assetTag);
    },

    async photo(assetTag: string) {
      const tool = await getToolRow(db, assetTag);
      if (!tool.photoKey) throw notFound("photo", assetTag);
      return { key: tool.photoKey, fileName: `${tool.assetTag}-photo` };
    },
  };
}
