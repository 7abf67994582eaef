// Instants as this browser's clock shows them (display only; the server keeps instants in UTC).

const medium = new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" });
const short = new Intl.DateTimeFormat(undefined, { year: "numeric", month: "short", day: "numeric", hour: "2-digit", minute: "2-digit" });

/** Date and time, medium style ("Jun 15, 2026, 5:00 PM"); a dash when there is none. */
export function formatInstant(iso: string | null | undefined): string {
  return iso ? medium.format(new Date(iso)) : "—";
}

/** Date and time with a short month ("Jun 15, 2026, 05:00 PM"); a dash when there is none. */
export function shortInstant(iso: string | null | undefined): string {
  return iso ? short.format(new Date(iso)) : "—";
}
