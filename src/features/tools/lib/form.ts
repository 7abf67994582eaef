// Forms keep what the person typed as text; numbers are made only on the way
// to the shared zod schema, so a length is never rounded by an input control.

/** register() options for a number field: blank means absent. */
export const asNumber = { setValueAs: (v: unknown) => (v === "" || v == null ? undefined : typeof v === "number" ? v : Number(String(v).trim())) };

/** Props for a text input that takes a decimal on phones and tablets. */
export const decimalInput = { type: "text", inputMode: "decimal" as const, autoComplete: "off" };

/** A datetime-local value (local wall time) for an instant, and back. */
export function toLocalInput(instant: Date): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${instant.getFullYear()}-${pad(instant.getMonth() + 1)}-${pad(instant.getDate())}T${pad(instant.getHours())}:${pad(instant.getMinutes())}`;
}
export function fromLocalInput(value: string): string | null {
  if (!value) return null;
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? null : d.toISOString();
}

/** Server field errors (400 zod issues) onto a react-hook-form. */
export function applyFieldErrors(fieldErrors: Record<string, string>, setError: (name: any, e: { type: string; message: string }) => void) {
  for (const [k, message] of Object.entries(fieldErrors)) setError(k, { type: "server", message });
}

/** Look of a file picker, matching the buttons. */
export const fileInputClass =
  "text-sm font-normal file:mr-3 file:min-h-10 file:cursor-pointer file:rounded-md file:border file:border-paper-line file:bg-paper-raised file:px-3 file:py-1.5 file:font-semibold file:text-ink hover:file:bg-paper-sunk";
