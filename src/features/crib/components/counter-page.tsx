import { useRef, useState } from "react";
import { PageHeader, Card, Facts } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { TextField, TextAreaField } from "../../../components/ui/field";
import { StatusBadge } from "../../../components/ui/status-badge";
import { cx } from "../../../components/ui/cx";
import { Link } from "react-router-dom";
import { RoleNotice } from "../../../components/ui/role-notice";
import { useCan, useRoleName } from "../../auth/api/auth";
import { ApiError, api, errorMessage, qs } from "../../../lib/api-client";
import type { Person } from "../../users/api/users";
import type { Checkout, IssueResult, LostFoundResult, ReturnResult } from "../../../../shared/checkouts/checkouts.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";
import { useIssueTool, useLostFound, useRetireTool, useReturnTool } from "../api/checkouts";
import { ScanField, type ScanFieldHandle } from "./scan-field";
import { PersonPicker } from "./person-picker";
import { ResultPanel } from "./result-panel";
import { shortWhen } from "./format";
import { useInView } from "./use-in-view";
import { checkPointOutsideRange } from "../../../../shared/tools/check-range";

type Tab = "issue" | "return" | "lost";
const TABS: { key: Tab; label: string }[] = [
  { key: "issue", label: "Issue" },
  { key: "return", label: "Return" },
  { key: "lost", label: "Lost, found, retire" },
];

export function CounterPage() {
  const canWork = useCan("checkouts.write");
  const roleName = useRoleName();
  if (!canWork) {
    return (
      <div className="mx-auto max-w-4xl">
        <PageHeader title="Crib counter" subtitle="Issuing and taking back tools at the crib." />
        <RoleNotice roleName={roleName}>
          cannot issue or take back tools; the crib attendant does.
          <Link className="underline" to="/crib/custody">
            The custody board
          </Link>{" "}
          shows who holds each tool, and{" "}
          <Link className="underline" to="/scan">
            Scan a tool
          </Link>{" "}
          tells whether one may be used.
        </RoleNotice>
      </div>
    );
  }
  return <Counter />;
}

function Counter() {
  const [tab, setTab] = useState<Tab>("issue");
  return (
    <div className="mx-auto max-w-4xl">
      <PageHeader title="Crib counter" subtitle="Scan or type an asset tag and press Enter; the field stays ready for the next scan." />
      <div role="tablist" aria-label="Counter task" className="mb-4 flex flex-wrap gap-2">
        {TABS.map((t) => (
          <button
            key={t.key}
            role="tab"
            type="button"
            aria-selected={tab === t.key}
            onClick={() => setTab(t.key)}
            className={cx("rounded-md border px-4 py-2 text-base font-semibold", tab === t.key ? "border-ink bg-ink text-paper" : "border-paper-line bg-paper-raised")}
          >
            {t.label}
          </button>
        ))}
      </div>
      {tab === "issue" && <IssuePanel />}
      {tab === "return" && <ReturnPanel />}
      {tab === "lost" && <LostFoundPanel />}
    </div>
  );
}

type IssueOutcome = { kind: "issued"; result: IssueResult } | { kind: "refused"; tag: string; error: ApiError | Error; retry?: () => void };

