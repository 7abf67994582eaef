// Stored readings as judging evidence (shared/inspection/judging.ts): the values as typed, temperatures, and for a
// feeler check the leaves with the thicknesses used. Readings recorded before the leaves were kept with them (judging
// rules 1) name only a go and a no-go leaf: their thickness is taken from the set's calibration in force at the reading.
import { sql } from "drizzle-orm";
import type { DbOrTx } from "../../db/client";
import { num } from "../../../shared/common/decimal";
import { convertLength, type LengthUnit, type MaterialKey } from "../../../shared/common/units";
import type { FeelerEvidence, LeafStack } from "../../../shared/inspection/feeler";
import type { ReadingEvidence } from "../../../shared/inspection/judging";
import type { readings } from "./readings.table";

type ReadingRow = typeof readings.$inferSelect;

interface LegacyLeaf {
  leafId: string;
  at: string;
  label: string;
  /** In the table's unit. */
  thickness: number;
  calibrated: boolean;
}

/** Thickness of leaves at instants: the calibrated thickness in force then (as-left, else as-found), else the nominal. */
export async function leafThicknessesAt(db: DbOrTx, wants: { leafId: string; at: Date }[], tableUnit: LengthUnit): Promise<Map<string, LegacyLeaf>> {
  const out = new Map<string, LegacyLeaf>();
  if (wants.length === 0) return out;
  const ids = sql`array[${sql.join(wants.map((w) => sql`${w.leafId}::uuid`), sql`, `)}]`;
  const ats = sql`array[${sql.join(wants.map((w) => sql`${w.at.toISOString()}::timestamptz`), sql`, `)}]`;
  const res = await db.execute(sql`
    select v.leaf_id::text as leaf_id, v.at as at, e.label, e.nominal::text as nominal, t.unit, x.thickness::text as thickness
    from unnest(${ids}, ${ats}) as v(leaf_id, at)
    join set_elements e on e.id = v.leaf_id
    join tools t on t.id = e.tool_id
    left join lateral (
      select coalesce(cp.as_left, cp.as_found) as thickness
      from calibration_points cp join calibrations c on c.id = cp.calibration_id
      where cp.element_id = v.leaf_id and c.performed_at <= v.at
        and not exists (select 1 from calibrations s where s.supersedes_id = c.id)
      order by c.performed_at desc limit 1
    ) x on true`);
  for (const r of res.rows as { leaf_id: string; at: Date | string; label: string; nominal: string; unit: LengthUnit; thickness: string | null }[]) {
    const at = new Date(r.at).toISOString();
    const raw = r.thickness ?? r.nominal;
    out.set(`${r.leaf_id}@${at}`, { leafId: r.leaf_id, at, label: r.label, thickness: num(convertLength(raw, r.unit, tableUnit)), calibrated: r.thickness != null });
  }
  return out;
}

const single = (l: LegacyLeaf): LeafStack => ({ leaves: [{ id: l.leafId, label: l.label, thickness: l.thickness }], thickness: l.thickness });

/** The legacy leaves of feeler readings that carry no feeler check of their own. */
export function legacyLeafWants(rows: ReadingRow[]): { leafId: string; at: Date }[] {
  return rows.filter((r) => !r.feelerCheck && (r.goLeafId || r.noGoLeafId)).flatMap((r) => [r.goLeafId, r.noGoLeafId].filter((x): x is string => !!x).map((leafId) => ({ leafId, at: r.takenAt })));
}

/** The feeler check of a stored reading, from its own record or (rules 1) from its go and no-go leaves. */
export function feelerEvidenceOf(r: ReadingRow, legacy: Map<string, LegacyLeaf>): FeelerEvidence | null {
  if (r.feelerCheck) return { ...r.feelerCheck, goEntered: r.goEntered, noGoEntered: r.noGoEntered };
  if (r.goEntered == null && r.noGoEntered == null) return null;
  const at = r.takenAt.toISOString();
  const go = r.goLeafId ? legacy.get(`${r.goLeafId}@${at}`) : undefined;
  const noGo = r.noGoLeafId ? legacy.get(`${r.noGoLeafId}@${at}`) : undefined;
  const nominalOnly = [go, noGo].some((l) => l && !l.calibrated);
  return {
    mode: "go_no_go",
    go: go ? single(go) : null,
    noGo: noGo ? single(noGo) : null,
    goEntered: r.goEntered,
    noGoEntered: r.noGoEntered,
    gap: null,
    why: `Recorded before the leaves were kept with the reading (judging rules 1, when the go was chosen under the minimum and the no-go over the maximum); ${
      nominalOnly ? "a leaf had no calibrated thickness then, so its marking is used" : "thicknesses from the set's calibration in force at the reading"
    }.`,
  };
}

/** A stored reading as judging evidence. */
export function evidenceOfRow(r: ReadingRow, legacy: Map<string, LegacyLeaf> = new Map()): ReadingEvidence {
  return {
    itemKey: r.itemKey,
    index: r.index,
    unit: r.unit,
    values: r.values,
    temperatureC: r.temperatureC,
    toolTemperatureC: r.toolTemperatureC,
    partMaterial: (r.partMaterial as MaterialKey | null) ?? null,
    visualResult: r.visualResult,
    finding: r.finding,
    feeler: feelerEvidenceOf(r, legacy),
  };
}

/** Evidence of many stored readings of one table, with the legacy leaf lookups done in one query. */
export async function evidenceOfRows(db: DbOrTx, rows: ReadingRow[], tableUnit: LengthUnit): Promise<Map<string, ReadingEvidence>> {
  const legacy = await leafThicknessesAt(db, legacyLeafWants(rows), tableUnit);
  return new Map(rows.map((r) => [r.id, evidenceOfRow(r, legacy)]));
}
