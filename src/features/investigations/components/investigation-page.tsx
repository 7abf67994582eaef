import { Link, useParams } from "react-router-dom";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import {
  CloseInvestigationSchema,
  INVESTIGATION_FLAG_CAUTION,
  READING_VERDICT_LABELS,
  TRIGGER_LABELS,
  type CloseInvestigationInput,
  type InvestigationDetail,
} from "../../../../shared/investigations/investigations.schemas";
import { reportUrl, useCloseInvestigation, useInvestigation } from "../api/investigations";
import { useCan } from "../../auth/api/auth";
import { Card, ErrorNote, Facts, Loading, PageHeader } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { TextAreaField } from "../../../components/ui/field";
import { Cautions } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { lengthWithUnit as length, signedLengthWithUnit as signedLength } from "../../../../shared/investigations/format";
import { formatDateTime as when } from "../../../lib/format";
import { InvestigationStatus } from "./investigation-status";
import { AffectedItemsTable } from "./affected-items-table";

export function InvestigationPage() {
  const { id = "" } = useParams();
  const q = useInvestigation(id);
  if (q.isPending) return <Loading what="Loading the investigation" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  return <InvestigationView inv={q.data} />;
}

function InvestigationView({ inv }: { inv: InvestigationDetail }) {
  const canDispose = useCan("dispositions.write") && inv.status === "open";
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            Investigation — {inv.toolAssetTag}
            <InvestigationStatus status={inv.status} />
          </span>
        }
        subtitle={`${TRIGGER_LABELS[inv.trigger]} · opened ${when(inv.openedAt)}${inv.openedBy ? ` by ${inv.openedBy}` : ""}`}
        actions={
          <>
            <Link to="/investigations" className="inline-flex min-h-10 items-center rounded-md px-3 text-sm font-semibold text-ink hover:bg-paper-sunk">
              All investigations
            </Link>
            {!inv.gathering && (
              <a href={reportUrl(inv.id)} target="_blank" rel="noreferrer" className="inline-flex min-h-10 items-center rounded-md border border-paper-line bg-paper-raised px-4 text-sm font-semibold hover:bg-paper-sunk">
                Report (PDF)
              </a>
            )}
          </>
        }
      />
      <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
        <FindingCard inv={inv} />
        <ProgressCard inv={inv} />
      </div>

      <section aria-labelledby="affected-heading" className="flex flex-col gap-3">
        <h2 id="affected-heading" className="text-xl font-bold">
          Affected readings{inv.standard ? " and calibrations" : ""}
          {inv.gathering ? "" : ` (${inv.totals.items})`}
        </h2>
        {inv.gathering ? (
          <Gathering inv={inv} />
        ) : inv.totals.items === 0 ? (
          <p className="text-ink-soft">No reading was taken with the tool in the window.</p>
        ) : (
          <AffectedItemsTable inv={inv} canDispose={canDispose} />
        )}
      </section>

      <Cautions />
      <p className="text-sm text-ink-soft">{INVESTIGATION_FLAG_CAUTION}</p>
    </div>
  );
}