function IssuePanel() {
  const [person, setPerson] = useState<Person | null>(null);
  const [workOrder, setWorkOrder] = useState("");
  const [engineSerial, setEngineSerial] = useState("");
  const [dueBack, setDueBack] = useState("");
  const [outcome, setOutcome] = useState<IssueOutcome | null>(null);
  const [recent, setRecent] = useState<IssueResult[]>([]);
  const scan = useRef<ScanFieldHandle>(null);
  const issue = useIssueTool();
  const [answerKey, setAnswerKey] = useState(0);
  const answer = useInView<HTMLDivElement>(answerKey);

  const send = (assetTag: string, referenceUseOnly?: boolean) => {
    if (!person) return;
    issue.mutate(
      {
        assetTag,
        userId: person.id,
        workOrder: workOrder || undefined,
        engineSerial: engineSerial || undefined,
        dueBackAt: dueBack ? new Date(dueBack).toISOString() : undefined,
        referenceUseOnly,
      },
      {
        onSuccess: (result) => {
          setOutcome({ kind: "issued", result });
          setRecent((r) => [result, ...r].slice(0, 10));
        },
        onError: (error) => {
          const confirmable = error instanceof ApiError && (error.details as { confirm?: string } | undefined)?.confirm === "referenceUseOnly";
          setOutcome({ kind: "refused", tag: assetTag, error, retry: confirmable ? () => send(assetTag, true) : undefined });
        },
        onSettled: () => (scan.current?.focus(), setAnswerKey((k) => k + 1)),
      },
    );
  };

  return (
    <div className="space-y-4">
      <Card title="1. Who takes the tool">
        <PersonPicker value={person} onChange={(p) => (setPerson(p), p && setTimeout(() => scan.current?.focus(), 0))} />
        <div className="mt-3 grid gap-3 sm:grid-cols-3">
          <TextField label="Work order (optional)" value={workOrder} onChange={(e) => setWorkOrder(e.target.value)} />
          <TextField label="Engine serial (optional)" value={engineSerial} onChange={(e) => setEngineSerial(e.target.value)} />
          <TextField label="Expected back" type="datetime-local" hint="Blank: end of this shift." value={dueBack} onChange={(e) => setDueBack(e.target.value)} />
        </div>
      </Card>
      <Card title="2. Scan each tool">
        {person ? (
          <ScanField ref={scan} label="Asset tag" hint="Scan the label or type the tag, then Enter." onScan={(tag) => send(tag)} />
        ) : (
          <p className="text-ink-faint">Choose the person first.</p>
        )}
        {issue.isPending && <p className="mt-2 text-ink-faint" aria-live="polite">Issuing…</p>}
        {/* The answer sits right under the scan box and is scrolled into view: on a phone it is never below the fold. */}
        <div ref={answer} className="mt-3 scroll-mb-4 empty:hidden">
          {outcome?.kind === "issued" && (
            <ResultPanel tone={outcome.result.warnings.length ? "caution" : "go"} title={`Issued ${outcome.result.tool.assetTag}`}>
              <p>
                To <strong>{outcome.result.person.name}</strong>, expected back {shortWhen(outcome.result.dueBackAt)}.
              </p>
              {outcome.result.warnings.map((w) => (
                <p key={w} className="font-semibold text-caution">
                  ! {w}
                </p>
              ))}
            </ResultPanel>
          )}
          {outcome?.kind === "refused" && (
            <ResultPanel tone="stop" title={`Do not issue ${outcome.tag.toUpperCase()}`}>
              <p className="text-xl font-semibold">{errorMessage(outcome.error)}</p>
              {outcome.error instanceof ApiError && Array.isArray((outcome.error.details as { reasons?: string[] })?.reasons) && (
                <ul className="list-disc pl-6">
                  {(outcome.error.details as { reasons: string[] }).reasons.slice(1).map((r) => (
                    <li key={r}>{r}</li>
                  ))}
                </ul>
              )}
              {outcome.retry && (
                <Button className="mt-2" onClick={outcome.retry}>
                  Issue for reference use only
                </Button>
              )}
            </ResultPanel>
          )}
        </div>
      </Card>
      {recent.length > 0 && (
        <Card title="Issued at this counter">
          <ul className="divide-y divide-paper-line">
            {recent.map((r) => (
              <li key={r.id} className="flex flex-wrap items-center gap-2 py-2">
                <span className="font-mono font-semibold">{r.tool.assetTag}</span>
                <StatusBadge status={r.tool.status} />
                <span>{r.person.name}</span>
                <span className="ml-auto text-sm text-ink-soft">back {shortWhen(r.dueBackAt)}</span>
              </li>
            ))}
          </ul>
        </Card>
      )}
    </div>
  );
}

