import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import { INVESTIGATION_STATUS_LABELS, TRIGGER_LABELS, type InvestigationSummary } from "../../../../shared/investigations/investigations.schemas";
import { useInvestigations } from "../api/investigations";
import { PageHeader, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { Cautions } from "../../../components/ui/cautions";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { formatDateTime as when } from "../../../lib/format";
import { InvestigationStatus } from "./investigation-status";
import { activeFilters, FilterChips } from "../../../components/ui/filter-chips";
import { FilterSelect } from "../../../components/ui/filter-select";

const FILTER_KEYS = ["toolAssetTag", "status", "awaitingDisposition"] as const;
const describeFilters = {
  status: (v: string) => INVESTIGATION_STATUS_LABELS[v as keyof typeof INVESTIGATION_STATUS_LABELS] ?? v,
  toolAssetTag: (v: string) => `Tool ${v}`,
  awaitingDisposition: (v: string) => (v === "true" ? "Awaiting a disposition" : "Every item dispositioned"),
};

const col = createColumnHelper<InvestigationSummary>();
const PAGE_SIZE = 50;

const columns = [
  col.accessor("toolAssetTag", {
    header: "Tool",
    cell: (c) => (
      <Link className="font-semibold text-ink underline decoration-brass underline-offset-2" to={`/investigations/${c.row.original.id}`}>
        {c.getValue() ?? "—"}
        <span className="sr-only"> investigation opened {when(c.row.original.openedAt)}</span>
      </Link>
    ),
  }),
  col.accessor("description", { header: "Description" }),
  col.accessor("trigger", { header: "Finding", cell: (c) => TRIGGER_LABELS[c.getValue()] }),
  col.accessor("status", { header: "Status", cell: (c) => <InvestigationStatus status={c.getValue()} /> }),
  col.display({ id: "window", header: "Window", cell: (c) => `${c.row.original.windowStart ? when(c.row.original.windowStart) : "since ever"} → ${when(c.row.original.windowEnd)}` }),
  col.accessor("affectedCount", { header: "Affected", cell: (c) => (c.row.original.gathering ? <span className="text-ink-soft">gathering…</span> : c.getValue()) }),
  col.accessor("couldChangeCount", {
    header: "Could change",
    cell: (c) => (c.row.original.gathering ? "—" : <span className={c.getValue() > 0 ? "font-semibold text-stop" : ""}>{c.getValue()}</span>),
  }),
  col.accessor("undisposedCount", { header: "Awaiting disposition", cell: (c) => (c.row.original.gathering ? "—" : c.getValue()) }),
  col.accessor("openedAt", { header: "Opened", cell: (c) => when(c.getValue()) }),
];

export function InvestigationsPage() {
  const list = useListParams(FILTER_KEYS);
  const q = useInvestigations({ toolAssetTag: list.filters.toolAssetTag, status: list.filters.status, awaitingDisposition: list.filters.awaitingDisposition, page: list.page, pageSize: PAGE_SIZE });
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Out-of-tolerance investigations"
        subtitle="Opened by themselves when a tool fails as found, fails a check, is lost or comes back damaged. Open ones first."
      />
      <FilterChips
        filters={activeFilters(list.filters, describeFilters)}
        onClear={(k) => list.clearFilters(k as (typeof FILTER_KEYS)[number])}
        onClearAll={() => list.clearFilters()}
        total={q.data?.total}
        noun={["investigation", "investigations"]}
      />
      {q.isError && <ErrorNote>{errorMessage(q.error)}</ErrorNote>}
      <DataTable
        label="Investigations"
        columns={columns}
        {...pagedProps(q, list, PAGE_SIZE)}
        rowKey={(r) => r.id}
        initialHidden={["description"]}
        empty="No investigation matches. One opens by itself when a tool is found out of tolerance."
        toolbar={
          <>
            <input
              aria-label="Filter by tool asset tag"
              placeholder="Tool asset tag"
              className="rounded-md border border-paper-line px-3 py-1.5"
              value={list.filters.toolAssetTag}
              onChange={(e) => list.setFilter("toolAssetTag", e.target.value)}
            />
            <FilterSelect label="Filter by status" all="Open and closed" options={["open", "closed"]} labels={INVESTIGATION_STATUS_LABELS} value={list.filters.status} onChange={(v) => list.setFilter("status", v)} />
          </>
        }
      />
      <Cautions compact />
    </div>
  );
}
