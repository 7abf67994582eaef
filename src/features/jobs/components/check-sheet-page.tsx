import { useEffect, useMemo, useState } from "react";
import { Link, useParams } from "react-router-dom";
import { useCheckSheet, useSignerCertificate, useSignJob } from "../api/jobs";
import { PageHeader, Card, Facts, Loading, ErrorNote } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { TextField, TextAreaField } from "../../../components/ui/field";
import { Cautions, DemoNotice } from "../../../components/ui/cautions";
import { StatusBadge } from "../../../components/ui/status-badge";
import { errorMessage } from "../../../lib/api-client";
import { formatDate, formatDateTime } from "../../../lib/format";
import { useCan } from "../../auth/api/auth";
import { formatLength, type LengthUnit } from "../../../../shared/common/units";
import { clearanceText, judgeRow, lengthText, slotKey, type JudgingContext, type PlaceView, type ReadingEvidence } from "../../../../shared/inspection/judging";
import { evidenceOf } from "../../../../shared/inspection/check-sheet";
import { FLAG_LABELS, type ReadingFlag } from "../../../../shared/readings/readings.schemas";
import { VERIFY_NOTICE } from "../../../../shared/limit-tables/limit-tables.schemas";
import type { CheckSheet, SheetItem, SheetReading, SheetRow } from "../../../../shared/jobs/jobs.schemas";
import type { ToolStatus } from "../../../../shared/tools/tool-status";
import { ReadingEntry } from "./reading-entry";
import { EntryGridSection } from "./entry-grid";
import { VerdictBadge } from "./verdict-badge";
import { PlaceDetail, rawValue } from "./place-view";
import { useInvestigations } from "../../investigations/api/investigations";
import { JOB_STATE_LABELS, jobStateOfSheet } from "../../../../shared/jobs/labels";
import { ScrollBox } from "../../../components/ui/scroll-box";

export function CheckSheetPage() {
  const { id = "" } = useParams();
  const sheet = useCheckSheet(id);
  // What is being typed, by place, so the places it feeds (clearances, tapers) are judged before anything is saved.
  const [drafts, setDrafts] = useState<Record<string, ReadingEvidence | null>>({});
  if (sheet.isPending) return <Loading what="Loading the check sheet" />;
  if (sheet.isError) return <ErrorNote>{errorMessage(sheet.error)}</ErrorNote>;
  const setDraft = (key: string, ev: ReadingEvidence | null) => setDrafts((d) => (d[key] === ev ? d : { ...d, [key]: ev }));
  return <Sheet sheet={sheet.data} drafts={drafts} setDraft={setDraft} />;
}

/** The judging context of a sheet: its table's unit and expansion coefficient. */
export const sheetContext = (s: CheckSheet): JudgingContext => ({ tableUnit: s.limitTable.unit, tableExpansionPerK: s.limitTable.expansionPerK });

