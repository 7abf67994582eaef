import { sql, type Placeholder, type SQL } from "drizzle-orm";
import { PgTransaction } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { inList, isoInstant, pgArray } from "../../db/values";
import { columnsOf } from "../../db/columns";
import { executePrepared, executeShaped } from "../../db/prepared";
import { statusColumns, type StatusContext } from "./tool-states.sql";
import { tools as toolsTable } from "./tools.table";
import { deriveToolStatus, type ToolStatusInput, type ToolStatusResult } from "../../../shared/tools/tool-status";
import { readOnlySettings } from "../settings/settings.service";
import type { Settings } from "../../../shared/settings/settings.schemas";

export type { StatusContext } from "./tool-states.sql";

export interface Custody {
  checkoutId: string;
  userId: string;
  name: string;
  email: string;
  since: string;
  dueBackAt: string;
}

export interface ToolStatusView extends ToolStatusResult {
  toolId: string;
  assetTag: string;
  custodian: Custody | null;
  lastCalibration: ToolStatusInput["lastCalibration"] & { id: string } | null;
}

/** Time zone and warning window from the shop's settings. */
export async function statusContext(db: DbOrTx, defaultTimeZone: string): Promise<StatusContext> {
  return statusContextOf(await readOnlySettings(db, defaultTimeZone));
}

/** The same from settings already read. */
export const statusContextOf = (s: Pick<Settings, "shopTimeZone" | "dueSoonDays">): StatusContext => ({ timeZone: s.shopTimeZone, dueSoonDays: s.dueSoonDays });

type Row = Record<string, unknown>;
const iso = isoInstant;
const dateOnly = (v: unknown) => (v == null ? null : v instanceof Date ? v.toISOString().slice(0, 10) : String(v).slice(0, 10));

/**
 * Each tool's status at instant `at`, from the one derivation (shared/tools/tool-status.ts).
 * The inputs come from the tool's row in tool_states (kept by database triggers, one query for
 * any number of tools) whenever `at` is at or after every event that row has read — the present,
 * and any later instant. A tool asked about at an earlier instant has its inputs gathered from
 * the records as they stood then (gatherStatusesAt).
 */
export async function statusesFor(db: DbOrTx, toolIds: string[], at: Date, ctx: StatusContext): Promise<Map<string, ToolStatusView>> {
  if (toolIds.length === 0) return new Map();
  return (await statusesWhere(db, sql`t.id = any(${pgArray(toolIds)}::uuid[])`, at, ctx)).views;
}

/**
 * Statuses at `at` of the tools whose id is in `toolIdsQuery` (a select of tool ids), with where each tool is kept
 * and whose it is: for a set the database can name itself, such as a batch's candidates, without sending thousands
 * of ids back and forth.
 */
export async function statusesIn(db: DbOrTx, toolIdsQuery: SQL, at: Date, ctx: StatusContext) {
  return statusesWhere(db, sql`t.id in (${toolIdsQuery})`, at, ctx);
}

/**
 * One tool's status by its asset tag (exact, else differing in case only, as a scanned or typed tag may), with what
 * a status answer shows of the tool: one query at the present.
 */
export async function statusByTag(db: DbOrTx, assetTag: string, at: Date, ctx: StatusContext) {
  // Built once (executeShaped): turning the select into text cost more than PostgreSQL's lookup.
  const byTag = async (shape: string, where: (tag: Placeholder) => SQL) =>
    statusesFromRows(db, (await executeShaped(db, shape, () => statusSelect(where(sql.placeholder("tag"))), { tag: assetTag })).rows as Row[], at, ctx);
  let found = await byTag("status-by-tag", (tag) => sql`t.asset_tag = ${tag}`);
  if (found.views.size === 0) found = await byTag("status-by-tag-any-case", (tag) => sql`lower(t.asset_tag) = lower(${tag})`);
  const [view] = found.views.values();
  const tool = found.tools.get(view?.toolId ?? "");
  return view && tool ? { view, description: tool.description, unit: tool.unit } : null;
}

