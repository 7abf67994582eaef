import cron, { type ScheduledTask } from "node-cron";
import { getSettings } from "../server/modules/settings/settings.service";
import type { RemindersDeps } from "../server/modules/reminders/reminders.service";
import { sendDueReminders } from "./send-due-reminders.job";

export interface ReminderScheduleOptions {
  /** How often the settings are read again for a changed schedule or time zone. */
  pollMs?: number;
}

/**
 * Runs the reminder job on the admin's cron expression in the shop's time
 * zone. Settings are read again every minute and the task is replaced when
 * either changes, so no restart is needed. node-cron's noOverlap skips a tick
 * while a run is still going; the run lock covers other instances.
 */
export async function startReminderSchedule(deps: RemindersDeps & { logger: NonNullable<RemindersDeps["logger"]> }, opts: ReminderScheduleOptions = {}) {
  let task: ScheduledTask | null = null;
  let current: { cron: string; timeZone: string } | null = null;

  async function tick() {
    try {
      const r = await sendDueReminders(deps, "schedule");
      if (r.status === "skipped_locked") deps.logger.info("reminder run skipped: another instance is sending");
    } catch (err) {
      deps.logger.error({ err }, "scheduled reminder run failed");
    }
  }

  /** Reads the settings and reschedules when the expression or the time zone changed. */
  async function refresh() {
    const s = await getSettings(deps.db, deps.config.SHOP_TIME_ZONE);
    if (current && current.cron === s.reminderCron && current.timeZone === s.shopTimeZone) return current;
    if (task) await task.destroy();
    task = cron.schedule(s.reminderCron, tick, { name: "due-reminders", timezone: s.shopTimeZone, noOverlap: true });
    current = { cron: s.reminderCron, timeZone: s.shopTimeZone };
    deps.logger.info({ cron: current.cron, timeZone: current.timeZone }, "reminder job scheduled");
    return current;
  }

  await refresh();
  const poll = setInterval(() => void refresh().catch((err) => deps.logger.error({ err }, "could not read settings for the reminder schedule")), opts.pollMs ?? 60_000);
  poll.unref();

  return {
    refresh,
    current: () => current,
    nextRun: () => task?.getNextRun() ?? null,
    async stop() {
      clearInterval(poll);
      if (task) await task.destroy();
      task = null;
    },
  };
}
