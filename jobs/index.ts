import type { AppDeps } from "../server/app-deps";
import { startReminderSchedule } from "./reminder-schedule";
import { startInvestigationNoticeSweep } from "./deliver-investigation-notices.job";
import { startReadingRejudging } from "./rejudge-readings.job";

/** Starts the scheduled jobs of a running server; returns a function that stops them. */
export async function startSchedules(deps: AppDeps): Promise<() => void> {
  const reminders = await startReminderSchedule(deps);
  const notices = startInvestigationNoticeSweep(deps);
  const rejudging = startReadingRejudging(deps);
  return () => {
    void reminders.stop();
    notices.stop();
    rejudging.stop();
  };
}
