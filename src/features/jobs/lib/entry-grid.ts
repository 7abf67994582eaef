// The keyboard entry grid's own logic, kept free of React so it can be tested alone: which places are rows, where
// Enter/Tab/arrows go, how a value typed (or sent by a gauge's data cable as keystrokes + Enter) is read, which tools in
// hand suit a row, and the drafts kept in the browser until each place is saved. The judging itself is shared
// (shared/inspection/judging.ts); nothing here decides a verdict.
import { z } from "zod";
import type { LengthUnit } from "../../../../shared/common/units";
import { slotKey, type ReadingEvidence } from "../../../../shared/inspection/judging";

/** What the grid needs of a sheet item. */
export interface GridItem {
  key: string;
  label: string;
  kind: string;
  section?: string | null;
  directions: number;
  repeat: number;
  toolKinds?: string[] | null;
}

/** One place measured with values: a journal or bore item × its number on the engine. */
export interface GridRow {
  slot: string;
  itemKey: string;
  index: number;
  label: string;
  section: string;
  kind: "journal" | "bore";
  directions: number;
  toolKinds: string[] | null;
}

/** A cell: a place and one of its directions (1-based). */
export interface CellRef {
  slot: string;
  direction: number;
}

/** The places a grid takes values for, in the sheet's order: each journal and bore item, numbers 1…repeat. */
export function entryRows(items: GridItem[]): GridRow[] {
  const rows: GridRow[] = [];
  for (const it of items) {
    if (it.kind !== "journal" && it.kind !== "bore") continue;
    for (let i = 1; i <= it.repeat; i++) {
      rows.push({ slot: slotKey(it.key, i), itemKey: it.key, index: i, label: it.label, section: it.section ?? "General", kind: it.kind, directions: it.directions, toolKinds: it.toolKinds ?? null });
    }
  }
  return rows;
}

/** The accessible name of a cell: the place and the direction. */
export const cellName = (row: Pick<GridRow, "label" | "index">, direction: number) => `${row.label} no. ${row.index}, direction ${direction}`;

/** Every cell that still takes a value (its place not yet saved), in reading order: row by row, direction by direction. */
export function openCells(rows: GridRow[], isOpen: (slot: string) => boolean): CellRef[] {
  return rows.filter((r) => isOpen(r.slot)).flatMap((r) => Array.from({ length: r.directions }, (_, d) => ({ slot: r.slot, direction: d + 1 })));
}

const same = (a: CellRef, b: CellRef) => a.slot === b.slot && a.direction === b.direction;

/**
 * Where the cursor goes from a cell: "next" and "previous" through the open cells in reading order (Enter and Tab),
 * "down" and "up" to the same direction of the nearest open place below or above. Null when there is nowhere to go.
 */
export function moveFrom(cells: CellRef[], at: CellRef, step: "next" | "previous" | "down" | "up"): CellRef | null {
  const i = cells.findIndex((c) => same(c, at));
  if (i < 0) return cells[0] ?? null;
  if (step === "next") return cells[i + 1] ?? null;
  if (step === "previous") return cells[i - 1] ?? null;
  const dir = step === "down" ? 1 : -1;
  for (let j = i + dir; j >= 0 && j < cells.length; j += dir) {
    if (cells[j].slot !== at.slot && cells[j].direction === at.direction) return cells[j];
  }
  return null;
}

/** The first cell of the open cells with nothing typed in it yet (where the cursor starts). */
export function firstEmpty(cells: CellRef[], valueAt: (c: CellRef) => string): CellRef | null {
  return cells.find((c) => valueAt(c).trim() === "") ?? null;
}

export type Parsed = { kind: "empty" } | { kind: "value"; value: number; text: string } | { kind: "tag"; tag: string } | { kind: "error"; message: string };

