import { useState } from "react";
import { useNavigate, useParams } from "react-router-dom";
import { useFieldArray, useForm, type UseFormRegisterReturn } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { CreateLimitTableSchema, LIMIT_ITEM_KINDS, LIMIT_ITEM_KIND_LABELS, VERIFY_NOTICE, type CreateLimitTableInput, type LimitTable } from "../../../../shared/limit-tables/limit-tables.schemas";
import { useLimitTable, useSaveLimitTable } from "../api/limit-tables";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { Cautions } from "../../../components/ui/cautions";
import { ApiError, errorMessage } from "../../../lib/api-client";

const blankItem = { key: "", label: "", section: "", kind: "journal" as const, directions: 2, repeat: 1, radial: false };
const optNum = { setValueAs: (v: unknown) => (v === "" || v == null ? undefined : typeof v === "number" ? v : Number(v)) };
const intNum = { setValueAs: (v: unknown) => (v === "" || v == null ? undefined : Number(v)) };

function fromTable(t: LimitTable): CreateLimitTableInput {
  const u = (v: number | null) => v ?? undefined;
  return {
    name: t.name,
    engineModel: t.engineModel,
    unit: t.unit,
    sourceDocument: t.sourceDocument,
    sourceRevision: t.sourceRevision,
    isDemo: t.isDemo,
    expansionPerK: u(t.expansionPerK),
    items: t.items.map((it) => ({
      key: it.key,
      label: it.label,
      section: it.section ?? "",
      kind: it.kind,
      min: u(it.min),
      max: u(it.max),
      serviceableMin: u(it.serviceableMin),
      serviceableMax: u(it.serviceableMax),
      boreKey: it.boreKey ?? "",
      journalKey: it.journalKey ?? "",
      directions: it.directions,
      repeat: it.repeat,
      // An item without tool kinds carries null; the form (and the schema) take "absent".
      toolKinds: (it.toolKinds ?? undefined) as CreateLimitTableInput["items"][number]["toolKinds"],
      radial: it.radial,
      outOfRoundMax: u(it.outOfRoundMax),
      stationKeys: it.stationKeys ?? undefined,
      expansionPerK: u(it.expansionPerK),
      note: it.note ?? "",
    })),
  };
}

export function NewLimitTablePage() {
  return <LimitTableEditor initial={{ name: "", engineModel: "", unit: "in", sourceDocument: "", sourceRevision: "", isDemo: false, items: [blankItem] }} />;
}

export function ReviseLimitTablePage() {
  const { id } = useParams();
  const table = useLimitTable(id);
  if (table.isPending) return <Loading />;
  if (table.isError) return <ErrorNote>{errorMessage(table.error)}</ErrorNote>;
  return <LimitTableEditor initial={fromTable(table.data)} reviseId={table.data.id} version={table.data.version} />;
}

function Cell({ label, reg, error, className, type = "text" }: { label: string; reg: UseFormRegisterReturn; error?: string; className?: string; type?: string }) {
  return <TextField label={label} error={error} wrapperClassName={className} inputMode={type === "decimal" ? "decimal" : undefined} {...reg} />;
}

