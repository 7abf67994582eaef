import { useEffect, useMemo, useState } from "react";
import { useFeelerLeaves, useRecordReading, useToolUnit } from "../api/jobs";
import { Button } from "../../../components/ui/button";
import { TextField, SelectField } from "../../../components/ui/field";
import { ErrorNote } from "../../../components/ui/layout";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { formatLength, EXPANSION_COEFFICIENTS, type LengthUnit, type MaterialKey } from "../../../../shared/common/units";
import { judgeSizeReading, temperatureCorrection, toTableUnit, verdictText } from "../../../../shared/inspection/check-sheet";
import { judgeFeeler } from "../../../../shared/inspection/feeler";
import { CreateReadingSchema, type CreateReadingInput, type ReadingView } from "../../../../shared/readings/readings.schemas";
import type { SheetItem } from "../../../../shared/jobs/jobs.schemas";
import { VerdictBadge } from "./verdict-badge";
import { useCan } from "../../auth/api/auth";

const isNumber = (s: string) => /^-?\d*\.?\d+$/.test(s.trim());

interface Props {
  jobId: string;
  item: SheetItem;
  index: number;
  unit: LengthUnit;
  correcting?: ReadingView;
  clearance: { label: string; text: string; verdict: string } | null;
  onDraft: (size: number | null) => void;
  onDone: () => void;
}