function Sheet({ sheet: s, drafts, setDraft }: { sheet: CheckSheet; drafts: Record<string, ReadingEvidence | null>; setDraft: (k: string, v: ReadingEvidence | null) => void }) {
  const unit = s.limitTable.unit;
  const ctx = sheetContext(s);
  const canRecord = useCan("readings.write");
  const sections = useMemo(() => {
    const m = new Map<string, SheetItem[]>();
    for (const it of s.items) m.set(it.section ?? "General", [...(m.get(it.section ?? "General") ?? []), it]);
    return [...m.entries()];
  }, [s.items]);
  const saved = useMemo(() => {
    const m = new Map<string, ReadingEvidence>();
    for (const it of s.items) for (const r of it.rows) if (r.reading) m.set(slotKey(it.key, r.index), evidenceOf(r.reading));
    return m;
  }, [s.items]);
  // The same lookup the server uses, with what is being typed taking the place of the saved reading.
  const evidenceAt = (itemKey: string, index: number): ReadingEvidence | undefined => {
    const k = slotKey(itemKey, index);
    return drafts[k] ?? saved.get(k);
  };
  const dependents = (item: SheetItem, index: number) =>
    s.items
      .filter((x) => index <= x.repeat && ((x.kind === "clearance" && (x.boreKey === item.key || x.journalKey === item.key)) || (x.kind === "taper" && (x.stationKeys ?? []).includes(item.key))))
      .map((x) => ({ label: x.label, place: judgeRow(s.items, x, index, evidenceAt, ctx).view }))
      .filter((x) => x.place.kind !== "pending");
  return (
    <div className="flex min-w-0 max-w-full flex-col gap-4 break-words">
      <PageHeader
        title={`Check sheet — ${s.engineSerial}`}
        subtitle={`${s.engineModel}${s.workOrder ? ` · work order ${s.workOrder}` : ""}`}
        actions={
          <a className="inline-flex min-h-10 items-center rounded-md border border-paper-line bg-paper-raised px-4 py-2 text-sm font-semibold" href={`/api/jobs/${s.id}/check-sheet.pdf`} target="_blank" rel="noreferrer">
            Printable PDF
          </a>
        }
      />
      <InvestigationBanner jobId={s.id} />
      {s.limitTable.isDemo && <DemoNotice what="limits" />}
      <p role="note" className="rounded-md border border-caution/40 bg-caution-light px-3 py-1.5 text-sm font-semibold text-caution">{VERIFY_NOTICE}</p>
      <Cautions compact />
      {s.summary.judgedDifferently > 0 && (
        <p role="alert" className="rounded-md border border-stop/40 bg-stop-light px-3 py-2 text-sm text-stop">
          <strong>Judged again under the current rules. </strong>
          {s.summary.judgedDifferently} reading{s.summary.judgedDifferently === 1 ? " was" : "s were"} recorded with another verdict than the current judging rules give; each is marked below. The readings themselves are kept as recorded.
        </p>
      )}
      <Card>
        <Facts
          items={[
            ["Limits", <Link key="t" className="underline" to={`/limit-tables/${s.limitTable.id}`}>{`${s.limitTable.name} (v${s.limitTable.version}) — ${s.limitTable.sourceDocument}, rev. ${s.limitTable.sourceRevision}`}</Link>],
            ["Unit", unit === "in" ? "inch" : "millimetre"],
            ["Opened", `${formatDateTime(s.openedAt)}${s.openedBy ? ` by ${s.openedBy.name}` : ""}`],
            ["Progress", `${s.summary.recorded} of ${s.summary.places} places measured · ${s.summary.outside} outside limits · ${s.summary.flagged} flagged`],
            ["Status", JOB_STATE_LABELS[jobStateOfSheet(s)]],
          ]}
        />
        <details className="mt-2 text-sm text-ink-soft">
          <summary className="cursor-pointer font-semibold">How places are judged (rules v{s.summary.rulesVersion})</summary>
          <ul className="mt-1 list-disc pl-5">
            <li>Every reading of a journal or bore is held to the size limits; one reading outside puts the place outside (two-point size, ISO 14405-1). The size (smallest journal, largest bore) feeds wear and clearances.</li>
            <li>A clearance is judged at both fits: the loosest (largest bore − smallest journal) against the maximum, the tightest (smallest bore − largest journal) against the minimum. Radial limits are judged on half the diametral clearance.</li>
            <li>Out-of-round (largest − smallest at one station) and taper (between two stations, same direction) are judged where the table limits them.</li>
            <li>With a part temperature and an expansion coefficient (item, table or the part's material), every length is judged at 20 °C (ISO 1); the raw value stays beside it.</li>
            <li>A feeler check uses a go and a no-go inside the limits, by calibrated thickness; when the set cannot make both, the thickest leaf or stack that enters is recorded as a measured gap.</li>
          </ul>
        </details>
        {s.limitTable.supersededById && <p className="mt-2 text-sm text-caution">The limits table has a newer revision; this job keeps the version it started with.</p>}
      </Card>
      <EntryGridSection sheet={s} />
      {sections.map(([section, items]) => (
        <section key={section} aria-label={section} className="flex flex-col gap-3">
          <h2 className="text-xl font-bold">{section}</h2>
          {items.map((item) => (
            <Card key={item.key} title={`${item.label}${item.repeat > 1 ? ` (× ${item.repeat})` : ""}`}>
              <p className="mb-2 text-sm text-ink-soft">{limitsLine(item, s)}</p>
              {item.flags.length > 0 && (
                <div className="mb-2 flex flex-wrap items-center gap-2 text-sm">
                  <span className="font-semibold">Every reading of this item:</span>
                  <Flags flags={item.flags} label={`Flags of every reading of ${item.label}`} />
                </div>
              )}
              <ol className="flex flex-col gap-2">
                {item.rows.map((row) => (
                  <li key={row.index} className="rounded-md border border-paper-line p-2">
                    {item.kind === "clearance" || item.kind === "taper" ? (
                      <DerivedRow item={item} row={row} unit={unit} live={judgeRow(s.items, item, row.index, evidenceAt, ctx).view} />
                    ) : (
                      <PlaceRow
                        item={item}
                        row={row}
                        sheet={s}
                        ctx={ctx}
                        canRecord={canRecord}
                        fed={dependents(item, row.index)}
                        onDraft={(v) => setDraft(slotKey(item.key, row.index), v)}
                      />
                    )}
                  </li>
                ))}
              </ol>
            </Card>
          ))}
        </section>
      ))}
      <ToolsCard sheet={s} />
      <SignCard sheet={s} />
      <Cautions />
    </div>
  );
}

/** The item's limits in words, with what is judged and how. */
export function limitsLine(item: SheetItem, s: CheckSheet): string {
  const unit = s.limitTable.unit;
  if (item.kind === "visual") return "Visual: serviceable or reject, with the finding.";
  const clearanceLike = item.kind === "clearance" || item.kind === "feeler";
  const f = (v: number | null) => (v == null ? "—" : clearanceLike ? clearanceText(v, unit) : `${formatLength(v, unit)} ${unit}`);
  const serviceable = item.serviceableMin != null || item.serviceableMax != null ? ` · serviceable ${item.serviceableMin != null ? `min ${f(item.serviceableMin)} ` : ""}${item.serviceableMax != null ? `max ${f(item.serviceableMax)}` : ""}` : "";
  const label = (k: string | null) => s.items.find((i) => i.key === k)?.label ?? k ?? "—";
  if (item.kind === "taper") return `Taper max ${lengthText(item.max ?? 0, unit)} ${unit}${item.serviceableMax != null ? ` · serviceable max ${lengthText(item.serviceableMax, unit)}` : ""} · ${label(item.stationKeys?.[0] ?? null)} − ${label(item.stationKeys?.[1] ?? null)}, same direction`;
  const alpha = item.expansionPerK ?? s.limitTable.expansionPerK;
  const how =
    item.kind === "journal" || item.kind === "bore"
      ? ` · every reading of ${item.directions} directions judged; size = ${item.kind === "journal" ? "smallest" : "largest"}${item.outOfRoundMax != null ? ` · out-of-round max ${lengthText(item.outOfRoundMax, unit)}` : ""}${alpha != null ? ` · expansion ${Number((alpha * 1e6).toFixed(3))} µm/(m·K) for 20 °C` : ""}`
      : item.kind === "clearance"
        ? ` · ${item.radial ? "RADIAL (half the diametral) · " : "diametral · "}loosest ${label(item.boreKey)} − ${label(item.journalKey)} against the maximum, tightest against the minimum`
        : " · go / no-go with leaves inside the limits";
  return `New ${f(item.min)} to ${f(item.max)}${item.kind === "clearance" && item.radial ? " radial" : ""}${serviceable}${how}`;
}

function Flags({ flags, label = "Flags" }: { flags: string[]; label?: string }) {
  if (!flags.length) return null;
  return (
    <ul className="flex flex-wrap gap-1" aria-label={label}>
      {flags.map((f) => (
        <li key={f} className="rounded-full border border-caution/40 bg-caution-light px-2 py-0.5 text-xs font-semibold text-caution">
          ! {FLAG_LABELS[f as ReadingFlag] ?? f}
        </li>
      ))}
    </ul>
  );
}

/** A clearance or taper row, worked out from its two readings (live while one of them is being typed). */
function DerivedRow({ item, row, unit, live }: { item: SheetItem; row: SheetRow; unit: LengthUnit; live: PlaceView }) {
  const showLive = live.kind !== "pending" && JSON.stringify(live) !== JSON.stringify(row.place);
  const place = showLive ? live : row.place;
  const headline =
    place.kind === "fit"
      ? `${clearanceText(place.loosest.value, unit)}${place.basis === "radial" ? " radial" : ""} loosest · ${clearanceText(place.tightest.value, unit)}${place.basis === "radial" ? " radial" : ""} tightest`
      : place.kind === "taper"
        ? `taper ${lengthText(place.taper, unit)}`
        : item.kind === "taper"
          ? "waiting for both stations"
          : "waiting for both sizes";
  return (
    <div className="flex flex-col gap-1" aria-label={`${item.label} no. ${row.index}`}>
      <div className="flex flex-wrap items-center gap-3">
        <span className="w-12 font-semibold">No. {row.index}</span>
        <span className="tabular-nums text-lg">{headline}</span>
        <VerdictBadge verdict={place.verdict} text={place.text} />
        {showLive && <span className="text-xs text-ink-faint">(as typed, not saved)</span>}
      </div>
      <PlaceDetail place={place} unit={unit} />
      <Flags flags={row.flags} />
    </div>
  );
}

function PlaceRow({
  item,
  row,
  sheet,
  ctx,
  canRecord,
  fed,
  onDraft,
}: {
  item: SheetItem;
  row: SheetRow;
  sheet: CheckSheet;
  ctx: JudgingContext;
  canRecord: boolean;
  fed: { label: string; place: PlaceView }[];
  onDraft: (v: ReadingEvidence | null) => void;
}) {
  const [editing, setEditing] = useState(false);
  const r = row.reading;
  const unit = sheet.limitTable.unit;
  const canWriteHere = canRecord && (!r ? !sheet.locked : true);
  return (
    <div className="flex flex-col gap-2" aria-label={`${item.label} no. ${row.index}`}>
      <div className="flex flex-wrap items-center gap-3">
        <span className="w-12 font-semibold">No. {row.index}</span>
        {r ? <SavedReading reading={r} place={row.place} unit={unit} /> : <span className="text-ink-faint">Not measured yet</span>}
        {r && <VerdictBadge verdict={r.verdict} text={r.verdictText} />}
        {canWriteHere && !editing && (
          <Button variant={r ? "ghost" : "secondary"} onClick={() => setEditing(true)} aria-label={`${r ? "Correct" : "Measure"} ${item.label} no. ${row.index}`}>
            {r ? "Correct" : "Measure"}
          </Button>
        )}
      </div>
      {r && <PlaceDetail place={row.place} unit={unit} />}
      {r && row.judgedDifferently && (
        <p className="text-sm font-semibold text-stop">
          Recorded {r.recordedVerdict === "within_limits" ? "within" : "outside"} limits under earlier rules; judged {r.verdict === "within_limits" ? "within" : "outside"} under the current rules
          {r.judgedAt ? ` (${formatDateTime(r.judgedAt)})` : ""}. The reading is kept as recorded.
        </p>
      )}
      {r && <Flags flags={row.flags} />}
      {r && !editing && fed.map((d) => (
        <p key={d.label} className="text-sm">
          {d.label}: {d.place.kind === "fit" ? `loosest ${clearanceText(d.place.loosest.value, unit)}, tightest ${clearanceText(d.place.tightest.value, unit)}${d.place.basis === "radial" ? " (radial)" : ""}` : d.place.kind === "taper" ? `taper ${lengthText(d.place.taper, unit)}` : ""} — {d.place.text}
        </p>
      ))}
      {row.history.length > 0 && (
        <details className="text-xs text-ink-soft">
          <summary>{row.history.length} earlier reading{row.history.length > 1 ? "s" : ""} (superseded)</summary>
          {row.history.map((h) => (
            <p key={h.id}>
              {h.values.map((v) => rawValue(v, h.unit)).join(" / ")} {h.unit} by {h.takenBy?.name} {formatDateTime(h.takenAt)}
            </p>
          ))}
          {r?.supersedeReason && <p>Correction reason: {r.supersedeReason}</p>}
        </details>
      )}
      {editing && (
        <ReadingEntry
          jobId={sheet.id}
          item={item}
          index={row.index}
          sheet={sheet}
          ctx={ctx}
          correcting={r ?? undefined}
          fed={fed}
          onDraft={onDraft}
          onDone={() => {
            onDraft(null);
            setEditing(false);
          }}
        />
      )}
    </div>
  );
}

function SavedReading({ reading: r, place, unit }: { reading: SheetReading; place: PlaceView; unit: LengthUnit }) {
  return (
    <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
      {r.size != null && (
        <span className="tabular-nums font-semibold">
          size {formatLength(r.size, unit)} {unit}
          {place.kind === "size" && place.thermal && ` · ${lengthText(place.size, unit)} at 20 °C`}
        </span>
      )}
      {r.finding && <span className="italic">{r.finding}</span>}
      <span className="text-xs text-ink-faint">{[r.tools.map((t) => t.assetTag).join(" + "), r.takenBy?.name, formatDateTime(r.takenAt)].filter(Boolean).join(" · ")}</span>
    </div>
  );
}

function ToolsCard({ sheet }: { sheet: CheckSheet }) {
  return (
    <Card title="Tools used">
      {sheet.tools.length === 0 ? (
        <p className="text-ink-faint">No readings yet.</p>
      ) : (
        <ScrollBox label="Tools used">
        <table className="w-full text-left text-sm" aria-label="Tools used">
          <thead className="text-xs uppercase text-ink-soft">
            <tr>
              <th className="py-1 pr-3">Tool</th>
              <th className="py-1 pr-3">Status at the reading</th>
              <th className="py-1 pr-3">Calibration due then</th>
              <th className="py-1 pr-3">Readings</th>
            </tr>
          </thead>
          <tbody>
            {sheet.tools.map((t) => (
              <tr key={t.assetTag} className="border-t border-paper-line">
                <td className="py-1.5 pr-3">
                  <span className="font-semibold">{t.assetTag}</span> <span className="text-ink-soft">{t.description}</span>
                </td>
                <td className="py-1.5 pr-3"><StatusBadge status={t.statusAtReading as ToolStatus} /></td>
                <td className="py-1.5 pr-3 tabular-nums">{formatDate(t.dueAtReading)}</td>
                <td className="py-1.5 pr-3">{t.readings}</td>
              </tr>
            ))}
          </tbody>
        </table>
        </ScrollBox>
      )}
    </Card>
  );
}

function SignCard({ sheet }: { sheet: CheckSheet }) {
  const canSign = useCan("jobs.sign");
  const mine = useSignerCertificate(canSign && !sheet.locked);
  const sign = useSignJob(sheet.id);
  const [cert, setCert] = useState("");
  // Filled in from the signer's own record; the server refuses any other number.
  const onRecord = mine.data?.certificateNumber ?? null;
  useEffect(() => {
    if (onRecord) setCert((c) => c || onRecord);
  }, [onRecord]);
  const [note, setNote] = useState("");
  return (
    <Card title="Inspector sign-off">
      {sheet.signoffs.map((so) => (
        <p key={so.id} className="text-sm">
          ✓ Signed by <strong>{so.inspector.name}</strong>, certificate {so.certificateNumber}, {formatDateTime(so.signedAt)}
          {so.note && ` — ${so.note}`}
        </p>
      ))}
      {sheet.changedSinceSignoff && <p className="text-sm font-semibold text-caution">A reading was corrected after sign-off; the sheet needs signing again.</p>}
      {!sheet.locked && canSign && (
        <form
          className="mt-2 flex flex-col gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            sign.mutate({ certificateNumber: cert, note });
          }}
        >
          <p className="text-sm">
            Review every verdict and flag above. {sheet.summary.missing.length ? `Still missing: ${sheet.summary.missing.length} place(s).` : "Every place has a reading."} {sheet.summary.outside} outside limits, {sheet.summary.flagged} flagged.
          </p>
          <TextField
            label="Inspector certificate number"
            hint={mine.isSuccess ? (onRecord ? "From your user record; only your own number is accepted." : "Your user record holds no certificate number: ask an admin to add it under People.") : undefined}
            value={cert}
            onChange={(e) => setCert(e.target.value)}
          />
          <TextAreaField label="Note (optional)" value={note} onChange={(e) => setNote(e.target.value)} />
          {sign.isError && <ErrorNote>{errorMessage(sign.error)}</ErrorNote>}
          <Button type="submit" disabled={sign.isPending}>Sign check sheet</Button>
        </form>
      )}
      {!sheet.locked && !canSign && sheet.signoffs.length === 0 && <p className="text-sm text-ink-faint">Not signed yet.</p>}
    </Card>
  );
}

/** Open out-of-tolerance investigations that include readings of this sheet. */
function InvestigationBanner({ jobId }: { jobId: string }) {
  const open = useInvestigations({ jobId, status: "open", page: 1 });
  const items = open.data?.items ?? [];
  if (!items.length) return null;
  return (
    <div role="alert" className="rounded-md border border-stop/40 bg-stop-light px-3 py-2 text-sm text-stop">
      <strong>Under investigation. </strong>
      {items.length === 1 ? "A tool used on this sheet was found out of tolerance" : `${items.length} tools used on this sheet were found out of tolerance`}; readings it took are marked suspect until dispositioned.{" "}
      {items.map((i: { id: string; toolAssetTag: string | null }) => (
        <Link key={i.id} className="mr-2 font-semibold underline" to={`/investigations/${i.id}`}>
          {i.toolAssetTag}
        </Link>
      ))}
    </div>
  );
}
