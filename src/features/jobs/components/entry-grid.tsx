import { useCallback, useEffect, useMemo, useRef, useState, type KeyboardEvent, type RefObject } from "react";
import { useSearchParams } from "react-router-dom";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type ColumnDef } from "@tanstack/react-table";
import type { ReactNode } from "react";
import { useRecordReading } from "../api/jobs";
import { useTool, useToolInvalidation, useToolStatus } from "../../tools/api/tools";
import { useCan, useCurrentUser } from "../../auth/api/auth";
import { Button } from "../../../components/ui/button";
import { cx } from "../../../components/ui/cx";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { formatDate } from "../../../lib/format";
import { STATUS_LABELS, type ToolStatus } from "../../../../shared/tools/tool-status";
import { clearanceText, dependentItems, judgeRow, lengthText, slotKey, type JudgingContext, type PlaceView, type ReadingEvidence } from "../../../../shared/inspection/judging";
import { evidenceOf } from "../../../../shared/inspection/check-sheet";
import type { CheckSheet, SheetItem, SheetRow } from "../../../../shared/jobs/jobs.schemas";
import {
  cellName,
  cellState,
  draftEvidence,
  draftStorageKey,
  entryRows,
  firstEmpty,
  moveFrom,
  openCells,
  parseEntry,
  readDrafts,
  readyToSave,
  takeInHand,
  toolsForRow,
  withCell,
  withOutcome,
  withoutRow,
  withoutSaved,
  writeDrafts,
  completeValues,
  type CellRef,
  type DraftSheet,
  type GridRow,
  type ToolBox,
  type ToolInHand,
} from "../lib/entry-grid";
import { VerdictBadge } from "./verdict-badge";
import { rawValue } from "./place-view";

/** A place's saved reading with its judged place, as the sheet's row carries them. */
type SavedRow = { reading: NonNullable<SheetRow["reading"]>; place: SheetRow["place"] };

// The keyboard entry grid of a check sheet: places as rows, directions as cells. Enter (or Tab) moves on, so a gauge
// whose data cable types the value and Enter fills the sheet cell by cell; the tool in hand stays until another is
// scanned; each place is judged live by the shared rules; what is typed is kept in this browser until it is saved.

/** "Enter by keyboard": the grid, opened from the check sheet (kept open across a reload through the address). */
export function EntryGridSection({ sheet }: { sheet: CheckSheet }) {
  const canRecord = useCan("readings.write");
  const [params, setParams] = useSearchParams();
  const open = params.get("entry") === "keyboard";
  if (!canRecord || sheet.locked) return null;
  const toggle = () =>
    setParams(
      (p) => {
        const n = new URLSearchParams(p);
        if (open) n.delete("entry");
        else n.set("entry", "keyboard");
        return n;
      },
      { replace: true },
    );
  return (
    <section aria-labelledby="entry-grid-heading" className="flex min-w-0 flex-col gap-2 rounded-card border border-paper-line bg-paper-raised p-3 shadow-card">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h2 id="entry-grid-heading" className="text-lg font-bold">Enter by keyboard</h2>
          <p className="text-sm text-ink-soft">A grid of every journal and bore: type or send each value with Enter. The form of each place below stays for corrections, feeler and visual checks.</p>
        </div>
        <Button variant="secondary" aria-expanded={open} onClick={toggle}>
          {open ? "Close the entry grid" : "Open the entry grid"}
        </Button>
      </div>
      {open && <EntryGrid sheet={sheet} />}
    </section>
  );
}

const sheetCtx = (s: CheckSheet): JudgingContext => ({ tableUnit: s.limitTable.unit, tableExpansionPerK: s.limitTable.expansionPerK });
const cellId = (c: CellRef) => `${c.slot}|${c.direction}`;

