import { familiesRepository, type FamilyRow } from "./families.repository";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound } from "../../http/errors";
import type { CreateFamily, Family, FamilyListQuery, UpdateFamily } from "../../../shared/families/families.schemas";
import type { z } from "zod";
import type { CheckPointInputSchema } from "../../../shared/families/families.schemas";
import { fromDbOrNull, toDb, toDbOrNull, type RegisterDeps } from "../tools/register.common";
import type { DbOrTx } from "../../db/client";
import type { families } from "./families.table";

type FamilyInsert = typeof families.$inferInsert;

/** A family as the API shows it. */
export function toFamily(row: FamilyRow, toolCount = 0): Family {
  return {
    id: row.id,
    name: row.name,
    kind: row.kind,
    unit: row.unit,
    defaultIntervalDays: row.defaultIntervalDays,
    mpe: fromDbOrNull(row.mpe),
    checkPoints: row.checkPoints.map((p) => Number(p.nominal)),
    checkPlan: row.checkPoints.map((p) => ({ nominal: Number(p.nominal), mpe: fromDbOrNull(p.mpe) })),
    usageLimit: row.usageLimit,
    resolution: fromDbOrNull(row.resolution),
    checkTolerance: fromDbOrNull(row.checkTolerance),
    toolCount,
    createdAt: row.createdAt.toISOString(),
  };
}

function checkPlan(points: z.infer<typeof CheckPointInputSchema>[] | undefined) {
  return (points ?? []).map((p) => (typeof p === "number" ? { nominal: toDb(p) } : { nominal: toDb(p.nominal), mpe: toDbOrNull(p.mpe) }));
}

function columns(input: Partial<CreateFamily>) {
  const out: Partial<FamilyInsert> = {};
  if (input.name !== undefined) out.name = input.name;
  if (input.kind !== undefined) out.kind = input.kind;
  if (input.unit !== undefined) out.unit = input.unit;
  if (input.defaultIntervalDays !== undefined) out.defaultIntervalDays = input.defaultIntervalDays;
  if (input.mpe !== undefined) out.mpe = toDbOrNull(input.mpe);
  if (input.checkPoints !== undefined) out.checkPoints = checkPlan(input.checkPoints);
  if (input.usageLimit !== undefined) out.usageLimit = input.usageLimit ?? null;
  if (input.resolution !== undefined) out.resolution = toDbOrNull(input.resolution);
  if (input.checkTolerance !== undefined) out.checkTolerance = toDbOrNull(input.checkTolerance);
  return out;
}

/** A family by id, or 404. */
export async function getFamilyRow(db: DbOrTx, id: string) {
  const row = await familiesRepository.findById(db, id);
  if (!row) throw notFound("family", id);
  return row;
}

export function familiesService({ db }: Pick<RegisterDeps, "db">) {
  async function refuseTakenName(tx: DbOrTx, name: string, exceptId?: string) {
    const other = await familiesRepository.findByName(tx, name);
    if (other && other.id !== exceptId) throw new AppError("family_name_taken", 409, `There is already a family named "${name}".`);
  }
  return {
    async list(query: FamilyListQuery) {
      const { items, total } = await familiesRepository.list(db, query);
      return { items: items.map((r) => toFamily(r.family, Number(r.toolCount))), total };
    },
    async get(id: string) {
      const row = await getFamilyRow(db, id);
      return toFamily(row, await familiesRepository.countTools(db, id));
    },
    async create(input: CreateFamily, actorId: string | null) {
      return db.transaction(async (tx) => {
        await refuseTakenName(tx, input.name);
        const row = await familiesRepository.insert(tx, columns(input) as FamilyInsert);
        const out = toFamily(row, 0);
        await recordAudit(tx, { actorId, action: "family.create", entityType: "family", entityId: row.id, after: out });
        return out;
      });
    },
    async update(id: string, patch: UpdateFamily, actorId: string | null) {
      return db.transaction(async (tx) => {
        const before = await getFamilyRow(tx, id);
        if (patch.name) await refuseTakenName(tx, patch.name, id);
        const tools = await familiesRepository.countTools(tx, id);
        // The unit and kind frame every limit of the family's tools; they are fixed once tools are registered.
        if (tools > 0 && ((patch.unit && patch.unit !== before.unit) || (patch.kind && patch.kind !== before.kind))) {
          throw new AppError("family_in_use", 409, "Tools are registered in this family; its kind and unit cannot change. Make a new family instead.");
        }
        const row = await familiesRepository.update(tx, id, columns(patch));
        const out = toFamily(row, tools);
        await recordAudit(tx, { actorId, action: "family.update", entityType: "family", entityId: id, before: toFamily(before, tools), after: out });
        return out;
      });
    },
  };
}
