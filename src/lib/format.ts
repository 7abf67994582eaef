// The one time formatter of the client (display only; the server keeps instants in UTC).
// Dates are YYYY-MM-DD; times are 24-hour in the shop's time zone, with the zone named
// wherever it differs from this browser's. The signed-in layout sets the shop's zone
// from /api/settings before any page renders (`useShopTimeZone`).

const browserZone = (() => {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone;
  } catch {
    return "UTC";
  }
})();

let shopZone: string = browserZone;
const cache = new Map<string, Intl.DateTimeFormat>();

function fmt(zone: string, kind: "parts" | "zone"): Intl.DateTimeFormat {
  const key = `${zone}|${kind}`;
  let f = cache.get(key);
  if (!f) {
    f =
      kind === "parts"
        ? new Intl.DateTimeFormat("en-CA", { timeZone: zone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" })
        : new Intl.DateTimeFormat("en-GB", { timeZone: zone, timeZoneName: "short" });
    cache.set(key, f);
  }
  return f;
}

/** Set the shop's time zone (an IANA name); an unknown name keeps the browser's. */
export function setShopTimeZone(zone: string | null | undefined): void {
  if (!zone) return;
  try {
    fmt(zone, "parts");
    shopZone = zone;
  } catch {
    shopZone = browserZone;
  }
}

/** The zone times are shown in. */
export function shopTimeZone(): string {
  return shopZone;
}

/** True when the shop's zone is not this browser's, so times carry the zone's name. */
export function zoneDiffers(): boolean {
  return shopZone !== browserZone;
}

function parts(d: Date): Record<string, string> {
  const out: Record<string, string> = {};
  for (const p of fmt(shopZone, "parts").formatToParts(d)) out[p.type] = p.value;
  if (out.hour === "24") out.hour = "00";
  return out;
}

function toDate(value: string | Date): Date | null {
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** The short name of the shop's zone at that instant ("CET", "GMT+1"). */
export function zoneName(value: string | Date = new Date()): string {
  const d = toDate(value) ?? new Date();
  return fmt(shopZone, "zone").formatToParts(d).find((p) => p.type === "timeZoneName")?.value ?? shopZone;
}

const suffix = (d: Date) => (zoneDiffers() ? ` ${zoneName(d)}` : "");

/** A calendar date, YYYY-MM-DD. A date already written so (a record's due date) is shown as it is; an instant is shown as the shop's date. */
export function formatDate(value: string | Date | null | undefined): string {
  if (!value) return "—";
  if (typeof value === "string" && /^\d{4}-\d{2}-\d{2}$/.test(value)) return value;
  const d = toDate(value);
  if (!d) return "—";
  const p = parts(d);
  return `${p.year}-${p.month}-${p.day}`;
}

/** A time of day, 24-hour ("07:15"), with the zone named where it differs from the browser's. */
export function formatTime(value: string | Date | null | undefined): string {
  if (!value) return "—";
  const d = toDate(value);
  if (!d) return "—";
  const p = parts(d);
  return `${p.hour}:${p.minute}${suffix(d)}`;
}

/** Date and time ("2026-12-02 07:15"), with the zone named where it differs from the browser's. */
export function formatDateTime(value: string | Date | null | undefined, opts: { seconds?: boolean } = {}): string {
  if (!value) return "—";
  const d = toDate(value);
  if (!d) return "—";
  const p = parts(d);
  return `${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute}${opts.seconds ? `:${p.second}` : ""}${suffix(d)}`;
}

/** Older names, kept so every page shows the same format. */
export const formatInstant = formatDateTime;
export const shortInstant = formatDateTime;
