import { eq } from "drizzle-orm";
import type { DbOrTx, Tx } from "../../db/client";
import { settings } from "./settings.table";
import { DEFAULT_SETTINGS, SettingsSchema, type Settings, type UpdateSettings } from "../../../shared/settings/settings.schemas";
import { recordAudit } from "../audit/audit.repository";
import { isValidTimeZone } from "../../config";
import { AppError } from "../../http/errors";
import cron from "node-cron";

const KEY = "shop";

/** The shop's settings: stored values over defaults (time zone default from configuration). */
export async function getSettings(db: DbOrTx, defaultTimeZone: string): Promise<Settings> {
  const row = await db.query.settings.findFirst({ where: eq(settings.key, KEY) });
  return SettingsSchema.parse({ ...DEFAULT_SETTINGS, shopTimeZone: defaultTimeZone, ...((row?.value as object) ?? {}) });
}

export async function updateSettings(db: Tx, defaultTimeZone: string, patch: UpdateSettings, actorId: string): Promise<Settings> {
  if (patch.shopTimeZone && !isValidTimeZone(patch.shopTimeZone)) {
    throw new AppError("invalid_time_zone", 400, `"${patch.shopTimeZone}" is not a time zone name such as America/Chicago.`);
  }
  if (patch.reminderCron && !cron.validate(patch.reminderCron)) {
    throw new AppError("invalid_cron", 400, `"${patch.reminderCron}" is not a schedule such as "0 6 * * *" (minute hour day month weekday).`);
  }
  const before = await getSettings(db, defaultTimeZone);
  const next = SettingsSchema.parse({ ...before, ...patch });
  // Nothing changes: nothing is written and no audit line says before = after.
  if (JSON.stringify(next) === JSON.stringify(before)) return before;
  await db
    .insert(settings)
    .values({ key: KEY, value: next, updatedBy: actorId })
    .onConflictDoUpdate({ target: settings.key, set: { value: next, updatedAt: new Date(), updatedBy: actorId } });
  await recordAudit(db, { actorId, action: "settings.update", entityType: "settings", entityId: KEY, before, after: next });
  return next;
}
