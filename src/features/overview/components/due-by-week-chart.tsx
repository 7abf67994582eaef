import { Link } from "react-router-dom";
import { Card } from "../../../components/ui/layout";
import type { StatsDashboard } from "../../../../shared/stats/stats.schemas";
import { links } from "./links";

// Twelve bars drawn with the page's own elements: the home page of every role stays free of the chart
// library (it loads only on the pages that plot measurements: drift, gauge studies).

const shortDate = (d: string) => d.slice(5, 10);

/** Tools falling due per week for the next twelve weeks; a bar opens those tools. */
export function DueByWeekChart({ weeks }: { weeks: StatsDashboard["dueByWeek"] }) {
  const data = weeks.map((w) => ({ ...w, label: shortDate(w.weekStart) }));
  const top = Math.max(1, ...data.map((d) => d.count));
  // A round top for the scale: 1, 2, 5, 10, 20, 50…
  const step = [1, 2, 5].flatMap((m) => [1, 10, 100, 1000, 10000, 100000].map((p) => m * p)).sort((a, b) => a - b).find((s) => s >= top) ?? top;
  return (
    <Card title="Falling due, next 12 weeks">
      <div className="flex h-56 gap-2" role="group" aria-label={`Tools falling due per week: ${data.map((d) => `week of ${d.label}: ${d.count}`).join("; ")}`}>
        <div className="flex flex-col justify-between pb-5 text-right text-[11px] tabular-nums text-ink-soft" aria-hidden="true">
          <span>{step}</span>
          <span>{step / 2 === Math.floor(step / 2) ? step / 2 : ""}</span>
          <span>0</span>
        </div>
        <ol className="flex flex-1 items-stretch gap-1 border-l border-paper-line">
          {data.map((w) => (
            <li key={w.weekStart} className="flex flex-1 flex-col">
              <Link
                to={links.dueWeek(w.weekStart, w.weekEnd)}
                title={`Week of ${w.label}: ${w.count} tools falling due`}
                aria-label={`Week of ${w.label}: ${w.count} tools falling due. Open the list.`}
                className="group flex flex-1 flex-col justify-end border-b border-paper-line focus-visible:outline-2 focus-visible:outline-brass"
              >
                <span className="block rounded-t-[3px] bg-brass group-hover:bg-caution" style={{ height: `${(w.count / step) * 100}%` }} />
              </Link>
              <span className="mt-1 block h-4 text-center text-[11px] text-ink-soft" aria-hidden="true">
                {w.label}
              </span>
            </li>
          ))}
        </ol>
      </div>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-ink-soft">Weeks as a list</summary>
        <ul className="mt-1 grid grid-cols-2 gap-x-4 sm:grid-cols-3">
          {data.map((w) => (
            <li key={w.weekStart}>
              <Link className="underline" to={links.dueWeek(w.weekStart, w.weekEnd)}>
                {w.label}–{shortDate(w.weekEnd)}: {w.count}
              </Link>
            </li>
          ))}
        </ul>
      </details>
    </Card>
  );
}
