import { useMemo, useState } from "react";
import { Link, useParams } from "react-router-dom";
import { useCheckSheet, useSignJob } from "../api/jobs";
import { PageHeader, Card, Facts, Loading, ErrorNote } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { TextField, TextAreaField } from "../../../components/ui/field";
import { Cautions, DemoNotice } from "../../../components/ui/cautions";
import { StatusBadge } from "../../../components/ui/status-badge";
import { errorMessage } from "../../../lib/api-client";
import { useCan, useCurrentUser } from "../../auth/api/auth";
import { DEFAULT_DECIMALS, formatLength, type LengthUnit } from "../../../../shared/common/units";
import { formatClearance } from "../../../../shared/inspection/sizes";
import { clearanceAt, slotKey, verdictText, type SheetReading } from "../../../../shared/inspection/check-sheet";
import { FLAG_LABELS, type ReadingFlag, type ReadingView } from "../../../../shared/readings/readings.schemas";
import { VERIFY_NOTICE } from "../../../../shared/limit-tables/limit-tables.schemas";
import type { CheckSheet, SheetItem, SheetRow } from "../../../../shared/jobs/jobs.schemas";
import type { ToolStatus } from "../../../../shared/tools/tool-status";
import { ReadingEntry } from "./reading-entry";
import { VerdictBadge } from "./verdict-badge";
import { useInvestigations } from "../../investigations/api/investigations";

export function CheckSheetPage() {
  const { id = "" } = useParams();
  const sheet = useCheckSheet(id);
  // Live sizes of what is being typed, by place, so clearances show before anything is saved.
  const [drafts, setDrafts] = useState<Record<string, number | null>>({});
  if (sheet.isPending) return <Loading what="Loading the check sheet" />;
  if (sheet.isError) return <ErrorNote>{errorMessage(sheet.error)}</ErrorNote>;
  const s = sheet.data;
  const setDraft = (key: string, size: number | null) => setDrafts((d) => (d[key] === size ? d : { ...d, [key]: size }));
  return <Sheet sheet={s} drafts={drafts} setDraft={setDraft} />;
}

