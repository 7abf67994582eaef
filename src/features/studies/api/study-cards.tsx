import { Link } from "react-router-dom";
import { Card, EmptyState, ErrorNote, Loading } from "../../../components/ui/layout";
import { MarkBadge } from "../../../components/ui/status-badge";
import { errorMessage } from "../../../lib/api-client";
import { useCan } from "../../auth/api/auth";
import type { LatestStudy } from "../../../../shared/studies/studies.schemas";
import { VERDICT_LABELS } from "../../../../shared/studies/study-labels";
import type { Verdict } from "../../../../shared/studies/study-labels";
import { useLatestStudies, useStudyGaps } from "./studies";

// The small pieces other pages show of gauge studies: the tool's page, the limits table, the overview.

const LOOK: Record<Verdict, { tone: "go" | "caution" | "stop"; mark: string; short: string }> = {
  acceptable: { tone: "go", mark: "✓", short: "Acceptable" },
  conditional: { tone: "caution", mark: "!", short: "Conditional" },
  not_acceptable: { tone: "stop", mark: "✕", short: "Not acceptable" },
};

/** A study verdict in words with a mark (colour never carries it alone). */
export function StudyVerdictBadge({ verdict, long }: { verdict: Verdict; long?: boolean }) {
  const l = LOOK[verdict];
  return (
    <MarkBadge tone={l.tone} mark={l.mark}>
      {long ? VERDICT_LABELS[verdict] : l.short}
    </MarkBadge>
  );
}

function LatestList({ rows, show }: { rows: LatestStudy[]; show: "characteristic" | "family" }) {
  const canRead = useCan("studies.read");
  return (
    <ul className="divide-y divide-paper-line text-sm">
      {rows.map((r) => (
        <li key={`${r.characteristic.limitTableId}/${r.characteristic.itemKey}/${r.family.id}`} className="flex flex-wrap items-center justify-between gap-2 py-2">
          <div className="min-w-0">
            <p className="font-semibold">{show === "characteristic" ? `${r.characteristic.label} (${r.characteristic.engineModel})` : `${r.characteristic.label} — ${r.family.name}`}</p>
            <p className="text-xs text-ink-faint">
              {r.latest ? (
                <>
                  {canRead ? (
                    <Link className="underline" to={`/studies/${r.latest.id}`}>
                      {r.latest.reference}
                    </Link>
                  ) : (
                    r.latest.reference
                  )}
                  {` · finished ${r.latest.completedAt.slice(0, 10)} · GRR ${r.latest.percentGrr == null ? "—" : `${r.latest.percentGrr.toFixed(1)} %`} of tolerance · ndc ${r.latest.ndc ?? "—"}`}
                  {r.latest.isDemo ? " · demo" : ""}
                </>
              ) : (
                "No finished study yet"
              )}
              {r.inProgress && ` · ${r.inProgress.reference} in progress`}
            </p>
          </div>
          {r.latest ? <StudyVerdictBadge verdict={r.latest.verdict} /> : <MarkBadge tone="faint" mark="…">In progress</MarkBadge>}
        </li>
      ))}
    </ul>
  );
}

/** On a tool's page: the latest gauge study of the tool's family on each characteristic it was studied on. */
export function FamilyStudiesCard({ familyId, familyName }: { familyId: string; familyName: string }) {
  const q = useLatestStudies({ familyId });
  return (
    <Card title="Gauge studies">
      {q.isPending ? (
        <Loading what="Looking for gauge studies" />
      ) : q.isError ? (
        <ErrorNote>{errorMessage(q.error)}</ErrorNote>
      ) : q.data.length === 0 ? (
        <EmptyState>No gauge study of the {familyName} family yet: nothing says yet how well it sorts good parts from bad on a given characteristic.</EmptyState>
      ) : (
        <>
          <p className="mb-1 text-sm text-ink-soft">The latest finished study of the {familyName} family on each characteristic:</p>
          <LatestList rows={q.data} show="characteristic" />
        </>
      )}
    </Card>
  );
}

/** On a limits table: the latest gauge study of each characteristic studied, per tool family. */
export function TableStudiesCard({ limitTableId }: { limitTableId: string }) {
  const q = useLatestStudies({ limitTableId });
  const canSetUp = useCan("studies.write");
  return (
    <Card
      title="Gauge studies of these characteristics"
      actions={
        canSetUp && (
          <Link className="text-sm underline" to={`/studies/new?limitTableId=${limitTableId}`}>
            Set up a study
          </Link>
        )
      }
    >
      {q.isPending ? (
        <Loading what="Looking for gauge studies" />
      ) : q.isError ? (
        <ErrorNote>{errorMessage(q.error)}</ErrorNote>
      ) : q.data.length === 0 ? (
        <EmptyState>No characteristic of this table has a gauge study yet.</EmptyState>
      ) : (
        <LatestList rows={q.data} show="family" />
      )}
    </Card>
  );
}

/** On the quality overview: characteristics with no finished study, or whose studied families all failed. */
export function StudyGapsCard() {
  const q = useStudyGaps();
  const canRead = useCan("studies.read");
  return (
    <Card title="Characteristics without an acceptable gauge study" actions={canRead && <Link className="text-sm underline" to="/studies">Gauge studies</Link>}>
      {q.isPending ? (
        <Loading what="Checking gauge studies" />
      ) : q.isError ? (
        <ErrorNote>{errorMessage(q.error)}</ErrorNote>
      ) : q.data.total === 0 ? (
        <EmptyState>Every journal and bore characteristic of the current limits tables has a finished study that is not failed.</EmptyState>
      ) : (
        <>
          <p className="mb-2 text-sm text-ink-soft">
            {q.data.notAcceptable} with a failed study · {q.data.noStudy} never studied
          </p>
          <ul className="divide-y divide-paper-line text-sm" aria-label="Characteristics without an acceptable gauge study">
            {q.data.items.slice(0, 12).map((g) => (
              <li key={`${g.limitTableId}/${g.itemKey}`} className="flex flex-wrap items-center justify-between gap-2 py-1.5">
                <span className="min-w-0">
                  <Link className="font-semibold underline" to={`/limit-tables/${g.limitTableId}`}>
                    {g.label}
                  </Link>{" "}
                  <span className="text-xs text-ink-faint">
                    {g.engineModel}
                    {g.latest ? ` · ${g.latest.reference}, ${g.latest.familyName}` : ""}
                  </span>
                </span>
                {g.reason === "not_acceptable" ? <StudyVerdictBadge verdict="not_acceptable" /> : <MarkBadge tone="faint" mark="–">No study</MarkBadge>}
              </li>
            ))}
          </ul>
          {q.data.total > 12 && <p className="mt-1 text-xs text-ink-faint">and {q.data.total - 12} more</p>}
        </>
      )}
    </Card>
  );
}
