import { useState } from "react";
import { Link, useParams } from "react-router-dom";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import {
  CloseInvestigationSchema,
  CreateDispositionSchema,
  DISPOSITION_KINDS,
  DISPOSITION_LABELS,
  INVESTIGATION_FLAG_CAUTION,
  TRIGGER_LABELS,
  type CloseInvestigationInput,
  type CreateDisposition,
  type CreateDispositionInput,
  type InvestigationDetail,
  type InvestigationItem,
} from "../../../../shared/investigations/investigations.schemas";
import { reportUrl, useAddDisposition, useCloseInvestigation, useInvestigation } from "../api/investigations";
import { useCan } from "../../auth/api/auth";
import { Card, ErrorNote, Facts, Loading, PageHeader } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { SelectField, TextAreaField, TextField } from "../../../components/ui/field";
import { Cautions } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { lengthWithUnit as length, signedLengthWithUnit as signedLength } from "../../../../shared/investigations/format";
import { shortInstant as when } from "../../../lib/format";
import { InvestigationStatus } from "./investigation-status";

export function InvestigationPage() {
  const { id = "" } = useParams();
  const q = useInvestigation(id);
  if (q.isPending) return <Loading what="Loading the investigation" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  return <InvestigationView inv={q.data} />;
}

function InvestigationView({ inv }: { inv: InvestigationDetail }) {
  const canDispose = useCan("dispositions.write") && inv.status === "open";
  const groups = groupByJob(inv.items);
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
            <a href={reportUrl(inv.id)} target="_blank" rel="noreferrer" className="inline-flex min-h-10 items-center rounded-md border border-paper-line bg-paper-raised px-4 text-sm font-semibold hover:bg-paper-sunk">
              Report (PDF)
            </a>
          </>
        }
      />
      <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
        <FindingCard inv={inv} />
        <ProgressCard inv={inv} />
      </div>

      <section aria-labelledby="affected-heading" className="flex flex-col gap-4">
        <h2 id="affected-heading" className="text-xl font-bold">
          Affected readings{inv.standard ? " and calibrations" : ""} ({inv.affectedCount})
        </h2>
        {inv.items.length === 0 && <p className="text-ink-faint">No reading was taken with the tool in the window.</p>}
        {groups.map((g) => (
          <Card
            key={g.key}
            title={g.job ? `Engine ${g.job.engineSerial}${g.job.workOrder ? ` · ${g.job.workOrder}` : ""}` : "Calibrations performed with the standard"}
            actions={g.job ? <Link className="text-sm font-semibold underline decoration-brass underline-offset-2" to={`/jobs/${g.job.id}`}>Check sheet</Link> : undefined}
          >
            {g.job && canDispose && <JobDisposition investigationId={inv.id} jobId={g.job.id} engineSerial={g.job.engineSerial} count={g.items.length} />}
            <ol className="flex flex-col gap-3">
              {g.items.map((item) => (
                <li key={item.id}>
                  <ItemCard investigationId={inv.id} item={item} canDispose={canDispose} />
                </li>
              ))}
            </ol>
          </Card>
        ))}
      </section>

      <Cautions />
      <p className="text-sm text-ink-soft">{INVESTIGATION_FLAG_CAUTION}</p>
    </div>
  );
}

