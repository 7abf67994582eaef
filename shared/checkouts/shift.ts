// The crib's default "expected back" is the end of the shift, a wall-clock time
// in the shop's time zone (settings.endOfShift), turned into an instant here.
import { addDays, calendarDate } from "../common/dates";

/** Offset of a time zone from UTC at an instant, in minutes (e.g. -300 for Chicago in summer). */
export function zoneOffsetMinutes(instant: Date, timeZone: string): number {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(instant);
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value ?? 0);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return Math.round((asUtc - Math.floor(instant.getTime() / 1000) * 1000) / 60_000);
}

/** The instant at which a wall-clock time (HH:MM) occurs on a calendar date in a time zone. */
export function zonedInstant(date: string, time: string, timeZone: string): Date {
  const [h, m] = time.split(":").map(Number);
  const [y, mo, d] = date.split("-").map(Number);
  const wall = Date.UTC(y, mo - 1, d, h, m);
  // Two passes settle the offset even on a day the clocks change.
  let guess = new Date(wall - zoneOffsetMinutes(new Date(wall), timeZone) * 60_000);
  guess = new Date(wall - zoneOffsetMinutes(guess, timeZone) * 60_000);
  return guess;
}

/**
 * The end of the shift a tool issued at `now` is expected back by: today's end
 * of shift in the shop, or tomorrow's when today's has already passed (a tool
 * issued on the night shift is due back at the next end of shift).
 */
export function endOfShiftAfter(now: Date, endOfShift: string, timeZone: string): Date {
  const today = calendarDate(now, timeZone);
  const todayEnd = zonedInstant(today, endOfShift, timeZone);
  return todayEnd.getTime() > now.getTime() ? todayEnd : zonedInstant(addDays(today, 1), endOfShift, timeZone);
}

/** An instant as the shop's wall clock reads it, "YYYY-MM-DD HH:MM". */
export function shopDateTime(instant: Date | string, timeZone: string): string {
  const d = instant instanceof Date ? instant : new Date(instant);
  const t = new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(d);
  return `${calendarDate(d, timeZone)} ${t}`;
}
