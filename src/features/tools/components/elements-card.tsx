import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import { useCan } from "../../auth/api/auth";
import { useRejectElement } from "../api/tools";
import { Card } from "../../../components/ui/layout";
import { cx } from "../../../components/ui/cx";
import { len, when } from "../lib/format";
import { ReasonAction } from "./reason-action";
import { RecordTable } from "./record-table";

/** Leaves of a feeler set or blocks of a gauge block set; a rejected element is never chosen again. */
export function ElementsCard({ tool }: { tool: ToolDetail }) {
  const canReject = useCan("tools.write");
  const reject = useRejectElement(tool.assetTag);
  const word = tool.kind === "feeler_set" ? "leaf" : tool.kind === "gauge_block_set" ? "block" : "element";
  const rejected = tool.elements.filter((e) => !e.usable).length;
  return (
    <Card title={`Set elements (${tool.elements.length}${rejected ? `, ${rejected} rejected` : ""})`}>
      <RecordTable label="Set elements" headers={["Element", "Nominal", "Grade", "Certified deviation", "State", canReject && "Action"]}>
        {tool.elements.map((e) => (
          <tr key={e.id} className={cx("border-t border-paper-line", !e.usable && "bg-stop-light/50")}>
            <td className={cx("py-1.5 pr-3 font-semibold", !e.usable && "line-through")}>{e.label}</td>
            <td className="pr-3">{len(e.nominal, tool.unit)}</td>
            <td className="pr-3">{e.grade ?? "—"}</td>
            <td className="pr-3">{e.certifiedDeviation == null ? "—" : len(e.certifiedDeviation, tool.unit, 6)}</td>
            <td className="pr-3">
              {e.usable ? (
                <span className="text-go">✓ In use</span>
              ) : (
                <span className="font-semibold text-stop">
                  ✕ Rejected {when(e.rejectedAt)}
                  {e.rejectedReason && <span className="block font-normal">{e.rejectedReason}</span>}
                </span>
              )}
            </td>
            {canReject && (
              <td>
                {e.usable && (
                  <ReasonAction
                    label={`Reject ${word} ${e.label}`}
                    variant="ghost"
                    prompt={`Why is ${word} ${e.label} rejected? It will never be chosen again.`}
                    run={(reason) => reject.mutateAsync({ elementId: e.id, reason })}
                  />
                )}
              </td>
            )}
          </tr>
        ))}
      </RecordTable>
    </Card>
  );
}