function LimitTableEditor({ initial, reviseId, version }: { initial: CreateLimitTableInput; reviseId?: string; version?: number }) {
  const navigate = useNavigate();
  const save = useSaveLimitTable();
  const form = useForm<CreateLimitTableInput>({ resolver: zodResolver(CreateLimitTableSchema) as never, defaultValues: initial });
  const items = useFieldArray({ control: form.control, name: "items" });
  const [invalid, setInvalid] = useState(false);
  const e = form.formState.errors;
  const server = save.error instanceof ApiError ? save.error.fieldErrors() : {};
  const err = (path: string) => (path.split(".").reduce<any>((o, k) => o?.[k], e)?.message as string | undefined) ?? server[path];
  const kinds = form.watch("items").map((i) => i.kind);
  return (
    <div className="flex flex-col gap-4">
      <PageHeader title={reviseId ? `Revise limits table (new version ${Number(version) + 1})` : "New limits table"} subtitle={`${VERIFY_NOTICE} Jobs already open keep the version they started with.`} />
      <form
        noValidate
        className="flex flex-col gap-4"
        onSubmit={form.handleSubmit(
          (input) => {
            setInvalid(false);
            save.mutate({ input, reviseId }, { onSuccess: (t) => navigate(`/limit-tables/${t.id}`) });
          },
          () => setInvalid(true),
        )}
      >
        <Card title="Source">
          <div className="grid gap-3 md:grid-cols-3">
            <Cell label="Table name" reg={form.register("name")} error={err("name")} />
            <Cell label="Engine model" reg={form.register("engineModel")} error={err("engineModel")} />
            <SelectField label="Unit" {...form.register("unit")}>
              <option value="in">inch</option>
              <option value="mm">millimetre</option>
            </SelectField>
            <Cell label="Source document" reg={form.register("sourceDocument")} error={err("sourceDocument")} />
            <Cell label="Source revision" reg={form.register("sourceRevision")} error={err("sourceRevision")} />
            <label className="flex items-center gap-2 self-end text-sm">
              <input type="checkbox" {...form.register("isDemo")} /> Demo values (invented)
            </label>
            <TextField
              label="Parts' expansion coefficient per kelvin (optional)"
              hint="Sizes read with a part temperature are judged at 20 °C (ISO 1). Steel 0.0000115; cast aluminium 0.0000215."
              inputMode="decimal"
              error={err("expansionPerK")}
              {...form.register("expansionPerK", optNum)}
            />
          </div>
        </Card>
        <Card title="Items" actions={<Button variant="secondary" onClick={() => items.append({ ...blankItem })}>Add item</Button>}>
          {typeof e.items?.message === "string" && <ErrorNote>{e.items.message}</ErrorNote>}
          <ol className="flex flex-col gap-4">
            {items.fields.map((f, i) => {
              const kind = kinds[i];
              const sized = kind !== "visual";
              return (
                <li key={f.id} className="rounded-md border border-paper-line p-3">
                  <div className="grid gap-2 md:grid-cols-4">
                    <Cell label="Key" reg={form.register(`items.${i}.key`)} error={err(`items.${i}.key`)} />
                    <Cell label="Label" reg={form.register(`items.${i}.label`)} error={err(`items.${i}.label`)} className="md:col-span-2" />
                    <SelectField label="Kind" {...form.register(`items.${i}.kind`)}>
                      {LIMIT_ITEM_KINDS.map((k) => (
                        <option key={k} value={k}>{LIMIT_ITEM_KIND_LABELS[k]}</option>
                      ))}
                    </SelectField>
                    <Cell label="Section" reg={form.register(`items.${i}.section`)} />
                    {sized && kind !== "taper" && <Cell type="decimal" label={kind === "clearance" || kind === "feeler" ? "New min clearance" : "New min"} reg={form.register(`items.${i}.min`, optNum)} error={err(`items.${i}.min`)} />}
                    {sized && <Cell type="decimal" label={kind === "clearance" || kind === "feeler" ? "New max clearance" : kind === "taper" ? "Taper max" : "New max"} reg={form.register(`items.${i}.max`, optNum)} error={err(`items.${i}.max`)} />}
                    {sized && kind !== "feeler" && kind !== "taper" && <Cell type="decimal" label="Serviceable min" reg={form.register(`items.${i}.serviceableMin`, optNum)} error={err(`items.${i}.serviceableMin`)} />}
                    {sized && kind !== "feeler" && <Cell type="decimal" label="Serviceable max" reg={form.register(`items.${i}.serviceableMax`, optNum)} error={err(`items.${i}.serviceableMax`)} />}
                    {kind === "clearance" && <Cell label="Bore item key" reg={form.register(`items.${i}.boreKey`)} error={err(`items.${i}.boreKey`)} />}
                    {kind === "clearance" && <Cell label="Journal item key" reg={form.register(`items.${i}.journalKey`)} error={err(`items.${i}.journalKey`)} />}
                    {kind === "clearance" && (
                      <label className="flex items-center gap-2 self-end text-sm">
                        <input type="checkbox" {...form.register(`items.${i}.radial`)} /> Limits are radial (half the diametral clearance)
                      </label>
                    )}
                    {kind === "taper" && <Cell label="Station A item key (e.g. top of ring travel)" reg={form.register(`items.${i}.stationKeys.0`)} error={err(`items.${i}.stationKeys`)} />}
                    {kind === "taper" && <Cell label="Station B item key (e.g. bottom)" reg={form.register(`items.${i}.stationKeys.1`)} />}
                    {(kind === "journal" || kind === "bore") && <Cell type="decimal" label="Out-of-round max (optional)" reg={form.register(`items.${i}.outOfRoundMax`, optNum)} error={err(`items.${i}.outOfRoundMax`)} />}
                    {(kind === "journal" || kind === "bore") && <Cell type="decimal" label="Expansion per kelvin (optional, this part)" reg={form.register(`items.${i}.expansionPerK`, optNum)} error={err(`items.${i}.expansionPerK`)} />}
                    {(kind === "journal" || kind === "bore") && <Cell type="decimal" label="Directions" reg={form.register(`items.${i}.directions`, intNum)} error={err(`items.${i}.directions`)} />}
                    <Cell type="decimal" label="How many per engine" reg={form.register(`items.${i}.repeat`, intNum)} error={err(`items.${i}.repeat`)} />
                    <Cell label="Note" reg={form.register(`items.${i}.note`)} className="md:col-span-2" />
                  </div>
                  <div className="mt-2 flex justify-end">
                    <Button variant="ghost" onClick={() => items.remove(i)} aria-label={`Remove item ${i + 1}`}>Remove</Button>
                  </div>
                </li>
              );
            })}
          </ol>
          <p className="mt-2 text-xs text-ink-faint">
            Clearance = bore − journal of the same number; a negative clearance is interference (shown "tight"). Every reading of a journal or bore is held to its size limits; a clearance is judged at its loosest
            (against the maximum) and its tightest (against the minimum). Taper = the difference between two stations read in the same direction.
          </p>
        </Card>
        {invalid && <ErrorNote>Some entries need attention; each is marked above.</ErrorNote>}
        {save.isError && <ErrorNote>{errorMessage(save.error)}</ErrorNote>}
        <div className="flex gap-2">
          <Button type="submit" disabled={save.isPending}>{reviseId ? "Save new version" : "Save limits table"}</Button>
        </div>
      </form>
      <Cautions compact />
    </div>
  );
}
