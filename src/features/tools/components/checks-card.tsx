import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import { useChecks } from "../api/calibrations";
import { Card, EmptyState, ErrorNote, Loading } from "../../../components/ui/layout";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { len, signedLen, when } from "../lib/format";
import { RecordTable } from "./record-table";

const CONTEXT = { pre_use: "Pre-use", return_zero_check: "On return", found_check: "When found" } as const;

/** The tool's intermediate checks, newest first. */
export function ChecksCard({ tool }: { tool: ToolDetail }) {
  const checks = useChecks(tool.assetTag);
  return (
    <Card title="Intermediate checks">
      {checks.isPending ? <Loading /> : checks.isError ? <ErrorNote>{errorMessage(checks.error)}</ErrorNote> : checks.data.items.length === 0 ? (
        <EmptyState>No intermediate checks recorded.</EmptyState>
      ) : (
        <RecordTable label="Intermediate checks" className="whitespace-nowrap" headers={["When", "Result", "Nominal", "Reading", "Deviation", "Tolerance", "Standard", "By", "Context"]}>
          {checks.data.items.map((c) => (
            <tr key={c.id} className="border-t border-paper-line">
              <td className="py-1.5 pr-3 whitespace-nowrap">{when(c.performedAt)}</td>
              <td className={cx("pr-3 font-semibold", c.passed ? "text-go" : "text-stop")}>{c.passed ? "✓ Passed" : "✕ Failed"}</td>
              <td className="pr-3">{len(c.nominal, tool.unit)}</td>
              <td className="pr-3">{len(c.reading, tool.unit)}</td>
              <td className="pr-3">{signedLen(c.deviation, tool.unit)}</td>
              <td className="pr-3">± {len(c.tolerance, tool.unit)}</td>
              <td className="pr-3">{c.standard?.assetTag ?? "—"}</td>
              <td className="pr-3">{c.performedBy?.name ?? "—"}</td>
              <td>
                {CONTEXT[c.context]}
                {c.note && <span className="block text-ink-faint">{c.note}</span>}
              </td>
            </tr>
          ))}
        </RecordTable>
      )}
    </Card>
  );
}
