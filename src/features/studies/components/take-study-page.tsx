import { useEffect, useRef, useState, type FormEvent, type KeyboardEvent } from "react";
import { Link, useParams } from "react-router-dom";
import { RecordStudyValueSchema, SupersedeStudyValueSchema } from "../../../../shared/studies/studies.schemas";
import { useRecordStudyValue, useStudySession, useSupersedeStudyValue } from "../api/studies";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { TextField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { Cautions, DemoNotice } from "../../../components/ui/cautions";
import { ApiError, errorMessage } from "../../../lib/api-client";

const isNumber = (s: string) => /^[-+]?(\d+\.?\d*|\.\d+)$/.test(s.trim());
const TRANSFER = new Set(["telescoping_gauge", "small_hole_gauge"]);

/**
 * Taking a study on the bench: one prompt at a time in the appraiser's randomized order, blind (no earlier value
 * shown). The value field keeps the focus, so a gauge with a data cable that types the value and Enter fills it.
 */
export function TakeStudyPage() {
  const { id = "" } = useParams();
  const q = useStudySession(id);
  const record = useRecordStudyValue(id);
  const [value, setValue] = useState("");
  const [tool, setTool] = useState("");
  const [reader, setReader] = useState("");
  const [clientError, setClientError] = useState<string | null>(null);
  const [correcting, setCorrecting] = useState(false);
  const valueRef = useRef<HTMLInputElement>(null);
  const s = q.data;

  // Offer the tools of the last value (or the study's own tool) once the session is known.
  useEffect(() => {
    if (!s || tool) return;
    const [first, second] = s.lastToolAssetTags;
    setTool(first ?? s.tool?.assetTag ?? "");
    if (second) setReader(second);
  }, [s]); // eslint-disable-line react-hooks/exhaustive-deps
  useEffect(() => {
    if (s?.prompt && !correcting) valueRef.current?.focus();
  }, [s?.prompt?.position, correcting]); // eslint-disable-line react-hooks/exhaustive-deps

  if (q.isPending) return <Loading what="Opening your study" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const study = q.data;
  const transfer = TRANSFER.has(study.family.kind);
  const unit = study.characteristic.unit;

  // A tag scanned (or typed) with Enter goes on to the value instead of recording an empty one.
  const toValueOnEnter = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key !== "Enter") return;
    e.preventDefault();
    valueRef.current?.focus();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!study.prompt) return;
    if (!isNumber(value)) return setClientError("Type the value as a number, e.g. 0.8747.");
    const body = { part: study.prompt.part, trial: study.prompt.trial, value: Number(value), toolAssetTags: [tool, reader].map((t) => t.trim()).filter(Boolean) };
    const parsed = RecordStudyValueSchema.safeParse(body);
    if (!parsed.success) return setClientError(parsed.error.issues[0]?.message ?? "Check the entries.");
    setClientError(null);
    record.mutate(body, {
      onSuccess: () => {
        setValue("");
        valueRef.current?.focus();
      },
    });
  };
  const refusal = record.error instanceof ApiError && record.error.code === "tool_not_usable" ? (record.error.details as { tools?: { assetTag: string; reasons: string[] }[] })?.tools : undefined;

  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <PageHeader
        title={`Gauge study ${study.reference}`}
        subtitle={`${study.characteristic.label} · ${study.characteristic.engineModel} · ${study.tool ? study.tool.assetTag : study.family.name}`}
        actions={
          <Link className="self-center text-sm underline" to="/bench/studies">
            My studies
          </Link>
        }
      />
      {study.isDemo && <DemoNotice what="study" />}
      <p className="text-sm text-ink-soft" aria-live="polite">
        {study.taken} of {study.needed} measured. Earlier values stay hidden so that each reading is your own; measure each part as you would on a job.
      </p>
      {study.prompt ? (
        <Card>
          <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Study entry">
            <div className="grid gap-3 sm:grid-cols-2">
              <TextField
                label={transfer ? "Gauge you measure with (tag)" : "Tool you measure with (tag)"}
                value={tool}
                onChange={(e) => setTool(e.target.value.toUpperCase())}
                onKeyDown={toValueOnEnter}
                hint={study.tool ? `This study is of ${study.tool.assetTag}.` : `Any tool of ${study.family.name}. A scanned tag with Enter moves on to the value.`}
                autoComplete="off"
              />
              {transfer && <TextField label="Micrometer that read it (tag)" value={reader} onChange={(e) => setReader(e.target.value.toUpperCase())} onKeyDown={toValueOnEnter} autoComplete="off" />}
            </div>
            <p className="rounded-md bg-ink px-4 py-3 text-paper" aria-live="assertive" role="status">
              <span className="block text-xs uppercase tracking-widest text-brass-bright">Next, no. {study.prompt.position} of {study.needed}</span>
              <span className="text-2xl font-bold">
                Measure {study.prompt.partLabel} — trial {study.prompt.trial}
              </span>
            </p>
            <TextField
              ref={valueRef}
              label={`Value for ${study.prompt.partLabel}, trial ${study.prompt.trial} (${unit})`}
              hint="Type it, or send it from a gauge with a data cable; Enter records it."
              inputMode="decimal"
              autoComplete="off"
              className="text-2xl tabular-nums"
              value={value}
              onChange={(e) => setValue(e.target.value)}
            />
            {clientError && <ErrorNote>{clientError}</ErrorNote>}
            {record.isError && (
              <ErrorNote>
                {errorMessage(record.error)}
                {refusal && refusal.length > 0 && <span className="block text-sm">{refusal.map((t) => `${t.assetTag}: ${t.reasons.join(" ")}`).join(" · ")}</span>}
              </ErrorNote>
            )}
            <div>
              <Button type="submit" disabled={record.isPending}>
                Record value
              </Button>
            </div>
          </form>
        </Card>
      ) : (
        <Card>
          <p role="status" className="text-lg font-semibold text-go">
            ✓ You have measured every part of this study. Thank you.
          </p>
          <p className="text-sm text-ink-soft">Quality reads the results once every appraiser has finished.</p>
        </Card>
      )}
      {study.last && !correcting && (
        <p className="text-sm">
          Just recorded: {study.last.partLabel}, trial {study.last.trial} = <strong className="tabular-nums">{study.last.value} {study.last.unit}</strong>{" "}
          <button type="button" className="underline" onClick={() => setCorrecting(true)}>
            Correct it
          </button>
        </p>
      )}
      {study.last && correcting && <Correction studyId={id} last={study.last} defaultTools={[tool, reader].filter(Boolean)} onDone={() => setCorrecting(false)} />}
      <Cautions compact />
    </div>
  );
}

