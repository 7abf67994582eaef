import type { Db, DbOrTx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { recordAudit } from "../audit/audit.repository";
import { notFound, refused } from "../../http/errors";
import { limitTablesRepository, type LimitItemRow, type LimitTableSummaryRow } from "./limit-tables.repository";
import type { CreateLimitTable, LimitItemView, LimitTable, LimitTableSummary } from "../../../shared/limit-tables/limit-tables.schemas";

const n = (v: string | null) => (v == null ? null : Number(v));

/** An item row as the API shows it; lengths become JSON numbers only here. */
export function toItemView(r: LimitItemRow): LimitItemView {
  return {
    key: r.key,
    label: r.label,
    section: r.section,
    kind: r.kind,
    min: n(r.min),
    max: n(r.max),
    serviceableMin: n(r.serviceableMin),
    serviceableMax: n(r.serviceableMax),
    boreKey: r.boreKey,
    journalKey: r.journalKey,
    directions: r.directions,
    repeat: r.repeat,
    toolKinds: r.toolKinds ?? null,
    radial: r.radial,
    outOfRoundMax: n(r.outOfRoundMax),
    stationKeys: r.stationAKey && r.stationBKey ? [r.stationAKey, r.stationBKey] : null,
    expansionPerK: n(r.expansionPerK),
    note: r.note,
  };
}

/** How many tables' items one process keeps (a shop works from a few dozen tables at a time). */
const KEPT_TABLES = 500;
const keptItems = new Map<string, readonly LimitItemView[]>();

/**
 * The items of a limits table as views, in order. A table's items never change once it is saved (the database refuses
 * it: limit_items_closed; a revision is a new table), so each process keeps the views of the tables it has read and
 * a reading or a check sheet does not read and map the whole table again. The views are frozen: callers copy, never change.
 */
export async function itemViewsOf(db: DbOrTx, tableId: string): Promise<readonly LimitItemView[]> {
  const kept = keptItems.get(tableId);
  if (kept) return kept;
  const views = Object.freeze((await limitTablesRepository.items(db, tableId)).map((r) => deepFreeze(toItemView(r))));
  // An unknown id reads no items and is not kept.
  if (views.length) {
    if (keptItems.size >= KEPT_TABLES) keptItems.delete(keptItems.keys().next().value!);
    keptItems.set(tableId, views);
  }
  return views;
}

function deepFreeze<T extends object>(o: T): T {
  for (const v of Object.values(o)) if (v && typeof v === "object") Object.freeze(v);
  return Object.freeze(o);
}

export function toSummary(r: LimitTableSummaryRow): LimitTableSummary {
  const t = r.table;
  return {
    id: t.id,
    name: t.name,
    engineModel: t.engineModel,
    unit: t.unit,
    sourceDocument: t.sourceDocument,
    sourceRevision: t.sourceRevision,
    version: t.version,
    supersedesId: t.supersedesId,
    supersededById: r.supersededById ?? null,
    isDemo: t.isDemo,
    expansionPerK: n(t.expansionPerK),
    createdAt: t.createdAt.toISOString(),
    createdBy: t.createdBy && r.creatorName ? { id: t.createdBy, name: r.creatorName } : null,
    itemCount: Number(r.itemCount),
  };
}

// Numbers arrive from JSON; String(n) is the text the person typed (shortest round trip), stored exactly.
const text = (v: number | undefined) => (v == null ? null : String(v));

function itemRows(input: CreateLimitTable) {
  return input.items.map((it, i) => ({
    seq: i + 1,
    key: it.key,
    label: it.label,
    section: it.section ?? null,
    kind: it.kind,
    min: text(it.min),
    max: text(it.max),
    serviceableMin: text(it.serviceableMin),
    serviceableMax: text(it.serviceableMax),
    boreKey: it.boreKey ?? null,
    journalKey: it.journalKey ?? null,
    directions: it.directions,
    repeat: it.repeat,
    toolKinds: it.toolKinds ?? null,
    radial: it.radial,
    outOfRoundMax: text(it.outOfRoundMax),
    stationAKey: it.stationKeys?.[0] ?? null,
    stationBKey: it.stationKeys?.[1] ?? null,
    expansionPerK: text(it.expansionPerK),
    note: it.note ?? null,
  }));
}

export function limitTablesService({ db, clock }: { db: Db; clock: Clock }) {
  async function get(id: string): Promise<LimitTable> {
    const row = await limitTablesRepository.summary(db, id);
    if (!row) throw notFound("limit table", id);
    const items = await limitTablesRepository.items(db, id);
    return { ...toSummary(row), items: items.map(toItemView) };
  }

  return {
    get,
    async create(input: CreateLimitTable, actorId: string | null) {
      const id = await db.transaction(async (tx) => {
        const row = await limitTablesRepository.insert(
          tx,
          { name: input.name, engineModel: input.engineModel, unit: input.unit, sourceDocument: input.sourceDocument, sourceRevision: input.sourceRevision, isDemo: input.isDemo, expansionPerK: text(input.expansionPerK), createdBy: actorId, createdAt: clock.now() },
          itemRows(input),
        );
        await recordAudit(tx, { actorId, action: "limit_table.create", entityType: "limit_table", entityId: row.id, after: input, at: clock.now() });
        return row.id;
      });
      return get(id);
    },

    /** A revision is a new row naming the one it supersedes; jobs already open keep the old one. */
    async revise(previousId: string, input: CreateLimitTable, actorId: string | null) {
      const id = await db.transaction(async (tx) => {
        const prev = await limitTablesRepository.lockForRevision(tx, previousId);
        if (!prev) throw notFound("limit table", previousId);
        const newer = await limitTablesRepository.revisionOf(tx, previousId);
        if (newer) throw refused("table_superseded", "This revision has already been revised; revise the current one.", { currentId: newer.id });
        const row = await limitTablesRepository.insert(
          tx,
          {
            name: input.name,
            engineModel: input.engineModel,
            unit: input.unit,
            sourceDocument: input.sourceDocument,
            sourceRevision: input.sourceRevision,
            isDemo: input.isDemo,
            expansionPerK: text(input.expansionPerK),
            version: Number(prev.version) + 1,
            supersedesId: previousId,
            createdBy: actorId,
            createdAt: clock.now(),
          },
          itemRows(input),
        );
        await recordAudit(tx, { actorId, action: "limit_table.revise", entityType: "limit_table", entityId: row.id, before: { id: previousId, version: prev.version }, after: input, at: clock.now() });
        return row.id;
      });
      return get(id);
    },
  };
}
