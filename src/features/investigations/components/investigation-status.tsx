import { MarkBadge } from "../../../components/ui/status-badge";

/** Open or closed, in words and a mark (never colour alone). */
export function InvestigationStatus({ status }: { status: "open" | "closed" }) {
  return (
    <MarkBadge tone={status === "open" ? "caution" : "neutral"} mark={status === "open" ? "!" : "✓"}>
      {status === "open" ? "Open" : "Closed"}
    </MarkBadge>
  );
}
