import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import type { StudySummary } from "../../../../shared/studies/studies.schemas";
import { useStudies } from "../api/studies";
import { StudyVerdictBadge } from "../api/study-cards";
import { PageHeader } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { ButtonLink } from "../../../components/ui/button";
import { Cautions } from "../../../components/ui/cautions";
import { useListParams } from "../../../lib/use-list-params";
import { useCan } from "../../auth/api/auth";

const col = createColumnHelper<StudySummary>();
const columns = [
  col.accessor("reference", { header: "Study", enableSorting: false, cell: (c) => <Link className="font-semibold underline" to={`/studies/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor((r) => r.characteristic.label, { id: "characteristic", header: "Characteristic", enableSorting: false, cell: (c) => <>{c.getValue()}<span className="block text-xs text-ink-faint">{c.row.original.characteristic.engineModel}</span></> }),
  col.accessor((r) => r.tool?.assetTag ?? r.family.name, { id: "system", header: "Tool or family", enableSorting: false }),
  col.accessor((r) => `${r.parts} × ${r.appraisers.length} × ${r.trials}`, { id: "design", header: "Parts × appraisers × trials", enableSorting: false }),
  col.accessor((r) => r, { id: "progress", header: "Values", enableSorting: false, cell: (c) => `${c.getValue().valuesTaken} of ${c.getValue().valuesNeeded}` }),
  col.accessor("verdict", { header: "Verdict", enableSorting: false, cell: (c) => (c.getValue() ? <StudyVerdictBadge verdict={c.getValue()!} /> : <span className="text-ink-faint">in progress</span>) }),
  col.accessor("percentGrr", { header: "GRR % of tolerance", enableSorting: false, cell: (c) => (c.getValue() == null ? "—" : `${c.getValue()!.toFixed(1)} %`) }),
  col.accessor("ndc", { header: "ndc", enableSorting: false, cell: (c) => c.getValue() ?? "—" }),
  col.accessor("createdAt", { header: "Set up", cell: (c) => <>{c.getValue().slice(0, 10)}{c.row.original.isDemo && <span className="block text-xs font-semibold text-hold">Demo</span>}</> }),
];

export function StudiesPage() {
  const list = useListParams(["state"] as const, { sort: "-createdAt" });
  const q = { state: (list.filters.state || undefined) as "in_progress" | "complete" | undefined, page: list.page, pageSize: 50, sort: (list.sort || "-createdAt") as "-createdAt" };
  const studies = useStudies(q);
  const canWrite = useCan("studies.write");
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Gauge studies"
        subtitle="Repeatability and reproducibility, crossed design: can these mechanics, with this tool family, tell a good part from a bad one on this characteristic?"
        actions={canWrite && <ButtonLink variant="primary" to="/studies/new">Set up a study</ButtonLink>}
      />
      <DataTable
        label="Gauge studies"
        columns={columns}
        {...pagedProps(studies, list, 50)}
        sorting={list.sorting}
        onSortingChange={list.setSorting}
        rowKey={(r) => r.id}
        empty="No gauge study yet."
        toolbar={
          <select aria-label="State" className="rounded-md border border-paper-line px-2 py-1.5" value={list.filters.state} onChange={(e) => list.setFilter("state", e.target.value)}>
            <option value="">All studies</option>
            <option value="in_progress">In progress</option>
            <option value="complete">Finished</option>
          </select>
        }
      />
      <Cautions compact />
    </div>
  );
}
