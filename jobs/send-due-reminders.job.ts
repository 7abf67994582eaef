import { runReminders, type RemindersDeps } from "../server/modules/reminders/reminders.service";
import type { RunRemindersResult } from "../shared/reminders/reminders.schemas";

/**
 * The due-reminder job: thin by design. Every rule (what is due, who gets it,
 * exactly once, retries) lives in the reminders service, so the schedule, the
 * admin's "run now" and the shell command all behave the same; running it
 * twice sends nothing twice.
 */
export function sendDueReminders(deps: RemindersDeps, trigger: "schedule" | "manual" | "cli"): Promise<RunRemindersResult> {
  return runReminders(deps, { trigger });
}
