import type { ToolStatus } from "../../../../shared/tools/tool-status";
import { StatusBadge } from "../../../components/ui/status-badge";
import { cx } from "../../../components/ui/cx";

export interface StatusAnswer {
  status: ToolStatus;
  usable: boolean;
  usableForAcceptance?: boolean;
  reasons: string[];
  dueAt: string | null;
}

// The one question a mechanic asks before measuring: may I use it? The answer
// is words first (colour and mark only repeat them), large enough to read at arm's length.
function headline(a: StatusAnswer): { words: string; tone: "go" | "caution" | "stop" } {
  if (!a.usable) return { words: "Do not use", tone: "stop" };
  if (a.status === "reference_only") return { words: "Reference only — not for acceptance", tone: "caution" };
  if (a.status === "limited") return { words: "Usable within limits only", tone: "caution" };
  if (a.status === "due_soon") return { words: "Usable — due soon", tone: "caution" };
  return { words: "Usable", tone: "go" };
}

const TONE = {
  go: "border-go bg-go-light text-go",
  caution: "border-caution bg-caution-light text-caution",
  stop: "border-stop bg-stop-light text-stop",
};
const MARK = { go: "✓", caution: "!", stop: "✕" };

/** The large, unmistakable answer to "may I use this tool, why not, until when?". */
export function ToolAnswer({ answer, assetTag, size = "large" }: { answer: StatusAnswer; assetTag: string; size?: "large" | "compact" }) {
  const h = headline(answer);
  const until = answer.usable && answer.dueAt ? `until ${answer.dueAt}` : null;
  return (
    <section aria-label={`May ${assetTag} be used?`} className={cx("rounded-card border-4 p-4 sm:p-5", TONE[h.tone])}>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <span aria-hidden="true" className={cx("grid shrink-0 place-items-center rounded-full border-4 border-current font-black", size === "large" ? "size-16 text-4xl" : "size-10 text-2xl")}>
          {MARK[h.tone]}
        </span>
        <div className="min-w-0">
          <p className={cx("font-black leading-tight tracking-tight", size === "large" ? "text-4xl sm:text-5xl" : "text-2xl")} data-testid="tool-answer">
            {h.words}
          </p>
          {until && <p className="mt-1 text-lg font-semibold text-ink">{until}</p>}
        </div>
        <StatusBadge status={answer.status} className="ml-auto text-sm" />
      </div>
      {answer.reasons.length > 0 && (
        <ul className="mt-3 list-disc space-y-1 pl-6 text-base text-ink" aria-label="Reasons">
          {answer.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      )}
    </section>
  );
}
