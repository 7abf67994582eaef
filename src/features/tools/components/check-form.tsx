import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { CreateCheckSchema, type CreateCheckInput } from "../../../../shared/calibrations/calibrations.schemas";
import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import { dec } from "../../../../shared/common/decimal";
import { useCreateCheck } from "../api/calibrations";
import { useStandards } from "../api/standards";
import { Button } from "../../../components/ui/button";
import { TextField, SelectField } from "../../../components/ui/field";
import { ErrorNote } from "../../../components/ui/layout";
import { cx } from "../../../components/ui/cx";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { applyFieldErrors, asNumber, decimalInput } from "../lib/form";
import { len, signedLen } from "../lib/format";
import { parseNumber } from "../lib/live-calibration";

const CHECK_KINDS = new Set(["check_block", "setting_standard", "gauge_block_set"]);

/** Intermediate (pre-use) check against a check block or setting standard; a failure takes the tool out of use at once. */
export function CheckForm({ tool }: { tool: ToolDetail }) {
  const [open, setOpen] = useState(false);
  const create = useCreateCheck(tool.assetTag);
  const standards = useStandards({ page: 1, pageSize: 500, inCalibration: "true" });
  const form = useForm<CreateCheckInput>({ resolver: zodResolver(CreateCheckSchema) });
  const tolerance = tool.family.checkTolerance ?? tool.family.mpe;
  const nominal = parseNumber(String(form.watch("nominal") ?? ""));
  const reading = parseNumber(String(form.watch("reading") ?? ""));
  const deviation = nominal != null && reading != null ? dec(reading).minus(dec(nominal)) : null;
  const passes = deviation != null && tolerance != null ? deviation.abs().lte(dec(tolerance)) : null;
  const e = form.formState.errors;

  if (!open) {
    return (
      <div>
        <Button variant="secondary" onClick={() => setOpen(true)}>
          Record intermediate check
        </Button>
        {create.data && <CheckOutcome passed={create.data.passed} deviation={create.data.deviation} unit={tool.unit} />}
      </div>
    );
  }
  const choices = (standards.data?.items ?? []).filter((s) => CHECK_KINDS.has(s.kind) && s.unit === tool.unit);
  return (
    <form
      noValidate
      aria-label="Intermediate check"
      className="flex flex-col gap-3 rounded-card border border-paper-line bg-paper-raised p-4 shadow-card"
      onSubmit={form.handleSubmit((v) =>
        create.mutate(CreateCheckSchema.parse(v), {
          onSuccess: () => {
            form.reset();
            setOpen(false);
          },
          onError: (err) => err instanceof ApiError && applyFieldErrors(err.fieldErrors(), form.setError),
        }),
      )}
    >
      <h2 className="text-lg font-semibold">Intermediate check of {tool.assetTag}</h2>
      <p className="text-sm text-ink-soft">
        Measure the check block or setting standard and type what the tool reads. Tolerance ± {tolerance == null ? "not set for this family" : len(tolerance, tool.unit)}.
      </p>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField
          label="Check standard"
          {...form.register("standardId", {
            setValueAs: (v: string) => v || null,
            onChange: (ev) => {
              const s = choices.find((c) => c.id === ev.target.value);
              const value = s?.certificate?.certifiedValue ?? s?.nominal;
              if (value != null) form.setValue("nominal", value);
            },
          })}
        >
          <option value="">— none named —</option>
          {choices.map((s) => (
            <option key={s.id} value={s.id}>
              {s.assetTag} {s.name}
            </option>
          ))}
        </SelectField>
        <TextField label={`Nominal (${tool.unit})`} {...decimalInput} error={e.nominal?.message} {...form.register("nominal", asNumber)} />
        <TextField label={`Tool reads (${tool.unit})`} {...decimalInput} error={e.reading?.message} {...form.register("reading", asNumber)} />
      </div>
      <TextField label="Note (optional)" {...form.register("note")} />
      {deviation != null && (
        <p className={cx("text-sm font-semibold", passes === false ? "text-stop" : passes ? "text-go" : "text-ink")} aria-live="polite">
          Deviation {signedLen(deviation.toNumber(), tool.unit)} {tool.unit}
          {passes === true && " — within the check tolerance"}
          {passes === false && " — outside the check tolerance: saving takes the tool out of use"}
        </p>
      )}
      {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
      <div className="flex gap-2">
        <Button type="submit" disabled={create.isPending}>
          Save check
        </Button>
        <Button variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function CheckOutcome({ passed, deviation, unit }: { passed: boolean; deviation: number; unit: "in" | "mm" }) {
  return (
    <p role="status" className={cx("mt-2 rounded-md px-3 py-2 text-sm font-semibold", passed ? "bg-go-light text-go" : "bg-stop-light text-stop")}>
      {passed
        ? `Check passed (deviation ${signedLen(deviation, unit)} ${unit}).`
        : `Check failed (deviation ${signedLen(deviation, unit)} ${unit}): the tool is now out of tolerance and may not be used until recalibrated.`}
    </p>
  );
}