function EntryGrid({ sheet }: { sheet: CheckSheet }) {
  const me = useCurrentUser();
  const key = draftStorageKey(sheet.id, me.id);
  const [drafts, setDrafts] = useState<DraftSheet>(() => readDrafts(window.localStorage, key));
  const update = useCallback(
    (f: (d: DraftSheet) => DraftSheet) =>
      setDrafts((d) => {
        const n = f(d);
        if (n !== d) writeDrafts(window.localStorage, key, n);
        return n;
      }),
    [key],
  );
  const ctx = sheetCtx(sheet);
  const unit = sheet.limitTable.unit;
  const rows = useMemo(() => entryRows(sheet.items), [sheet.items]);
  const itemOf = useMemo(() => new Map(sheet.items.map((i) => [i.key, i])), [sheet.items]);
  const saved = useMemo(() => {
    const m = new Map<string, SavedRow>();
    for (const it of sheet.items) for (const r of it.rows) if (r.reading) m.set(slotKey(it.key, r.index), { reading: r.reading, place: r.place });
    return m;
  }, [sheet.items]);
  const savedOnSheet = useCallback((slot: string) => saved.has(slot), [saved]);

  // A draft the server recorded goes once the sheet shows the reading.
  useEffect(() => update((d) => withoutSaved(d, new Set(saved.keys()))), [saved, update]);

  const box: ToolBox = drafts.box;
  const cells = useMemo(() => openCells(rows, (slot) => !saved.has(slot) && !drafts.rows[slot]?.savedId), [rows, saved, drafts.rows]);
  const valueAt = useCallback((c: CellRef) => drafts.rows[c.slot]?.values[c.direction - 1] ?? "", [drafts.rows]);

  const inputs = useRef(new Map<string, HTMLInputElement>());
  const toolInput = useRef<HTMLInputElement>(null);
  const focusCell = useCallback((c: CellRef | null) => {
    const el = c ? inputs.current.get(cellId(c)) : null;
    if (el) {
      el.focus();
      el.select();
    } else document.getElementById("entry-grid-save")?.focus();
  }, []);
  const focusStart = useCallback(() => {
    const c = firstEmpty(cells, valueAt);
    if (c) focusCell(c);
    else toolInput.current?.focus();
  }, [cells, valueAt, focusCell]);

  const latestFocusStart = useRef(focusStart);
  latestFocusStart.current = focusStart;

  // Where the cursor starts: the tool box until a tool is in hand, then the first empty cell.
  const started = useRef(false);
  useEffect(() => {
    if (started.current) return;
    started.current = true;
    if (box.reader) focusStart();
    else toolInput.current?.focus();
  }, [box.reader, focusStart]);

  const [notes, setNotes] = useState<Record<string, string>>({});
  const note = (slot: string, text: string | null) => setNotes((n) => (text ? { ...n, [slot]: text } : Object.fromEntries(Object.entries(n).filter(([k]) => k !== slot))));
  const [announce, setAnnounce] = useState("");

  // ——— the tool in hand ———
  const [scanning, setScanning] = useState<{ tag: string; then: CellRef | null } | null>(null);
  const [scanRefusal, setScanRefusal] = useState<string | null>(null);
  const onScanned = useCallback(
    (result: { slot: "reader" | "transfer"; tool: ToolInHand } | { refusal: string }, then: CellRef | null) => {
      setScanning(null);
      if ("refusal" in result) {
        setScanRefusal(result.refusal);
        setAnnounce(result.refusal);
        if (then) focusCell(then);
        return;
      }
      setScanRefusal(null);
      update((d) => ({ ...d, box: { ...d.box, [result.slot]: result.tool } }));
      setAnnounce(`${result.tool.tag} in hand.`);
      // Back to where the scan came from, or on to the first empty cell.
      setTimeout(() => (then ? focusCell(then) : latestFocusStart.current()), 0);
    },
    [update, focusCell],
  );
  const putDown = (slot: "reader" | "transfer") => update((d) => ({ ...d, box: { ...d.box, [slot]: null } }));

  // ——— cells ———
  const heldBeforeFocus = useRef<string>("");
  const rowOf = useMemo(() => new Map(rows.map((r) => [r.slot, r])), [rows]);

  /** Reads what is in a cell (Enter, Tab or leaving it): a value is kept, a tag goes to the tool box, anything else is said plainly. */
  const commit = (c: CellRef, typed?: string): "moved-on" | "stay" => {
    const row = rowOf.get(c.slot)!;
    const text = typed ?? valueAt(c);
    const fit = toolsForRow(row, box);
    const parsed = parseEntry(text, "tags" in fit ? fit.unit : (box.reader?.unit ?? null));
    if (parsed.kind === "tag") {
      update((d) => withCell(d, row, c.direction, heldBeforeFocus.current, null));
      setScanning({ tag: parsed.tag, then: c });
      return "stay";
    }
    if (parsed.kind === "error") {
      note(row.slot, `${cellName(row, c.direction)}: ${parsed.message}`);
      return "stay";
    }
    if (parsed.kind === "empty") {
      note(row.slot, null);
      return "moved-on";
    }
    if (!("tags" in fit)) {
      note(row.slot, fit.problem);
      return "stay";
    }
    note(row.slot, null);
    update((d) => withCell(d, row, c.direction, parsed.text, fit));
    heldBeforeFocus.current = parsed.text;
    return "moved-on";
  };

  const onKeyDown = (c: CellRef) => (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === "Enter") {
      e.preventDefault();
      if (commit(c) === "moved-on") focusCell(moveFrom(cells, c, "next"));
    } else if (e.key === "ArrowDown" || e.key === "ArrowUp") {
      const to = moveFrom(cells, c, e.key === "ArrowDown" ? "down" : "up");
      if (to) {
        e.preventDefault();
        commit(c);
        focusCell(to);
      }
    } else if (e.key === "Escape") {
      // Back to what the cell held when the cursor came in.
      e.preventDefault();
      const row = rowOf.get(c.slot)!;
      update((d) => withCell(d, row, c.direction, heldBeforeFocus.current, null));
    }
  };

  // A gauge that sends while the cursor is in the tool box: the value lands in the active cell (or the first empty one).
  const activeCell = useRef<CellRef | null>(null);
  const onToolBoxEntry = (text: string) => {
    if (/^[A-Za-z]/.test(text)) return setScanning({ tag: text.toUpperCase(), then: null });
    const c = activeCell.current && cells.some((x) => x.slot === activeCell.current!.slot && x.direction === activeCell.current!.direction) ? activeCell.current : firstEmpty(cells, valueAt);
    if (!c) return setScanRefusal(`${text} is a value, and no cell is open for it.`);
    const row = rowOf.get(c.slot)!;
    const fit = toolsForRow(row, box);
    update((d) => withCell(d, row, c.direction, text, "tags" in fit ? fit : null));
    heldBeforeFocus.current = valueAt(c);
    focusCell(commit(c, text) === "moved-on" ? moveFrom(cells, c, "next") : c);
  };

  const onType = (c: CellRef, text: string) => {
    const row = rowOf.get(c.slot)!;
    const fit = toolsForRow(row, box);
    update((d) => withCell(d, row, c.direction, text, "tags" in fit ? fit : null));
  };

  // ——— live judging: what is typed takes the place of the saved reading, as on the server ———
  const evidenceAt = useCallback(
    (itemKey: string, index: number): ReadingEvidence | undefined => {
      const slot = slotKey(itemKey, index);
      const row = rowOf.get(slot);
      const draft = row && !saved.has(slot) ? draftEvidence(row, drafts.rows[slot]) : null;
      if (draft) return draft;
      const r = saved.get(slot);
      return r ? evidenceOf(r.reading) : undefined;
    },
    [rowOf, saved, drafts.rows],
  );

  // ——— saving, place by place ———
  const record = useRecordReading(sheet.id);
  const refreshTools = useToolInvalidation();
  const [saving, setSaving] = useState<string | null>(null);
  const ready = readyToSave(rows, drafts, savedOnSheet);
  const drafted = rows.filter((r) => drafts.rows[r.slot] && !drafts.rows[r.slot].savedId && !saved.has(r.slot)).length;
  const saveAll = async () => {
    let ok = 0;
    let refused = 0;
    for (const row of ready) {
      const draft = drafts.rows[row.slot];
      const values = completeValues(row, draft)!;
      if (!draft.tools.length) {
        update((d) => withOutcome(d, row.slot, { refusal: "No tool was in hand when this was typed: scan the tool that read it, then press Enter in its last cell." }));
        refused++;
        continue;
      }
      setSaving(row.slot);
      try {
        const res = await record.mutateAsync({ input: { itemKey: row.itemKey, index: row.index, values, toolAssetTags: draft.tools } });
        update((d) => withOutcome(d, row.slot, { savedId: res.id }));
        ok++;
      } catch (e) {
        update((d) => withOutcome(d, row.slot, { refusal: refusalWords(e) }));
        refused++;
        // A tool refused at saving has changed since it was scanned: show its status now in the tool box.
        if (e instanceof ApiError && e.code === "tool_not_usable") void refreshTools();
      }
    }
    setSaving(null);
    setTimeout(() => latestFocusStart.current(), 0);
    setAnnounce(`${ok} place${ok === 1 ? "" : "s"} saved${refused ? `, ${refused} refused: see the rows marked refused` : ""}.`);
  };

  const helper = createColumnHelper<GridRow>();
  const maxDirections = Math.max(1, ...rows.map((r) => r.directions));
  const columns: ColumnDef<GridRow, any>[] = [
    helper.display({
      id: "place",
      header: "Place",
      cell: ({ row: { original: r } }) => (
        <span className="font-semibold">
          {r.label} <span className="whitespace-nowrap">no. {r.index}</span>
        </span>
      ),
    }),
    ...Array.from({ length: maxDirections }, (_, i) =>
      helper.display({
        id: `d${i + 1}`,
        header: `Direction ${i + 1}`,
        cell: ({ row: { original: r } }) => {
          const direction = i + 1;
          if (direction > r.directions) return <span className="text-ink-soft">—</span>;
          const reading = saved.get(r.slot)?.reading;
          const draft = drafts.rows[r.slot];
          const state = cellState(!!reading, draft, direction);
          if (reading || draft?.savedId) {
            const v = reading ? rawValue(reading.values[direction - 1], reading.unit) : (draft?.values[direction - 1] ?? "");
            return (
              <span className="flex flex-col">
                <span className="tabular-nums font-semibold">{v}</span>
                <CellMark state={state} />
              </span>
            );
          }
          const c = { slot: r.slot, direction };
          return (
            <span className="flex flex-col gap-0.5">
              <input
                ref={(el) => {
                  if (el) inputs.current.set(cellId(c), el);
                  else inputs.current.delete(cellId(c));
                }}
                aria-label={cellName(r, direction)}
                aria-invalid={notes[r.slot]?.startsWith(cellName(r, direction)) || undefined}
                aria-describedby={notes[r.slot] || draft?.refusal ? `${r.slot}-note` : undefined}
                inputMode="decimal"
                autoComplete="off"
                spellCheck={false}
                value={draft?.values[direction - 1] ?? ""}
                onFocus={(e) => {
                  activeCell.current = c;
                  heldBeforeFocus.current = e.currentTarget.value;
                  e.currentTarget.select();
                }}
                onChange={(e) => onType(c, e.target.value)}
                onKeyDown={onKeyDown(c)}
                onBlur={() => commit(c)}
                className={cx(
                  "min-h-10 w-28 rounded-md border bg-paper-raised px-2 py-1 text-base tabular-nums focus:border-brass focus:outline focus:outline-2 focus:outline-brass",
                  state === "draft" && "border-brass-dark border-dashed bg-brass-light",
                  state === "refused" && "border-stop bg-stop-light",
                  state === "empty" && "border-paper-line",
                )}
              />
              <CellMark state={state} />
            </span>
          );
        },
      }),
    ),
    helper.display({
      id: "result",
      header: "Size, clearance and verdict",
      cell: ({ row: { original: r } }) => (
        <RowResult row={r} item={itemOf.get(r.itemKey)!} items={sheet.items} saved={saved.get(r.slot) ?? null} evidenceAt={evidenceAt} ctx={ctx} unit={unit} />
      ),
    }),
    helper.display({
      id: "state",
      header: "Saved?",
      cell: ({ row: { original: r } }) => {
        const draft = drafts.rows[r.slot];
        const stray = !!draft && !draft.savedId && saved.has(r.slot);
        const text =
          saving === r.slot ? "Saving…" : stray ? "Saved earlier" : saved.has(r.slot) || draft?.savedId ? "Saved" : draft?.refusal ? "Refused" : draft ? (completeValues(r, draft) ? "Draft, not saved" : "Draft, incomplete") : "Not measured yet";
        return (
          <span className="flex flex-col gap-1">
            <span className={cx("font-semibold", text === "Refused" && "text-stop", text.startsWith("Draft") && "text-brass-dark")}>{text}</span>
            {(notes[r.slot] || draft?.refusal) && (
              <span id={`${r.slot}-note`} role="alert" className="max-w-64 text-sm text-stop">
                {notes[r.slot] ?? draft?.refusal}
              </span>
            )}
            {stray && (
              <span className="max-w-64 text-sm text-brass-dark">
                Your draft ({draft.values.join(" / ")}) was not saved: this place already has a reading. Correct it with its form below if needed.
              </span>
            )}
            {draft && !draft.savedId && (stray || draft.refusal) && (
              <button type="button" className="self-start text-sm font-semibold text-ink underline" onClick={() => update((d) => withoutRow(d, r.slot))}>
                Discard this draft
              </button>
            )}
          </span>
        );
      },
    }),
  ];
  const table = useReactTable({ data: rows, columns, getCoreRowModel: getCoreRowModel(), getRowId: (r) => r.slot });

  if (rows.length === 0) return <p className="text-sm text-ink-soft">This sheet has no journal or bore to measure; use the form of each place below.</p>;
  let lastSection = "";
  return (
    <div className="flex min-w-0 flex-col gap-3">
      <ToolBoxPanel box={box} inputRef={toolInput} onScan={onToolBoxEntry} onPutDown={putDown} refusal={scanRefusal} checking={scanning?.tag ?? null} />
      {scanning && <ScanCheck key={scanning.tag} tag={scanning.tag} onDone={(r) => onScanned(r, scanning.then)} />}
      <p role="status" aria-live="polite" className="min-h-5 text-sm font-semibold">
        {announce}
      </p>
      <div className="max-w-full overflow-x-auto rounded-md border border-paper-line" role="region" aria-label="Entry grid, scrolls sideways on a narrow screen">
        <table className="min-w-full border-collapse text-left text-sm" aria-label="Entry grid">
          <thead className="bg-paper-sunk text-xs uppercase tracking-wide text-ink-soft">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <th key={h.id} scope="col" className={cx("px-2 py-2", h.column.id === "place" && "sticky left-0 z-10 bg-paper-sunk")}>
                    {flexRender(h.column.columnDef.header, h.getContext())}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => {
              const r = row.original;
              const header =
                r.section !== lastSection ? (
                  <tr key={`s-${r.section}`} className="bg-paper">
                    <th scope="colgroup" colSpan={columns.length} className="px-2 py-1.5 text-sm font-bold">
                      {r.section}
                    </th>
                  </tr>
                ) : null;
              lastSection = r.section;
              return [
                header,
                <tr key={row.id} className="border-t border-paper-line align-top" aria-label={`${r.label} no. ${r.index} in the grid`}>
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className={cx("px-2 py-2", cell.column.id === "place" && "sticky left-0 z-10 max-w-40 bg-paper-raised")}>
                      {renderCell(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>,
              ];
            })}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button id="entry-grid-save" onClick={saveAll} disabled={saving != null || ready.length === 0}>
          {ready.length ? `Save ${ready.length} drafted place${ready.length === 1 ? "" : "s"}` : "Nothing to save"}
        </Button>
        <span className="text-sm text-ink-soft">
          {drafted} place{drafted === 1 ? "" : "s"} drafted in this browser, kept until saved. Enter or Tab: next cell · ↑ ↓: same direction above or below · Esc: undo the cell · a tag typed in a cell changes the tool in hand.
        </span>
      </div>
    </div>
  );
}

