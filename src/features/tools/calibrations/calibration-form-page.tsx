import { useEffect, useMemo, useRef, useState } from "react";
import { Link, useParams, useSearchParams } from "react-router-dom";
import { useFieldArray, useForm, type FieldErrors, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { CreateCalibrationSchema, type Calibration, type CreateCalibration } from "../../../../shared/calibrations/calibrations.schemas";
import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import type { StandardDetail } from "../../../../shared/standards/standards.schemas";
import { calendarDate } from "../../../../shared/common/dates";
import { useTool } from "../api/tools";
import { useCalibrations, useCreateCalibration, useUploadCalibrationCertificate } from "../api/calibrations";
import { certificateOn, useStandardsWithCertificates } from "../api/standards";
import { useAllLabs } from "../api/labs";
import { useShopSettings } from "../api/settings";
import { useCan } from "../../auth/api/auth";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { TextField, SelectField, TextAreaField } from "../../../components/ui/field";
import { Button, ButtonLink } from "../../../components/ui/button";
import { Cautions } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { decimalInput, fromLocalInput, toLocalInput, fileInputClass } from "../lib/form";
import { len, when } from "../lib/format";
import { asFoundOf, asLeftOf, liveCalibration, parseNumber, parseReadings, type LiveContext, type PointText } from "../lib/live-calibration";
import { standardForCompute } from "../../../../shared/calibrations/calibration-compute";
import { DECISION_RULES, DECISION_RULE_LABELS, type DecisionRule } from "../../../../shared/calibrations/decision-rules";
import { LivePointCells, LiveSummary } from "./live-result";
import { PointsTable } from "./calibration-history";
import { AsFoundBadge, ResultBadge, TurWarning } from "./result-badge";
import { ToolAnswer } from "../components/tool-answer";

interface PointRow extends PointText {
  elementId: string;
  label: string;
}

interface FormValues {
  performedAt: string;
  temperatureC: string;
  temperatureVariationC: string;
  humidityPct: string;
  source: "in_house" | "outside_lab";
  labId: string;
  certificateNumber: string;
  performedByName: string;
  decisionRule: DecisionRule;
  adjusted: boolean;
  standardIds: string[];
  limited: boolean;
  limitedMin: string;
  limitedMax: string;
  limitedNote: string;
  points: PointRow[];
  notes: string;
  supersedeReason: string;
}

const text = (n: number | null | undefined) => (n == null ? "" : String(n));
/** Typed text to what the shared schema expects: blank is absent, anything else a number (NaN is refused by the schema). */
const n = (t: string) => (t.trim() === "" ? undefined : Number(t.trim()));

/** The form's text values as the request body of POST …/calibrations. */
function toRequest(v: FormValues, correcting: Calibration | null, resolution: number) {
  const outside = v.source === "outside_lab";
  const supersedesId = correcting?.id ?? null;
  // The picker shows minutes; a correction that keeps the date keeps the exact original instant.
  const keepsDate = correcting && v.performedAt === toLocalInput(new Date(correcting.performedAt));
  return {
    performedAt: keepsDate ? correcting.performedAt : (fromLocalInput(v.performedAt) ?? v.performedAt),
    temperatureC: n(v.temperatureC),
    temperatureVariationC: n(v.temperatureVariationC),
    humidityPct: n(v.humidityPct),
    standardIds: v.standardIds,
    decisionRule: v.decisionRule,
    adjusted: v.adjusted,
    points: v.points.map((p) => ({
      nominal: n(p.nominal),
      reference: n(p.reference),
      // Blank as-found with repeat readings: their mean. Blank as-left on an adjusted record: the point read the same after it.
      asFound: asFoundOf(p, resolution) ?? n(p.asFound),
      asLeft: asLeftOf(p, v.adjusted, resolution) ?? undefined,
      mpe: n(p.mpe),
      uncertainty: n(p.uncertainty),
      repeatReadings: p.repeatReadings.trim() ? (parseReadings(p.repeatReadings) ?? [NaN]) : undefined,
      elementId: p.elementId || undefined,
    })),
    notes: v.notes,
    source: v.source,
    labId: outside ? v.labId || undefined : undefined,
    certificateNumber: v.certificateNumber,
    performedByName: v.performedByName,
    limitedRange: v.limited ? { min: n(v.limitedMin), max: n(v.limitedMax), note: v.limitedNote } : undefined,
    supersedesId: supersedesId ?? undefined,
    supersedeReason: supersedesId ? v.supersedeReason : undefined,
  };
}

/** Validates with the shared schema (the one the route uses) and puts its messages on the form's own fields. */
function resolverFor(correcting: Calibration | null, resolution: number): Resolver<FormValues, unknown, CreateCalibration> {
  const zod = zodResolver(CreateCalibrationSchema);
  return async (values, ctx, opts) => {
    const out = await zod(toRequest(values, correcting, resolution) as never, ctx, opts as never);
    const errors = out.errors as FieldErrors & { limitedRange?: { min?: unknown; max?: unknown } };
    if (errors.limitedRange) {
      Object.assign(errors, { limitedMin: errors.limitedRange.min, limitedMax: errors.limitedRange.max });
      delete errors.limitedRange;
    }
    return out as never;
  };
}

/** Plain words for the refusals the server may give (its own message follows). */
const REFUSALS: Record<string, string> = {
  standard_not_in_calibration: "A reference standard you chose was not in calibration on the calibration date.",
  record_signed: "That record is signed and cannot be changed; correct it with a new record instead.",
  already_superseded: "That record has already been corrected by another record.",
  tool_retired: "A retired tool is not calibrated.",
};

function refusal(e: unknown): string {
  if (e instanceof ApiError && e.status === 409 && REFUSALS[e.code]) return `${REFUSALS[e.code]} ${e.message}`;
  if (e instanceof ApiError && e.status === 400) return `Some fields are not valid: ${e.message}`;
  return errorMessage(e);
}

/** The points a new record starts with: the family's check plan, or one per usable element of a set. */
function planPoints(tool: ToolDetail): PointRow[] {
  const blank = { reference: "", asFound: "", asLeft: "", uncertainty: "", repeatReadings: "" };
  const usable = tool.elements.filter((e) => e.usable);
  if (usable.length > 0) return usable.map((e) => ({ ...blank, nominal: text(e.nominal), mpe: "", elementId: e.id, label: e.label }));
  if (tool.family.checkPlan.length > 0) return tool.family.checkPlan.map((p) => ({ ...blank, nominal: text(p.nominal), mpe: text(p.mpe), elementId: "", label: "" }));
  return [{ ...blank, nominal: "", mpe: "", elementId: "", label: "" }];
}

function fromRecord(c: Calibration): Partial<FormValues> {
  return {
    performedAt: toLocalInput(new Date(c.performedAt)),
    temperatureC: text(c.temperatureC),
    temperatureVariationC: text(c.temperatureVariationC),
    humidityPct: text(c.humidityPct),
    source: c.source,
    labId: c.lab?.id ?? "",
    certificateNumber: c.certificateNumber ?? "",
    performedByName: c.performedByName ?? "",
    decisionRule: c.decisionRule,
    adjusted: c.adjusted,
    standardIds: c.standards.map((s) => s.id),
    limited: !!c.limitedRange,
    limitedMin: text(c.limitedRange?.min),
    limitedMax: text(c.limitedRange?.max),
    limitedNote: c.limitedRange?.note ?? "",
    notes: c.notes ?? "",
    points: c.points.map((p) => ({
      nominal: text(p.nominal),
      reference: p.reference === p.nominal ? "" : text(p.reference),
      asFound: text(p.asFound),
      asLeft: text(p.asLeft),
      mpe: text(p.mpe),
      uncertainty: p.budget ? "" : text(p.uncertainty),
      repeatReadings: p.repeatReadings ? p.repeatReadings.join(" ") : "",
      elementId: p.elementId ?? "",
      label: p.elementLabel ?? "",
    })),
  };
}

export function CalibrationFormPage() {
  const { assetTag = "" } = useParams();
  const [sp] = useSearchParams();
  const supersedesId = sp.get("supersedes");
  const tool = useTool(assetTag);
  const cals = useCalibrations(assetTag);
  const standards = useStandardsWithCertificates();
  const settings = useShopSettings();
  const canCalibrate = useCan("calibrations.write");
  if (!canCalibrate) return <ErrorNote>Only a quality manager or an administrator logs calibrations.</ErrorNote>;
  if (tool.isPending || standards.isPending || settings.isPending || (supersedesId && cals.isPending)) return <Loading what="Preparing the calibration form" />;
  const err = tool.error ?? standards.error ?? settings.error ?? cals.error;
  if (err) return <ErrorNote>{errorMessage(err)}</ErrorNote>;
  const old = supersedesId ? (cals.data?.items.find((c) => c.id === supersedesId) ?? null) : null;
  if (supersedesId && !old) return <ErrorNote>The record to correct is not among {assetTag}'s calibrations.</ErrorNote>;
  return <CalibrationForm tool={tool.data!} standards={standards.data} timeZone={settings.data!.shopTimeZone} guardBandMultiplier={settings.data!.guardBandMultiplier} correcting={old} />;
}

function CalibrationForm({
  tool,
  standards,
  timeZone,
  guardBandMultiplier,
  correcting,
}: {
  tool: ToolDetail;
  standards: StandardDetail[];
  timeZone: string;
  guardBandMultiplier: number;
  correcting: Calibration | null;
}) {
  const create = useCreateCalibration(tool.assetTag);
  const upload = useUploadCalibrationCertificate();
  const labs = useAllLabs();
  const [file, setFile] = useState<File | null>(null);
  const [saved, setSaved] = useState<Calibration | null>(null);
  const defaults: FormValues = {
    performedAt: toLocalInput(new Date()),
    temperatureC: "20",
    temperatureVariationC: "",
    humidityPct: "",
    source: "in_house",
    labId: "",
    certificateNumber: "",
    performedByName: "",
    decisionRule: "simple",
    adjusted: false,
    standardIds: [],
    limited: false,
    limitedMin: "",
    limitedMax: "",
    limitedNote: "",
    points: planPoints(tool),
    notes: "",
    supersedeReason: "",
    ...(correcting ? fromRecord(correcting) : {}),
  };
  const form = useForm<FormValues, unknown, CreateCalibration>({ resolver: resolverFor(correcting, tool.resolution), defaultValues: defaults });
  const points = useFieldArray({ control: form.control, name: "points" });
  const v = form.watch();
  const e = form.formState.errors;
  const unit = tool.unit;

  // Typing an as-left reading that differs from the as-found ticks "adjusted" once, visibly; the person may untick it (a repeat reading).
  const adjustedTouched = useRef(!!correcting);
  const movedPoint = v.points.some((p) => {
    const left = parseNumber(p.asLeft);
    const found = parseNumber(p.asFound);
    return left != null && found != null && left !== found;
  });
  useEffect(() => {
    if (movedPoint && !v.adjusted && !adjustedTouched.current) {
      adjustedTouched.current = true;
      form.setValue("adjusted", true);
    }
  }, [movedPoint, v.adjusted, form]);

  const performedIso = fromLocalInput(v.performedAt);
  const onDate = performedIso ? calendarDate(performedIso, timeZone) : null;
  const standardChoices = useMemo(
    () =>
      standards
        .map((s) => ({ s, cert: onDate ? certificateOn(s, onDate) : null }))
        .sort((a, b) => Number(!!b.cert) - Number(!!a.cert) || a.s.assetTag.localeCompare(b.s.assetTag)),
    [standards, onDate],
  );

  const ctx: LiveContext = {
    rule: v.decisionRule,
    guardBandMultiplier,
    adjusted: v.adjusted,
    unit,
    resolution: tool.resolution,
    familyMpe: tool.family.mpe,
    checkPlan: tool.family.checkPlan,
    temperatureC: parseNumber(v.temperatureC),
    temperatureVariationC: parseNumber(v.temperatureVariationC),
    // Every standard ticked: each point's reference and budget come from the ones that make its size, as on the server.
    standards: v.standardIds.flatMap((id) => {
      const c = standardChoices.find((x) => x.s.id === id);
      return c?.cert ? [standardForCompute({ standard: c.s, certificate: c.cert })] : [];
    }),
    limitedRange: v.limited && parseNumber(v.limitedMin) != null && parseNumber(v.limitedMax) != null ? { min: parseNumber(v.limitedMin)!, max: parseNumber(v.limitedMax)! } : null,
    performedAt: performedIso,
    intervalDays: tool.intervalDays,
    timeZone,
  };
  const live = liveCalibration(v.points, ctx);

  if (saved) return <SavedCalibration tool={tool} saved={saved} />;

  const toggleStandard = (id: string, on: boolean) =>
    form.setValue("standardIds", on ? [...v.standardIds, id] : v.standardIds.filter((x) => x !== id), { shouldValidate: form.formState.isSubmitted });
  const outside = v.source === "outside_lab";

  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title={correcting ? `Correct the calibration of ${tool.assetTag}` : `Log a calibration of ${tool.assetTag}`}
        subtitle={`${tool.description} · ${tool.familyName} · ${len(tool.rangeMin, unit)} – ${len(tool.rangeMax, unit)}, resolution ${len(tool.resolution, unit)}, MPE ${tool.family.mpe == null ? "per point" : `± ${len(tool.family.mpe, unit)}`}`}
        actions={
          <Link className="self-center text-sm underline" to={`/tools/${encodeURIComponent(tool.assetTag)}`}>
            Back to {tool.assetTag}
          </Link>
        }
      />
      <form
        noValidate
        aria-label="Calibration record"
        className="flex flex-col gap-5"
        onSubmit={form.handleSubmit(async (body) => {
          // The certificate file is stored first; the signed record names it, so record and file arrive together.
          const stored = file ? await upload.mutateAsync(file).catch(() => null) : null;
          if (file && !stored) return;
          const rec = await create.mutateAsync({ ...body, certificateFileKey: stored?.fileKey ?? undefined }).catch(() => null);
          if (rec) setSaved(rec);
        })}
      >
        {correcting && (
          <Card title="Correction" className="border-caution/60">
            <p className="mb-2 text-sm">
              This new record supersedes the record of {when(correcting.performedAt)} (result {correcting.result}). The old record stays in the history,
              marked superseded; it is never edited.
            </p>
            <TextAreaField label="Reason for the correction" error={e.supersedeReason?.message} {...form.register("supersedeReason")} />
          </Card>
        )}
        <Card title="When, where, how">
          <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
            <TextField label="Performed at" type="datetime-local" error={e.performedAt?.message} {...form.register("performedAt")} />
            <TextField label="Temperature (°C)" {...decimalInput} error={e.temperatureC?.message} {...form.register("temperatureC")} />
            <TextField
              label="Temperature variation (± °C)"
              hint="How far tool and standard may differ in temperature during the calibration; it adds its own term to the budget."
              {...decimalInput}
              error={e.temperatureVariationC?.message}
              {...form.register("temperatureVariationC")}
            />
            <TextField label="Humidity (% RH)" {...decimalInput} error={e.humidityPct?.message} {...form.register("humidityPct")} />
            <SelectField
              label="Decision rule for release"
              hint="ILAC-G8: decides whether the tool may go back into service. Whether it was in tolerance as found is always the error against ± MPE."
              error={e.decisionRule?.message}
              {...form.register("decisionRule")}
            >
              {DECISION_RULES.map((r) => (
                <option key={r} value={r}>
                  {DECISION_RULE_LABELS[r]}
                  {r === "guarded_scaled" ? ` — r = ${guardBandMultiplier}` : ""}
                </option>
              ))}
            </SelectField>
            <SelectField label="Performed" {...form.register("source")}>
              <option value="in_house">In-house</option>
              <option value="outside_lab">By an outside lab (from its certificate)</option>
            </SelectField>
            {outside && (
              <>
                <SelectField label="Outside lab" error={e.labId?.message} {...form.register("labId")}>
                  <option value="">— choose —</option>
                  {(labs.data?.items ?? []).map((l) => (
                    <option key={l.id} value={l.id}>
                      {l.name}
                      {l.accreditation !== "valid" ? ` (accreditation ${l.accreditation.replace("_", " ")})` : ""}
                    </option>
                  ))}
                </SelectField>
                <TextField label="Certificate number" error={e.certificateNumber?.message} {...form.register("certificateNumber")} />
                <TextField label="Lab technician (optional)" {...form.register("performedByName")} />
                <label className="flex flex-col gap-1 text-sm font-semibold text-ink-soft">
                  Certificate file (PDF or image)
                  <input type="file" className={fileInputClass} accept="application/pdf,image/*" onChange={(ev) => setFile(ev.target.files?.[0] ?? null)} />
                </label>
              </>
            )}
          </div>
          {outside && <p className="mt-2 text-sm text-ink-soft">An outside-lab record counts only after its certificate review is recorded on the tool page.</p>}
        </Card>

        <Card title="Reference standards used">
          <p className="mb-2 text-sm text-ink-soft">
            Only standards whose certificate covers {onDate ?? "the calibration date"} can be chosen{outside ? " (optional for an outside-lab record)" : ""}.
          </p>
          <ul className="grid gap-2 sm:grid-cols-2 xl:grid-cols-3" aria-label="Reference standards">
            {standardChoices.map(({ s, cert }) => {
              const latest = s.certificates[0];
              const checked = v.standardIds.includes(s.id);
              return (
                <li key={s.id}>
                  <label
                    className={cx(
                      "flex items-start gap-2 rounded-md border p-2 text-sm",
                      cert ? "border-paper-line" : checked ? "border-stop bg-stop-light text-stop" : "border-dashed border-paper-line text-ink-faint",
                    )}
                  >
                    {/* A standard ticked before the date changed stays tickable, so it can be taken off. */}
                    <input type="checkbox" className="mt-1 size-4" disabled={!cert && !checked} checked={checked} onChange={(ev) => toggleStandard(s.id, ev.target.checked)} />
                    <span>
                      <strong>{s.assetTag}</strong> {s.name}
                      <span className="block text-xs">
                        {cert
                          ? `Certificate ${cert.number}, due ${cert.dueAt}, U ${len(cert.expandedUncertainty, s.unit, 6)} (k = ${cert.coverageFactor})`
                          : latest
                            ? `Not in calibration on that date (certificate ${latest.number}: ${latest.issuedAt} – ${latest.dueAt})`
                            : "No certificate on record"}
                      </span>
                    </span>
                  </label>
                </li>
              );
            })}
          </ul>
          {e.standardIds?.message && <p role="alert" className="mt-2 text-sm text-stop">{e.standardIds.message}</p>}
        </Card>

        <Card title="Check points">
          <p className="mb-2 text-sm text-ink-soft">
            Type the as-found readings; the error, the as-found statement (ILAC-G8), TUR and the release verdict follow at once. Repeat readings (two or more, separated by
            spaces) add the repeatability to the budget; as found blank is then their mean. Reference blank = the standard's certified value (or the sum of a stack of
            blocks), else the nominal. MPE blank = the check plan's or the family's{tool.family.mpe != null ? ` (± ${len(tool.family.mpe, unit)})` : ""}. U blank = computed from
            the budget (every standard used, resolution, repeatability, temperature; k from the effective degrees of freedom). Values in {unit === "in" ? "inches" : "millimetres"}.
            Error = indication − reference.
          </p>
          <div className="overflow-x-auto">
            <table className="w-full min-w-[58rem] text-left text-sm" aria-label="Check points entry">
              <thead className="text-xs uppercase tracking-wide text-ink-faint">
                <tr>
                  <th className="py-1 pr-2">#</th>
                  <th className="pr-2">Nominal</th>
                  <th className="pr-2">As found</th>
                  <th className="pr-2">Repeat readings</th>
                  <th className="pr-2">As left</th>
                  <th className="pr-2">Error</th>
                  <th className="pr-2">TUR</th>
                  <th className="pr-2">Found · Release</th>
                  <th className="pr-2">Reference</th>
                  <th className="pr-2">MPE ±</th>
                  <th className="pr-2">U</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {points.fields.map((f, i) => {
                  const pe = e.points?.[i];
                  const computed = live.points[i]?.computed;
                  // Placeholders show the defaults the shared computation applied (certified value, budget U).
                  const budgetU = computed?.uncertaintySource === "budget" ? computed.uncertainty : null;
                  const defaultRef = computed && computed.referenceSource !== "given" ? String(computed.reference) : v.points[i]?.nominal || "= nominal";
                  const cell = (name: keyof PointText, label: string, placeholder?: string, wide = false) => (
                    <td className="pr-2 py-1 align-top">
                      <input
                        {...(name === "repeatReadings" ? { inputMode: "decimal" as const, autoComplete: "off" } : decimalInput)}
                        aria-label={`Point ${i + 1} ${label}`}
                        aria-invalid={!!pe?.[name]}
                        placeholder={placeholder}
                        title={pe?.[name]?.message}
                        className={cx(wide ? "w-[10rem]" : "w-[6.5rem]", "rounded-md border bg-paper-raised px-2 py-1.5", pe?.[name] ? "border-stop" : "border-paper-line")}
                        {...form.register(`points.${i}.${name}` as const)}
                      />
                    </td>
                  );
                  return (
                    <tr key={f.id} className="border-t border-paper-line">
                      <td className="pr-2 py-1 align-top text-ink-faint">
                        {i + 1}
                        {f.label && <span className="block text-xs">el. {f.label}</span>}
                      </td>
                      {cell("nominal", "nominal")}
                      {cell("asFound", "as found", parseReadings(v.points[i]?.repeatReadings) ? "= mean" : undefined)}
                      {cell("repeatReadings", "repeat readings", "optional", true)}
                      {cell("asLeft", "as left", v.adjusted ? "= as found" : "not adjusted")}
                      <LivePointCells point={live.points[i]} unit={unit} index={i} />
                      {cell("reference", "reference", defaultRef)}
                      {cell("mpe", "MPE", computed ? String(computed.mpe) : tool.family.mpe != null ? String(tool.family.mpe) : "")}
                      {cell("uncertainty", "U", budgetU != null ? String(budgetU) : "from budget")}
                      <td className="align-top">
                        <Button variant="ghost" className="min-h-8 px-2" aria-label={`Remove point ${i + 1}`} onClick={() => points.remove(i)}>
                          ✕
                        </Button>
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {e.points?.message && <p role="alert" className="text-sm text-stop">{e.points.message}</p>}
          {e.points && !e.points.message && <p role="alert" className="mt-2 text-sm text-stop">Some points are incomplete or not numbers: every point needs a nominal and an as-found reading.</p>}
          <div className="mt-2 flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => points.append({ nominal: "", reference: "", asFound: "", asLeft: "", mpe: "", uncertainty: "", repeatReadings: "", elementId: "", label: "" })}>
              Add point
            </Button>
          </div>
          <fieldset className="mt-4 rounded-md border border-paper-line p-3">
            <legend className="px-1 text-sm font-semibold text-ink-soft">Adjustment</legend>
            <label className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                className="size-4"
                {...form.register("adjusted", {
                  onChange: () => {
                    adjustedTouched.current = true;
                  },
                })}
              />{" "}
              The tool was adjusted: release is decided on the as-left readings
            </label>
            <p className="mt-1 text-xs text-ink-faint">
              {v.adjusted
                ? "Blank as-left cells are signed as reading the same as found after the adjustment; type the as-left reading wherever a point moved."
                : "Not adjusted: release is decided on the as-found readings; an as-left reading typed here is kept as a repeat reading only."}
            </p>
          </fieldset>
          <fieldset className="mt-4 rounded-md border border-paper-line p-3">
            <legend className="px-1 text-sm font-semibold text-ink-soft">Limited range</legend>
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" className="size-4" {...form.register("limited")} /> Release the tool for part of its range only
            </label>
            {v.limited && (
              <div className="mt-2 grid gap-3 sm:grid-cols-3">
                <TextField label={`From (${unit})`} {...decimalInput} error={(e as FieldErrors<Record<string, string>>).limitedMin?.message as string | undefined} {...form.register("limitedMin")} />
                <TextField label={`To (${unit})`} {...decimalInput} error={(e as FieldErrors<Record<string, string>>).limitedMax?.message as string | undefined} {...form.register("limitedMax")} />
                <TextField label="Note shown wherever it is used" {...form.register("limitedNote")} />
              </div>
            )}
          </fieldset>
        </Card>

        <LiveSummary live={live} unit={unit} />
        <Cautions compact />

        <TextAreaField label="Notes (optional)" {...form.register("notes")} />
        {upload.isError && <ErrorNote>The certificate file was not stored, so nothing was signed: {errorMessage(upload.error)}</ErrorNote>}
        {create.isError && <ErrorNote>{refusal(create.error)}</ErrorNote>}
        <div className="flex flex-wrap gap-2">
          <Button type="submit" disabled={create.isPending || upload.isPending}>
            {correcting ? "Sign the correcting record" : "Sign the calibration record"}
          </Button>
          <ButtonLink variant="ghost" to={`/tools/${encodeURIComponent(tool.assetTag)}`}>
            Cancel
          </ButtonLink>
        </div>
        <p className="text-xs text-ink-faint">A signed record is never edited or deleted; a mistake is corrected by a new record that supersedes it, with a reason.</p>
      </form>
    </div>
  );
}

function SavedCalibration({ tool, saved }: { tool: ToolDetail; saved: Calibration }) {
  const fresh = useTool(tool.assetTag);
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title={`Calibration of ${tool.assetTag} saved`} subtitle="The server judged the record with the same rules the form showed." />
      <section role="status" aria-label="Saved calibration" className="rounded-card border border-paper-line bg-paper-raised p-4 shadow-card">
        <p className="flex flex-wrap items-center gap-3 text-lg font-semibold">
          As found: <AsFoundBadge inTolerance={saved.asFoundInTolerance} statement={saved.asFoundStatement} className="text-sm" />
        </p>
        <p className="mt-1 flex flex-wrap items-center gap-3 text-xl font-bold">
          Release: <ResultBadge result={saved.result} className="text-base" />
        </p>
        <p className="mt-1">
          As found {saved.asFoundInTolerance ? "in tolerance" : <strong className="text-stop">out of tolerance</strong>}; {saved.adjusted ? "adjusted, released on the as-left readings" : "not adjusted"}; next due{" "}
          <strong>{saved.nextDueAt}</strong>.{saved.awaitingReview && " Awaiting certificate review before the tool counts as in calibration."}
        </p>
        {(saved.asFoundStatement === "conditional_pass" || saved.asFoundStatement === "conditional_fail") && (
          <p className="mt-1 text-sm">
            Some points lie within U of a limit: they are listed under <Link className="underline" to="/calibrations/conditional">Conditional results</Link> for review.
          </p>
        )}
        {saved.investigationId && (
          <p className="mt-1 font-semibold text-stop">
            An out-of-tolerance investigation was opened: <Link className="underline" to={`/investigations/${saved.investigationId}`}>open it</Link>.
          </p>
        )}
        {saved.turWarning && <TurWarning className="mt-2" points={saved.points.filter((p) => p.turAdequate === false).length} />}
        <PointsTable points={saved.points} unit={saved.unit} />
      </section>
      {fresh.data && <ToolAnswer answer={fresh.data} assetTag={tool.assetTag} size="compact" />}
      <div className="flex gap-2">
        <ButtonLink variant="primary" to={`/tools/${encodeURIComponent(tool.assetTag)}`}>
          Back to {tool.assetTag}
        </ButtonLink>
      </div>
    </div>
  );
}
