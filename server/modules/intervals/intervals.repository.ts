import { desc, eq, sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { intervalDecisions } from "./intervals.table";
import { families } from "../families/families.table";
import { tools } from "../tools/tools.table";
import { users } from "../users/users.table";
import { IMPORTED_CALIBRATION_NOTE } from "../../../shared/transfers/transfers.schemas";

type Row = Record<string, unknown>;

/**
 * Every calibration that still counts (not superseded by a correction), with its
 * place in its tool's history: rn = 1 is the tool's first calibration, which is
 * not an end-of-period observation; imported history records are not either
 * (their as-found result is unknown), but they do make the next one a recalibration.
 */
const countedCalibrations = sql`
  select c.id, c.tool_id, c.performed_at, c.as_found_in_tolerance, c.interval_days,
    coalesce(c.notes, '') = ${IMPORTED_CALIBRATION_NOTE} as imported,
    row_number() over (partition by c.tool_id order by c.performed_at, c.created_at) as rn,
    lag(c.interval_days) over (partition by c.tool_id order by c.performed_at, c.created_at) as period_days
  from calibrations c
  where not exists (select 1 from calibrations s where s.supersedes_id = c.id)`;

export interface ObservationRow {
  calibrationId: string;
  assetTag: string;
  performedAt: Date;
  asFoundInTolerance: boolean;
  intervalDays: number;
  /** The interval the tool was on before this calibration: the period this observation ends. */
  periodDays: number | null;
  imported: boolean;
  endOfPeriod: boolean;
}

export interface FamilyRateRow {
  familyId: string;
  name: string;
  kind: string;
  defaultIntervalDays: number;
  tools: number;
  recalibrations: number;
  inTolerance: number;
  /** Mean interval the end-of-period observations were made under (I_old); null with none. */
  observedIntervalDays: number | null;
  lastDecisionAt: Date | null;
}

export const intervalsRepository = {
  findFamily: (db: DbOrTx, id: string) => db.query.families.findFirst({ where: eq(families.id, id) }),

  async lockFamily(db: DbOrTx, id: string) {
    const r = await db.select().from(families).where(eq(families.id, id)).for("update");
    return r[0];
  },

  /** A family's calibrations in time order, marked as end-of-period observations or not. */
  async observations(db: DbOrTx, familyId: string): Promise<ObservationRow[]> {
    const r = await db.execute(sql`
      with counted as (${countedCalibrations} and c.tool_id in (select id from tools where family_id = ${familyId}::uuid))
      select k.id, t.asset_tag, k.performed_at, k.as_found_in_tolerance, k.interval_days, k.imported, k.rn, k.period_days
      from counted k join tools t on t.id = k.tool_id
      order by k.performed_at, t.asset_tag`);
    return (r.rows as Row[]).map((x) => ({
      calibrationId: String(x.id),
      assetTag: String(x.asset_tag),
      performedAt: new Date(String(x.performed_at)),
      asFoundInTolerance: Boolean(x.as_found_in_tolerance),
      intervalDays: Number(x.interval_days),
      periodDays: x.period_days == null ? null : Number(x.period_days),
      imported: Boolean(x.imported),
      endOfPeriod: Number(x.rn) > 1 && !x.imported,
    }));
  },

  /** Per family: tools, end-of-period recalibrations and how many were found in tolerance. */
  async familyRates(db: DbOrTx): Promise<FamilyRateRow[]> {
    const r = await db.execute(sql`
      with counted as (${countedCalibrations}),
      eop as (
        select t.family_id, count(*)::int as n, count(*) filter (where k.as_found_in_tolerance)::int as ok, avg(k.period_days)::float8 as period
        from counted k join tools t on t.id = k.tool_id
        where k.rn > 1 and not k.imported
        group by t.family_id
      )
      select f.id, f.name, f.kind, f.default_interval_days,
        (select count(*)::int from tools t where t.family_id = f.id) as tools,
        coalesce(e.n, 0) as n, coalesce(e.ok, 0) as ok, e.period,
        (select max(d.decided_at) from interval_decisions d where d.family_id = f.id) as last_decision_at
      from families f left join eop e on e.family_id = f.id
      order by f.name`);
    return (r.rows as Row[]).map((x) => ({
      familyId: String(x.id),
      name: String(x.name),
      kind: String(x.kind),
      defaultIntervalDays: Number(x.default_interval_days),
      tools: Number(x.tools),
      recalibrations: Number(x.n),
      inTolerance: Number(x.ok),
      observedIntervalDays: x.period == null ? null : Math.round(Number(x.period) * 10) / 10,
      lastDecisionAt: x.last_decision_at ? new Date(String(x.last_decision_at)) : null,
    }));
  },

  decisions: (db: DbOrTx, familyId: string) =>
    db
      .select({
        id: intervalDecisions.id,
        decidedAt: intervalDecisions.decidedAt,
        decidedBy: intervalDecisions.decidedBy,
        decidedByName: users.name,
        previousIntervalDays: intervalDecisions.previousIntervalDays,
        newIntervalDays: intervalDecisions.newIntervalDays,
        method: intervalDecisions.method,
        rationale: intervalDecisions.rationale,
      })
      .from(intervalDecisions)
      .innerJoin(users, eq(users.id, intervalDecisions.decidedBy))
      .where(eq(intervalDecisions.familyId, familyId))
      .orderBy(desc(intervalDecisions.decidedAt)),

  insertDecision: async (db: DbOrTx, values: typeof intervalDecisions.$inferInsert) => (await db.insert(intervalDecisions).values(values).returning())[0],

  setFamilyInterval: (db: DbOrTx, familyId: string, days: number) => db.update(families).set({ defaultIntervalDays: days }).where(eq(families.id, familyId)),

  /** The interval each tool of the family gets at its next calibration; existing due dates stay as recorded. */
  async setToolsInterval(db: DbOrTx, familyId: string, days: number): Promise<string[]> {
    const r = await db.update(tools).set({ intervalDays: days }).where(eq(tools.familyId, familyId)).returning({ assetTag: tools.assetTag });
    return r.map((x) => x.assetTag).sort();
  },

  findTool: (db: DbOrTx, assetTag: string) => db.query.tools.findFirst({ where: eq(tools.assetTag, assetTag) }),

  /** As-found (and as-left) errors of every point of a tool's counted calibrations, oldest first. */
  async driftPoints(db: DbOrTx, toolId: string) {
    const r = await db.execute(sql`
      select c.id as calibration_id, c.performed_at, coalesce(c.adjusted, c.result = 'adjusted') as adjusted,
        p.seq, p.nominal, p.error_as_found, p.error_as_left, p.mpe, p.as_found_in_tolerance, e.label as element
      from calibrations c
      join calibration_points p on p.calibration_id = c.id
      left join set_elements e on e.id = p.element_id
      where c.tool_id = ${toolId}::uuid and not exists (select 1 from calibrations s where s.supersedes_id = c.id)
      order by c.performed_at, p.seq`);
    return r.rows as {
      calibration_id: string;
      performed_at: string | Date;
      adjusted: boolean;
      seq: number;
      nominal: string;
      error_as_found: string;
      error_as_left: string | null;
      mpe: string;
      as_found_in_tolerance: boolean;
      element: string | null;
    }[];
  },
};

