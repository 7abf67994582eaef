import { addDays, calendarDate, daysBetween } from "../common/dates";

/** Next due date: the calendar date of the calibration in the shop's zone plus the interval in days; no grace period (api.md). */
export function nextDueAt(args: { performedAt: string; intervalDays: number; timeZone: string }): string {
  if (!Number.isInteger(args.intervalDays) || args.intervalDays <= 0) {
    throw new RangeError(`A calibration interval is a positive whole number of days: ${args.intervalDays}`);
  }
  return addDays(calendarDate(args.performedAt, args.timeZone), args.intervalDays);
}

/** True from the day after the due date (in the shop's zone): a tool is usable through its due date. */
export function isOverdue(dueAt: string, at: Date | string, timeZone: string): boolean {
  return calendarDate(at, timeZone) > dueAt;
}

/** Calendar days from `at` (in the shop's zone) to the due date: 0 on the due date, negative once overdue. */
export function daysToDue(dueAt: string, at: Date | string, timeZone: string): number {
  return daysBetween(calendarDate(at, timeZone), dueAt);
}
