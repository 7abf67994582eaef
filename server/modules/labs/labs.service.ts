import { labsRepository, type LabRow } from "./labs.repository";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound } from "../../http/errors";
import type { AccreditationState, CreateLab, Lab, LabListQuery } from "../../../shared/labs/labs.schemas";
import { calendarDate, daysBetween } from "../../../shared/common/dates";
import { getSettings } from "../settings/settings.service";
import type { DbOrTx } from "../../db/client";
import type { RegisterDeps } from "../tools/register.common";

/** Accreditation on a calendar date: expired after its expiry date, expiring within the shop's warning window. */
export function accreditationState(expiresAt: string | null, today: string, warnDays: number): AccreditationState {
  if (!expiresAt) return "unknown";
  const days = daysBetween(today, expiresAt);
  if (days < 0) return "expired";
  return days <= warnDays ? "expiring_soon" : "valid";
}

export function toLab(row: LabRow, today: string, warnDays: number): Lab {
  return {
    id: row.id,
    name: row.name,
    accreditationBody: row.accreditationBody,
    accreditationNumber: row.accreditationNumber,
    scope: row.scope,
    accreditationExpiresAt: row.accreditationExpiresAt,
    contact: row.contact,
    accreditation: accreditationState(row.accreditationExpiresAt, today, warnDays),
    createdAt: row.createdAt.toISOString(),
  };
}

/** Today in the shop's zone and its warning window, for judging accreditations and certificates. */
export async function shopToday(db: DbOrTx, defaultTimeZone: string, now: Date) {
  const s = await getSettings(db, defaultTimeZone);
  return { today: calendarDate(now, s.shopTimeZone), warnDays: s.dueSoonDays, timeZone: s.shopTimeZone };
}

export function labsService({ db, clock, defaultTimeZone }: RegisterDeps) {
  return {
    async list(query: LabListQuery) {
      const { today, warnDays } = await shopToday(db, defaultTimeZone, clock.now());
      const { items, total } = await labsRepository.list(db, query);
      return { items: items.map((r) => toLab(r, today, warnDays)), total };
    },
    async get(id: string) {
      const row = await labsRepository.findById(db, id);
      if (!row) throw notFound("lab", id);
      const { today, warnDays } = await shopToday(db, defaultTimeZone, clock.now());
      return toLab(row, today, warnDays);
    },
    async create(input: CreateLab, actorId: string | null) {
      const { today, warnDays } = await shopToday(db, defaultTimeZone, clock.now());
      return db.transaction(async (tx) => {
        if (await labsRepository.findByName(tx, input.name)) throw new AppError("lab_name_taken", 409, `There is already a lab named "${input.name}".`);
        const row = await labsRepository.insert(tx, {
          name: input.name,
          accreditationBody: input.accreditationBody ?? null,
          accreditationNumber: input.accreditationNumber ?? null,
          scope: input.scope ?? null,
          accreditationExpiresAt: input.accreditationExpiresAt ?? null,
          contact: input.contact ?? null,
        });
        const out = toLab(row, today, warnDays);
        await recordAudit(tx, { actorId, action: "lab.create", entityType: "lab", entityId: row.id, after: out, at: clock.now() });
        return out;
      });
    },
  };
}
