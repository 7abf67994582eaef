import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import { useIntervalFamilies } from "../api/intervals";
import { Button } from "../../../components/ui/button";
import { ErrorNote, PageHeader } from "../../../components/ui/layout";
import { DataTable } from "../../../components/ui/data-table";
import { Cautions } from "../../../components/ui/cautions";
import { errorMessage } from "../../../lib/api-client";
import type { IntervalFamily } from "../../../../shared/intervals/intervals.schemas";
import { downloadCsv, type CsvColumn } from "../lib/export-csv";
import { day, pct } from "./format";

const col = createColumnHelper<IntervalFamily>();
const columns = [
  col.accessor("name", { header: "Family", cell: (c) => <Link className="font-semibold underline" to={`/analysis/intervals/${c.row.original.familyId}`}>{c.getValue()}</Link> }),
  col.accessor("tools", { header: "Tools" }),
  col.accessor("currentIntervalDays", { header: "Interval (days)" }),
  col.accessor("recalibrations", { header: "Recalibrations" }),
  col.accessor("rate", { header: "In tolerance as found", cell: (c) => pct(c.getValue()) }),
  col.accessor("lastDecisionAt", { header: "Last interval decision", cell: (c) => (c.getValue() ? day(c.getValue()!) : "—") }),
];
const csvColumns: CsvColumn<IntervalFamily>[] = [
  { header: "family", value: (f) => f.name },
  { header: "kind", value: (f) => f.kind },
  { header: "tools", value: (f) => f.tools },
  { header: "intervalDays", value: (f) => f.currentIntervalDays },
  { header: "recalibrations", value: (f) => f.recalibrations },
  { header: "inTolerance", value: (f) => f.inTolerance },
  { header: "rate", value: (f) => (f.rate == null ? "" : f.rate.toFixed(4)) },
  { header: "lastDecisionAt", value: (f) => f.lastDecisionAt },
];

export function IntervalsPage() {
  const q = useIntervalFamilies();
  const rows = q.data ?? [];
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Interval analysis"
        subtitle="How often each family is found in tolerance at recalibration, and whether its interval should change."
        actions={<Button variant="secondary" disabled={!rows.length} onClick={() => downloadCsv("tenthwise-interval-review", csvColumns, rows)}>Export this list</Button>}
      />
      {q.isError && <ErrorNote>{errorMessage(q.error)}</ErrorNote>}
      <DataTable label="Families" columns={columns} data={rows} total={rows.length} page={1} pageSize={Math.max(rows.length, 1)} onPageChange={() => undefined} loading={q.isPending} rowKey={(f) => f.familyId} />
      <Cautions compact />
    </div>
  );
}