function FindingCard({ inv }: { inv: InvestigationDetail }) {
  const f = inv.finding;
  const unit = f.unit;
  return (
    <Card title="Finding and window">
      <p className="mb-3">{f.summary}</p>
      {f.errors ? (
        <table className="mb-3 w-full max-w-md text-sm" aria-label="Errors found">
          <thead className="text-left text-xs uppercase text-ink-soft">
            <tr>
              <th className="py-1 pr-3">Check point</th>
              <th className="pr-3">Error found</th>
              <th className="pr-3">Permissible</th>
              <th title="Expanded uncertainty of the calibration point, at about 95 % coverage">U (≈ 95 %)</th>
            </tr>
          </thead>
          <tbody>
            {f.errors.map((e) => (
              <tr key={e.nominal} className={cx("border-t border-paper-line", e.mpe != null && Math.abs(e.error) > e.mpe && "font-semibold text-stop")}>
                <td className="py-1 pr-3">{length(e.nominal, unit)}</td>
                <td className="pr-3">{signedLength(e.error, unit)}</td>
                <td className="pr-3">{e.mpe == null ? "—" : `±${length(e.mpe, unit)}`}</td>
                <td>{e.uncertainty == null ? "—" : length(e.uncertainty, unit)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : (
        <p className="mb-3 font-semibold text-stop">The error is unknown: every affected reading could have been judged differently.</p>
      )}
      <Facts
        items={[
          ["Tool", inv.tool ? `${inv.tool.assetTag} — ${inv.tool.description}` : "—"],
          ...(inv.standard ? ([["Reference standard", `${inv.standard.assetTag} — ${inv.standard.name}`]] as [string, string][]) : []),
          ["Window from", inv.windowStart ? when(inv.windowStart) : "never known good — every earlier reading"],
          ["Window to", when(inv.windowEnd)],
          ["Note", f.note],
          [
            "Notified",
            f.notifications
              ? `${f.notifications.recipients.map((r) => r.name).join(", ") || "nobody"} (${f.notifications.status}${f.notifications.sentAt ? `, ${when(f.notifications.sentAt)}` : ""})`
              : "—",
          ],
        ]}
      />
      <details className="mt-3 text-sm text-ink-soft">
        <summary className="cursor-pointer font-semibold">How the window is set</summary>
        <p className="mt-1">{f.windowRule}</p>
      </details>
    </Card>
  );
}

/** A large window just opened: its readings are being re-judged; the page asks again every second. */
function Gathering({ inv }: { inv: InvestigationDetail }) {
  return (
    <p role="status" className="rounded-md border border-paper-line bg-paper-sunk px-4 py-3">
      <span className="font-semibold">Gathering the affected readings.</span> Every reading {inv.toolAssetTag} took in the window is being re-judged with
      its error; this page fills in by itself in a moment. Dispositions, closing and the report wait until then.
    </p>
  );
}

function ProgressCard({ inv }: { inv: InvestigationDetail }) {
  const canClose = useCan("investigations.close");
  if (inv.gathering)
    return (
      <Card title="Progress">
        <p className="text-ink-soft">Counted once the affected readings are gathered.</p>
      </Card>
    );
  return (
    <Card title="Progress">
      <Facts
        items={[
          ["Affected", inv.totals.items],
          ["Verdict could change", <span className={cx(inv.totals.couldChange > 0 && "font-semibold text-stop")}>{inv.totals.couldChange}</span>],
          ["Verdict holds", inv.totals.holds],
          ...(inv.totals.readings > 0
            ? ([
                [`Recorded ${READING_VERDICT_LABELS.within_limits.toLowerCase()}`, inv.totals.byVerdict.within_limits],
                [`Recorded ${READING_VERDICT_LABELS.outside_limits.toLowerCase()}`, inv.totals.byVerdict.outside_limits],
                ...(inv.totals.byVerdict.pending ? ([[`Recorded ${READING_VERDICT_LABELS.pending.toLowerCase()}`, inv.totals.byVerdict.pending]] as [string, number][]) : []),
              ] as [string, number][])
            : []),
          ...(inv.totals.calibrations > 0 ? ([["Calibrations re-judged", inv.totals.calibrations]] as [string, number][]) : []),
          ["Awaiting disposition", inv.undisposedCount],
        ]}
      />
      {inv.status === "closed" ? (
        <div className="mt-3 text-sm">
          <p className="font-semibold">
            Closed {when(inv.closedAt)}
            {inv.closedBy ? ` by ${inv.closedBy}` : ""}
          </p>
          <p className="mt-1 whitespace-pre-line">{inv.closingSummary}</p>
        </div>
      ) : canClose ? (
        <CloseForm inv={inv} />
      ) : null}
    </Card>
  );
}

function CloseForm({ inv }: { inv: InvestigationDetail }) {
  const close = useCloseInvestigation(inv.id);
  const form = useForm<CloseInvestigationInput>({ resolver: zodResolver(CloseInvestigationSchema), defaultValues: { summary: "" } });
  return (
    <form noValidate className="mt-4 flex flex-col gap-2" onSubmit={form.handleSubmit((v) => close.mutate(v))}>
      <TextAreaField label="Closing summary" error={form.formState.errors.summary?.message} hint="What was found, what was done for each job, and why the matter is closed." {...form.register("summary")} />
      {inv.undisposedCount > 0 && <p className="text-sm text-ink-soft">It closes once every affected item has a disposition ({inv.undisposedCount} to go).</p>}
      {close.isError && <ErrorNote>{errorMessage(close.error)}</ErrorNote>}
      <Button type="submit" disabled={close.isPending}>
        Close investigation
      </Button>
    </form>
  );
}

