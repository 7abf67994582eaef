import type { ReactNode } from "react";
import { cx } from "../../../components/ui/cx";

/** The big answer at the counter: readable from a step back, never colour alone (a word and a mark too). */
export function ResultPanel({ tone, title, children }: { tone: "go" | "stop" | "caution"; title: string; children?: ReactNode }) {
  const look = { go: "border-go bg-go-light text-go", stop: "border-stop bg-stop-light text-stop", caution: "border-caution bg-caution-light text-caution" }[tone];
  const mark = { go: "✓", stop: "✕", caution: "!" }[tone];
  return (
    <section role={tone === "go" ? "status" : "alert"} aria-label={title} className={cx("rounded-card border-4 p-4 sm:p-6", look)}>
      <h2 className="flex items-center gap-3 text-2xl font-extrabold sm:text-3xl">
        <span aria-hidden="true">{mark}</span>
        {title}
      </h2>
      {children && <div className="mt-2 space-y-1 text-lg text-ink">{children}</div>}
    </section>
  );
}