function ReturnPanel() {
  const scan = useRef<ScanFieldHandle>(null);
  const [checkout, setCheckout] = useState<Checkout | null>(null);
  const [lookup, setLookup] = useState<{ tag: string; message: string } | null>(null);
  const [condition, setCondition] = useState<"ok" | "damaged">("ok");
  const [note, setNote] = useState("");
  const [photo, setPhoto] = useState<File | null>(null);
  const [zeroNominal, setZeroNominal] = useState("");
  const [zeroReading, setZeroReading] = useState("");
  const [done, setDone] = useState<ReturnResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const ret = useReturnTool();
  const [answerKey, setAnswerKey] = useState(0);
  const answer = useInView<HTMLDivElement>(answerKey);

  const reset = () => {
    setCondition("ok");
    setNote("");
    setPhoto(null);
    setZeroNominal("");
    setZeroReading("");
  };

  const find = async (tag: string) => {
    setDone(null);
    setError(null);
    setLookup(null);
    try {
      const page = await api.get<Page<Checkout>>(`/api/checkouts${qs({ open: "true", assetTag: tag, pageSize: 1 })}`);
      if (page.items[0]) {
        reset();
        setCheckout(page.items[0]);
      } else {
        setCheckout(null);
        setLookup({ tag, message: `${tag.toUpperCase()} is not checked out to anyone; nothing to return.` });
      }
    } catch (e) {
      setLookup({ tag, message: errorMessage(e) });
    }
    setAnswerKey((k) => k + 1);
  };

  const nominalNumber = zeroNominal.trim() === "" ? null : Number(zeroNominal);
  const nominalError =
    nominalNumber === null ? undefined : !Number.isFinite(nominalNumber) ? "Type a number, e.g. 1.0000." : checkout ? (checkPointOutsideRange(nominalNumber, checkout.tool) ?? undefined) : undefined;
  const readingError = zeroReading.trim() !== "" && !Number.isFinite(Number(zeroReading)) ? "Type a number, e.g. 1.0001." : undefined;

  const submit = () => {
    if (!checkout || nominalError || readingError) return;
    const zeroCheck = zeroNominal !== "" && zeroReading !== "" ? { nominal: Number(zeroNominal), reading: Number(zeroReading) } : undefined;
    ret.mutate(
      { id: checkout.id, condition, note: note || undefined, photo, zeroCheck },
      {
        onSuccess: (r) => {
          setDone(r);
          setCheckout(null);
          reset();
        },
        onError: (e) => setError(errorMessage(e)),
        onSettled: () => (scan.current?.focus(), setAnswerKey((k) => k + 1)),
      },
    );
  };

  return (
    <div className="space-y-4">
      <Card title="Scan the tool coming back">
        <ScanField ref={scan} label="Asset tag" hint="Scan the label or type the tag, then Enter." onScan={find} />
      </Card>
      <div ref={answer} className="space-y-4 scroll-mt-4 empty:hidden">
      {lookup && <ResultPanel tone="caution" title={`Not out: ${lookup.tag.toUpperCase()}`}>{lookup.message}</ResultPanel>}
      {checkout && (
        <Card title={`Return ${checkout.tool.assetTag}`}>
          <Facts
            items={[
              ["Tool", checkout.tool.description],
              ["Held by", `${checkout.person.name} (${checkout.person.email})`],
              ["Since", shortWhen(checkout.issuedAt)],
              ["Expected back", shortWhen(checkout.dueBackAt)],
              ["Work order", checkout.workOrder ?? "—"],
            ]}
          />
          <fieldset className="mt-4">
            <legend className="text-sm font-semibold text-ink-soft">Condition</legend>
            <div className="mt-1 flex flex-wrap gap-3">
              {(["ok", "damaged"] as const).map((c) => (
                <label key={c} className={cx("flex min-h-12 cursor-pointer items-center gap-2 rounded-md border px-4 text-lg", condition === c ? (c === "ok" ? "border-go bg-go-light" : "border-stop bg-stop-light") : "border-paper-line")}>
                  <input type="radio" name="condition" value={c} checked={condition === c} onChange={() => setCondition(c)} />
                  {c === "ok" ? "Good condition" : "Damaged"}
                </label>
              ))}
            </div>
          </fieldset>
          {condition === "damaged" && <p className="mt-2 font-semibold text-stop">A damaged tool is quarantined at once and cannot be issued until released.</p>}
          <div className="mt-3 grid gap-3 sm:grid-cols-2">
            <TextAreaField label="Note" value={note} onChange={(e) => setNote(e.target.value)} hint={condition === "damaged" ? "Say what is wrong." : undefined} />
            <div className="flex flex-col gap-1">
              <label className="text-sm font-semibold text-ink-soft" htmlFor="return-photo">
                Photo (optional)
              </label>
              <input id="return-photo" type="file" accept="image/*" capture="environment" onChange={(e) => setPhoto(e.target.files?.[0] ?? null)} />
            </div>
          </div>
          <fieldset className="mt-3">
            <legend className="text-sm font-semibold text-ink-soft">Zero check on return (optional)</legend>
            <div className="grid gap-3 sm:grid-cols-2">
              <TextField
                label={`Nominal (${checkout.tool.unit})`}
                inputMode="decimal"
                value={zeroNominal}
                onChange={(e) => setZeroNominal(e.target.value)}
                error={nominalError}
                hint={`Inside the tool's range, ${checkout.tool.rangeMin}–${checkout.tool.rangeMax} ${checkout.tool.unit}: ${checkout.tool.rangeMin === 0 ? "0 when it closes to zero" : "the setting standard's size"}.`}
              />
              <TextField label={`Reading (${checkout.tool.unit})`} inputMode="decimal" value={zeroReading} onChange={(e) => setZeroReading(e.target.value)} error={readingError} />
            </div>
          </fieldset>
          {error && <p role="alert" className="mt-3 text-stop">{error}</p>}
          <div className="mt-4 flex gap-2">
            <Button onClick={submit} disabled={ret.isPending || !!nominalError || !!readingError} variant={condition === "damaged" ? "danger" : "primary"}>
              Record return
            </Button>
            <Button variant="ghost" onClick={() => (setCheckout(null), scan.current?.focus())}>
              Cancel
            </Button>
          </div>
        </Card>
      )}
      {done && (
        <ResultPanel tone={done.quarantined || done.zeroCheck?.passed === false ? "stop" : "go"} title={`Returned ${done.tool.assetTag}`}>
          <p>
            From {done.person.name}; condition {done.returnCondition === "ok" ? "good" : "damaged"}. Now: <StatusBadge status={done.tool.status} />
          </p>
          {done.zeroCheck && <p>Zero check {done.zeroCheck.passed ? "passed" : "failed"} (deviation {done.zeroCheck.deviation}).</p>}
          {done.messages.map((m) => (
            <p key={m} className="font-semibold">
              {m}
            </p>
          ))}
        </ResultPanel>
      )}
      </div>
    </div>
  );
}

