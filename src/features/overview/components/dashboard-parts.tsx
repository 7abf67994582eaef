import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { Card } from "../../../components/ui/layout";
import { cx } from "../../../components/ui/cx";
import { StatusBadge } from "../../../components/ui/status-badge";
import { TOOL_STATUSES, type ToolStatus } from "../../../../shared/tools/status-labels";
import type { FamilyRate, StatsDashboard } from "../../../../shared/stats/stats.schemas";
import { links } from "./links";

type Tone = "plain" | "go" | "caution" | "stop" | "hold";
const TONES: Record<Tone, string> = {
  plain: "border-paper-line",
  go: "border-go/50",
  caution: "border-caution/60",
  stop: "border-stop/60",
  hold: "border-hold/50",
};
const NUMBER_TONES: Record<Tone, string> = { plain: "text-ink", go: "text-go", caution: "text-caution", stop: "text-stop", hold: "text-hold" };

/** One count that leads to the list it counts. */
export function StatTile({ label, value, to, tone = "plain", hint }: { label: string; value: number; to: string; tone?: Tone; hint?: string }) {
  return (
    <Link
      to={to}
      className={cx("group block rounded-card border-2 bg-paper-raised p-3 shadow-card transition-colors hover:bg-paper focus-visible:outline-2 focus-visible:outline-brass", TONES[value === 0 ? "plain" : tone])}
    >
      {/* The name is what the tile shows (number, words, hint) and then where it leads, so a voice command naming it works. */}
      <span className={cx("block text-3xl font-bold tabular-nums", NUMBER_TONES[value === 0 ? "plain" : tone])}>{value} </span>
      <span className="block text-sm font-semibold text-ink-soft group-hover:underline">{label}</span>
      {hint && <span className="block text-xs text-ink-faint"> {hint}</span>}
      <span className="sr-only">. Open the list.</span>
    </Link>
  );
}

export function TileRow({ children, className = "sm:grid-cols-3 xl:grid-cols-6" }: { children: ReactNode; className?: string }) {
  return <div className={cx("grid grid-cols-2 gap-3", className)}>{children}</div>;
}

/** Tools by derived status, each count a link to the register filtered by it. */
export function StatusCounts({ byStatus }: { byStatus: StatsDashboard["byStatus"] }) {
  return (
    <Card title="Tools by status">
      <ul className="grid gap-1 sm:grid-cols-2">
        {TOOL_STATUSES.map((s: ToolStatus) => (
          <li key={s}>
            <Link to={links.toolsByStatus(s)} className="flex items-center justify-between gap-2 rounded-md px-2 py-1.5 hover:bg-paper">
              <StatusBadge status={s} />
              <span className="font-semibold tabular-nums">{byStatus[s] ?? 0}</span>
            </Link>
          </li>
        ))}
      </ul>
    </Card>
  );
}

export { DueByWeekChart } from "./due-by-week-chart";

const pct = (r: number | null) => (r == null ? "—" : `${(r * 100).toFixed(1)} %`);

/** End-of-period in-tolerance rate per family, with the number of recalibrations it rests on. */
export function FamilyRates({ rates, canReview }: { rates: FamilyRate[]; canReview: boolean }) {
  // Lowest rate first: the families whose interval most needs a look.
  const shown = rates.filter((f) => f.recalibrations > 0).sort((a, b) => (a.rate ?? 2) - (b.rate ?? 2) || a.name.localeCompare(b.name));
  const waiting = rates.length - shown.length;
  return (
    <Card title="In tolerance at recalibration, by family">
      <p className="mb-2 text-xs text-ink-faint">Share of recalibrations found in tolerance as found; a tool's first calibration is not counted.</p>
      {shown.length === 0 ? (
        <p className="text-sm text-ink-faint">No family has a recalibration on record yet.</p>
      ) : (
        <ul className="flex flex-col gap-2">
          {shown.map((f) => (
            <li key={f.familyId}>
              <Link to={canReview ? links.family(f.familyId) : links.toolsOfFamily(f.familyId)} className="block rounded-md px-1 py-1 hover:bg-paper">
                <span className="flex justify-between gap-2 text-sm">
                  <span className="truncate font-medium">{f.name}</span>
                  <span className="whitespace-nowrap tabular-nums">
                    {pct(f.rate)} <span className="text-ink-faint">({f.inTolerance}/{f.recalibrations})</span>
                  </span>
                </span>
                <span className="mt-1 block h-2 rounded-full bg-paper-sunk" aria-hidden="true">
                  {f.rate != null && <span className={cx("block h-2 rounded-full", f.rate >= 0.95 ? "bg-go" : f.rate >= 0.85 ? "bg-caution" : "bg-stop")} style={{ width: `${Math.max(2, f.rate * 100)}%` }} />}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
      {waiting > 0 && shown.length > 0 && (
        <p className="mt-2 text-xs text-ink-faint">
          {waiting} more famil{waiting === 1 ? "y has" : "ies have"} no recalibration on record yet.
        </p>
      )}
    </Card>
  );
}