function groupByJob(items: InvestigationItem[]) {
  const out: { key: string; job: InvestigationItem["job"]; items: InvestigationItem[] }[] = [];
  for (const i of items) {
    const key = i.job?.id ?? "calibrations";
    let g = out.find((x) => x.key === key);
    if (!g) out.push((g = { key, job: i.job, items: [] }));
    g.items.push(i);
  }
  // The standard's calibrations first: they explain why the readings below are here.
  return out.sort((a, b) => (a.key === "calibrations" ? -1 : b.key === "calibrations" ? 1 : 0));
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
              <th>U (k = 2)</th>
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

function ProgressCard({ inv }: { inv: InvestigationDetail }) {
  const canClose = useCan("investigations.close");
  return (
    <Card title="Progress">
      <Facts
        items={[
          ["Affected", inv.affectedCount],
          ["Verdict could change", <span className={inv.couldChangeCount ? "text-stop" : ""}>{inv.couldChangeCount}</span>],
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

function CouldChange({ value }: { value: boolean }) {
  return value ? (
    <span className="inline-flex items-center gap-1 rounded-full border border-stop/40 bg-stop-light px-2 py-0.5 text-xs font-semibold text-stop">
      <span aria-hidden="true">!</span>Verdict could change
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 rounded-full border border-go/40 bg-go-light px-2 py-0.5 text-xs font-semibold text-go">
      <span aria-hidden="true">✓</span>Verdict holds
    </span>
  );
}

const sentence = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

function itemName(i: InvestigationItem) {
  if (i.kind === "calibration") return `Calibration of ${i.toolAssetTag} on ${i.takenAt?.slice(0, 10)}`;
  return `${i.itemLabel ?? i.itemKey}${i.index && i.index > 1 ? ` no. ${i.index}` : ""}`;
}

function ItemCard({ investigationId, item, canDispose }: { investigationId: string; item: InvestigationItem; canDispose: boolean }) {
  const [open, setOpen] = useState(false);
  const unit = item.unit;
  const answered = item.dispositions.length > 0;
  return (
    <article aria-label={itemName(item)} className={cx("rounded-md border p-3", answered ? "border-paper-line bg-paper" : "border-brass/50 bg-paper-raised")}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="font-semibold">
          {itemName(item)} <span className="font-normal text-ink-soft">· {item.toolAssetTag}</span>
          {item.override && <span className="ml-2 rounded bg-hold-light px-1.5 py-0.5 text-xs font-semibold text-hold">taken under an override</span>}
        </h3>
        <CouldChange value={item.verdictCouldChange} />
      </div>
      {item.kind === "reading" ? (
        <>
          <dl className="mt-2 grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
            <Fact k="Values">{item.values.length ? item.values.map((v) => length(v, unit)).join(" / ") : "—"}</Fact>
            <Fact k={`${sentence(item.quantity ?? "size")} as judged`}>{length(item.measuredValue, unit)}</Fact>
            <Fact k="Verdict given">{item.originalVerdict?.replace("_", " ") ?? "—"}</Fact>
            <Fact k={`${sentence(item.quantity ?? "size")} over the error band`}>{item.bandLow != null && item.bandHigh != null ? `${length(item.bandLow, unit)} to ${length(item.bandHigh, unit)}` : "—"}</Fact>
            <Fact k="Most likely (error at the nearest check point)">{length(item.correctedValue, unit)}</Fact>
            <Fact k="Margin as read">{signedLength(item.marginBefore, unit)}</Fact>
            <Fact k="Margin at the worst of the band">
              <span className={item.marginAfter != null && item.marginAfter < 0 ? "font-semibold text-stop" : ""}>{signedLength(item.marginAfter, unit)}</span>
            </Fact>
            <Fact k="Measured">{when(item.takenAt)} {item.takenBy ? `by ${item.takenBy}` : ""}</Fact>
          </dl>
          {item.places.length > 0 && (
            <ul className="mt-2 flex flex-col gap-0.5 text-sm" aria-label="Places re-judged">
              {item.places.map((p) => (
                <li key={p.itemKey} className="tabular-nums">
                  <span className={cx("font-semibold", p.couldChange ? "text-stop" : "text-go")}>{p.couldChange ? "could change" : "holds"}</span> — {p.label}: {p.quantity}{" "}
                  {p.value != null && length(p.value, unit)}
                  {p.low != null && p.high != null && p.low !== p.high && ` (${length(p.low, unit)} to ${length(p.high, unit)})`}; {p.verdictNow.replace("_", " ")} as read
                </li>
              ))}
            </ul>
          )}
        </>
      ) : (
        <dl className="mt-2 grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
          <Fact k="Result recorded">{item.originalVerdict ?? "—"}</Fact>
          <Fact k="As-found error corrected">{item.correctedValue ?? "—"}</Fact>
          <Fact k="Margin before">{item.marginBefore ?? "—"}</Fact>
          <Fact k="Margin after">{item.marginAfter ?? "—"}</Fact>
        </dl>
      )}
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer font-semibold text-ink-soft">How it was re-judged</summary>
        <p className="mt-1 text-ink-soft">{item.basis}</p>
      </details>
      {item.dispositions.length > 0 && (
        <ul className="mt-2 flex flex-col gap-1 text-sm" aria-label="Dispositions">
          {item.dispositions.map((d) => (
            <li key={d.id} className="rounded bg-paper-sunk px-2 py-1">
              <strong>{DISPOSITION_LABELS[d.kind]}</strong> — {d.rationale}{" "}
              <span className="text-ink-faint">
                ({d.decidedBy.name}, {when(d.decidedAt)}
                {d.notifiedWhom ? `; told ${d.notifiedWhom} by ${d.notifiedHow}` : ""})
              </span>
            </li>
          ))}
        </ul>
      )}
      {canDispose &&
        (open ? (
          <DispositionForm investigationId={investigationId} target={{ itemIds: [item.id] }} allowRemeasure={item.kind === "reading"} onDone={() => setOpen(false)} />
        ) : (
          <Button variant="secondary" className="mt-2" onClick={() => setOpen(true)} aria-label={`Record a disposition for ${itemName(item)}`}>
            Record a disposition
          </Button>
        ))}
    </article>
  );
}

function Fact({ k, children }: { k: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="text-xs text-ink-faint">{k}</dt>
      <dd className="font-medium">{children}</dd>
    </div>
  );
}

function JobDisposition({ investigationId, jobId, engineSerial, count }: { investigationId: string; jobId: string; engineSerial: string; count: number }) {
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <Button variant="ghost" className="mb-3" onClick={() => setOpen(true)}>
        Dispose all {count} of engine {engineSerial} at once
      </Button>
    );
  }
  return (
    <div className="mb-3 rounded-md border border-paper-line p-3">
      <DispositionForm investigationId={investigationId} target={{ jobId }} allowRemeasure={false} onDone={() => setOpen(false)} />
    </div>
  );
}

function DispositionForm({
  investigationId,
  target,
  allowRemeasure,
  onDone,
}: {
  investigationId: string;
  target: { itemIds: string[] } | { jobId: string };
  allowRemeasure: boolean;
  onDone: () => void;
}) {
  const add = useAddDisposition(investigationId);
  const form = useForm<CreateDispositionInput, unknown, CreateDisposition>({
    resolver: zodResolver(CreateDispositionSchema),
    defaultValues: { ...target, kind: "no_impact", rationale: "" },
  });
  const kind = useWatch({ control: form.control, name: "kind" });
  const e = form.formState.errors;
  return (
    <form noValidate className="mt-3 flex flex-col gap-3" onSubmit={form.handleSubmit((v) => add.mutate(v, { onSuccess: onDone }))}>
      <SelectField label="Disposition" error={e.kind?.message} {...form.register("kind")}>
        {DISPOSITION_KINDS.filter((k) => allowRemeasure || k !== "remeasure").map((k) => (
          <option key={k} value={k}>
            {DISPOSITION_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <TextAreaField label="Rationale" error={e.rationale?.message} hint="Why this disposition is right: what was checked, by whom, against what." {...form.register("rationale")} />
      {kind === "notify_owner" && (
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Who was notified" error={e.notifiedWhom?.message} {...form.register("notifiedWhom")} />
          <TextField label="How they were notified" error={e.notifiedHow?.message} placeholder="Telephone, e-mail, letter…" {...form.register("notifiedHow")} />
        </div>
      )}
      {kind === "remeasure" && (
        <TextField
          label="New reading (id)"
          error={e.remeasureReadingId?.message}
          hint="Record the remeasurement on the check sheet as a correction of this reading, then give its id here."
          {...form.register("remeasureReadingId")}
        />
      )}
      {e.itemIds?.message && <ErrorNote>{e.itemIds.message}</ErrorNote>}
      {add.isError && <ErrorNote>{errorMessage(add.error)}</ErrorNote>}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={add.isPending}>
          Save disposition
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