function LostFoundPanel() {
  const [tag, setTag] = useState("");
  const [reason, setReason] = useState("");
  const [result, setResult] = useState<{ tone: "go" | "stop" | "caution"; title: string; lines: string[] } | null>(null);
  // On a phone the answer lands below the buttons: bring it on screen, as the check-out and check-in answers are.
  const answer = useInView<HTMLDivElement>(result);
  const lostFound = useLostFound();
  const retire = useRetireTool();
  const ready = tag.trim() && reason.trim().length >= 3;

  const onDone = (r: LostFoundResult, action: "lost" | "found") =>
    setResult({ tone: action === "lost" ? "stop" : "caution", title: action === "lost" ? `${r.assetTag} recorded as lost` : `${r.assetTag} found — held`, lines: [...r.messages, ...r.reasons] });
  const onError = (e: unknown) => setResult({ tone: "stop", title: "Refused", lines: [errorMessage(e)] });

  return (
    <div className="space-y-4">
      <Card title="Lost, found or retired">
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Asset tag" value={tag} autoComplete="off" className="font-mono" onChange={(e) => setTag(e.target.value)} />
          <TextField label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} hint="Goes into the tool's history." />
        </div>
        <div className="mt-4 flex flex-wrap gap-2">
          <Button variant="danger" disabled={!ready || lostFound.isPending} onClick={() => lostFound.mutate({ assetTag: tag.trim(), action: "lost", reason }, { onSuccess: (r) => onDone(r, "lost"), onError })}>
            Mark lost
          </Button>
          <Button variant="secondary" disabled={!ready || lostFound.isPending} onClick={() => lostFound.mutate({ assetTag: tag.trim(), action: "found", reason }, { onSuccess: (r) => onDone(r, "found"), onError })}>
            Found again
          </Button>
          <Button
            variant="secondary"
            disabled={!ready || retire.isPending}
            onClick={() =>
              window.confirm(`Retire ${tag.trim()} for good? A retired tool does not come back into use.`) &&
              retire.mutate({ assetTag: tag.trim(), reason }, { onSuccess: () => setResult({ tone: "caution", title: `${tag.trim().toUpperCase()} retired`, lines: [reason] }), onError })
            }
          >
            Retire
          </Button>
        </div>
        <p className="mt-3 text-sm text-ink-soft">
          Losing a tool opens an out-of-tolerance investigation of the readings it took. A found tool stays held until a passing check or calibration releases it.
        </p>
      </Card>
      <div ref={answer} className="scroll-mt-4 empty:hidden">
        {result && (
          <ResultPanel tone={result.tone} title={result.title}>
            {result.lines.map((l) => (
              <p key={l}>{l}</p>
            ))}
          </ResultPanel>
        )}
      </div>
    </div>
  );
}
