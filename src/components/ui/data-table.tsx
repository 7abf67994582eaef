import { useState, type ReactNode } from "react";
import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type VisibilityState,
  type OnChangeFn,
  type Column,
  type Table,
} from "@tanstack/react-table";
import { Button } from "./button";
import { ScrollBox } from "./scroll-box";

interface DataTableProps<T> {
  columns: ColumnDef<T, any>[];
  data: T[];
  total: number;
  page: number;
  pageSize: number;
  onPageChange: (page: number) => void;
  sorting?: SortingState;
  onSortingChange?: OnChangeFn<SortingState>;
  /** Accessible name of the table. */
  label: string;
  loading?: boolean;
  empty?: ReactNode;
  toolbar?: ReactNode;
  initialHidden?: string[];
  rowKey?: (row: T) => string;
  /** The total is a floor: the list counted this many rows and stopped (a trail of millions is not counted whole). */
  totalCapped?: boolean;
  /** Whether a page follows this one, when the list says so itself (keyset paging); else worked out from the total. */
  hasMore?: boolean;
}

/**
 * A server-paged, server-sorted table (TanStack Table in manual mode) with a
 * column chooser. Filtering lives in the page above it, in the URL.
 */
export function DataTable<T>({ columns, data, total, page, pageSize, onPageChange, sorting, onSortingChange, label, loading, empty, toolbar, initialHidden, rowKey, totalCapped, hasMore }: DataTableProps<T>) {
  const [visibility, setVisibility] = useState<VisibilityState>(() => Object.fromEntries((initialHidden ?? []).map((c) => [c, false])));
  const [choosing, setChoosing] = useState(false);
  const table = useReactTable({
    data,
    columns,
    state: { sorting: sorting ?? [], columnVisibility: visibility },
    onSortingChange,
    onColumnVisibilityChange: setVisibility,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    pageCount: Math.max(1, Math.ceil(total / pageSize)),
    getCoreRowModel: getCoreRowModel(),
    getRowId: rowKey ? (r) => rowKey(r) : undefined,
  });
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = (page - 1) * pageSize + 1;
  const shown = totalCapped
    ? `${data.length ? `${first.toLocaleString("en")}–${(first + data.length - 1).toLocaleString("en")}` : "0"} of more than ${total.toLocaleString("en")}`
    : `${total === 0 ? "0" : `${first}–${Math.min(page * pageSize, total)}`} of ${total}`;
  const nextOpen = hasMore ?? page < pages;
  return (
    <div className="min-w-0 rounded-card border border-paper-line bg-paper-raised shadow-card">
      <div className="no-print flex flex-wrap items-center justify-between gap-2 border-b border-paper-line p-2">
        <div className="flex flex-wrap items-center gap-2">{toolbar}</div>
        <div className="relative">
          <Button variant="ghost" onClick={() => setChoosing((v) => !v)} aria-expanded={choosing}>
            Columns
          </Button>
          {choosing && (
            <div className="absolute right-0 z-10 mt-1 w-56 rounded-md border border-paper-line bg-paper-raised p-2 shadow-card">
              {table.getAllLeafColumns().map((c) => (
                <label key={c.id} className="flex items-center gap-2 py-1 text-sm">
                  <input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} />
                  {typeof c.columnDef.header === "string" ? c.columnDef.header : c.id}
                </label>
              ))}
            </div>
          )}
        </div>
      </div>
      <ScrollBox label={label}>
        <table className="w-full text-left text-sm" aria-label={label} aria-busy={loading}>
          <SortableHead table={table} canSort={(column) => column.getCanSort() && !!onSortingChange} />
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-paper-line hover:bg-paper">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {!loading && data.length === 0 && <div className="p-4">{empty ?? <p className="text-center text-ink-faint">Nothing matches.</p>}</div>}
      </ScrollBox>
      <div className="no-print flex items-center justify-between gap-2 border-t border-paper-line p-2 text-sm">
        <span>{shown}</span>
        <div className="flex items-center gap-2">
          <Button variant="secondary" disabled={page <= 1} onClick={() => onPageChange(page - 1)}>
            Previous
          </Button>
          <span>{totalCapped ? `Page ${page.toLocaleString("en")}` : `Page ${page} of ${pages}`}</span>
          <Button variant="secondary" disabled={!nextOpen} onClick={() => onPageChange(page + 1)}>
            Next
          </Button>
        </div>
      </div>
    </div>
  );
}

/** The paging props a DataTable takes from a page query ({ items, total }) and the URL's list state. */
export function pagedProps<T>(query: { data?: { items: T[]; total: number }; isPending: boolean }, list: { page: number; setPage: (page: number) => void }, pageSize: number) {
  return { data: query.data?.items ?? [], total: query.data?.total ?? 0, page: list.page, pageSize, onPageChange: list.setPage, loading: query.isPending };
}

/** A table's header row: a sortable column is a button that turns through ascending, descending and off, with aria-sort. */
export function SortableHead<T>({ table, canSort }: { table: Table<T>; canSort: (column: Column<T, unknown>) => boolean }) {
  return (
    <thead className="bg-paper-sunk text-xs uppercase tracking-wide text-ink-soft">
      {table.getHeaderGroups().map((hg) => (
        <tr key={hg.id}>
          {hg.headers.map((h) => {
            const sorted = h.column.getIsSorted();
            return (
              <th key={h.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}>
                {canSort(h.column) ? (
                  <button type="button" className="inline-flex items-center gap-1 uppercase" onClick={h.column.getToggleSortingHandler()}>
                    {flexRender(h.column.columnDef.header, h.getContext())}
                    <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                  </button>
                ) : (
                  flexRender(h.column.columnDef.header, h.getContext())
                )}
              </th>
            );
          })}
        </tr>
      ))}
    </thead>
  );
}
