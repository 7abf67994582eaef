import { MarkBadge } from "../../../components/ui/status-badge";
import { INVESTIGATION_STATUS_LABELS } from "../../../../shared/investigations/investigations.schemas";

/** Open or closed, in words and a mark (never colour alone). */
export function InvestigationStatus({ status }: { status: "open" | "closed" }) {
  return (
    <MarkBadge tone={status === "open" ? "caution" : "neutral"} mark={status === "open" ? "!" : "✓"}>
      {INVESTIGATION_STATUS_LABELS[status]}
    </MarkBadge>
  );
}
