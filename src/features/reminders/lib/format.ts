const when = new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" });

/** An instant as this browser's local date and time. */
export function formatInstant(iso: string | null | undefined): string {
  return iso ? when.format(new Date(iso)) : "—";
}
