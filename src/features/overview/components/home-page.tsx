import { Link } from "react-router-dom";
import { useCurrentUser, useCan } from "../../auth/api/auth";
import { Card, EmptyState, ErrorNote, Loading, PageHeader } from "../../../components/ui/layout";
import { Cautions } from "../../../components/ui/cautions";
import { StatusBadge } from "../../../components/ui/status-badge";
import { ROLE_LABELS, type Role } from "../../../../shared/auth/roles";
import { errorMessage } from "../../../lib/api-client";
import { useDashboard, useInspection, useMine } from "../api/stats";
import { DueByWeekChart, FamilyRates, StatTile, StatusCounts, TileRow } from "./dashboard-parts";
import { links } from "./links";
import { StudyGapsCard } from "../../studies/api/study-cards";
import { formatDate, formatDateTime } from "../../../lib/format";
import { TRIGGER_LABELS, type InvestigationTrigger } from "../../../../shared/investigations/labels";

const SHOP_VIEW: readonly Role[] = ["quality", "crib", "auditor", "admin"];
const INSPECTION_VIEW: readonly Role[] = ["inspector", "quality", "auditor", "admin"];

/** The overview each role opens first: what is due, what is wrong, what waits on them. */
export function HomePage() {
  const user = useCurrentUser();
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title={`Good to see you, ${user.name.split(" ")[0]}`} subtitle={`${ROLE_LABELS[user.role]} · overview`} />
      {user.role === "mechanic" && <MechanicView />}
      {SHOP_VIEW.includes(user.role) && <ShopView />}
      {INSPECTION_VIEW.includes(user.role) && <InspectionView />}
      <Cautions compact />
    </div>
  );
}

function ShopView() {
  const q = useDashboard();
  const canReview = useCan("intervals.read");
  if (q.isPending) return <Loading what="Counting the register" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const d = q.data;
  return (
    <section aria-labelledby="shop-heading" className="flex flex-col gap-4">
      <h2 id="shop-heading" className="sr-only">
        Register and crib
      </h2>
      <TileRow>
        <StatTile label="Overdue" value={d.overdue} to={links.overdue} tone="stop" hint="Do not use" />
        <StatTile label="Due within 7 days" value={d.dueWithin7Days} to={links.dueWithin(7)} tone="caution" />
        <StatTile label="Due within 30 days" value={d.dueWithin30Days} to={links.dueWithin(30)} tone="caution" />
        <StatTile label="Open investigations" value={d.openInvestigations} to={links.openInvestigations} tone="hold" />
        <StatTile label="Not returned" value={d.notReturned} to={links.notReturned} tone="stop" hint="Past due-back time" />
        <StatTile label="Tools in register" value={d.totalTools} to={links.allTools} />
      </TileRow>
      <div className="grid gap-4 xl:grid-cols-[1fr_1fr]">
        <DueByWeekChart weeks={d.dueByWeek} />
        <StatusCounts byStatus={d.byStatus} />
      </div>
      <FamilyRates rates={d.inToleranceRateByFamily} canReview={canReview} />
      <StudyGapsCard />
    </section>
  );
}

const dueText = (daysToDue: number | null, dueAt: string | null) =>
  dueAt == null ? "no due date" : daysToDue == null ? dueAt : daysToDue < 0 ? `${dueAt} (${-daysToDue} d overdue)` : daysToDue === 0 ? `${dueAt} (today)` : `${dueAt} (in ${daysToDue} d)`;

