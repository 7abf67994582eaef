import { eq } from "drizzle-orm";
import type { DbOrTx, Tx } from "../../db/client";
import { settings } from "./settings.table";
import { DEFAULT_SETTINGS, SettingsSchema, type Settings, type UpdateSettings } from "../../../shared/settings/settings.schemas";
import { recordAudit } from "../audit/audit.repository";
import { isValidTimeZone } from "../../config";
import { AppError } from "../../http/errors";
import cron from "node-cron";

const KEY = "shop";

/**
 * How long a read of the settings on the pool is reused. Every request that judges a tool needs them;
 * a change made through this process is seen at once (the cache is dropped), one made by another
 * instance on the same database within this interval.
 */
export const SETTINGS_CACHE_MS = 5_000;
let cache = new WeakMap<object, { at: number; defaultTimeZone: string; value: Promise<Settings> }>();

/** The shop's settings: stored values over defaults (time zone default from configuration). A copy the caller may change. */
export async function getSettings(db: DbOrTx, defaultTimeZone: string): Promise<Settings> {
  // Inside a transaction always the row itself (a new object): a change in the same transaction must be seen.
  if ("rollback" in db) return readSettings(db, defaultTimeZone);
  return structuredClone(await keptSettings(db, defaultTimeZone));
}

/**
 * The same settings as kept for SETTINGS_CACHE_MS, not a copy: for a caller that only reads a few values from them
 * (the time zone and warning window of every status lookup), which a copy of the whole object cost more than.
 */
export async function readOnlySettings(db: DbOrTx, defaultTimeZone: string): Promise<Readonly<Settings>> {
  if ("rollback" in db) return readSettings(db, defaultTimeZone);
  return keptSettings(db, defaultTimeZone);
}

function keptSettings(db: DbOrTx, defaultTimeZone: string): Promise<Settings> {
  const now = Date.now();
  const hit = cache.get(db);
  if (hit && hit.defaultTimeZone === defaultTimeZone && now - hit.at < SETTINGS_CACHE_MS) return hit.value;
  const value = readSettings(db, defaultTimeZone);
  const entry = { at: now, defaultTimeZone, value };
  cache.set(db, entry);
  // A failed read is not kept.
  value.catch(() => cache.get(db) === entry && cache.delete(db));
  return value;
}

async function readSettings(db: DbOrTx, defaultTimeZone: string): Promise<Settings> {
  const row = await db.query.settings.findFirst({ where: eq(settings.key, KEY) });
  return SettingsSchema.parse({ ...DEFAULT_SETTINGS, shopTimeZone: defaultTimeZone, ...((row?.value as object) ?? {}) });
}

/** Drops the reused settings (after a change). */
export function forgetCachedSettings() {
  cache = new WeakMap();
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
  forgetCachedSettings();
  return next;
}
