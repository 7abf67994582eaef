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

const DECISION_LOOK: Record<IntervalFamily["decision"], { text: string; className: string }> = {
  keep: { text: "Keep", className: "text-go" },
  shorten: { text: "Shorten", className: "font-semibold text-stop" },
  lengthen: { text: "Lengthen", className: "font-semibold text-caution" },
  none: { text: "No basis yet", className: "text-ink-faint" },
};

const col = createColumnHelper<IntervalFamily>();
const columns = [
  col.accessor("name", { header: "Family", cell: (c) => <Link className="font-semibold underline" to={`/analysis/intervals/${c.row.original.familyId}`}>{c.getValue()}</Link> }),
  col.accessor("tools", { header: "Tools" }),
  col.accessor("currentIntervalDays", { header: "Interval (days)" }),
  col.accessor("recalibrations", { header: "Recalibrations", cell: (c) => `${c.row.original.inTolerance} of ${c.getValue()} in` }),
  col.accessor("rate", { header: "Observed rate", cell: (c) => pct(c.getValue()) }),
  col.accessor("confidenceInterval", { header: "Its interval", cell: (c) => (c.getValue() ? `${pct(c.getValue()!.lower)} – ${pct(c.getValue()!.upper)}` : "—") }),
  col.accessor("reliabilityTarget", { header: "Target R*", cell: (c) => pct(c.getValue()) }),
  col.accessor("decision", {
    header: "Interval test",
    cell: (c) => {
      const f = c.row.original;
      const look = DECISION_LOOK[f.decision];
      return (
        <span title={f.reason} className={look.className}>
          {look.text}
          {f.decision !== "keep" && f.decision !== "none" && f.recommendedIntervalDays != null ? ` to ${f.recommendedIntervalDays} d` : ""}
        </span>
      );
    },
  }),
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
  { header: "rateLower", value: (f) => (f.confidenceInterval ? f.confidenceInterval.lower.toFixed(4) : "") },
  { header: "rateUpper", value: (f) => (f.confidenceInterval ? f.confidenceInterval.upper.toFixed(4) : "") },
  { header: "target", value: (f) => f.reliabilityTarget },
  { header: "decision", value: (f) => f.decision },
  { header: "recommendedIntervalDays", value: (f) => f.recommendedIntervalDays },
  { header: "reason", value: (f) => f.reason },
  { header: "lastDecisionAt", value: (f) => f.lastDecisionAt },
];

export function IntervalsPage() {
  const q = useIntervalFamilies();
  const rows = q.data ?? [];
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Interval analysis"
        subtitle="How often each family is found in tolerance at recalibration, and whether that differs significantly from the target: an interval changes only when the target lies outside the observed rate's Clopper-Pearson interval (NCSL RP-1 method A3)."
        actions={<Button variant="secondary" disabled={!rows.length} onClick={() => downloadCsv("tenthwise-interval-review", csvColumns, rows)}>Export this list</Button>}
      />
      {q.isError && <ErrorNote>{errorMessage(q.error)}</ErrorNote>}
      <DataTable label="Families" columns={columns} data={rows} total={rows.length} page={1} pageSize={Math.max(rows.length, 1)} onPageChange={() => undefined} loading={q.isPending} rowKey={(f) => f.familyId} />
      <Cautions compact />
    </div>
  );
}
