import { Fragment, useMemo, useState } from "react";
import { Link } from "react-router-dom";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type RowSelectionState } from "@tanstack/react-table";
import {
  AFFECTED_SORTS,
  DISPOSITION_KINDS,
  DISPOSITION_LABELS,
  READING_VERDICT_LABELS,
  type InvestigationDetail,
  type InvestigationItem,
} from "../../../../shared/investigations/investigations.schemas";
import { lengthWithUnit as length, signedLengthWithUnit as signedLength } from "../../../../shared/investigations/format";
import { useInvestigationItems } from "../api/investigations";
import { useListParams } from "../../../lib/use-list-params";
import { formatDate, formatDateTime } from "../../../lib/format";
import { errorMessage } from "../../../lib/api-client";
import { Button } from "../../../components/ui/button";
import { ErrorNote } from "../../../components/ui/layout";
import { FilterSelect } from "../../../components/ui/filter-select";
import { cx } from "../../../components/ui/cx";
import { SortableHead } from "../../../components/ui/data-table";
import { DispositionForm } from "./disposition-form";
import { ScrollBox } from "../../../components/ui/scroll-box";

const FILTER_KEYS = ["couldChange", "verdict", "disposition", "jobId", "q"] as const;
const PAGE_SIZE = 50;
const SORTABLE = new Set<string>(AFFECTED_SORTS);

const col = createColumnHelper<InvestigationItem>();

const sentence = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** The name of an affected item as the check sheet shows its place ("Exhaust valve stem no. 3"). */
export function itemName(i: InvestigationItem) {
  if (i.kind === "calibration") return `Calibration of ${i.toolAssetTag} on ${formatDate(i.takenAt)}`;
  return `${i.itemLabel ?? i.itemKey}${i.index && i.index > 1 ? ` no. ${i.index}` : ""}`;
}

function CouldChange({ value }: { value: boolean }) {
  return value ? (
    <span className="inline-flex items-center gap-1 whitespace-nowrap rounded-full border border-stop/40 bg-stop-light px-2 py-0.5 text-xs font-semibold text-stop">
      <span aria-hidden="true">!</span>Could change
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 whitespace-nowrap rounded-full border border-go/40 bg-go-light px-2 py-0.5 text-xs font-semibold text-go">
      <span aria-hidden="true">✓</span>Holds
    </span>
  );
}

const verdictText = (i: InvestigationItem) =>
  i.kind === "reading" ? (READING_VERDICT_LABELS[i.originalVerdict as keyof typeof READING_VERDICT_LABELS] ?? i.originalVerdict ?? "—") : (i.originalVerdict ?? "—");

/**
 * The affected readings (and a cascade's calibrations) of an investigation as one table: paged, sorted and filtered
 * on the server, could-change ones first; a row opens to show how it was re-judged and its dispositions; selected
 * rows take one disposition together.
 */
