import { createColumnHelper } from "@tanstack/react-table";
import { PageHeader } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { StatusBadge } from "../../../components/ui/status-badge";
import { ErrorNote } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import type { Checkout, CheckoutListQuery } from "../../../../shared/checkouts/checkouts.schemas";
import { useCheckouts } from "../api/checkouts";
import { shortWhen } from "./format";
import { activeFilters, FilterChips } from "../../../components/ui/filter-chips";
import { formatDateTime } from "../../../lib/format";

const FILTER_KEYS = ["q", "overdue"] as const;
const describeFilters = {
  overdue: (v: string) => (v === "true" ? "Not returned by their due-back time" : "Not yet due back"),
  q: (v: string) => `Search “${v}”`,
};

const col = createColumnHelper<Checkout>();
const columns = [
  col.accessor((c) => c.person.name, {
    id: "person",
    header: "Who",
    cell: (c) => (
      <span className={c.row.original.notBackInTime ? "font-bold text-stop" : "font-semibold"}>
        {c.getValue()}
        <span className="block text-xs font-normal text-ink-soft">{c.row.original.person.email}</span>
      </span>
    ),
  }),
  col.accessor((c) => c.tool.assetTag, {
    id: "assetTag",
    header: "Tool",
    cell: (c) => (
      <span>
        <span className="font-mono font-semibold">{c.getValue()}</span>
        <span className="block text-xs text-ink-soft">{c.row.original.tool.description}</span>
      </span>
    ),
  }),
  col.accessor((c) => c.tool.status, { id: "status", header: "Status", enableSorting: false, cell: (c) => <StatusBadge status={c.getValue()} /> }),
  col.accessor("issuedAt", { header: "Since", cell: (c) => shortWhen(c.getValue()) }),
  col.accessor("dueBackAt", {
    header: "Expected back",
    cell: (c) =>
      c.row.original.notBackInTime ? (
        <span className="inline-block rounded-md border-2 border-stop bg-stop-light px-2 py-0.5 font-bold text-stop">✕ Not back — due {shortWhen(c.getValue())}</span>
      ) : (
        shortWhen(c.getValue())
      ),
  }),
  col.accessor((c) => [c.workOrder, c.engineSerial].filter(Boolean).join(" · "), { id: "job", header: "Work order · engine", enableSorting: false }),
  col.accessor("issuedBy", { header: "Issued by", enableSorting: false }),
];

/** Who has what, since when, expected back; tools not back by their time stand out; prints as a list. */
export function CustodyPage() {
  const list = useListParams(FILTER_KEYS, { sort: "dueBackAt" });
  const query: CheckoutListQuery = { open: "true", q: list.filters.q || undefined, overdue: (list.filters.overdue || undefined) as CheckoutListQuery["overdue"], page: list.page, pageSize: list.pageSize, sort: list.sort as CheckoutListQuery["sort"] };
  const rows = useCheckouts(query);
  const late = useCheckouts({ open: "true", overdue: "true", pageSize: 1 });

  return (
    <div>
      <PageHeader
        title="Custody board"
        subtitle={
          <>
            Tools out of the crib now.{" "}
            {late.data && late.data.total > 0 ? <strong className="text-stop">{late.data.total} not back by their expected time.</strong> : "All back on time so far."}
          </>
        }
        actions={<Button variant="secondary" onClick={() => window.print()}>Print list</Button>}
      />
      <p className="mb-2 hidden text-sm print:block">Printed {formatDateTime(new Date())}</p>
      <FilterChips
        className="mb-3"
        filters={activeFilters(list.filters, describeFilters)}
        onClear={(k) => list.clearFilters(k as (typeof FILTER_KEYS)[number])}
        onClearAll={() => list.clearFilters()}
        total={rows.data?.total}
        noun={["tool out", "tools out"]}
      />
      {rows.isError && <ErrorNote>{errorMessage(rows.error)}</ErrorNote>}
      <DataTable
        label="Tools out of the crib"
        columns={columns}
        {...pagedProps(rows, list, list.pageSize)}
        sorting={list.sorting}
        onSortingChange={list.setSorting}
        rowKey={(r) => r.id}
        empty={<p className="text-center text-ink-faint">No tools are out.</p>}
        toolbar={
          <>
            <TextField label="Search" placeholder="Tag, person, work order" value={list.filters.q} onChange={(e) => list.setFilter("q", e.target.value)} wrapperClassName="min-w-56" />
            <label className="mt-5 flex items-center gap-2 text-sm font-semibold">
              <input type="checkbox" checked={list.filters.overdue === "true"} onChange={(e) => list.setFilter("overdue", e.target.checked ? "true" : "")} />
              Only not back in time
            </label>
          </>
        }
      />
    </div>
  );
}
