import { Link } from "react-router-dom";
import { PageHeader, EmptyState, ErrorNote, Loading } from "../../../components/ui/layout";
import { StatusBadge } from "../../../components/ui/status-badge";
import { Cautions } from "../../../components/ui/cautions";
import { errorMessage } from "../../../lib/api-client";
import { useMyTools } from "../api/checkouts";
import { shortWhen } from "./format";

/** The tools a person holds: issued from the crib, and their own; each with its status and due date. */
export function MyToolsPage() {
  const mine = useMyTools();
  return (
    <div className="mx-auto max-w-3xl">
      <PageHeader title="My tools" subtitle="Tools issued to you and your own tools, with whether each may be used." />
      {mine.isPending && <Loading what="Loading your tools" />}
      {mine.isError && <ErrorNote>{errorMessage(mine.error)}</ErrorNote>}
      {mine.data && mine.data.items.length === 0 && <EmptyState>You hold no tools from the crib and have no tools of your own in the register.</EmptyState>}
      <ul className="space-y-3">
        {mine.data?.items.map((t) => (
          <li key={t.assetTag} className="rounded-card border border-paper-line bg-paper-raised p-4 shadow-card">
            <div className="flex flex-wrap items-center gap-2">
              <Link to={`/t/${encodeURIComponent(t.assetTag)}`} className="font-mono text-lg font-bold underline">
                {t.assetTag}
              </Link>
              <StatusBadge status={t.status} />
              <span className="ml-auto text-sm text-ink-soft">{t.relation === "own" ? "Your own tool" : `Issued ${shortWhen(t.since)}`}</span>
            </div>
            <p className="text-ink-soft">{t.description}</p>
            <p className="mt-1 text-sm">
              Calibration due: <strong>{t.dueAt ?? "—"}</strong>
              {t.dueBackAt && (
                <>
                  {" "}
                  · back to the crib by{" "}
                  <strong className={Date.parse(t.dueBackAt) < Date.now() ? "text-stop" : undefined}>
                    {shortWhen(t.dueBackAt)}
                    {Date.parse(t.dueBackAt) < Date.now() ? " — overdue, return it now" : ""}
                  </strong>
                </>
              )}
            </p>
            {!t.usable && <p className="mt-1 font-semibold text-stop">Do not use: {t.reasons[0]}</p>}
          </li>
        ))}
      </ul>
      <Cautions compact className="mt-6" />
    </div>
  );
}