export function AffectedItemsTable({ inv, canDispose }: { inv: InvestigationDetail; canDispose: boolean }) {
  const list = useListParams(FILTER_KEYS, { pageSize: PAGE_SIZE });
  const f = list.filters;
  const q = useInvestigationItems(inv.id, { page: list.page, pageSize: PAGE_SIZE, sort: SORTABLE.has(list.sort.replace(/^-/, "")) ? list.sort : undefined, ...f });
  const [selection, setSelection] = useState<RowSelectionState>({});
  const [expanded, setExpanded] = useState<string | null>(null);
  const [bulkOpen, setBulkOpen] = useState(false);
  const data = q.data?.items ?? [];
  const total = q.data?.total ?? 0;
  const totals = q.data?.totals;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));

  const columns = useMemo(
    () => [
      ...(canDispose
        ? [
            col.display({
              id: "select",
              header: ({ table }) => (
                <input
                  type="checkbox"
                  aria-label="Select every row on this page"
                  className="h-5 w-5"
                  checked={table.getIsAllPageRowsSelected()}
                  ref={(el) => {
                    if (el) el.indeterminate = table.getIsSomePageRowsSelected();
                  }}
                  onChange={table.getToggleAllPageRowsSelectedHandler()}
                />
              ),
              cell: ({ row }) => (
                <input type="checkbox" aria-label={`Select ${itemName(row.original)}${row.original.job ? `, engine ${row.original.job.engineSerial}` : ""}`} className="h-5 w-5" checked={row.getIsSelected()} onChange={row.getToggleSelectedHandler()} />
              ),
            }),
          ]
        : []),
      col.display({
        id: "item",
        header: "Place",
        enableSorting: true,
        cell: ({ row }) => {
          const open = expanded === row.original.id;
          return (
            <button
              type="button"
              className="text-left font-semibold text-ink underline decoration-brass underline-offset-2"
              aria-expanded={open}
              aria-controls={`item-detail-${row.original.id}`}
              onClick={() => setExpanded(open ? null : row.original.id)}
            >
              {itemName(row.original)}
              {row.original.override && <span className="ml-1 text-xs font-semibold text-hold">(override)</span>}
            </button>
          );
        },
      }),
      col.display({
        id: "sheet",
        header: "Check sheet",
        enableSorting: true,
        cell: ({ row }) =>
          row.original.job ? (
            <Link className="underline decoration-brass underline-offset-2" to={`/jobs/${row.original.job.id}`}>
              {row.original.job.engineSerial}
              {row.original.job.workOrder ? ` · ${row.original.job.workOrder}` : ""}
            </Link>
          ) : (
            "Calibration with the standard"
          ),
      }),
      col.accessor("toolAssetTag", { id: "tool", header: "Tool", enableSorting: true, cell: (c) => c.getValue() ?? "—" }),
      col.accessor("takenAt", { id: "takenAt", header: "Measured", enableSorting: true, cell: (c) => <span className="whitespace-nowrap">{formatDateTime(c.getValue())}</span> }),
      col.display({
        id: "value",
        header: "As judged",
        cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{row.original.kind === "reading" ? length(row.original.measuredValue, row.original.unit) : signedLength(row.original.measuredValue, null)}</span>,
      }),
      col.display({
        id: "band",
        header: "Over the error band",
        cell: ({ row }) => (
          // Each end of the band kept whole with its unit; the band breaks between them when the column is narrow.
          <span className="tabular-nums">
            {row.original.bandLow != null && row.original.bandHigh != null ? (
              <>
                <span className="whitespace-nowrap">{length(row.original.bandLow, row.original.unit)}</span> to{" "}
                <span className="whitespace-nowrap">{length(row.original.bandHigh, row.original.unit)}</span>
              </>
            ) : (
              "—"
            )}
          </span>
        ),
      }),
      col.accessor("marginAfter", {
        id: "margin",
        header: "Worst margin",
        enableSorting: true,
        cell: (c) => <span className={cx("whitespace-nowrap tabular-nums", c.getValue() != null && c.getValue()! < 0 && "font-semibold text-stop")}>{signedLength(c.getValue(), c.row.original.unit)}</span>,
      }),
      col.display({ id: "verdict", header: "Verdict recorded", enableSorting: true, cell: ({ row }) => verdictText(row.original) }),
      col.accessor("verdictCouldChange", { id: "couldChange", header: "Re-judged", enableSorting: true, cell: (c) => <CouldChange value={c.getValue()} /> }),
      col.display({
        id: "disposition",
        header: "Disposition",
        enableSorting: true,
        cell: ({ row }) =>
          row.original.disposition ? (
            <span>
              {DISPOSITION_LABELS[row.original.disposition.kind]}
              {row.original.dispositions.length > 1 && <span className="text-ink-soft"> (changed)</span>}
            </span>
          ) : (
            <span className="font-semibold text-hold">None yet</span>
          ),
      }),
    ],
    [canDispose, expanded],
  );

  const table = useReactTable({
    data,
    columns,
    state: { sorting: list.sorting, rowSelection: selection },
    onSortingChange: list.setSorting,
    onRowSelectionChange: setSelection,
    enableRowSelection: canDispose,
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableSortingRemoval: false,
    pageCount: pages,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.id,
  });
  const selectedIds = Object.keys(selection).filter((k) => selection[k]);
  const clearSelection = () => setSelection({});
  const visible = table.getVisibleLeafColumns().length;

  return (
    <div className="flex flex-col gap-3">
      {totals && (
        <p className="text-sm" aria-live="polite">
          <strong>{total}</strong> shown: <span className={cx(totals.couldChange > 0 && "font-semibold text-stop")}>{totals.couldChange} could change</span>, {totals.holds} hold
          {totals.readings > 0 && (
            <>
              {" "}
              · recorded {READING_VERDICT_LABELS.within_limits.toLowerCase()} {totals.byVerdict.within_limits}, {READING_VERDICT_LABELS.outside_limits.toLowerCase()} {totals.byVerdict.outside_limits}
              {totals.byVerdict.pending > 0 ? `, ${READING_VERDICT_LABELS.pending.toLowerCase()} ${totals.byVerdict.pending}` : ""}
            </>
          )}{" "}
          · {totals.undisposed} awaiting a disposition
        </p>
      )}
      <div className="rounded-card border border-paper-line bg-paper-raised shadow-card">
        <div className="no-print flex flex-wrap items-center gap-2 border-b border-paper-line p-2">
          <input
            type="search"
            aria-label="Search place, engine, work order or tool"
            placeholder="Place, engine, work order, tool"
            className="rounded-md border border-paper-line px-3 py-1.5"
            value={f.q}
            onChange={(e) => list.setFilter("q", e.target.value)}
          />
          <FilterSelect label="Filter by re-judged verdict" all="Could change or holds" options={["true", "false"]} labels={{ true: "Could change", false: "Holds" }} value={f.couldChange} onChange={(v) => list.setFilter("couldChange", v)} />
          <FilterSelect label="Filter by verdict recorded" all="Any verdict recorded" options={["within_limits", "outside_limits", "pending"]} labels={READING_VERDICT_LABELS} value={f.verdict} onChange={(v) => list.setFilter("verdict", v)} />
          <FilterSelect
            label="Filter by disposition"
            all="Any disposition"
            options={["none", ...DISPOSITION_KINDS]}
            labels={{ none: "None yet", ...DISPOSITION_LABELS }}
            value={f.disposition}
            onChange={(v) => list.setFilter("disposition", v)}
          />
          {inv.jobs.length > 1 && (
            <FilterSelect
              label="Filter by check sheet"
              all="Every check sheet"
              options={inv.jobs.map((j) => j.id)}
              labels={Object.fromEntries(inv.jobs.map((j) => [j.id, `${j.engineSerial}${j.workOrder ? ` · ${j.workOrder}` : ""} (${j.count})`]))}
              value={f.jobId}
              onChange={(v) => list.setFilter("jobId", v)}
            />
          )}
          {Object.values(f).some(Boolean) && (
            <Button variant="ghost" onClick={() => list.clearFilters()}>
              Clear filters
            </Button>
          )}
        </div>
        {canDispose && selectedIds.length > 0 && (
          <div className="border-b border-paper-line bg-paper p-3" role="region" aria-label="Disposition for the selected rows">
            <div className="flex flex-wrap items-center gap-2">
              <strong>{selectedIds.length} selected</strong>
              {!bulkOpen && <Button onClick={() => setBulkOpen(true)}>Record one disposition for the {selectedIds.length} selected</Button>}
              <Button variant="ghost" onClick={() => (clearSelection(), setBulkOpen(false))}>
                Clear selection
              </Button>
            </div>
            {bulkOpen && (
              <div className="mt-3 max-w-2xl">
                <p className="mb-2 text-sm text-ink-soft">One disposition for every selected row, all or none; a row that already has one gets this one in its place (the old one is kept in its history).</p>
                <DispositionForm
                  investigationId={inv.id}
                  itemIds={selectedIds}
                  submitLabel={`Save for the ${selectedIds.length} selected`}
                  onDone={() => {
                    setBulkOpen(false);
                    clearSelection();
                  }}
                />
              </div>
            )}
          </div>
        )}
        {q.isError && <ErrorNote>{errorMessage(q.error)}</ErrorNote>}
        <ScrollBox label="Affected items">
          <table className="w-full text-left text-sm" aria-label="Affected items" aria-busy={q.isFetching}>
            <SortableHead table={table} canSort={(column) => column.columnDef.enableSorting === true} />
            <tbody>
              {table.getRowModel().rows.map((row) => (
                <Fragment key={row.id}>
                  <tr className={cx("border-t border-paper-line", row.getIsSelected() && "bg-paper-sunk")}>
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id} className="px-3 py-2 align-top">
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    ))}
                  </tr>
                  {expanded === row.id && (
                    <tr id={`item-detail-${row.id}`}>
                      <td colSpan={visible} className="border-t border-paper-line bg-paper px-3 py-3">
                        <ItemDetail investigationId={inv.id} item={row.original} canDispose={canDispose} />
                      </td>
                    </tr>
                  )}
                </Fragment>
              ))}
            </tbody>
          </table>
          {!q.isPending && data.length === 0 && <p className="p-4 text-center text-ink-soft">No affected item matches these filters.</p>}
        </ScrollBox>
        <div className="no-print flex flex-wrap items-center justify-between gap-2 border-t border-paper-line p-2 text-sm">
          <span>
            {total === 0 ? "0" : `${(list.page - 1) * PAGE_SIZE + 1}–${Math.min(list.page * PAGE_SIZE, total)}`} of {total}
          </span>
          <div className="flex items-center gap-2">
            <Button variant="secondary" disabled={list.page <= 1} onClick={() => list.setPage(list.page - 1)}>
              Previous
            </Button>
            <span>
              Page {list.page} of {pages}
            </span>
            <Button variant="secondary" disabled={list.page >= pages} onClick={() => list.setPage(list.page + 1)}>
              Next
            </Button>
          </div>
        </div>
      </div>
    </div>
  );
}

