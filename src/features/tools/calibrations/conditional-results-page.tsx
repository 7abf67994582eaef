import { Link } from "react-router-dom";
import { createColumnHelper } from "@tanstack/react-table";
import type { ConditionalResult } from "../../../../shared/calibrations/calibrations.schemas";
import { AS_FOUND_STATEMENT_LABELS, AS_FOUND_STATEMENT_MEANINGS } from "../../../../shared/calibrations/decision-rules";
import { RESULT_LABELS } from "../../../../shared/calibrations/calibrations.schemas";
import { useConditionalResults } from "../api/calibrations";
import { useCan } from "../../auth/api/auth";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { ErrorNote, PageHeader } from "../../../components/ui/layout";
import { FilterSelect } from "../../../components/ui/filter-select";
import { Cautions } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { len, signedLen, when } from "../lib/format";

const col = createColumnHelper<ConditionalResult>();
const columns = [
  col.accessor("assetTag", {
    header: "Tool",
    cell: (c) => (
      <Link className="font-semibold underline" to={`/tools/${encodeURIComponent(c.getValue())}`}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("toolDescription", { header: "Description" }),
  col.accessor("performedAt", { header: "Calibrated", cell: (c) => when(c.getValue()) }),
  col.accessor("nominal", { header: "Point", cell: (c) => `${len(c.getValue(), c.row.original.unit)}${c.row.original.elementLabel ? ` (${c.row.original.elementLabel})` : ""}` }),
  col.accessor("errorAsFound", { header: "Error as found", cell: (c) => <span className="font-mono">{signedLen(c.getValue(), c.row.original.unit)}</span> }),
  col.accessor("mpe", { header: "MPE ±", cell: (c) => len(c.getValue(), c.row.original.unit) }),
  col.accessor("uncertainty", { header: "U", cell: (c) => len(c.getValue(), c.row.original.unit, 6) }),
  col.accessor("asFoundStatement", {
    header: "Statement (ILAC-G8)",
    cell: (c) => (
      <span title={AS_FOUND_STATEMENT_MEANINGS[c.getValue()]} className={cx("font-semibold", c.getValue() === "conditional_fail" ? "text-stop" : "text-caution")}>
        {AS_FOUND_STATEMENT_LABELS[c.getValue()]}
      </span>
    ),
  }),
  col.accessor("result", { header: "Release", cell: (c) => RESULT_LABELS[c.getValue()] }),
];

/**
 * As-found points whose error lies within U of a tolerance limit (ILAC-G8 conditional statements), for the quality
 * manager's review: a conditional pass opens no investigation; a conditional fail is out of tolerance and has one.
 */
export function ConditionalResultsPage() {
  const canRead = useCan("intervals.read");
  const list = useListParams(["statement", "current"] as const);
  const q = useConditionalResults({ statement: list.filters.statement, current: list.filters.current, page: list.page });
  if (!canRead) return <ErrorNote>Conditional results are reviewed by the quality manager; an auditor may read them.</ErrorNote>;
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Conditional results to review"
        subtitle="As-found errors within U of a tolerance limit (ILAC-G8 non-binary statements). A conditional pass was in tolerance and opens no investigation; a conditional fail was out of tolerance and has its own. Review whether the tool's use, interval or procedure should change."
      />
      {q.isError && <ErrorNote>{errorMessage(q.error)}</ErrorNote>}
      <DataTable
        label="Conditional results"
        columns={columns}
        {...pagedProps(q, list, 50)}
        rowKey={(r) => r.pointId}
        empty="No as-found point lies within U of its limits."
        initialHidden={["toolDescription"]}
        toolbar={
          <>
            <FilterSelect
              label="Filter by statement"
              all="Both statements"
              options={["conditional_pass", "conditional_fail"]}
              labels={{ conditional_pass: "Conditional pass", conditional_fail: "Conditional fail" }}
              value={list.filters.statement}
              onChange={(v) => list.setFilter("statement", v)}
            />
            <FilterSelect
              label="Which calibrations"
              all="Each tool's latest calibration"
              options={["false"]}
              labels={{ false: "Every calibration that counts" }}
              value={list.filters.current}
              onChange={(v) => list.setFilter("current", v)}
            />
          </>
        }
      />
      <Cautions compact />
    </div>
  );
}