/** What a status answer or a reminder line says of the tool besides its status. */
export interface ToolFacts {
  description: string;
  unit: string;
  location: string | null;
  ownerType: string;
  ownerUserId: string | null;
  ownerName: string | null;
  usageLimit: number | null;
}

/** A tool's own columns, prefixed (`t.asset_tag as "tool.assetTag"`), beside the columns the status reads. */
const TOOL = columnsOf(toolsTable, "t", "tool.");
type ToolRow = typeof toolsTable.$inferSelect;

/** A tool as recording a reading checks it: its whole row, its family's kind, its status at the instant. */
export type ToolWithStatus = { tool: ToolRow; kind: string; status: ToolStatusView };

/**
 * The select behind toolsWithStatusByTags, for a caller that runs it inside another statement (recording a reading
 * asks it in the statement that reads the sheet: one round trip fewer); its rows go to toolsWithStatusFromRows. Every
 * column it names is the tool's or its status's (none is `job.…`). The tags may be placeholders (a statement built
 * once per shape), one for each tag.
 */
export function toolsByTagsSelect(tags: readonly (string | Placeholder)[]): SQL {
  return statusSelect(inList(sql`t.asset_tag`, tags, "text"), {
    columns: sql`, ${TOOL.list}, f.kind as family_kind`,
    joins: sql`join families f on f.id = t.family_id`,
  });
}

/** The tools of toolsByTagsSelect's rows (rows without a tool, as an outer join gives, are left out), with their status at `at`. */
export async function toolsWithStatusFromRows(db: DbOrTx, rows: Row[], at: Date, ctx: StatusContext): Promise<ToolWithStatus[]> {
  const found = rows.filter((r) => r.id != null);
  const { views } = await statusesFromRows(db, found, at, ctx);
  return found.map((r) => ({ tool: TOOL.read(r), kind: String(r.family_kind), status: views.get(String(r.id))! }));
}

/**
 * Statuses at `at` of the tools named by their asset tags as recorded, each with the tool's whole row and its family's
 * kind: what recording a reading checks of its tools, in one statement instead of two.
 */
export async function toolsWithStatusByTags(db: DbOrTx, tags: string[], at: Date, ctx: StatusContext): Promise<ToolWithStatus[]> {
  if (tags.length === 0) return [];
  const res = await db.execute(toolsByTagsSelect(tags));
  return toolsWithStatusFromRows(db, res.rows as Row[], at, ctx);
}

/**
 * Each tool's status at `at` from rows that carry statusColumns (the register's page reads them with the page): from
 * the row's tool_states columns, or from the records as they stood at `at` when that is before the row's last event.
 */
export async function statusesOfRows(db: DbOrTx, rows: Row[], at: Date, ctx: StatusContext): Promise<Map<string, ToolStatusView>> {
  return (await statusesFromRows(db, rows, at, ctx)).views;
}

/** The tools that `where` names (over `tools t`), with the columns their status and a status answer read. */
function statusSelect(where: SQL, extra?: { columns: SQL; joins: SQL }): SQL {
  return sql`
    select ${statusColumns("t", "u")}
      ${extra?.columns ?? sql``}
    from tools t
    ${extra?.joins ?? sql``}
    left join tool_states s on s.tool_id = t.id
    left join users u on u.id = s.custody_user_id
    where ${where}`;
}

async function statusesWhere(db: DbOrTx, where: SQL, at: Date, ctx: StatusContext) {
  // Every caller's condition is a fixed text (a tag, a list of ids as one array, a select of ids).
  const res = await executePrepared(db, statusSelect(where));
  return statusesFromRows(db, res.rows as Row[], at, ctx);
}

/**
 * Each tool's status at `at` from statusSelect's rows: from its tool_states columns when `at` is at or after every
 * event the row has read, else gathered from the records as they stood then.
 */
