import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import type { LimitTableSummary } from "../../../../shared/limit-tables/limit-tables.schemas";
import { useLimitTables } from "../api/limit-tables";
import { PageHeader } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { ButtonLink } from "../../../components/ui/button";
import { useListParams } from "../../../lib/use-list-params";
import { useCan } from "../../auth/api/auth";

const col = createColumnHelper<LimitTableSummary>();
const columns = [
  col.accessor("name", { header: "Table", cell: (c) => <Link className="font-semibold underline" to={`/limit-tables/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor("engineModel", { header: "Engine model" }),
  col.accessor("version", { header: "Version", enableSorting: false, cell: (c) => `v${c.getValue()}${c.row.original.supersededById ? " (revised)" : ""}` }),
  col.accessor("sourceDocument", { header: "Source", enableSorting: false, cell: (c) => `${c.getValue()}, rev. ${c.row.original.sourceRevision}` }),
  col.accessor("unit", { header: "Unit", enableSorting: false }),
  col.accessor("itemCount", { header: "Items", enableSorting: false }),
  col.accessor("isDemo", { header: "Values", enableSorting: false, cell: (c) => (c.getValue() ? <span className="font-semibold text-hold">Demo</span> : "Entered") }),
];

export function LimitTablesPage() {
  const list = useListParams(["q", "current"] as const, { sort: "engineModel" });
  const q = { q: list.filters.q || undefined, current: (list.filters.current || "true") as "true" | "false", page: list.page, pageSize: 50, sort: (list.sort || "engineModel") as "engineModel" };
  const tables = useLimitTables(q);
  const canWrite = useCan("limitTables.write");
  return (
    <div>
      <PageHeader
        title="Limits tables"
        subtitle="Limits per engine model, versioned; a job keeps the revision it started with. Verify every table against the manufacturer's current data."
        actions={canWrite && <ButtonLink variant="primary" to="/limit-tables/new">New limits table</ButtonLink>}
      />
      <DataTable
        label="Limits tables"
        columns={columns}
        {...pagedProps(tables, list, 50)}
        sorting={list.sorting}
        onSortingChange={list.setSorting}
        rowKey={(r) => r.id}
        toolbar={
          <>
            <input aria-label="Search tables" placeholder="Search name, model or source" className="rounded-md border border-paper-line px-3 py-1.5" defaultValue={list.filters.q} onChange={(e) => list.setFilter("q", e.target.value)} />
            <select aria-label="Revisions" className="rounded-md border border-paper-line px-2 py-1.5" value={list.filters.current || "true"} onChange={(e) => list.setFilter("current", e.target.value)}>
              <option value="true">Current revisions</option>
              <option value="false">Revised (older) versions</option>
            </select>
          </>
        }
      />
    </div>
  );
}