/**
 * A cell's content called as a plain function: the column definitions are rebuilt on each render (they close over the
 * drafts), and rendering them as components would remount every input on each keystroke and lose the cursor.
 */
function renderCell<C>(def: unknown, ctx: C): ReactNode {
  return typeof def === "function" ? (def as (c: C) => ReactNode)(ctx) : (def as ReactNode);
}

/** The server's refusal in plain words, with each unusable tool's reason when there are several. */
function refusalWords(e: unknown): string {
  const base = errorMessage(e);
  if (e instanceof ApiError && e.code === "tool_not_usable") {
    const tools = (e.details as { tools?: { assetTag: string; reasons: string[] }[] } | undefined)?.tools ?? [];
    const more = tools.flatMap((t) => t.reasons.slice(t === tools[0] ? 1 : 0).map((r) => `${t.assetTag}: ${r}`));
    return more.length ? `${base} ${more.join(" ")}` : base;
  }
  return base;
}

function CellMark({ state }: { state: ReturnType<typeof cellState> }) {
  if (state === "empty") return null;
  const look = { saved: ["text-go", "✓ saved"], draft: ["text-brass-dark", "not saved"], refused: ["text-stop", "✕ refused"] }[state];
  return <span className={cx("text-xs font-semibold", look[0])}>{look[1]}</span>;
}