async function statusesFromRows(db: DbOrTx, rows: Row[], at: Date, ctx: StatusContext) {
  const views = new Map<string, ToolStatusView>();
  const tools = new Map<string, ToolFacts>();
  const atTs = at.toISOString();
  const past: string[] = [];
  for (const r of rows) {
    tools.set(String(r.id), {
      description: String(r.description),
      unit: String(r.unit),
      location: (r.location as string | null) ?? null,
      ownerType: String(r.owner_type),
      ownerUserId: (r.owner_user_id as string | null) ?? null,
      ownerName: (r.owner_name as string | null) ?? null,
      usageLimit: r.usage_limit == null ? null : Number(r.usage_limit),
    });
    const id = String(r.id);
    if (!r.has_state || (r.settled_at != null && Date.parse(iso(r.settled_at)!) > at.getTime())) {
      past.push(id);
      continue;
    }
    views.set(id, fromState(r, atTs, ctx));
  }
  if (past.length) for (const [id, v] of await gatherStatusesAt(db, past, at, ctx)) views.set(id, v);
  return { views, tools };
}

/** The derivation's inputs from a tool_states row (with the tool's tag and unit and the custodian's name), derived at `at`. */
/** The last counting calibration as the status rule reads it, from a row's columns. */
function calibrationOf(c: { id: unknown; performedAt: string; result: unknown; nextDue: unknown; min: unknown; max: unknown; unit: unknown; note: unknown }) {
  return {
    id: String(c.id),
    performedAt: c.performedAt,
    result: c.result as "pass" | "adjusted" | "fail" | "limited",
    nextDueAt: dateOnly(c.nextDue as string | Date | null)!,
    limitedRange: c.min != null && c.max != null ? { min: Number(c.min), max: Number(c.max), unit: c.unit as "in" | "mm", note: (c.note as string) ?? null } : null,
  };
}

function fromState(r: Row, atTs: string, ctx: StatusContext): ToolStatusView {
  const lastCalibration =
    r.cal_id != null
      ? calibrationOf({ id: r.cal_id, performedAt: iso(r.cal_performed_at)!, result: r.cal_result, nextDue: r.cal_next_due, min: r.cal_limited_min, max: r.cal_limited_max, unit: r.unit, note: r.cal_limited_note })
      : null;
  const input: ToolStatusInput = {
    at: atTs,
    timeZone: ctx.timeZone,
    dueSoonDays: ctx.dueSoonDays,
    tool: { calibrationRequired: Boolean(r.calibration_required), lifecycle: r.lifecycle as ToolStatusInput["tool"]["lifecycle"], usageLimit: r.usage_limit == null ? null : Number(r.usage_limit) },
    lastCalibration,
    pendingReview: r.pending_performed_at != null ? { performedAt: iso(r.pending_performed_at)!, lab: String(r.pending_lab) } : null,
    usesSinceCalibration: Number(r.uses_since_cal ?? 0),
    failedCheckSinceCalibration: r.failed_check_at != null ? { performedAt: iso(r.failed_check_at)!, deviation: Number(r.failed_check_deviation) } : null,
    hold: r.hold_since != null ? { reason: String(r.hold_reason), since: iso(r.hold_since)! } : null,
    atLab: r.lab_since != null ? { since: iso(r.lab_since)!, lab: String(r.lab_name), expectedBackAt: dateOnly(r.lab_expected_back) } : null,
  };
  return {
    ...deriveToolStatus(input),
    toolId: String(r.id),
    assetTag: String(r.asset_tag),
    lastCalibration,
    custodian:
      r.custody_checkout_id != null
        ? { checkoutId: String(r.custody_checkout_id), userId: String(r.custody_user_id), name: String(r.custody_name), email: String(r.custody_email), since: iso(r.custody_since)!, dueBackAt: iso(r.custody_due_back)! }
        : null,
  };
}

