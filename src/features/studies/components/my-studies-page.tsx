import { Link } from "react-router-dom";
import { useMyStudies } from "../api/studies";
import { PageHeader, Card, EmptyState, ErrorNote, Loading } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";

/** The studies a mechanic is an appraiser of and has not finished. */
export function MyStudiesPage() {
  const q = useMyStudies();
  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <PageHeader title="Gauge studies to take" subtitle="Quality asked you to measure these parts, in the order shown, without seeing earlier values." />
      {q.isPending ? (
        <Loading what="Finding your studies" />
      ) : q.isError ? (
        <ErrorNote>{errorMessage(q.error)}</ErrorNote>
      ) : q.data.length === 0 ? (
        <EmptyState>No gauge study is waiting for you.</EmptyState>
      ) : (
        <Card>
          <ul className="divide-y divide-paper-line">
            {q.data.map((s) => (
              <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <div>
                  <Link className="font-semibold underline" to={`/bench/studies/${s.id}`}>
                    {s.reference}: {s.characteristicLabel}
                  </Link>
                  <p className="text-xs text-ink-faint">
                    {s.engineModel} · {s.familyName}
                    {s.isDemo ? " · demo" : ""}
                  </p>
                </div>
                <span className="text-sm tabular-nums">
                  {s.taken} of {s.needed} measured
                </span>
              </li>
            ))}
          </ul>
        </Card>
      )}
    </div>
  );
}
