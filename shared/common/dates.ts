// Due dates are calendar dates in the shop's time zone (api.md); instants are converted once, here.

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
    formatters.set(timeZone, f);
  }
  return f;
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;

/** True when text is a real calendar date written YYYY-MM-DD. */
export function isCalendarDate(text: string): boolean {
  const m = DATE_RE.exec(text);
  if (!m) return false;
  const d = new Date(Date.UTC(+m[1], +m[2] - 1, +m[3]));
  return d.getUTCFullYear() === +m[1] && d.getUTCMonth() === +m[2] - 1 && d.getUTCDate() === +m[3];
}

/** True when the runtime knows the IANA time zone name. */
export function isValidTimeZone(timeZone: string): boolean {
  try {
    formatterFor(timeZone);
    return true;
  } catch {
    return false;
  }
}

/** The calendar date (YYYY-MM-DD) an instant falls on in the given time zone. */
export function calendarDate(instant: Date | string, timeZone: string): string {
  const d = instant instanceof Date ? instant : new Date(instant);
  const ms = d.getTime();
  if (Number.isNaN(ms)) throw new RangeError(`Not an instant: ${String(instant)}`);
  // The last answer is kept for its whole UTC second: a page of statuses asks for the same instant once per row, and
  // every status lookup in the same second asks for the same date. Exact for every zone: an offset from UTC is a whole
  // number of seconds and changes only at a whole second (the tz database's resolution), so a local midnight always
  // falls on a whole UTC second and never inside one.
  const second = Math.floor(ms / 1000);
  if (second === lastDate.second && timeZone === lastDate.timeZone) return lastDate.date;
  const parts = formatterFor(timeZone).formatToParts(d);
  const get = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? "";
  const date = `${get("year").padStart(4, "0")}-${get("month")}-${get("day")}`;
  lastDate = { second, timeZone, date };
  return date;
}
let lastDate = { second: NaN, timeZone: "", date: "" };

function toUtcMs(date: string): number {
  if (!isCalendarDate(date)) throw new RangeError(`Not a calendar date (YYYY-MM-DD): ${date}`);
  const m = DATE_RE.exec(date)!;
  return Date.UTC(+m[1], +m[2] - 1, +m[3]);
}

/** The calendar date a whole number of days after (or before, if negative) the given date. */
export function addDays(date: string, days: number): string {
  if (!Number.isInteger(days)) throw new RangeError(`Days must be a whole number: ${days}`);
  // Counting on UTC midnights keeps every day 24 h long, so DST never shifts a calendar date.
  return new Date(toUtcMs(date) + days * MS_PER_DAY).toISOString().slice(0, 10);
}

/** Whole calendar days from one date to another (negative when toDate is earlier). */
export function daysBetween(fromDate: string, toDate: string): number {
  return Math.round((toUtcMs(toDate) - toUtcMs(fromDate)) / MS_PER_DAY);
}