/** Size and verdict of the place, and the clearances and tapers it feeds, judged by the shared rules. */
function RowResult({
  row,
  item,
  items,
  saved,
  evidenceAt,
  ctx,
  unit,
}: {
  row: GridRow;
  item: SheetItem;
  items: SheetItem[];
  saved: SavedRow | null;
  evidenceAt: (k: string, i: number) => ReadingEvidence | undefined;
  ctx: JudgingContext;
  unit: "in" | "mm";
}) {
  const place: PlaceView = saved ? saved.place : judgeRow(items, item, row.index, evidenceAt, ctx).view;
  const fed = dependentItems(items, item.key)
    .filter((x) => row.index <= x.repeat)
    .map((x) => ({ label: x.label, place: judgeRow(items, x, row.index, evidenceAt, ctx).view }))
    .filter((x) => x.place.kind !== "pending");
  return (
    <div className="flex min-w-56 flex-col gap-1">
      {place.kind === "size" ? (
        <span className="flex flex-wrap items-center gap-2">
          <span className="tabular-nums font-semibold">
            size {lengthText(place.rawSize, unit)} {unit}
            {place.thermal && ` · ${lengthText(place.size, unit)} at 20 °C`}
          </span>
          <VerdictBadge verdict={place.verdict} text={place.text} />
        </span>
      ) : (
        <span className="text-ink-soft">Waiting for every direction</span>
      )}
      {fed.map((d) => (
        <span key={d.label} className="text-sm">
          {d.label}:{" "}
          <span className="tabular-nums font-semibold">
            {d.place.kind === "fit"
              ? `${clearanceText(d.place.loosest.value, unit)} loosest, ${clearanceText(d.place.tightest.value, unit)} tightest${d.place.basis === "radial" ? " (radial)" : ""}`
              : d.place.kind === "taper"
                ? `taper ${lengthText(d.place.taper, unit)}`
                : ""}
          </span>{" "}
          <VerdictBadge verdict={d.place.verdict} text={d.place.text} />
        </span>
      ))}
    </div>
  );
}