/** Entry of one reading on a tablet, with size, out-of-round, clearance and verdict worked out live by the shared code. */
export function ReadingEntry({ jobId, item, index, unit, correcting, clearance, onDraft, onDone }: Props) {
  const where = `${item.label} no. ${index}`;
  const record = useRecordReading(jobId);
  const canOverride = useCan("readings.override");
  const [values, setValues] = useState<string[]>(() => Array.from({ length: item.directions }, () => ""));
  const isBore = item.kind === "bore";
  const [gauge, setGauge] = useState(isBore ? (correcting?.tools.find((t) => t.kind === "telescoping_gauge" || t.kind === "small_hole_gauge")?.assetTag ?? "") : "");
  const [mic, setMic] = useState(correcting?.tools.find((t) => t.kind !== "telescoping_gauge" && t.kind !== "small_hole_gauge")?.assetTag ?? "");
  const [setTag, setSetTag] = useState(item.kind === "feeler" ? (correcting?.tools[0]?.assetTag ?? "") : "");
  const [goEntered, setGo] = useState<"" | "yes" | "no">("");
  const [noGoEntered, setNoGo] = useState<"" | "yes" | "no">("");
  const [visual, setVisual] = useState<"" | "serviceable" | "reject">("");
  const [finding, setFinding] = useState("");
  const [temp, setTemp] = useState("");
  const [toolTemp, setToolTemp] = useState("");
  const [material, setMaterial] = useState<"" | MaterialKey>("");
  const [reason, setReason] = useState("");
  const [overrideReason, setOverrideReason] = useState("");
  const toolUnit = useToolUnit(mic).data ?? unit;
  const leaves = useFeelerLeaves(jobId, item.key, item.kind === "feeler" ? setTag : "");

  // Live: the same shared functions the server runs when the reading is saved.
  const live = useMemo(() => {
    if (item.kind !== "journal" && item.kind !== "bore") return null;
    const typed = values.filter((v) => isNumber(v));
    if (typed.length < item.directions) return null;
    const out = judgeSizeReading(item, toTableUnit(typed, toolUnit, unit));
    const correction = material && isNumber(temp) ? temperatureCorrection({ size: out.size, partMaterial: material, temperatureC: temp, toolTemperatureC: isNumber(toolTemp) ? toolTemp : null }) : null;
    return { ...out, correction };
  }, [values, item, toolUnit, unit, material, temp, toolTemp]);
  useEffect(() => onDraft(live ? live.size : null), [live?.size]); // eslint-disable-line react-hooks/exhaustive-deps

  const feelerVerdict = goEntered && noGoEntered ? judgeFeeler({ goEntered: goEntered === "yes", noGoEntered: noGoEntered === "yes" }) : null;

  const input = (): CreateReadingInput => {
    const base: CreateReadingInput = { itemKey: item.key, index };
    if (isNumber(temp)) base.temperatureC = Number(temp);
    if (isNumber(toolTemp)) base.toolTemperatureC = Number(toolTemp);
    if (material) base.partMaterial = material;
    if (overrideReason.trim()) base.override = { reason: overrideReason.trim() };
    if (item.kind === "journal" || item.kind === "bore") return { ...base, values: values.filter((v) => v.trim() !== "").map(Number), toolAssetTags: [gauge, mic].filter((t) => t.trim()) };
    if (item.kind === "feeler") return { ...base, toolAssetTags: [setTag].filter((t) => t.trim()), goEntered: goEntered ? goEntered === "yes" : undefined, noGoEntered: noGoEntered ? noGoEntered === "yes" : undefined };
    return { ...base, visualResult: visual || undefined, finding };
  };
  const [clientError, setClientError] = useState<string | null>(null);
  const submit = () => {
    const parsed = CreateReadingSchema.safeParse(input());
    if (!parsed.success) return setClientError(parsed.error.issues[0]?.message ?? "Check the entries.");
    setClientError(null);
    record.mutate({ input: input(), supersedeId: correcting?.id, reason }, { onSuccess: onDone });
  };
  const refusal = record.error instanceof ApiError && record.error.code === "tool_not_usable" ? (record.error.details as { tools?: { assetTag: string; reasons: string[] }[] })?.tools : undefined;

  return (
    <div className="flex flex-col gap-3 rounded-md bg-paper-sunk p-3" role="group" aria-label={`Entry for ${where}`}>
      {(item.kind === "journal" || item.kind === "bore") && (
        <>
          <div className="grid grid-cols-2 gap-2 md:grid-cols-4">
            {values.map((v, d) => (
              <TextField
                key={d}
                label={`Direction ${d + 1} (${toolUnit})`}
                aria-label={`${where}, direction ${d + 1}`}
                inputMode="decimal"
                autoComplete="off"
                value={v}
                onChange={(e) => setValues((vs) => vs.map((x, i) => (i === d ? e.target.value : x)))}
              />
            ))}
            {isBore && <TextField label="Gauge tag (telescoping / small-hole)" aria-label={`${where}, gauge tag`} value={gauge} onChange={(e) => setGauge(e.target.value.toUpperCase())} />}
            <TextField label={isBore ? "Micrometer that read it" : "Micrometer tag"} aria-label={`${where}, micrometer tag`} value={mic} onChange={(e) => setMic(e.target.value.toUpperCase())} />
          </div>
          <details>
            <summary className="cursor-pointer text-sm">Temperature and material (optional, for a correction to 20 °C)</summary>
            <div className="mt-2 grid grid-cols-2 gap-2 md:grid-cols-3">
              <TextField label="Part temperature °C" inputMode="decimal" value={temp} onChange={(e) => setTemp(e.target.value)} />
              <TextField label="Tool temperature °C (if different)" inputMode="decimal" value={toolTemp} onChange={(e) => setToolTemp(e.target.value)} />
              <SelectField label="Part material" value={material} onChange={(e) => setMaterial(e.target.value as MaterialKey | "")}>
                <option value="">—</option>
                {Object.values(EXPANSION_COEFFICIENTS).map((m) => (
                  <option key={m.key} value={m.key}>{m.label}</option>
                ))}
              </SelectField>
            </div>
          </details>
          <div className="flex flex-wrap items-center gap-3" aria-live="polite" aria-label={`Live result for ${where}`}>
            {live ? (
              <>
                <span className="text-lg font-semibold tabular-nums">Size {formatLength(live.size, unit)} {unit}</span>
                <span className="tabular-nums">Out-of-round {formatLength(live.outOfRound, unit)}</span>
                <VerdictBadge verdict={live.judgement.verdict} text={verdictText(item, live.judgement)} />
                {live.correction && <span className="text-sm text-ink-soft">At 20 °C: {formatLength(live.correction.correctedSize, unit)} {unit} (raw value kept)</span>}
              </>
            ) : (
              <span className="text-ink-faint">Type a value in each of the {item.directions} directions.</span>
            )}
            {live && clearance && <span className="font-semibold">{clearance.label}: {clearance.text}</span>}
          </div>
        </>
      )}
      {item.kind === "feeler" && (
        <>
          <TextField label="Feeler set tag" aria-label={`${where}, feeler set tag`} value={setTag} onChange={(e) => setSetTag(e.target.value.toUpperCase())} />
          {leaves.data && (
            <p className="text-sm" aria-live="polite">
              Use go leaf <strong>{leaves.data.goLeaf?.label ?? "none"}</strong> (must enter) and no-go leaf <strong>{leaves.data.noGoLeaf?.label ?? "none"}</strong> (must not enter).
            </p>
          )}
          {leaves.isError && <ErrorNote>{errorMessage(leaves.error)}</ErrorNote>}
          <div className="grid grid-cols-2 gap-2">
            <SelectField label="Did the go leaf enter?" value={goEntered} onChange={(e) => setGo(e.target.value as "yes" | "no")}>
              <option value="">—</option>
              <option value="yes">Yes, it entered</option>
              <option value="no">No</option>
            </SelectField>
            <SelectField label="Did the no-go leaf enter?" value={noGoEntered} onChange={(e) => setNoGo(e.target.value as "yes" | "no")}>
              <option value="">—</option>
              <option value="no">No, it did not</option>
              <option value="yes">Yes, it entered</option>
            </SelectField>
          </div>
          {feelerVerdict && <VerdictBadge verdict={feelerVerdict.verdict} text={feelerVerdict.verdict === "within_limits" ? "Within limits" : feelerVerdict.finding === "too_tight" ? "Outside limits: too tight" : "Outside limits: too loose"} />}
          {feelerVerdict?.note && <p className="text-sm text-caution">{feelerVerdict.note}</p>}
        </>
      )}
      {item.kind === "visual" && (
        <div className="grid grid-cols-1 gap-2 md:grid-cols-2">
          <SelectField label="Result" value={visual} onChange={(e) => setVisual(e.target.value as "serviceable" | "reject")}>
            <option value="">—</option>
            <option value="serviceable">Serviceable</option>
            <option value="reject">Reject</option>
          </SelectField>
          <TextField label="Finding" value={finding} onChange={(e) => setFinding(e.target.value)} />
        </div>
      )}
      {correcting && <TextField label="Reason for the correction" value={reason} onChange={(e) => setReason(e.target.value)} />}
      {canOverride && refusal && (
        <TextField label="Accept anyway (quality): reason" hint="The reading will carry the override flag." value={overrideReason} onChange={(e) => setOverrideReason(e.target.value)} />
      )}
      {clientError && <ErrorNote>{clientError}</ErrorNote>}
      {record.isError && (
        <ErrorNote>
          {errorMessage(record.error)}
          {refusal && (refusal.length > 1 || refusal[0].reasons.length > 1) && <span className="block text-sm">{refusal.map((t) => `${t.assetTag}: ${t.reasons.join(" ")}`).join(" · ")}</span>}
        </ErrorNote>
      )}
      <div className="flex gap-2">
        <Button onClick={submit} disabled={record.isPending}>{correcting ? "Save correction" : "Save reading"}</Button>
        <Button variant="ghost" onClick={onDone}>Cancel</Button>
      </div>
    </div>
  );
}
