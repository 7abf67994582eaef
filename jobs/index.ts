import type { AppDeps } from "../server/app";
import { startReminderSchedule } from "./reminder-schedule";

/** Starts the scheduled jobs of a running server; returns a function that stops them. */
export async function startSchedules(deps: AppDeps): Promise<() => void> {
  const reminders = await startReminderSchedule(deps);
  return () => void reminders.stop();
}