/**
 * Gathers, for many tools at once, what the one status derivation needs at
 * instant `at` (lifecycle, the calibration that counts, pending review, uses,
 * failed checks, holds, lab trips, custody) from the records as they stood
 * then, and derives each status. Seven set-based queries, whatever the number
 * of tools. The definition tool_states is tested against.
 */
export async function gatherStatusesAt(db: DbOrTx, toolIds: string[], at: Date, ctx: StatusContext): Promise<Map<string, ToolStatusView>> {
  const out = new Map<string, ToolStatusView>();
  if (toolIds.length === 0) return out;
  // One array parameter, however many tools: no parameter-count limit and one plan.
  const ids = sql`${pgArray(toolIds)}::uuid[]`;
  const atTs = at.toISOString();

  // A transaction is one connection: its queries go one after another; on the
  // pool they run side by side.
  const run = <T>(queries: (() => PromiseLike<T>)[]): Promise<T[]> =>
    db instanceof PgTransaction ? queries.reduce<Promise<T[]>>(async (acc, q) => [...(await acc), await q()], Promise.resolve([])) : Promise.all(queries.map((q) => q()));

  const [tools, cals, pending, checks, holds, labs, custody] = await run([
    () =>
      db.execute(sql`
      select t.id, t.asset_tag, t.calibration_required, t.usage_limit,
        coalesce((select e.lifecycle from tool_lifecycle_events e where e.tool_id = t.id and e.at <= ${atTs} order by e.at desc limit 1), 'active') as lifecycle
      from tools t where t.id = any(${ids})`),
    // The calibration that counts: latest, not superseded, performed by `at`,
    // in-house or outside-lab with an accepted certificate review by `at`.
    () => db.execute(sql`
      select distinct on (c.tool_id) c.id, c.tool_id, c.performed_at, c.result, c.next_due_at, c.limited_min, c.limited_max, c.limited_note, t.unit
      from calibrations c join tools t on t.id = c.tool_id
      where c.tool_id = any(${ids}) and c.performed_at <= ${atTs}
        and not exists (select 1 from calibrations s where s.supersedes_id = c.id)
        and (c.source = 'in_house' or exists (select 1 from calibration_reviews r where r.calibration_id = c.id and r.accepted and r.reviewed_at <= ${atTs}))
      order by c.tool_id, c.performed_at desc`),
    () => db.execute(sql`
      select distinct on (c.tool_id) c.tool_id, c.performed_at, coalesce(l.name, 'outside lab') as lab
      from calibrations c left join labs l on l.id = c.lab_id
      where c.tool_id = any(${ids}) and c.source = 'outside_lab' and c.performed_at <= ${atTs}
        and not exists (select 1 from calibration_reviews r where r.calibration_id = c.id and r.reviewed_at <= ${atTs})
        and not exists (select 1 from calibrations s where s.supersedes_id = c.id)
      order by c.tool_id, c.performed_at desc`),
    () => db.execute(sql`
      select distinct on (k.tool_id) k.tool_id, k.performed_at, k.deviation
      from intermediate_checks k
      where k.tool_id = any(${ids}) and not k.passed and k.performed_at <= ${atTs}
      order by k.tool_id, k.performed_at desc`),
    () => db.execute(sql`
      select distinct on (h.tool_id) h.tool_id, h.placed_at, h.reason
      from holds h
      where h.tool_id = any(${ids}) and h.placed_at <= ${atTs} and (h.released_at is null or h.released_at > ${atTs})
      order by h.tool_id, h.placed_at desc`),
    () => db.execute(sql`
      select distinct on (s.tool_id) s.tool_id, s.shipped_at, s.expected_back_at, l.name as lab
      from lab_shipments s join labs l on l.id = s.lab_id
      where s.tool_id = any(${ids}) and s.shipped_at <= ${atTs} and (s.received_at is null or s.received_at > ${atTs})
      order by s.tool_id, s.shipped_at desc`),
    () => db.execute(sql`
      select distinct on (c.tool_id) c.id, c.tool_id, c.user_id, c.issued_at, c.due_back_at, u.name, u.email
      from checkouts c join users u on u.id = c.user_id
      where c.tool_id = any(${ids}) and c.issued_at <= ${atTs} and (c.returned_at is null or c.returned_at > ${atTs})
      order by c.tool_id, c.issued_at desc`),
  ]);

  const byTool = (rows: Row[]) => new Map(rows.map((r) => [String(r.tool_id), r]));
  const calMap = byTool(cals.rows as Row[]);
  const pendingMap = byTool(pending.rows as Row[]);
  const checkMap = byTool(checks.rows as Row[]);
  const holdMap = byTool(holds.rows as Row[]);
  const labMap = byTool(labs.rows as Row[]);
  const custodyMap = byTool(custody.rows as Row[]);

  // Uses since the calibration that counts: check-outs after it, up to `at`.
  const usesRows = await db.execute(sql`
    select c.tool_id, count(*)::int as uses
    from checkouts c
    left join lateral (select max(x.performed_at) as since from calibrations x where x.tool_id = c.tool_id and x.performed_at <= ${atTs}) cal on true
    where c.tool_id = any(${ids}) and c.issued_at <= ${atTs} and (cal.since is null or c.issued_at > cal.since)
    group by c.tool_id`);
  const uses = new Map((usesRows.rows as Row[]).map((r) => [String(r.tool_id), Number(r.uses)]));

  for (const t of tools.rows as Row[]) {
    const id = String(t.id);
    const cal = calMap.get(id);
    const calAt = cal ? iso(cal.performed_at)! : null;
    const failed = checkMap.get(id);
    const failedAt = failed ? iso(failed.performed_at)! : null;
    const lastCalibration = cal
      ? calibrationOf({ id: cal.id, performedAt: calAt!, result: cal.result, nextDue: cal.next_due_at, min: cal.limited_min, max: cal.limited_max, unit: cal.unit, note: cal.limited_note })
      : null;
    const p = pendingMap.get(id);
    const hold = holdMap.get(id);
    const lab = labMap.get(id);
    const cust = custodyMap.get(id);
    const input: ToolStatusInput = {
      at: atTs,
      timeZone: ctx.timeZone,
      dueSoonDays: ctx.dueSoonDays,
      tool: { calibrationRequired: Boolean(t.calibration_required), lifecycle: t.lifecycle as ToolStatusInput["tool"]["lifecycle"], usageLimit: t.usage_limit == null ? null : Number(t.usage_limit) },
      lastCalibration,
      pendingReview: p && (!calAt || iso(p.performed_at)! > calAt) ? { performedAt: iso(p.performed_at)!, lab: String(p.lab) } : null,
      usesSinceCalibration: uses.get(id) ?? 0,
      failedCheckSinceCalibration: failed && (!calAt || failedAt! > calAt) ? { performedAt: failedAt!, deviation: Number(failed.deviation) } : null,
      hold: hold ? { reason: String(hold.reason), since: iso(hold.placed_at)! } : null,
      atLab: lab ? { since: iso(lab.shipped_at)!, lab: String(lab.lab), expectedBackAt: dateOnly(lab.expected_back_at) } : null,
    };
    const result = deriveToolStatus(input);
    out.set(id, {
      ...result,
      toolId: id,
      assetTag: String(t.asset_tag),
      lastCalibration,
      custodian: cust
        ? { checkoutId: String(cust.id), userId: String(cust.user_id), name: String(cust.name), email: String(cust.email), since: iso(cust.issued_at)!, dueBackAt: iso(cust.due_back_at)! }
        : null,
    });
  }
  return out;
}

/** One tool's status at an instant. */
export async function statusOf(db: DbOrTx, toolId: string, at: Date, ctx: StatusContext): Promise<ToolStatusView> {
  const m = await statusesFor(db, [toolId], at, ctx);
  const v = m.get(toolId);
  if (!v) throw new Error(`tool ${toolId} not found`);
  return v;
}