function MechanicView() {
  const q = useMine();
  if (q.isPending) return <Loading what="Finding your tools" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const { tools, openJobs } = q.data;
  const unusable = tools.filter((t) => !t.usable).length;
  return (
    <div className="flex flex-col gap-4">
      <TileRow className="sm:grid-cols-4">
        <StatTile label="My tools" value={tools.length} to="/my-tools" />
        <StatTile label="Not usable" value={unusable} to="/my-tools" tone="stop" hint="Return or recalibrate" />
        <StatTile label="Due within 30 days" value={tools.filter((t) => t.usable && t.daysToDue != null && t.daysToDue <= 30).length} to="/my-tools" tone="caution" />
        <StatTile label="My open check sheets" value={openJobs.length} to={links.myOpenJobs} />
      </TileRow>
      <div className="grid gap-4 xl:grid-cols-[3fr_2fr]">
        <Card title="My tools and their due dates">
          {tools.length === 0 ? (
            <EmptyState>No tools checked out to you and no tools of your own on the register.</EmptyState>
          ) : (
            <ul className="divide-y divide-paper-line">
              {tools.map((t) => (
                <li key={t.assetTag} className="flex flex-wrap items-start justify-between gap-2 py-2">
                  <div className="min-w-0">
                    <Link to={links.tool(t.assetTag)} className="font-semibold underline">
                      {t.assetTag}
                    </Link>{" "}
                    <span className="text-ink-soft">{t.description}</span>
                    <p className="text-xs text-ink-faint">
                      {t.relation === "issued" ? "Checked out to you" : "Your own tool"} · due {dueText(t.daysToDue, t.dueAt)}
                    </p>
                    {!t.usable && t.reasons[0] && <p className="text-sm text-stop">{t.reasons[0]}</p>}
                  </div>
                  <StatusBadge status={t.status} />
                </li>
              ))}
            </ul>
          )}
        </Card>
        <JobsCard title="My open check sheets" jobs={openJobs} empty="No unsigned check sheets of yours." />
      </div>
    </div>
  );
}

function JobsCard({ title, jobs, empty, total, allLink }: { title: string; jobs: { id: string; engineSerial: string; engineModel: string; workOrder: string | null; readings: number; lastReadingAt: string | null }[]; empty: string; total?: number; allLink?: string }) {
  return (
    <Card title={title} actions={allLink && total != null ? <Link className="text-sm underline" to={allLink}>All {total}</Link> : undefined}>
      {jobs.length === 0 ? (
        <EmptyState>{empty}</EmptyState>
      ) : (
        <ul className="divide-y divide-paper-line">
          {jobs.map((j) => (
            <li key={j.id} className="py-2">
              <Link to={links.job(j.id)} className="font-semibold underline">
                {j.engineModel} · {j.engineSerial}
              </Link>
              <p className="text-xs text-ink-faint">
                {j.workOrder ? `WO ${j.workOrder} · ` : ""}
                {j.readings} reading{j.readings === 1 ? "" : "s"}
                {j.lastReadingAt ? ` · last ${formatDateTime(j.lastReadingAt)}` : ""}
              </p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

function InspectionView() {
  const q = useInspection();
  if (q.isPending) return <Loading what="Finding sheets to sign" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const { sheetsAwaitingSignature: sheets, investigationsNeedingDisposition: invs, sheetsTotal, investigationsTotal } = q.data;
  return (
    <section aria-labelledby="inspection-heading" className="flex flex-col gap-4">
      <h2 id="inspection-heading" className="text-lg font-semibold">
        Waiting on inspection
      </h2>
      <TileRow className="sm:grid-cols-3 xl:grid-cols-6">
        <StatTile label="Sheets awaiting signature" value={sheetsTotal} to={links.awaitingSignature} tone="caution" />
        <StatTile label="Investigations needing a disposition" value={investigationsTotal} to={links.investigationsAwaitingDisposition} tone="hold" />
      </TileRow>
      <div className="grid gap-4 xl:grid-cols-2">
        <JobsCard title="Check sheets awaiting signature" jobs={sheets} empty="Every sheet with readings is signed." total={sheetsTotal} allLink={links.awaitingSignature} />
        <Card title="Investigations needing a disposition">
          {invs.length === 0 ? (
            <EmptyState>No affected readings wait for a disposition.</EmptyState>
          ) : (
            <ul className="divide-y divide-paper-line">
              {invs.map((v) => (
                <li key={v.id} className="py-2">
                  <Link to={links.investigation(v.id)} className="font-semibold underline">
                    {v.toolAssetTag ?? v.standardAssetTag ?? "Investigation"} · {TRIGGER_LABELS[v.trigger as InvestigationTrigger] ?? v.trigger}
                  </Link>
                  <p className="text-xs text-ink-faint">
                    Opened {formatDate(v.openedAt)} · {v.itemsAwaitingDisposition} item{v.itemsAwaitingDisposition === 1 ? "" : "s"} without a disposition
                  </p>
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </section>
  );
}
