import { useState } from "react";
import { Link, useNavigate } from "react-router-dom";
import { useFieldArray, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { CreateToolSchema, OWNER_TYPES, OWNER_TYPE_LABELS, type CreateTool, type CreateToolInput } from "../../../../shared/tools/tools.schemas";
import { KIND_LABELS } from "../../../../shared/families/families.schemas";
import { useCan } from "../../auth/api/auth";
import { usePeople } from "../../users/api/users";
import { useCreateTool } from "../api/tools";
import { useAllFamilies } from "../api/families";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { TextField, SelectField, TextAreaField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { applyFieldErrors, asNumber, decimalInput } from "../lib/form";

const SET_KINDS = new Set(["feeler_set", "gauge_block_set"]);

export function NewToolPage() {
  const canWrite = useCan("tools.write");
  if (!canWrite) return <ErrorNote>Only the tool crib, quality or an administrator registers tools.</ErrorNote>;
  return <NewToolForm />;
}

function NewToolForm() {
  const navigate = useNavigate();
  const create = useCreateTool();
  const families = useAllFamilies();
  const form = useForm<CreateToolInput, unknown, CreateTool>({
    resolver: zodResolver(CreateToolSchema),
    defaultValues: { assetTag: "", description: "", serialNumber: "", unit: "in", ownerType: "shop", calibrationRequired: true, acceptanceUse: true, elements: [] },
  });
  const elements = useFieldArray({ control: form.control, name: "elements" });
  const [bulk, setBulk] = useState("");
  const e = form.formState.errors;
  const familyId = form.watch("familyId");
  const family = families.data?.items.find((f) => f.id === familyId);
  const unit = form.watch("unit");
  const ownerType = form.watch("ownerType");
  const isSet = family ? SET_KINDS.has(family.kind) : false;

  /** A family's defaults fill the fields a person would otherwise copy by hand. */
  const applyFamily = (id: string) => {
    const f = families.data?.items.find((x) => x.id === id);
    if (!f) return;
    form.setValue("unit", f.unit);
    form.setValue("intervalDays", f.defaultIntervalDays);
    if (f.resolution != null) form.setValue("resolution", f.resolution);
    if (f.usageLimit != null) form.setValue("usageLimit", f.usageLimit);
    if (!form.getValues("description")) form.setValue("description", KIND_LABELS[f.kind]);
    if (f.checkPlan.length > 0) {
      form.setValue("rangeMin", 0);
      form.setValue("rangeMax", Math.max(...f.checkPlan.map((p) => p.nominal)));
    }
  };

  return (
    <div className="max-w-4xl">
      <PageHeader title="Register a tool" subtitle="Its identity, range, interval and owner; calibrate it before first use." actions={<Link className="self-center text-sm underline" to="/tools">Tool register</Link>} />
      <form
        noValidate
        className="flex flex-col gap-5"
        onSubmit={form.handleSubmit((body) =>
          create.mutate(body, {
            onSuccess: (t) => navigate(`/tools/${encodeURIComponent(t.assetTag)}`),
            onError: (err) => err instanceof ApiError && applyFieldErrors(err.fieldErrors(), form.setError),
          }),
        )}
      >
        <Card title="Identity">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Asset tag" hint="Printed on the label, e.g. MIC-0120." error={e.assetTag?.message} {...form.register("assetTag")} />
            <SelectField label="Family" error={e.familyId?.message} {...form.register("familyId", { onChange: (ev) => applyFamily(ev.target.value) })}>
              <option value="">— choose —</option>
              {(families.data?.items ?? []).map((f) => (
                <option key={f.id} value={f.id}>
                  {f.name}
                </option>
              ))}
            </SelectField>
            <TextField label="Description" error={e.description?.message} {...form.register("description")} />
            <TextField label="Serial number" error={e.serialNumber?.message} {...form.register("serialNumber")} />
            <TextField label="Maker (free text)" error={e.maker?.message} {...form.register("maker")} />
            <TextField label="Model (free text)" error={e.model?.message} {...form.register("model")} />
          </div>
        </Card>
        <Card title="Range, resolution and interval">
          <div className="grid gap-3 sm:grid-cols-3">
            <SelectField label="Unit" error={e.unit?.message} {...form.register("unit")}>
              <option value="in">inch</option>
              <option value="mm">millimetre</option>
            </SelectField>
            <TextField label={`Range from (${unit})`} {...decimalInput} error={e.rangeMin?.message} {...form.register("rangeMin", asNumber)} />
            <TextField label={`Range to (${unit})`} {...decimalInput} error={e.rangeMax?.message} {...form.register("rangeMax", asNumber)} />
            <TextField label={`Resolution (${unit})`} {...decimalInput} error={e.resolution?.message} {...form.register("resolution", asNumber)} />
            <TextField label="Interval (days)" {...decimalInput} inputMode="numeric" error={e.intervalDays?.message} {...form.register("intervalDays", asNumber)} />
            <TextField label="Usage limit (issues, optional)" {...decimalInput} inputMode="numeric" error={e.usageLimit?.message} {...form.register("usageLimit", asNumber)} />
          </div>
          <div className="mt-3 flex flex-col gap-2 text-sm">
            <label className="flex items-center gap-2">
              <input type="checkbox" className="size-4" {...form.register("calibrationRequired")} /> Needs calibration (untick for a reference-only tool)
            </label>
            <label className="flex items-center gap-2">
              <input type="checkbox" className="size-4" {...form.register("acceptanceUse")} /> May be used for acceptance readings
            </label>
          </div>
        </Card>
        <Card title="Where and whose">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Location" error={e.location?.message} {...form.register("location")} />
            <SelectField label="Owner" error={e.ownerType?.message} {...form.register("ownerType")}>
              {OWNER_TYPES.map((o) => (
                <option key={o} value={o}>
                  {OWNER_TYPE_LABELS[o]}
                </option>
              ))}
            </SelectField>
            {ownerType === "personal" && <OwnerPicker error={e.ownerUserId?.message} onPick={(id) => form.setValue("ownerUserId", id, { shouldValidate: true })} />}
            {(ownerType === "customer" || ownerType === "loaner") && <TextField label="Owner's name" error={e.ownerName?.message} {...form.register("ownerName")} />}
          </div>
          <TextAreaField label="Notes" wrapperClassName="mt-3" {...form.register("notes")} />
        </Card>
        {(isSet || elements.fields.length > 0) && (
          <Card title={family?.kind === "feeler_set" ? "Leaves of the set" : "Blocks of the set"}>
            <p className="mb-2 text-sm text-ink-soft">Each element is calibrated, and can be rejected, on its own.</p>
            <div className="mb-3 flex flex-wrap items-end gap-2">
              <TextField label="Add many nominal sizes at once (comma-separated)" wrapperClassName="grow" value={bulk} onChange={(ev) => setBulk(ev.target.value)} placeholder="0.0015, 0.002, 0.003" />
              <Button
                variant="secondary"
                onClick={() => {
                  const sizes = bulk.split(/[,\s]+/).filter(Boolean);
                  elements.append(sizes.map((s) => ({ label: s, nominal: Number(s) })));
                  setBulk("");
                }}
              >
                Add sizes
              </Button>
            </div>
            <ol className="flex flex-col gap-2">
              {elements.fields.map((f, i) => {
                const ee = e.elements?.[i];
                return (
                  <li key={f.id} className="grid grid-cols-2 items-end gap-2 sm:grid-cols-[1fr_1fr_6rem_1fr_auto]">
                    <TextField label={`Element ${i + 1} label`} error={ee?.label?.message} {...form.register(`elements.${i}.label` as const)} />
                    <TextField label={`Nominal (${unit})`} {...decimalInput} error={ee?.nominal?.message} {...form.register(`elements.${i}.nominal` as const, asNumber)} />
                    <TextField label="Grade" {...form.register(`elements.${i}.grade` as const)} />
                    <TextField label="Certified deviation" {...decimalInput} {...form.register(`elements.${i}.certifiedDeviation` as const, asNumber)} />
                    <Button variant="ghost" aria-label={`Remove element ${i + 1}`} onClick={() => elements.remove(i)}>
                      Remove
                    </Button>
                  </li>
                );
              })}
            </ol>
            {e.elements?.message && <p role="alert" className="text-sm text-stop">{e.elements.message}</p>}
            <Button variant="secondary" className="mt-2" onClick={() => elements.append({ label: "", nominal: undefined as unknown as number })}>
              Add element
            </Button>
          </Card>
        )}
        {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
        <div>
          <Button type="submit" disabled={create.isPending}>
            Register tool
          </Button>
        </div>
      </form>
    </div>
  );
}

function OwnerPicker({ onPick, error }: { onPick: (id: string) => void; error?: string }) {
  const [q, setQ] = useState("");
  const [picked, setPicked] = useState<string | null>(null);
  const people = usePeople(q);
  return (
    <div className="relative">
      <TextField label="Mechanic who owns it" value={picked ?? q} error={error} placeholder="Type a name" onChange={(ev) => { setPicked(null); setQ(ev.target.value); }} />
      {!picked && q.trim() && people.data && (
        <ul className="absolute left-0 right-0 z-10 mt-1 max-h-60 overflow-auto rounded-md border border-paper-line bg-paper-raised shadow-card">
          {people.data.items.map((p) => (
            <li key={p.id}>
              <button type="button" className="w-full px-3 py-2 text-left text-sm hover:bg-paper-sunk" onClick={() => { setPicked(p.name); onPick(p.id); }}>
                {p.name} <span className="text-ink-faint">{p.email}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
