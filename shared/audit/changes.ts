/**
 * An audit line's before and after, field by field in words, for people reading the trail: nested fields are named by
 * their path ("Override › reason"), lists of plain values are joined, a field only one side has shows empty on the
 * other, and each row says whether the field changed.
 */
export interface ChangeRow {
  field: string;
  before: string | null;
  after: string | null;
  changed: boolean;
}

/** "supersedesId" and "due_back_at" → "Supersedes id", "Due back at". */
export function fieldWords(key: string): string {
  const words = key
    .replace(/_/g, " ")
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .toLowerCase()
    .trim();
  return words ? words[0].toUpperCase() + words.slice(1) : key;
}

function text(v: unknown): string {
  if (v === null || v === undefined) return "none";
  if (typeof v === "boolean") return v ? "yes" : "no";
  if (typeof v === "string") return v === "" ? "(empty)" : v;
  return String(v);
}

const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

function flatten(v: unknown, path: string, out: Map<string, string>) {
  if (isPlainObject(v)) {
    const entries = Object.entries(v);
    if (entries.length === 0 && path) out.set(path, "none");
    for (const [k, x] of entries) flatten(x, path ? `${path} › ${fieldWords(k).toLowerCase()}` : fieldWords(k), out);
  } else if (Array.isArray(v)) {
    if (v.some((x) => isPlainObject(x) || Array.isArray(x))) v.forEach((x, i) => flatten(x, `${path || "Value"} ${i + 1}`, out));
    else out.set(path || "Value", v.length ? v.map(text).join(", ") : "none");
  } else out.set(path || "Value", text(v));
}

/** The rows of a change: the fields of `before` in their order, then those only `after` has. */
export function changeRows(before: unknown, after: unknown): ChangeRow[] {
  const b = new Map<string, string>();
  const a = new Map<string, string>();
  if (before != null) flatten(before, "", b);
  if (after != null) flatten(after, "", a);
  const fields = [...new Set([...b.keys(), ...a.keys()])];
  return fields.map((field) => {
    const was = b.get(field) ?? null;
    const now = a.get(field) ?? null;
    return { field, before: was, after: now, changed: before != null && after != null && was !== now };
  });
}