function ToolBoxPanel({
  box,
  inputRef,
  onScan,
  onPutDown,
  refusal,
  checking,
}: {
  box: ToolBox;
  inputRef: RefObject<HTMLInputElement | null>;
  onScan: (tag: string) => void;
  onPutDown: (slot: "reader" | "transfer") => void;
  refusal: string | null;
  checking: string | null;
}) {
  const [text, setText] = useState("");
  return (
    <div className="flex flex-col gap-2 rounded-md border border-paper-line bg-paper p-3" role="group" aria-label="Tools in hand">
      <div className="flex flex-col gap-1">
        <label htmlFor="entry-grid-tool" className="text-sm font-semibold text-ink-soft">
          Tool in hand: scan or type its tag, then Enter
        </label>
        <input
          id="entry-grid-tool"
          ref={inputRef}
          autoComplete="off"
          spellCheck={false}
          value={text}
          aria-describedby="entry-grid-tool-hint"
          onChange={(e) => setText(e.target.value.toUpperCase())}
          onKeyDown={(e) => {
            if (e.key !== "Enter") return;
            e.preventDefault();
            const tag = text.trim();
            if (!tag) return;
            setText("");
            onScan(tag);
          }}
          className="min-h-10 w-full max-w-xs rounded-md border border-paper-line bg-paper-raised px-3 py-2 text-base focus:border-brass"
        />
        <p id="entry-grid-tool-hint" className="text-xs text-ink-soft">
          It stays in hand until you scan another. A bore read through a telescoping or small-hole gauge needs the gauge and the micrometer that reads it. A value sent here goes to the cell the cursor was last in.
        </p>
      </div>
      {checking && <p className="text-sm">Checking {checking}…</p>}
      {refusal && (
        <p role="alert" className="rounded-md border border-stop/40 bg-stop-light px-3 py-2 text-sm font-semibold text-stop">
          ✕ {refusal}
        </p>
      )}
      <ul className="flex flex-col gap-1" aria-label="In hand">
        <HeldTool what="Measuring tool" tool={box.reader} onPutDown={() => onPutDown("reader")} />
        {box.transfer && <HeldTool what="Transfer gauge" tool={box.transfer} onPutDown={() => onPutDown("transfer")} />}
      </ul>
    </div>
  );
}