/**
 * Reads what landed in a cell. Digital gauges with a data cable type the value and Enter, often signed and zero-padded
 * ("+0.87490", "-000.0012") or with the unit after it ("0.8749 in", "22.225mm"); some send a decimal comma. A text that
 * starts with a letter is a tool's tag scanned while the cursor was in the grid.
 */
export function parseEntry(raw: string, toolUnit: LengthUnit | null): Parsed {
  const text = raw.trim();
  if (text === "") return { kind: "empty" };
  if (/^[A-Za-z]/.test(text)) {
    const tag = text.toUpperCase();
    return /^[A-Z0-9][A-Z0-9-]{1,39}$/.test(tag) ? { kind: "tag", tag } : { kind: "error", message: `"${text}" is neither a number nor a tool's tag.` };
  }
  const m = /^([+-]?)(\d*)(?:([.,])(\d*))?\s*(in|mm|")?$/i.exec(text);
  if (!m || (m[2] === "" && (m[4] ?? "") === "")) return { kind: "error", message: `"${text}" is not a number.` };
  const unit = m[5] ? (m[5] === '"' ? "in" : (m[5].toLowerCase() as LengthUnit)) : null;
  if (unit && toolUnit && unit !== toolUnit) return { kind: "error", message: `The value came in ${unit}, but the tool in hand reads in ${toolUnit}.` };
  const digits = `${m[1] === "-" ? "-" : ""}${m[2] || "0"}${m[4] ? `.${m[4]}` : ""}`;
  const value = Number(digits);
  if (!Number.isFinite(value)) return { kind: "error", message: `"${text}" is not a number.` };
  if (value <= 0) return { kind: "error", message: "A diameter is more than zero." };
  return { kind: "value", value, text: digits.replace(/^(-?)0+(?=\d)/, "$1") };
}

// ——— tools in hand ———

/** Transfer gauges carry a bore's size to a micrometer; the value is read on the micrometer (as the server holds it). */
export const TRANSFER_KINDS = ["telescoping_gauge", "small_hole_gauge"] as const;
/** Tools a size is read on. */
export const READ_KINDS = ["outside_micrometer", "inside_micrometer", "dial_indicator", "caliper", "other"] as const;

export interface ToolInHand {
  tag: string;
  kind: string;
  unit: LengthUnit;
}
export interface ToolBox {
  reader: ToolInHand | null;
  transfer: ToolInHand | null;
}

const article = (w: string) => (/^[aeiou]/i.test(w) ? "an" : "a");
const words = (kinds: readonly string[]) => kinds.map((k) => k.replace(/_/g, " ")).join(" or ");

/** The slot of the tool box a scanned tool goes to, or why it cannot be held for this grid. */
export function slotFor(kind: string): "reader" | "transfer" | { problem: string } {
  if ((TRANSFER_KINDS as readonly string[]).includes(kind)) return "transfer";
  if ((READ_KINDS as readonly string[]).includes(kind)) return "reader";
  if (kind === "feeler_set") return { problem: "Feeler checks are entered with the form of each place below." };
  return { problem: `${article(kind) === "an" ? "An" : "A"} ${kind.replace(/_/g, " ")} does not read a size.` };
}

/**
 * The tags a reading of this row names, from the tools in hand, or why the tools in hand do not suit it. A journal is
 * read on the measuring tool; a bore through the transfer gauge in hand (named with the micrometer that read it) or
 * directly when its item allows the measuring tool itself. Mirrors the server's rule so a mismatch shows before typing.
 */
export function toolsForRow(row: Pick<GridRow, "kind" | "label" | "toolKinds">, box: ToolBox): { tags: string[]; unit: LengthUnit } | { problem: string } {
  const allowed = row.toolKinds?.length ? row.toolKinds : null;
  const fits = (t: ToolInHand | null) => !!t && (!allowed || allowed.includes(t.kind));
  if (!box.reader) {
    return { problem: box.transfer ? `Scan the micrometer that reads ${box.transfer.tag}.` : "Scan the tool in hand first." };
  }
  if (row.kind === "bore" && fits(box.transfer)) return { tags: [box.transfer!.tag, box.reader.tag], unit: box.reader.unit };
  if (fits(box.reader)) return { tags: [box.reader.tag], unit: box.reader.unit };
  if (row.kind === "bore" && allowed?.some((k) => (TRANSFER_KINDS as readonly string[]).includes(k))) {
    return { problem: `${row.label} is read through a ${words(allowed.filter((k) => (TRANSFER_KINDS as readonly string[]).includes(k)))}: scan it too.` };
  }
  return { problem: `${row.label} is measured with: ${words(allowed ?? [])}. ${box.reader.tag} is ${article(box.reader.kind)} ${box.reader.kind.replace(/_/g, " ")}.` };
}

// ——— drafts ———

const DraftRowSchema = z.object({
  /** As typed, one per direction ("" where nothing is typed yet). */
  values: z.array(z.string().max(40)).max(12),
  /** The tools in hand when the values were typed, and the unit they read in. */
  tools: z.array(z.string().max(40)).max(4),
  unit: z.enum(["in", "mm"]),
  /** The server's refusal, in its words, when saving failed. */
  refusal: z.string().max(1000).nullable().default(null),
  /** Set once the server has recorded it; the draft goes when the sheet shows the reading. */
  savedId: z.string().max(60).nullable().default(null),
});
export type DraftRow = z.infer<typeof DraftRowSchema>;

const TagSchema = z.object({ tag: z.string().max(40), kind: z.string().max(40), unit: z.enum(["in", "mm"]) }).nullable();
const DraftSheetSchema = z.object({
  version: z.literal(1),
  rows: z.record(z.string().max(80), DraftRowSchema),
  box: z.object({ reader: TagSchema, transfer: TagSchema }),
});
export type DraftSheet = z.infer<typeof DraftSheetSchema>;

export const emptyDrafts = (): DraftSheet => ({ version: 1, rows: {}, box: { reader: null, transfer: null } });

/** Where a sheet's drafts live in this browser: one entry per sheet and person, so two people on one tablet keep theirs apart. */
export const draftStorageKey = (jobId: string, userId: string) => `tenthwise.entry-grid.v1.${jobId}.${userId}`;

/** The drafts kept for a sheet; anything unreadable (an older shape, a hand edit) counts as none. */
export function readDrafts(storage: Pick<Storage, "getItem">, key: string): DraftSheet {
  try {
    const raw = storage.getItem(key);
    if (!raw) return emptyDrafts();
    const parsed = DraftSheetSchema.safeParse(JSON.parse(raw));
    return parsed.success ? parsed.data : emptyDrafts();
  } catch {
    return emptyDrafts();
  }
}

/** Keeps the drafts (or forgets them when nothing is left to keep). */
export function writeDrafts(storage: Pick<Storage, "setItem" | "removeItem">, key: string, d: DraftSheet): void {
  if (Object.keys(d.rows).length === 0 && !d.box.reader && !d.box.transfer) storage.removeItem(key);
  else storage.setItem(key, JSON.stringify(d));
}

/** A value typed in a cell, with the tools in hand that read it; a place with every cell cleared is no longer a draft. */
export function withCell(d: DraftSheet, row: Pick<GridRow, "slot" | "directions">, direction: number, text: string, inHand: { tags: string[]; unit: LengthUnit } | null): DraftSheet {
  const prev = d.rows[row.slot];
  const values = Array.from({ length: row.directions }, (_, i) => (i === direction - 1 ? text : (prev?.values[i] ?? "")));
  const rows = { ...d.rows };
  if (values.every((v) => v.trim() === "")) delete rows[row.slot];
  else rows[row.slot] = { values, tools: inHand?.tags ?? prev?.tools ?? [], unit: inHand?.unit ?? prev?.unit ?? "in", refusal: null, savedId: null };
  return { ...d, rows };
}

/** The outcome of saving a place: recorded (kept until the sheet shows it) or refused with the server's words. */
export function withOutcome(d: DraftSheet, slot: string, outcome: { savedId: string } | { refusal: string }): DraftSheet {
  const r = d.rows[slot];
  if (!r) return d;
  return { ...d, rows: { ...d.rows, [slot]: { ...r, savedId: "savedId" in outcome ? outcome.savedId : null, refusal: "refusal" in outcome ? outcome.refusal : null } } };
}

/** Forgets drafts the sheet now holds as saved readings. */
export function withoutSaved(d: DraftSheet, savedSlots: Set<string>): DraftSheet {
  const gone = Object.entries(d.rows).filter(([slot, r]) => r.savedId && savedSlots.has(slot));
  if (!gone.length) return d;
  const rows = { ...d.rows };
  for (const [slot] of gone) delete rows[slot];
  return { ...d, rows };
}

export const withoutRow = (d: DraftSheet, slot: string): DraftSheet => {
  const rows = { ...d.rows };
  delete rows[slot];
  return { ...d, rows };
};

/** The values of a drafted place when every direction holds a number, else null. */
export function completeValues(row: Pick<GridRow, "directions">, draft: DraftRow | undefined): number[] | null {
  if (!draft) return null;
  const out: number[] = [];
  for (let i = 0; i < row.directions; i++) {
    const p = parseEntry(draft.values[i] ?? "", draft.unit);
    if (p.kind !== "value") return null;
    out.push(p.value);
  }
  return out;
}

/** A drafted place as judging evidence (judged live by the shared rules), once every direction holds a number. */
export function draftEvidence(row: GridRow, draft: DraftRow | undefined): ReadingEvidence | null {
  const values = completeValues(row, draft);
  return values && draft ? { itemKey: row.itemKey, index: row.index, unit: draft.unit, values } : null;
}

/** The state of one cell: saved on the sheet, typed but not saved, typed but refused by the server, or empty. */
export type CellState = "saved" | "draft" | "refused" | "empty";
export function cellState(savedOnSheet: boolean, draft: DraftRow | undefined, direction: number): CellState {
  if (savedOnSheet || draft?.savedId) return "saved";
  if (!draft || (draft.values[direction - 1] ?? "").trim() === "") return "empty";
  return draft.refusal ? "refused" : "draft";
}

/** The drafted places ready to save, in the grid's order: complete, not yet recorded, not on a saved place. */
export function readyToSave(rows: GridRow[], d: DraftSheet, savedOnSheet: (slot: string) => boolean): GridRow[] {
  return rows.filter((r) => !savedOnSheet(r.slot) && !d.rows[r.slot]?.savedId && completeValues(r, d.rows[r.slot]) != null);
}

/** What the register says of a scanned tool (GET /api/tools/:tag and its status answer). */
export interface ScannedTool {
  assetTag: string;
  kind: string;
  unit: LengthUnit;
  acceptanceUse: boolean;
  status: string;
  statusLabel: string;
  usableForAcceptance: boolean;
  reasons: string[];
}

/**
 * Whether a scanned tool may be taken in hand for readings, and in which slot: refused before anything is measured
 * when the one status derivation says it may not be used for acceptance (overdue, out of tolerance, quarantined,
 * reference only…), in the words of its reasons.
 */
export function takeInHand(t: ScannedTool): { slot: "reader" | "transfer"; tool: ToolInHand } | { refusal: string } {
  if (!t.usableForAcceptance || !t.acceptanceUse) {
    const why = t.reasons[0] ?? (t.acceptanceUse ? t.statusLabel : "This tool is not for acceptance readings.");
    return { refusal: `${t.assetTag} may not be used for readings: ${why}` };
  }
  const slot = slotFor(t.kind);
  if (typeof slot !== "string") return { refusal: `${t.assetTag}: ${slot.problem}` };
  return { slot, tool: { tag: t.assetTag, kind: t.kind, unit: t.unit } };
}
