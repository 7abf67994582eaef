import { useEffect, useMemo, useState } from "react";
import { useFeelerLeaves, useRecordReading, useToolUnit } from "../api/jobs";
import { Button } from "../../../components/ui/button";
import { TextField, SelectField } from "../../../components/ui/field";
import { ErrorNote } from "../../../components/ui/layout";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { EXPANSION_COEFFICIENTS, type MaterialKey } from "../../../../shared/common/units";
import { clearanceText, judgeReading, lengthText, type JudgingContext, type PlaceView, type ReadingEvidence } from "../../../../shared/inspection/judging";
import { stackFrom, type FeelerEvidence, type LeafStack } from "../../../../shared/inspection/feeler";
import { CreateReadingSchema, ENTER_A_NUMBER, type CreateReadingInput, type LeafView } from "../../../../shared/readings/readings.schemas";
import type { CheckSheet, SheetItem, SheetReading } from "../../../../shared/jobs/jobs.schemas";
import { VerdictBadge } from "./verdict-badge";
import { PlaceDetail, stackText } from "./place-view";
import { useCan } from "../../auth/api/auth";

const isNumber = (s: string) => /^-?\d*\.?\d+$/.test(s.trim());
const stackOf = (l: LeafView | null): LeafStack | null => (l ? { leaves: l.leaves, thickness: l.thickness } : null);

interface Props {
  jobId: string;
  item: SheetItem;
  index: number;
  sheet: CheckSheet;
  ctx: JudgingContext;
  correcting?: SheetReading;
  /** The places this reading feeds (clearances, tapers), judged with what is typed here. */
  fed: { label: string; place: PlaceView }[];
  onDraft: (evidence: ReadingEvidence | null) => void;
  onDone: () => void;
}