function HeldTool({ what, tool, onPutDown }: { what: string; tool: ToolInHand | null; onPutDown: () => void }) {
  if (!tool) return <li className="text-sm text-ink-soft">{what}: none in hand.</li>;
  return <HeldToolStatus what={what} tool={tool} onPutDown={onPutDown} />;
}

/** A tool in hand with its status now (the one status derivation), so a tool that has run out since it was scanned shows it. */
function HeldToolStatus({ what, tool, onPutDown }: { what: string; tool: ToolInHand; onPutDown: () => void }) {
  const me = useCurrentUser();
  const status = useToolStatus(tool.tag);
  const s = status.data;
  const usable = s ? s.usableForAcceptance : null;
  return (
    <li className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
      <span>
        {what}: <strong>{tool.tag}</strong> ({tool.kind.replace(/_/g, " ")}, reads in {tool.unit})
      </span>
      {s && (
        <span className={cx("font-semibold", usable ? "text-go" : "text-stop")}>
          {usable ? "✓" : "✕"} {STATUS_LABELS[s.status as ToolStatus] ?? s.status}
          {s.dueAt ? `, due ${formatDate(s.dueAt)}` : ""}
          {!usable && s.reasons[0] ? ` — ${s.reasons[0]} Readings with it will be refused.` : ""}
        </span>
      )}
      {s && <span className="text-ink-soft">{s.custodian ? (s.custodian.userId === me.id ? "issued to you" : `issued to ${s.custodian.name}`) : "not issued"}</span>}
      <button type="button" className="text-sm font-semibold underline" onClick={onPutDown}>
        Put down {tool.tag}
      </button>
    </li>
  );
}

/** Asks the register about a scanned tag (the tool, and the one status derivation at this instant) and says whether it may be held. */
function ScanCheck({ tag, onDone }: { tag: string; onDone: (r: ReturnType<typeof takeInHand>) => void }) {
  const detail = useTool(tag);
  const status = useToolStatus(tag);
  const done = useRef(false);
  useEffect(() => {
    if (done.current) return;
    const err = detail.error ?? status.error;
    if (err) {
      done.current = true;
      onDone({ refusal: err instanceof ApiError && err.status === 404 ? `No tool with the tag ${tag} is in the register.` : errorMessage(err) });
      return;
    }
    if (!detail.data || !status.data) return;
    done.current = true;
    const s = status.data;
    onDone(
      takeInHand({
        assetTag: detail.data.assetTag,
        kind: detail.data.kind,
        unit: detail.data.unit,
        acceptanceUse: detail.data.acceptanceUse,
        status: s.status,
        statusLabel: STATUS_LABELS[s.status as ToolStatus] ?? s.status,
        usableForAcceptance: s.usableForAcceptance,
        reasons: s.reasons,
      }),
    );
  }, [detail.data, detail.error, status.data, status.error, tag, onDone]);
  return null;
}
