import { and, asc, count, desc, eq, ilike, inArray, isNull, or, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { tools, setElements, toolLifecycleEvents } from "./tools.table";
import { families } from "../families/families.table";
import { users } from "../users/users.table";
import { checkouts } from "../checkouts/checkouts.table";
import { intermediateChecks } from "../checks/checks.table";
import type { ToolListQuery } from "../../../shared/tools/tools.schemas";
import { listPage, pageOffset } from "../../db/paging";
import { executePrepared } from "../../db/prepared";
import { eventsAfterSql, statusColumns, statusCountSql, statusIn, statusOrder, type StatusNow } from "./tool-states.sql";
import type { ToolStatus } from "../../../shared/tools/tool-status";

export type ToolRow = typeof tools.$inferSelect;
export type SetElementRow = typeof setElements.$inferSelect;
/** What a line of the register shows of a tool itself (toToolSummary); its status comes beside it. */
export type ToolSummaryRow = Pick<
  ToolRow,
  | "id" | "assetTag" | "description" | "familyId" | "unit" | "rangeMin" | "rangeMax" | "resolution" | "serialNumber" | "maker" | "model"
  | "location" | "ownerType" | "ownerUserId" | "ownerName" | "intervalDays" | "lifecycle" | "calibrationRequired" | "acceptanceUse"
>;
export type ToolListRow = { tool: ToolSummaryRow; familyName: string; kind: (typeof families.$inferSelect)["kind"] };

/** Filters of the register that SQL can apply (status is derived, see tools.service listTools). */
export type ToolSqlFilters = Pick<ToolListQuery, "familyId" | "kind" | "q" | "custodianId" | "ownerUserId" | "location" | "ownerType">;

/** Sort keys SQL can order by; the others (status, dueAt, custodian) are derived. */
export const SQL_SORTS = {
  assetTag: tools.assetTag,
  description: tools.description,
  family: families.name,
  location: tools.location,
  createdAt: tools.createdAt,
} as const;
export type SqlSortKey = keyof typeof SQL_SORTS;

/** The text the register's free-text search looks in: one trigram-indexed expression (tools_search_trgm_idx). */
const searchText = sql`tenthwise_tool_search_text(${tools.assetTag}, ${tools.description}, ${tools.serialNumber}, ${tools.maker}, ${tools.model}, ${tools.location}, ${tools.ownerName})`;

function whereOf(f: ToolSqlFilters): SQL | undefined {
  const like = f.q ? `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : null;
  return and(
    f.familyId ? eq(tools.familyId, f.familyId) : undefined,
    f.kind ? eq(families.kind, f.kind) : undefined,
    f.ownerType ? eq(tools.ownerType, f.ownerType) : undefined,
    f.ownerUserId ? eq(tools.ownerUserId, f.ownerUserId) : undefined,
    f.location ? sql`lower(${tools.location}) = lower(${f.location})` : undefined,
    // The columns are joined by U+001F, which a search for text never matches across.
    like ? (like.includes("\u001f") ? sql`false` : sql`${searchText} ilike ${like}`) : undefined,
    // Current custody: the open checkout (one per tool, partial unique index).
    f.custodianId
      ? sql`exists (select 1 from ${checkouts} where ${checkouts.toolId} = ${tools.id} and ${checkouts.userId} = ${f.custodianId} and ${checkouts.returnedAt} is null)`
      : undefined,
  );
}

function orderOf(sort: { key: SqlSortKey; desc: boolean }) {
  const col = SQL_SORTS[sort.key];
  return sort.desc ? sql`${col} desc nulls last` : sql`${col} asc nulls last`;
}

const listColumns = { tool: tools, familyName: families.name, kind: families.kind };

/**
 * The register page's own columns of `tools`: what a line shows beyond the columns the status reads (statusColumns
 * gives id, tag, unit, description, location and owner, not read twice). Read into one object literal per row
 * (readListTool): a spread of a reader's dynamically built object left every line's objects slow to read and to
 * write as JSON, and doubled the page's garbage collection.
 */
const LIST_TOOL = sql.raw(
  "tools.family_id as tool_family_id, tools.range_min as tool_range_min, tools.range_max as tool_range_max, tools.resolution as tool_resolution, " +
    "tools.serial_number as tool_serial_number, tools.maker as tool_maker, tools.model as tool_model, tools.interval_days as tool_interval_days, " +
    "tools.lifecycle as tool_lifecycle, tools.calibration_required as tool_calibration_required, tools.acceptance_use as tool_acceptance_use",
);
const readListTool = (r: Record<string, unknown>): ToolSummaryRow => ({
  id: String(r.id),
  assetTag: String(r.asset_tag),
  description: String(r.description),
  familyId: String(r.tool_family_id),
  unit: r.unit as ToolRow["unit"],
  rangeMin: String(r.tool_range_min),
  rangeMax: String(r.tool_range_max),
  resolution: String(r.tool_resolution),
  serialNumber: String(r.tool_serial_number),
  maker: (r.tool_maker as string | null) ?? null,
  model: (r.tool_model as string | null) ?? null,
  location: (r.location as string | null) ?? null,
  ownerType: r.owner_type as ToolRow["ownerType"],
  ownerUserId: (r.owner_user_id as string | null) ?? null,
  ownerName: (r.owner_name as string | null) ?? null,
  intervalDays: Number(r.tool_interval_days),
  lifecycle: r.tool_lifecycle as ToolRow["lifecycle"],
  calibrationRequired: Boolean(r.tool_calibration_required),
  acceptanceUse: Boolean(r.tool_acceptance_use),
});

/** Filters on the indexed status (docs/decisions/013). */
export interface StatusFilters {
  statuses?: readonly ToolStatus[];
  dueWithin?: { days: number; stillIn: readonly ToolStatus[] };
  dueFrom?: string;
  dueTo?: string;
}

/** Sort keys of the register, each with its SQL value and type (the type reads a cursor's value back exactly). */
function sortOf(key: string, now: StatusNow): { value: SQL; type: "text" | "date" | "timestamptz" | "int" } {
  switch (key) {
    case "dueAt":
      return { value: sql`s.cal_next_due`, type: "date" };
    case "status":
      return { value: statusOrder(now), type: "int" };
    case "custodian":
      // Code-point order of the lower-cased name, as the register always sorted custodians.
      return { value: sql`(lower(cu.name) collate "C")`, type: "text" };
    case "createdAt":
      return { value: sql`${tools.createdAt}`, type: "timestamptz" };
    default:
      return { value: sql`${SQL_SORTS[key as SqlSortKey]}`, type: "text" };
  }
}

/**
 * A page's size written into the statement's text rather than sent as a parameter. With `limit $1`, PostgreSQL plans a
 * generic plan for a tenth of the matching rows, judges it dearer than one planned for the size given, and plans the
 * page afresh at every request (about 0.4 ms of the database's time for the overdue page); with `limit 50` it keeps
 * one plan after the first five. The size is a whole number the page query's schema bounds (1–500), so the texts are
 * few. (Drizzle's `limit` takes a number or a placeholder; a fragment of SQL goes into the text as it is.)
 */
function literalLimit(size: number): number {
  if (!Number.isInteger(size) || size < 1 || size > 500) throw new Error(`register page: page size ${size} out of bounds`);
  return sql.raw(String(size)) as unknown as number;
}

/** An opaque keyset cursor: the sort value (as text) and asset tag of the last row of a page. */
export const cursorCodec = {
  encode: (v: string | null, tag: string) => Buffer.from(JSON.stringify([v, tag]), "utf8").toString("base64url"),
  decode(c: string): { v: string | null; tag: string } | null {
    try {
      const x = JSON.parse(Buffer.from(c, "base64url").toString("utf8"));
      if (Array.isArray(x) && x.length === 2 && (x[0] === null || typeof x[0] === "string") && typeof x[1] === "string") return { v: x[0], tag: x[1] };
    } catch {
      /* not a cursor */
    }
    return null;
  },
};

export const toolsRepository = {
  async findByTag(db: DbOrTx, tag: string) {
    return (
      (await db.query.tools.findFirst({ where: eq(tools.assetTag, tag) })) ??
      // Scanned or typed tags may differ in case only.
      (await db.query.tools.findFirst({ where: sql`lower(${tools.assetTag}) = lower(${tag})` }))
    );
  },
  findById: (db: DbOrTx, id: string) => db.query.tools.findFirst({ where: eq(tools.id, id) }),
  tagTaken: async (db: DbOrTx, tag: string) => !!(await db.query.tools.findFirst({ where: sql`lower(${tools.assetTag}) = lower(${tag})`, columns: { id: true } })),

  /** One SQL-sorted page of the register and the total. */
  async page(db: DbOrTx, f: ToolSqlFilters, sort: { key: SqlSortKey; desc: boolean }, page: number, pageSize: number) {
    const where = whereOf(f);
    const { items, total } = await listPage(
      db
        .select(listColumns)
        .from(tools)
        .innerJoin(families, eq(families.id, tools.familyId))
        .where(where)
        .orderBy(orderOf(sort), asc(tools.assetTag))
        .limit(pageSize)
        .offset(pageOffset(page, pageSize)),
      db.select({ total: count() }).from(tools).innerJoin(families, eq(families.id, tools.familyId)).where(where),
    );
    return { items: items as ToolListRow[], total };
  },

  /** Every tool matching the SQL filters, in the given order: the candidate set for status filters and derived sorts. */
  async candidates(db: DbOrTx, f: ToolSqlFilters, sort: { key: SqlSortKey; desc: boolean } = { key: "assetTag", desc: false }) {
    return (await db
      .select(listColumns)
      .from(tools)
      .innerJoin(families, eq(families.id, tools.familyId))
      .where(whereOf(f))
      .orderBy(orderOf(sort), asc(tools.assetTag))) as ToolListRow[];
  },

  /**
   * The register filtered, sorted and paged in one SQL statement (and a count), status read from tool_states on the
   * shop's date: blanks last either way, ties in asset-tag order. A cursor (the last row's sort value and tag) pages by
   * keyset; otherwise page and size give an offset; no limit at all for the whole view (CSV). Each row carries the
   * columns its status is derived from (statusColumns), read with the page: no second statement for the statuses.
   * Written as SQL, not with the query builder, whose building cost more of the process's thread than the page costs
   * the database (docs/decisions/022).
   */
  async registerPage(
    db: DbOrTx,
    f: ToolSqlFilters & StatusFilters,
    sort: { key: string; desc: boolean },
    now: StatusNow,
    at: Date,
    paging: { page: number; pageSize: number; after?: { v: string | null; tag: string } } | null,
  ) {
    const { value, type } = sortOf(sort.key, now);
    const today = now.today;
    const where =
      and(
        whereOf(f),
        f.statuses ? statusIn(f.statuses, now) : undefined,
        f.dueWithin
          ? and(statusIn(f.dueWithin.stillIn, now), sql`s.cal_next_due >= ${today} and s.cal_next_due <= ${today} + ${f.dueWithin.days}::int`)
          : undefined,
        f.dueFrom ? sql`s.cal_next_due >= ${f.dueFrom}::date` : undefined,
        f.dueTo ? sql`s.cal_next_due <= ${f.dueTo}::date` : undefined,
      ) ?? sql`true`;
    const after = paging?.after;
    const cmp = sort.desc ? sql`<` : sql`>`;
    const cv = after?.v == null ? null : sql`${after.v}::${sql.raw(type)}`;
    const keyset = after
      ? cv
        ? sql` and ((${value}) is null or (${value}) ${cmp} ${cv} or ((${value}) = ${cv} and ${tools.assetTag} > ${after.tag}))`
        : sql` and ((${value}) is null and ${tools.assetTag} > ${after.tag})`
      : sql``;
    const skip = paging && !after ? pageOffset(paging.page, paging.pageSize) : 0;
    // The size in the text (one plan kept, literalLimit); the offset only past the first page.
    const limit = paging ? sql` limit ${literalLimit(paging.pageSize)}${skip > 0 ? sql` offset ${skip}` : sql``}` : sql``;
    // Blanks last either way (asc puts nulls last already, so an index on the value serves it in order).
    const order = sort.desc ? sql`(${value}) desc nulls last` : sql`(${value}) asc`;
    // From the state rows (one per tool, kept by triggers): with no filter on the tool itself PostgreSQL drops
    // the left joins, and a count by status is a count on tool_states' indexes alone.
    // Was the clock set back (a tool with an event after `at`)? Asked with the count: one statement fewer.
    const setBack = eventsAfterSql(at);
    // Filtered by status alone (the register's status tabs, the overdue list): counted off the status index alone.
    const byStatusAlone = f.statuses && !whereOf(f) && !f.dueWithin && !f.dueFrom && !f.dueTo;
    const counted = !paging
      ? sql`-1`
      : byStatusAlone
        ? statusCountSql(f.statuses!, now)
        : sql`(select count(*)::int from tool_states s
            left join tools on tools.id = s.tool_id
            left join families on families.id = tools.family_id
            where ${where})`;
    // The page carries the count and the clock check in each row (uncorrelated subqueries, each run once as an
    // init plan): one statement and one round trip a page, where two in parallel cost two hand-overs each way.
    const pageQ = sql`select ${LIST_TOOL}, ${statusColumns("tools", "cu")}, families.name as family_name, families.kind as family_kind,
        (${value})::text as sort_value, ${counted} as total, ${setBack} as clock_set_back
      from tools
      join families on families.id = tools.family_id
      left join tool_states s on s.tool_id = tools.id
      left join users cu on cu.id = s.custody_user_id
      where ${where}${keyset}
      order by ${order}, tools.asset_tag asc${limit}`;
    // Named prepared statements (planned once per connection), except with free text: how many tools a search
    // matches decides between the trigram index and a scan, so that plan is made for each search.
    const run = (q: SQL) => (f.q ? db.execute(q) : executePrepared(db, q));
    const pageRows = (await run(pageQ)).rows as Record<string, unknown>[];
    const rows = pageRows.map((r) => ({
      tool: readListTool(r),
      familyName: String(r.family_name),
      kind: r.family_kind as ToolListRow["kind"],
      sortValue: (r.sort_value as string | null) ?? null,
      /** The columns the tool's status is derived from (statusesOfRows). */
      state: r,
    }));
    // An empty page carries neither: asked on their own (a page past the end, or nothing matches).
    const { total, clock_set_back } = (pageRows[0] ?? (await run(sql`select ${counted} as total, ${setBack} as clock_set_back`)).rows[0]) as { total: number; clock_set_back: boolean };
    return { rows, total: paging ? total : rows.length, clockSetBack: Boolean(clock_set_back) };
  },

  /** Distinct non-blank locations, sorted case-insensitively (tools_location_idx). */
  locations: async (db: DbOrTx) =>
    (
      await db
        .selectDistinct({ location: tools.location })
        .from(tools)
        .where(sql`${tools.location} is not null and ${tools.location} <> ''`)
        .orderBy(asc(tools.location))
    )
      .map((r) => r.location!)
      .sort((a, b) => a.localeCompare(b, "en", { sensitivity: "base" })),

  insert: async (db: DbOrTx, values: typeof tools.$inferInsert) => (await db.insert(tools).values(values).returning())[0],
  update: async (db: DbOrTx, id: string, values: Partial<typeof tools.$inferInsert>) => (await db.update(tools).set(values).where(eq(tools.id, id)).returning())[0],

  elementsOf: (db: DbOrTx, toolId: string) => db.select().from(setElements).where(eq(setElements.toolId, toolId)).orderBy(asc(setElements.nominal), asc(setElements.label)),
  findElement: (db: DbOrTx, toolId: string, elementId: string) =>
    db.query.setElements.findFirst({ where: and(eq(setElements.toolId, toolId), eq(setElements.id, elementId)) }),
  insertElements: (db: DbOrTx, values: (typeof setElements.$inferInsert)[]) => (values.length ? db.insert(setElements).values(values).returning() : Promise.resolve([])),
  rejectElement: async (db: DbOrTx, elementId: string, at: Date, reason: string) =>
    (await db.update(setElements).set({ rejectedAt: at, rejectedReason: reason }).where(and(eq(setElements.id, elementId), isNull(setElements.rejectedAt))).returning())[0],

  lifecycleEvents: (db: DbOrTx, toolId: string) =>
    db
      .select({ at: toolLifecycleEvents.at, lifecycle: toolLifecycleEvents.lifecycle, reason: toolLifecycleEvents.reason, byName: users.name })
      .from(toolLifecycleEvents)
      .leftJoin(users, eq(users.id, toolLifecycleEvents.byUserId))
      .where(eq(toolLifecycleEvents.toolId, toolId))
      .orderBy(desc(toolLifecycleEvents.at)),

  /** The latest failed intermediate check after an instant (or ever, when null). */
  failedCheckSince: (db: DbOrTx, toolId: string, since: Date | null) =>
    db.query.intermediateChecks.findFirst({
      where: and(eq(intermediateChecks.toolId, toolId), eq(intermediateChecks.passed, false), since ? sql`${intermediateChecks.performedAt} > ${since.toISOString()}` : undefined),
      orderBy: desc(intermediateChecks.performedAt),
    }),

  userNames: async (db: DbOrTx, ids: string[]) =>
    new Map((ids.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)) : []).map((u) => [u.id, u.name])),
  userExists: async (db: DbOrTx, id: string) => !!(await db.query.users.findFirst({ where: eq(users.id, id), columns: { id: true } })),
};