/** Entry of one reading on a tablet; its place and the places it feeds are judged live by the shared rules. */
export function ReadingEntry({ jobId, item, index, sheet, ctx, correcting, fed, onDraft, onDone }: Props) {
  const where = `${item.label} no. ${index}`;
  const unit = ctx.tableUnit;
  const record = useRecordReading(jobId);
  const canOverride = useCan("readings.override");
  const [values, setValues] = useState<string[]>(() => Array.from({ length: item.directions }, () => ""));
  const isBore = item.kind === "bore";
  const [gauge, setGauge] = useState(isBore ? (correcting?.tools.find((t) => t.kind === "telescoping_gauge" || t.kind === "small_hole_gauge")?.assetTag ?? "") : "");
  const [mic, setMic] = useState(correcting?.tools.find((t) => t.kind !== "telescoping_gauge" && t.kind !== "small_hole_gauge")?.assetTag ?? "");
  const [setTag, setSetTag] = useState(item.kind === "feeler" ? (correcting?.tools[0]?.assetTag ?? "") : "");
  const [goEntered, setGo] = useState<"" | "yes" | "no">("");
  const [noGoEntered, setNoGo] = useState<"" | "yes" | "no">("");
  const [gapLeaves, setGapLeaves] = useState<string[]>(["", "", ""]);
  const [visual, setVisual] = useState<"" | "serviceable" | "reject">("");
  const [finding, setFinding] = useState("");
  const [temp, setTemp] = useState("");
  const [toolTemp, setToolTemp] = useState("");
  const [material, setMaterial] = useState<"" | MaterialKey>("");
  const [reason, setReason] = useState("");
  const [overrideReason, setOverrideReason] = useState("");
  const toolUnit = useToolUnit(mic).data ?? unit;
  const leaves = useFeelerLeaves(jobId, item.key, item.kind === "feeler" ? setTag : "");
  const alpha = item.expansionPerK ?? sheet.limitTable.expansionPerK;

  // Live: the same shared judging the server runs when the reading is saved.
  const evidence = useMemo((): ReadingEvidence | null => {
    if (item.kind === "journal" || item.kind === "bore") {
      const typed = values.filter((v) => isNumber(v));
      if (typed.length < item.directions) return null;
      return {
        itemKey: item.key,
        index,
        unit: toolUnit,
        values: typed,
        temperatureC: isNumber(temp) ? temp : null,
        toolTemperatureC: isNumber(toolTemp) ? toolTemp : null,
        partMaterial: material || null,
      };
    }
    if (item.kind === "feeler" && leaves.data) {
      const d = leaves.data;
      let feeler: FeelerEvidence | null = null;
      if (d.mode === "go_no_go" && goEntered && noGoEntered) {
        feeler = { mode: "go_no_go", go: stackOf(d.goLeaf), noGo: stackOf(d.noGoLeaf), goEntered: goEntered === "yes", noGoEntered: noGoEntered === "yes", gap: null, why: d.why };
      } else if (d.mode === "measured_gap") {
        const gap = stackFrom(d.leaves, gapLeaves.filter(Boolean));
        if (gap) feeler = { mode: "measured_gap", go: null, noGo: null, goEntered: null, noGoEntered: null, gap, why: d.why };
      }
      return feeler ? { itemKey: item.key, index, unit, values: [], feeler } : null;
    }
    return null;
  }, [values, item, index, toolUnit, unit, material, temp, toolTemp, leaves.data, goEntered, noGoEntered, gapLeaves]);
  const live = evidence ? judgeReading(item, evidence, ctx).view : null;
  useEffect(() => onDraft(item.kind === "journal" || item.kind === "bore" ? evidence : null), [evidence]); // eslint-disable-line react-hooks/exhaustive-deps

  const input = (): CreateReadingInput => {
    const base: CreateReadingInput = { itemKey: item.key, index };
    if (isNumber(temp)) base.temperatureC = Number(temp);
    if (isNumber(toolTemp)) base.toolTemperatureC = Number(toolTemp);
    if (material) base.partMaterial = material;
    if (overrideReason.trim()) base.override = { reason: overrideReason.trim() };
    if (item.kind === "journal" || item.kind === "bore") return { ...base, values: values.filter((v) => v.trim() !== "").map(Number), toolAssetTags: [gauge, mic].filter((t) => t.trim()) };
    if (item.kind === "feeler") {
      const tools = { toolAssetTags: [setTag].filter((t) => t.trim()) };
      if (leaves.data?.mode === "measured_gap") return { ...base, ...tools, gapLeafIds: gapLeaves.filter(Boolean) };
      return { ...base, ...tools, goEntered: goEntered ? goEntered === "yes" : undefined, noGoEntered: noGoEntered ? noGoEntered === "yes" : undefined };
    }
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
                error={v.trim() !== "" && !isNumber(v) ? ENTER_A_NUMBER : undefined}
                onChange={(e) => setValues((vs) => vs.map((x, i) => (i === d ? e.target.value : x)))}
              />
            ))}
            {isBore && <TextField label="Gauge tag (telescoping / small-hole)" aria-label={`${where}, gauge tag`} value={gauge} onChange={(e) => setGauge(e.target.value.toUpperCase())} />}
            <TextField label={isBore ? "Micrometer that read it" : "Micrometer tag"} aria-label={`${where}, micrometer tag`} value={mic} onChange={(e) => setMic(e.target.value.toUpperCase())} />
          </div>
          <details>
            <summary className="cursor-pointer text-sm">Temperature (judged at 20 °C when the part's expansion is known)</summary>
            <div className="mt-2 grid grid-cols-2 gap-2 md:grid-cols-3">
              <TextField label="Part temperature °C" aria-label={`${where}, part temperature`} inputMode="decimal" value={temp} onChange={(e) => setTemp(e.target.value)} />
              <TextField label="Tool temperature °C (if different)" aria-label={`${where}, tool temperature`} inputMode="decimal" value={toolTemp} onChange={(e) => setToolTemp(e.target.value)} />
              {alpha != null ? (
                <p className="self-end text-sm text-ink-soft">Part expansion from the limits table: {Number((alpha * 1e6).toFixed(3))} µm/(m·K).</p>
              ) : (
                <SelectField label="Part material" value={material} onChange={(e) => setMaterial(e.target.value as MaterialKey | "")}>
                  <option value="">—</option>
                  {Object.values(EXPANSION_COEFFICIENTS).map((m) => (
                    <option key={m.key} value={m.key}>{m.label}</option>
                  ))}
                </SelectField>
              )}
            </div>
          </details>
          <div className="flex flex-col gap-1" aria-live="polite" aria-label={`Live result for ${where}`}>
            {live && live.kind === "size" ? (
              <>
                <div className="flex flex-wrap items-center gap-3">
                  <span className="text-lg font-semibold tabular-nums">
                    Size {lengthText(live.rawSize, unit)} {unit}
                    {live.thermal && ` · ${lengthText(live.size, unit)} ${unit} at 20 °C`}
                  </span>
                  <VerdictBadge verdict={live.verdict} text={live.text} />
                </div>
                <PlaceDetail place={live} unit={unit} />
              </>
            ) : (
              <span className="text-ink-faint">Type a value in each of the {item.directions} directions.</span>
            )}
            {live &&
              fed.map((d) => (
                <p key={d.label} className="font-semibold">
                  {d.label}: {d.place.kind === "fit" ? `${clearanceText(d.place.loosest.value, unit)}${d.place.basis === "radial" ? " radial" : ""} loosest, ${clearanceText(d.place.tightest.value, unit)} tightest` : d.place.kind === "taper" ? `taper ${lengthText(d.place.taper, unit)}` : ""} — {d.place.text}
                </p>
              ))}
          </div>
        </>
      )}
      {item.kind === "feeler" && (
        <>
          <TextField label="Feeler set tag" aria-label={`${where}, feeler set tag`} value={setTag} onChange={(e) => setSetTag(e.target.value.toUpperCase())} />
          {leaves.data?.mode === "go_no_go" && (
            <div className="rounded-md border border-paper-line bg-paper-raised p-2 text-sm" aria-label="Leaves to use" aria-live="polite">
              <p>
                Go: <strong>{stackText(stackOf(leaves.data.goLeaf), unit)}</strong> — must enter. No-go: <strong>{stackText(stackOf(leaves.data.noGoLeaf), unit)}</strong> — must not enter.
              </p>
              <p className="text-ink-soft">{leaves.data.why}</p>
            </div>
          )}
          {leaves.data?.mode === "measured_gap" && (
            <div role="note" className="rounded-md border border-caution/40 bg-caution-light p-2 text-sm text-caution" aria-label="Leaves to use">
              <p className="font-semibold">This set cannot check the gap go/no-go inside its limits ({lengthText(leaves.data.min, unit)}–{lengthText(leaves.data.max, unit)}).</p>
              <p>{leaves.data.why}</p>
            </div>
          )}
          {leaves.isError && <ErrorNote>{errorMessage(leaves.error)}</ErrorNote>}
          {leaves.data?.mode === "go_no_go" && (
            <div className="grid grid-cols-2 gap-2">
              <SelectField label="Did the go enter?" value={goEntered} onChange={(e) => setGo(e.target.value as "yes" | "no")}>
                <option value="">—</option>
                <option value="yes">Yes, it entered</option>
                <option value="no">No</option>
              </SelectField>
              <SelectField label="Did the no-go enter?" value={noGoEntered} onChange={(e) => setNoGo(e.target.value as "yes" | "no")}>
                <option value="">—</option>
                <option value="no">No, it did not</option>
                <option value="yes">Yes, it entered</option>
              </SelectField>
            </div>
          )}
          {leaves.data?.mode === "measured_gap" && (
            <div className="grid grid-cols-1 gap-2 md:grid-cols-3">
              {gapLeaves.map((g, i) => (
                <SelectField
                  key={i}
                  label={i === 0 ? "Thickest leaf that enters" : `Stacked with (leaf ${i + 1}, optional)`}
                  value={g}
                  onChange={(e) => setGapLeaves((gs) => gs.map((x, j) => (j === i ? e.target.value : x)))}
                >
                  <option value="">—</option>
                  {leaves.data!.leaves.map((l) => (
                    <option key={l.id} value={l.id} disabled={gapLeaves.includes(l.id) && g !== l.id}>
                      {l.label} ({lengthText(l.thickness, unit)} calibrated)
                    </option>
                  ))}
                </SelectField>
              ))}
            </div>
          )}
          {live && live.kind === "feeler" && (
            <div className="flex flex-col gap-1" aria-live="polite" aria-label={`Live result for ${where}`}>
              <VerdictBadge verdict={live.verdict} text={live.text} />
              <PlaceDetail place={live} unit={unit} />
            </div>
          )}
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
