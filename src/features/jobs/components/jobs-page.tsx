import { Link, useNavigate } from "react-router-dom";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { createColumnHelper } from "@tanstack/react-table";
import { CreateJobSchema, JOB_LIST_STATUSES, type CreateJobInput, type JobListStatus, type JobSummary } from "../../../../shared/jobs/jobs.schemas";
import { JOB_LIST_FILTER_LABELS, JOB_STATE_LABELS, jobStateOfSummary } from "../../../../shared/jobs/labels";
import { useJobs, useOpenJob } from "../api/jobs";
import { useLimitTables } from "../../limit-tables/api/limit-tables";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { useCan } from "../../auth/api/auth";
import { activeFilters, FilterChips } from "../../../components/ui/filter-chips";
import { FilterSelect } from "../../../components/ui/filter-select";

const FILTER_KEYS = ["engineSerial", "status", "mine"] as const;
const describeFilters = {
  status: (v: string) => JOB_LIST_FILTER_LABELS[v as JobListStatus] ?? v,
  mine: () => "Mine",
  engineSerial: (v: string) => `Engine serial contains “${v}”`,
};

const col = createColumnHelper<JobSummary>();
const columns = [
  col.accessor("engineSerial", { header: "Engine serial", cell: (c) => <Link className="font-semibold underline" to={`/jobs/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor("engineModel", { header: "Model", enableSorting: false }),
  col.accessor("workOrder", { header: "Work order", enableSorting: false }),
  col.accessor("limitTableName", { header: "Limits table", enableSorting: false, cell: (c) => `${c.getValue()} (v${c.row.original.limitTableVersion})` }),
  col.accessor("readingCount", { header: "Readings", enableSorting: false }),
  col.accessor("status", {
    header: "Status",
    enableSorting: false,
    cell: (c) => {
      const state = jobStateOfSummary(c.row.original);
      return state === "signed" ? <span className="font-semibold text-go">✓ {JOB_STATE_LABELS.signed}</span> : JOB_STATE_LABELS[state];
    },
  }),
  col.accessor("openedAt", { header: "Opened", cell: (c) => `${c.getValue().slice(0, 10)}${c.row.original.openedBy ? ` · ${c.row.original.openedBy.name}` : ""}` }),
];

export function JobsPage() {
  const list = useListParams(FILTER_KEYS, { sort: "-openedAt" });
  const jobs = useJobs({
    engineSerial: list.filters.engineSerial || undefined,
    status: (list.filters.status || undefined) as JobListStatus | undefined,
    mine: (list.filters.mine || undefined) as "true" | undefined,
    page: list.page,
    pageSize: 50,
    sort: (list.sort || "-openedAt") as "-openedAt",
  });
  const canOpen = useCan("jobs.create");
  return (
    <div>
      <PageHeader title="Check sheets" subtitle="One job per engine: every item measured, tied to the tools that measured it, then signed by an inspector." />
      <div className="grid gap-5 xl:grid-cols-[1fr_22rem]">
        <div className="min-w-0">
          <FilterChips
            className="mb-3"
            filters={activeFilters(list.filters, describeFilters)}
            onClear={(k) => list.clearFilters(k as (typeof FILTER_KEYS)[number])}
            onClearAll={() => list.clearFilters()}
            total={jobs.data?.total}
            noun={["check sheet", "check sheets"]}
          />
          {jobs.isError && <ErrorNote>{errorMessage(jobs.error)}</ErrorNote>}
          <DataTable
            label="Jobs"
            columns={columns}
            {...pagedProps(jobs, list, 50)}
            sorting={list.sorting}
            onSortingChange={list.setSorting}
            rowKey={(j) => j.id}
            toolbar={
              <>
                <input aria-label="Engine serial" placeholder="Engine serial" className="rounded-md border border-paper-line px-3 py-1.5" value={list.filters.engineSerial} onChange={(e) => list.setFilter("engineSerial", e.target.value)} />
                <FilterSelect label="Status" all="Open and signed" options={JOB_LIST_STATUSES} labels={JOB_LIST_FILTER_LABELS} value={list.filters.status} onChange={(v) => list.setFilter("status", v)} />
                <label className="flex items-center gap-1 text-sm">
                  <input type="checkbox" checked={list.filters.mine === "true"} onChange={(e) => list.setFilter("mine", e.target.checked ? "true" : "")} /> Mine
                </label>
              </>
            }
          />
        </div>
        {canOpen && <OpenJobCard />}
      </div>
    </div>
  );
}

function OpenJobCard() {
  const navigate = useNavigate();
  const open = useOpenJob();
  const tables = useLimitTables({ current: "true", pageSize: 200, page: 1, sort: "engineModel" });
  const form = useForm<CreateJobInput>({ resolver: zodResolver(CreateJobSchema) as never, defaultValues: { limitTableId: "", engineSerial: "", workOrder: "" } });
  const e = form.formState.errors;
  return (
    <Card title="Open a job">
      <form noValidate className="flex flex-col gap-3" onSubmit={form.handleSubmit((v) => open.mutate(v, { onSuccess: (j) => navigate(`/jobs/${j.id}`) }))}>
        <SelectField label="Engine model and limits table" error={e.limitTableId?.message} {...form.register("limitTableId")}>
          <option value="">Choose…</option>
          {(tables.data?.items ?? []).map((t) => (
            <option key={t.id} value={t.id}>
              {t.engineModel} — {t.name} (v{t.version}){t.isDemo ? " [demo]" : ""}
            </option>
          ))}
        </SelectField>
        <TextField label="Engine serial" error={e.engineSerial?.message} {...form.register("engineSerial")} />
        <TextField label="Work order (optional)" error={e.workOrder?.message} {...form.register("workOrder")} />
        {open.isError && <ErrorNote>{errorMessage(open.error)}</ErrorNote>}
        <Button type="submit" disabled={open.isPending}>Open job</Button>
      </form>
    </Card>
  );
}