function Sheet({ sheet: s, drafts, setDraft }: { sheet: CheckSheet; drafts: Record<string, number | null>; setDraft: (k: string, v: number | null) => void }) {
  const unit = s.limitTable.unit;
  const canRecord = useCan("readings.write");
  const sections = useMemo(() => {
    const m = new Map<string, SheetItem[]>();
    for (const it of s.items) m.set(it.section ?? "General", [...(m.get(it.section ?? "General") ?? []), it]);
    return [...m.entries()];
  }, [s.items]);
  const saved = useMemo(() => {
    const m = new Map<string, SheetReading>();
    for (const it of s.items) for (const r of it.rows) if (r.reading) m.set(slotKey(it.key, r.index), { itemKey: it.key, index: r.index, size: r.reading.size });
    return m;
  }, [s.items]);
  // The same lookup the server uses, with live drafts taking the place of saved readings while typing.
  const lookup = (itemKey: string, index: number): SheetReading | undefined => {
    const k = slotKey(itemKey, index);
    if (k in drafts && drafts[k] != null) return { itemKey, index, size: drafts[k] };
    return saved.get(k);
  };
  const clearanceFor = (item: SheetItem, index: number) => {
    const c = s.items.find((x) => x.kind === "clearance" && (x.boreKey === item.key || x.journalKey === item.key) && index <= x.repeat);
    if (!c) return null;
    const out = clearanceAt(c, index, lookup);
    return out.clearance == null ? null : { label: c.label, text: `${formatClearance(out.clearance, unit)} — ${verdictText(c, out.judgement, out.verdict)}`, verdict: out.verdict };
  };
  return (
    <div className="flex flex-col gap-4">
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
      <Card>
        <Facts
          items={[
            ["Limits", <Link key="t" className="underline" to={`/limit-tables/${s.limitTable.id}`}>{`${s.limitTable.name} (v${s.limitTable.version}) — ${s.limitTable.sourceDocument}, rev. ${s.limitTable.sourceRevision}`}</Link>],
            ["Unit", unit === "in" ? "inch" : "millimetre"],
            ["Opened", `${s.openedAt.slice(0, 10)}${s.openedBy ? ` by ${s.openedBy.name}` : ""}`],
            ["Progress", `${s.summary.recorded} of ${s.summary.places} places measured · ${s.summary.outside} outside limits · ${s.summary.flagged} flagged`],
            ["Status", s.locked ? "Signed and locked" : s.changedSinceSignoff ? "Corrected since sign-off: needs signing again" : "Open"],
          ]}
        />
        {s.limitTable.supersededById && <p className="mt-2 text-sm text-caution">The limits table has a newer revision; this job keeps the version it started with.</p>}
      </Card>
      {sections.map(([section, items]) => (
        <section key={section} aria-label={section} className="flex flex-col gap-3">
          <h2 className="text-xl font-bold">{section}</h2>
          {items.map((item) => (
            <Card key={item.key} title={`${item.label}${item.repeat > 1 ? ` (× ${item.repeat})` : ""}`}>
              <p className="mb-2 text-sm text-ink-soft">{limitsLine(item, unit)}</p>
              <ol className="flex flex-col gap-2">
                {item.rows.map((row) => (
                  <li key={row.index} className="rounded-md border border-paper-line p-2">
                    {item.kind === "clearance" ? (
                      <ClearanceRow item={item} row={row} unit={unit} live={clearanceAt(item, row.index, lookup)} />
                    ) : (
                      <PlaceRow item={item} row={row} sheet={s} canRecord={canRecord} clearance={clearanceFor(item, row.index)} onDraft={(v) => setDraft(slotKey(item.key, row.index), v)} />
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

function limitsLine(item: SheetItem, unit: LengthUnit): string {
  if (item.kind === "visual") return "Visual: serviceable or reject, with the finding.";
  const f = (v: number | null) => (v == null ? "—" : item.kind === "clearance" || item.kind === "feeler" ? formatClearance(v, unit) : `${formatLength(v, unit)} ${unit}`);
  const serviceable = item.serviceableMin != null || item.serviceableMax != null ? ` · serviceable ${item.serviceableMin != null ? `min ${f(item.serviceableMin)} ` : ""}${item.serviceableMax != null ? `max ${f(item.serviceableMax)}` : ""}` : "";
  const how = item.kind === "journal" ? ` · size = smallest of ${item.directions} directions` : item.kind === "bore" ? ` · size = largest of ${item.directions} directions` : item.kind === "clearance" ? ` · ${item.boreKey} − ${item.journalKey}` : " · go / no-go with a feeler set";
  return `New ${f(item.min)} to ${f(item.max)}${serviceable}${how}`;
}

function Flags({ flags }: { flags: string[] }) {
  if (!flags.length) return null;
  return (
    <ul className="flex flex-wrap gap-1" aria-label="Flags">
      {flags.map((f) => (
        <li key={f} className="rounded-full border border-caution/40 bg-caution-light px-2 py-0.5 text-xs font-semibold text-caution">
          ! {FLAG_LABELS[f as ReadingFlag] ?? f}
        </li>
      ))}
    </ul>
  );
}

function ClearanceRow({ item, row, unit, live }: { item: SheetItem; row: SheetRow; unit: LengthUnit; live: ReturnType<typeof clearanceAt> }) {
  const showLive = live.clearance != null && live.clearance !== row.clearance;
  const value = showLive ? live : { clearance: row.clearance, judgement: row.judgement, verdict: row.verdict };
  return (
    <div className="flex flex-wrap items-center gap-3" aria-label={`${item.label} no. ${row.index}`}>
      <span className="w-12 font-semibold">No. {row.index}</span>
      <span className="tabular-nums text-lg">{value.clearance == null ? "waiting for both sizes" : formatClearance(value.clearance, unit)}</span>
      <VerdictBadge verdict={value.verdict} text={verdictText(item, value.judgement, value.verdict)} />
      {showLive && <span className="text-xs text-ink-faint">(as typed, not saved)</span>}
      <Flags flags={row.flags} />
    </div>
  );
}

function PlaceRow({ item, row, sheet, canRecord, clearance, onDraft }: { item: SheetItem; row: SheetRow; sheet: CheckSheet; canRecord: boolean; clearance: { label: string; text: string; verdict: string } | null; onDraft: (v: number | null) => void }) {
  const [editing, setEditing] = useState(false);
  const r = row.reading;
  const canWriteHere = canRecord && (!r ? !sheet.locked : true);
  return (
    <div className="flex flex-col gap-2" aria-label={`${item.label} no. ${row.index}`}>
      <div className="flex flex-wrap items-center gap-3">
        <span className="w-12 font-semibold">No. {row.index}</span>
        {r ? <SavedReading reading={r} unit={sheet.limitTable.unit} /> : <span className="text-ink-faint">Not measured yet</span>}
        {r && <VerdictBadge verdict={r.verdict} text={r.verdictText} />}
        {canWriteHere && !editing && (
          <Button variant={r ? "ghost" : "secondary"} onClick={() => setEditing(true)} aria-label={`${r ? "Correct" : "Measure"} ${item.label} no. ${row.index}`}>
            {r ? "Correct" : "Measure"}
          </Button>
        )}
      </div>
      {r && <Flags flags={r.flags} />}
      {r && !editing && clearance && <p className="text-sm">{clearance.label}: {clearance.text}</p>}
      {row.history.length > 0 && (
        <details className="text-xs text-ink-soft">
          <summary>{row.history.length} earlier reading{row.history.length > 1 ? "s" : ""} (superseded)</summary>
          {row.history.map((h) => (
            <p key={h.id}>
              {h.values.map((v) => rawValue(v, h.unit)).join(" / ")} {h.unit} by {h.takenBy?.name} {h.takenAt.slice(0, 16).replace("T", " ")}
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
          unit={sheet.limitTable.unit}
          correcting={r ?? undefined}
          clearance={clearance}
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

/** A raw value as typed: never rounded, but padded to the unit's customary decimals (1.125 shows as 1.1250). */
function rawValue(v: number, unit: LengthUnit): string {
  const text = String(v);
  const decimals = text.includes(".") ? text.split(".")[1].length : 0;
  return decimals >= DEFAULT_DECIMALS[unit] || /e/i.test(text) ? text : v.toFixed(DEFAULT_DECIMALS[unit]);
}

function SavedReading({ reading: r, unit }: { reading: ReadingView; unit: LengthUnit }) {
  return (
    <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
      {r.values.length > 0 && (
        <span className="tabular-nums">
          {r.values.map((v) => rawValue(v, r.unit)).join(" / ")} {r.unit}
        </span>
      )}
      {r.size != null && (
        <span className="tabular-nums font-semibold">
          size {formatLength(r.size, unit)} {unit}
          {r.outOfRound != null && ` · out-of-round ${formatLength(r.outOfRound, unit)}`}
        </span>
      )}
      {r.correction && (
        <span className="text-xs text-ink-soft">
          at 20 °C: {formatLength(r.correction.correctedSize, unit)} ({r.correction.partMaterial.replace(/_/g, " ")}, {r.correction.temperatureC} °C)
        </span>
      )}
      {r.goLeaf && r.noGoLeaf && (
        <span>
          go {r.goLeaf.label} {r.goEntered ? "entered" : "did not enter"} · no-go {r.noGoLeaf.label} {r.noGoEntered ? "entered" : "did not enter"}
        </span>
      )}
      {r.finding && <span className="italic">{r.finding}</span>}
      <span className="text-xs text-ink-faint">
        {r.tools.map((t) => t.assetTag).join(" + ")} · {r.takenBy?.name} · {r.takenAt.slice(0, 16).replace("T", " ")}
      </span>
    </div>
  );
}

function ToolsCard({ sheet }: { sheet: CheckSheet }) {
  return (
    <Card title="Tools used">
      {sheet.tools.length === 0 ? (
        <p className="text-ink-faint">No readings yet.</p>
      ) : (
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
                <td className="py-1.5 pr-3 tabular-nums">{t.dueAtReading ?? "—"}</td>
                <td className="py-1.5 pr-3">{t.readings}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </Card>
  );
}

function SignCard({ sheet }: { sheet: CheckSheet }) {
  const canSign = useCan("jobs.sign");
  const me = useCurrentUser() as { certificateNumber?: string | null };
  const sign = useSignJob(sheet.id);
  const [cert, setCert] = useState(me.certificateNumber ?? "");
  const [note, setNote] = useState("");
  return (
    <Card title="Inspector sign-off">
      {sheet.signoffs.map((so) => (
        <p key={so.id} className="text-sm">
          ✓ Signed by <strong>{so.inspector.name}</strong>, certificate {so.certificateNumber}, {so.signedAt.slice(0, 16).replace("T", " ")}
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
          <TextField label="Inspector certificate number" value={cert} onChange={(e) => setCert(e.target.value)} />
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