function Correction({ studyId, last, defaultTools, onDone }: { studyId: string; last: NonNullable<ReturnType<typeof useStudySession>["data"]>["last"] & object; defaultTools: string[]; onDone: () => void }) {
  const supersede = useSupersedeStudyValue(studyId);
  const [value, setValue] = useState(String(last.value));
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const save = (e: FormEvent) => {
    e.preventDefault();
    const body = { value: Number(value), toolAssetTags: last.toolAssetTags.length ? last.toolAssetTags : defaultTools, reason };
    if (!isNumber(value)) return setError("Type the value as a number.");
    const parsed = SupersedeStudyValueSchema.safeParse(body);
    if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? "Check the entries.");
    setError(null);
    supersede.mutate({ valueId: last.id, input: body }, { onSuccess: onDone });
  };
  return (
    <Card title={`Correct ${last.partLabel}, trial ${last.trial}`}>
      <form onSubmit={save} className="flex flex-col gap-3" aria-label="Correct the last value">
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label={`Corrected value (${last.unit})`} inputMode="decimal" autoComplete="off" value={value} onChange={(e) => setValue(e.target.value)} />
          <TextField label="Reason for the correction" value={reason} onChange={(e) => setReason(e.target.value)} />
        </div>
        <p className="text-xs text-ink-faint">The value first recorded stays on record, marked corrected.</p>
        {error && <ErrorNote>{error}</ErrorNote>}
        {supersede.isError && <ErrorNote>{errorMessage(supersede.error)}</ErrorNote>}
        <div className="flex gap-2">
          <Button type="submit" disabled={supersede.isPending}>
            Save correction
          </Button>
          <Button variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        </div>
      </form>
    </Card>
  );
}
