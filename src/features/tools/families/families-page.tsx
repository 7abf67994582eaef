import { useFieldArray, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { createColumnHelper } from "@tanstack/react-table";
import { CreateFamilySchema, KIND_LABELS, TOOL_KINDS, type CreateFamilyInput, type Family } from "../../../../shared/families/families.schemas";
import { useCan } from "../../auth/api/auth";
import { useCreateFamily, useFamilies } from "../api/families";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { DebouncedInput } from "../components/debounced-input";
import { applyFieldErrors, asNumber, decimalInput } from "../lib/form";
import { len } from "../lib/format";
import { FilterSelect } from "../../../components/ui/filter-select";

const col = createColumnHelper<Family>();

const columns = [
  col.accessor("name", { header: "Family", cell: (c) => <span className="font-semibold">{c.getValue()}</span> }),
  col.accessor("kind", { header: "Kind", cell: (c) => KIND_LABELS[c.getValue()] }),
  col.accessor("unit", { header: "Unit" }),
  col.accessor("defaultIntervalDays", { header: "Interval", cell: (c) => `${c.getValue()} days` }),
  col.accessor("usageLimit", { header: "Usage limit", cell: (c) => (c.getValue() ? `${c.getValue()} issues` : "—") }),
  col.accessor("mpe", { header: "MPE", cell: (c) => (c.getValue() == null ? "—" : `± ${len(c.getValue(), c.row.original.unit)}`) }),
  col.accessor("resolution", { header: "Resolution", cell: (c) => len(c.getValue(), c.row.original.unit) }),
  col.accessor("checkPlan", {
    header: "Check plan",
    enableSorting: false,
    cell: (c) => (c.getValue().length ? c.getValue().map((p) => p.nominal).join(", ") : "—"),
  }),
  col.accessor("toolCount", { header: "Tools" }),
];

export function FamiliesPage() {
  const list = useListParams(["q", "kind"] as const, { sort: "name" });
  const families = useFamilies({ q: list.filters.q, kind: list.filters.kind, page: list.page });
  const canWrite = useCan("families.write");
  return (
    <div>
      <PageHeader title="Tool families" subtitle="Defaults each new tool takes: kind, interval, permissible error, resolution and check plan." />
      <div className="grid gap-5 2xl:grid-cols-[1fr_30rem]">
        <DataTable
          label="Tool families"
          columns={columns}
          {...pagedProps(families, list, 50)}
          rowKey={(f) => f.id}
          toolbar={
            <>
              <DebouncedInput aria-label="Search families" placeholder="Search families" className="rounded-md border border-paper-line px-3 py-1.5" value={list.filters.q} onValue={(v) => list.setFilter("q", v)} />
              <FilterSelect label="Filter by kind" all="All kinds" options={TOOL_KINDS} labels={KIND_LABELS} value={list.filters.kind} onChange={(v) => list.setFilter("kind", v)} />
            </>
          }
        />
        {canWrite && <NewFamilyCard />}
      </div>
      {families.isError && <ErrorNote>{errorMessage(families.error)}</ErrorNote>}
    </div>
  );
}

// Classic check sizes that turn a micrometer screw through whole and part turns
// (reference-values.md, "Micrometers": common practice, from memory).
const CLASSIC_PLANS: Record<string, { label: string; unit: "in" | "mm"; points: number[] }> = {
  in: { label: "Ten classic sizes 0–1 in", unit: "in", points: [0.105, 0.21, 0.315, 0.42, 0.5, 0.605, 0.71, 0.815, 0.92, 1.0] },
  mm: { label: "Ten classic sizes 0–25 mm", unit: "mm", points: [2.5, 5.1, 7.7, 10.3, 12.9, 15.0, 17.6, 20.2, 22.8, 25.0] },
};

type PlanRow = { nominal?: number; mpe?: number | null };

function NewFamilyCard() {
  const create = useCreateFamily();
  const form = useForm<CreateFamilyInput>({
    resolver: zodResolver(CreateFamilySchema),
    defaultValues: { name: "", kind: "outside_micrometer", unit: "in", defaultIntervalDays: 365, checkPoints: [] },
  });
  const plan = useFieldArray({ control: form.control, name: "checkPoints" as never });
  const e = form.formState.errors;
  const unit = form.watch("unit");
  const planErrors = (e.checkPoints ?? []) as unknown as ({ nominal?: { message?: string }; mpe?: { message?: string } } | undefined)[];
  return (
    <Card title="New family">
      <form
        noValidate
        className="flex flex-col gap-3"
        onSubmit={form.handleSubmit((v) =>
          create.mutate(CreateFamilySchema.parse(v), {
            onSuccess: () => form.reset(),
            onError: (err) => err instanceof ApiError && applyFieldErrors(err.fieldErrors(), form.setError),
          }),
        )}
      >
        <TextField label="Name" error={e.name?.message} {...form.register("name")} />
        <div className="grid gap-3 sm:grid-cols-2">
          <SelectField label="Kind" error={e.kind?.message} {...form.register("kind")}>
            {TOOL_KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
          <SelectField label="Unit" error={e.unit?.message} {...form.register("unit")}>
            <option value="in">inch</option>
            <option value="mm">millimetre</option>
          </SelectField>
          <TextField label="Interval (days)" {...decimalInput} inputMode="numeric" error={e.defaultIntervalDays?.message} {...form.register("defaultIntervalDays", asNumber)} />
          <TextField label="Usage limit (issues, optional)" {...decimalInput} inputMode="numeric" hint="Calibrate after this many issues or at the interval, whichever comes first." error={e.usageLimit?.message} {...form.register("usageLimit", asNumber)} />
          <TextField label={`Permissible error ± (${unit})`} {...decimalInput} error={e.mpe?.message} {...form.register("mpe", asNumber)} />
          <TextField label={`Resolution (${unit})`} {...decimalInput} error={e.resolution?.message} {...form.register("resolution", asNumber)} />
          <TextField label={`Intermediate check tolerance ± (${unit})`} {...decimalInput} hint="Blank: the permissible error." error={e.checkTolerance?.message} {...form.register("checkTolerance", asNumber)} />
        </div>
        <fieldset className="rounded-md border border-paper-line p-3">
          <legend className="px-1 text-sm font-semibold text-ink-soft">Check plan</legend>
          <p className="mb-2 text-xs text-ink-faint">Nominal sizes checked at each calibration; a point may have its own permissible error.</p>
          {plan.fields.length > 0 && (
            <ol className="mb-2 flex flex-col gap-2">
              {plan.fields.map((f, i) => (
                <li key={f.id} className="grid grid-cols-[2rem_1fr_1fr_auto] items-end gap-2">
                  <span className="pb-2 text-sm text-ink-faint">{i + 1}.</span>
                  <TextField label={`Point ${i + 1} nominal`} {...decimalInput} error={planErrors[i]?.nominal?.message} {...form.register(`checkPoints.${i}.nominal` as const, asNumber)} />
                  <TextField label="Own MPE (optional)" {...decimalInput} error={planErrors[i]?.mpe?.message} {...form.register(`checkPoints.${i}.mpe` as const, asNumber)} />
                  <Button variant="ghost" aria-label={`Remove point ${i + 1}`} onClick={() => plan.remove(i)}>
                    Remove
                  </Button>
                </li>
              ))}
            </ol>
          )}
          <div className="flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => plan.append({ nominal: undefined, mpe: undefined } as PlanRow as never)}>
              Add point
            </Button>
            <Button variant="ghost" onClick={() => plan.replace(CLASSIC_PLANS[unit].points.map((n) => ({ nominal: n, mpe: undefined })) as never)}>
              Use {CLASSIC_PLANS[unit].label}
            </Button>
          </div>
        </fieldset>
        {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
        {create.isSuccess && (
          <p role="status" className="text-sm text-go">
            Added the family {create.data.name}.
          </p>
        )}
        <Button type="submit" disabled={create.isPending}>
          Add family
        </Button>
      </form>
    </Card>
  );
}