/** One affected item opened: every place re-judged, how, its dispositions (old ones kept), and a new disposition. */
function ItemDetail({ investigationId, item, canDispose }: { investigationId: string; item: InvestigationItem; canDispose: boolean }) {
  const [open, setOpen] = useState(false);
  const unit = item.unit;
  return (
    <section aria-label={`${itemName(item)} in detail`} className="flex flex-col gap-2">
      {item.kind === "reading" ? (
        <>
          <dl className="grid grid-cols-2 gap-x-4 gap-y-1 sm:grid-cols-4">
            <Fact k="Values">{item.values.length ? item.values.map((v) => length(v, unit)).join(" / ") : "—"}</Fact>
            <Fact k={`${sentence(item.quantity ?? "size")} as judged`}>{length(item.measuredValue, unit)}</Fact>
            <Fact k="Most likely (error at the nearest check point)">{length(item.correctedValue, unit)}</Fact>
            <Fact k="Margin as read">{signedLength(item.marginBefore, unit)}</Fact>
            <Fact k="Measured by">{item.takenBy ?? "—"}</Fact>
          </dl>
          {item.places.length > 0 && (
            <ul className="flex flex-col gap-0.5" aria-label="Places re-judged">
              {item.places.map((p) => (
                <li key={p.itemKey} className="tabular-nums">
                  <span className={cx("font-semibold", p.couldChange ? "text-stop" : "text-go")}>{p.couldChange ? "could change" : "holds"}</span> — {p.label}: {p.quantity}{" "}
                  {p.value != null && length(p.value, unit)}
                  {p.low != null && p.high != null && p.low !== p.high && ` (${length(p.low, unit)} to ${length(p.high, unit)})`}; {READING_VERDICT_LABELS[p.verdictNow].toLowerCase()} as read
                </li>
              ))}
            </ul>
          )}
        </>
      ) : (
        <dl className="grid grid-cols-2 gap-x-4 gap-y-1 sm:grid-cols-4">
          <Fact k="Result recorded">{item.originalVerdict ?? "—"}</Fact>
          <Fact k="As-found error corrected">{item.correctedValue ?? "—"}</Fact>
          <Fact k="Margin before">{item.marginBefore ?? "—"}</Fact>
          <Fact k="Margin after">{item.marginAfter ?? "—"}</Fact>
        </dl>
      )}
      <div>
        <h4 className="font-semibold">How it was re-judged</h4>
        <p className="text-ink-soft">{item.basis}</p>
      </div>
      {item.dispositions.length > 0 && (
        <ol className="flex flex-col gap-1" aria-label="Dispositions">
          {item.dispositions.map((d) => {
            const current = d.id === item.disposition?.id;
            return (
              <li key={d.id} className={cx("rounded px-2 py-1", current ? "bg-paper-sunk" : "text-ink-soft")}>
                <strong>{DISPOSITION_LABELS[d.kind]}</strong>
                {current ? "" : " (replaced)"} — {d.rationale}{" "}
                <span className="text-ink-soft">
                  ({d.decidedBy.name}, {formatDateTime(d.decidedAt)}
                  {d.notifiedWhom ? `; told ${d.notifiedWhom} by ${d.notifiedHow}` : ""})
                </span>
              </li>
            );
          })}
        </ol>
      )}
      {canDispose &&
        (open ? (
          <div className="max-w-2xl rounded-md border border-paper-line bg-paper-raised p-3">
            <DispositionForm investigationId={investigationId} itemIds={[item.id]} item={item} onDone={() => setOpen(false)} />
          </div>
        ) : (
          <div>
            <Button variant="secondary" onClick={() => setOpen(true)} aria-label={`${item.disposition ? "Change the disposition" : "Record a disposition"} for ${itemName(item)}`}>
              {item.disposition ? "Change the disposition" : "Record a disposition"}
            </Button>
          </div>
        ))}
    </section>
  );
}

function Fact({ k, children }: { k: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="text-xs text-ink-soft">{k}</dt>
      <dd className="font-medium">{children}</dd>
    </div>
  );
}
