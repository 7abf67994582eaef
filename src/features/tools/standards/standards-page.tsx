import { useState } from "react";
import { Link } from "react-router-dom";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { createColumnHelper } from "@tanstack/react-table";
import { CreateStandardSchema, STANDARD_KINDS, type CreateStandardInput, type Standard } from "../../../../shared/standards/standards.schemas";
import { KIND_LABELS } from "../../../../shared/families/families.schemas";
import { useCan } from "../../auth/api/auth";
import { useCreateStandard, useStandards, useUploadCertificateFile } from "../api/standards";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { DebouncedInput } from "../components/debounced-input";
import { applyFieldErrors, asNumber, decimalInput, fileInputClass } from "../lib/form";
import { len } from "../lib/format";
import { CertificateFields } from "./certificate-fields";
import { InCalibrationBadge } from "./in-calibration-badge";
import { FilterSelect } from "../../../components/ui/filter-select";

export const standardKindLabel = (k: string) => (k === "check_block" ? "Check block" : (KIND_LABELS as Record<string, string>)[k] ?? k);

const col = createColumnHelper<Standard>();
const columns = [
  col.accessor("assetTag", {
    header: "Asset tag",
    cell: (c) => (
      <Link className="font-semibold text-ink underline decoration-brass underline-offset-2" to={`/standards/${c.row.original.id}`}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("name", { header: "Name" }),
  col.accessor("kind", { header: "Kind", cell: (c) => standardKindLabel(c.getValue()) }),
  col.accessor("inCalibration", { header: "State", cell: (c) => <InCalibrationBadge inCalibration={c.getValue()} dueAt={c.row.original.dueAt} /> }),
  col.accessor("dueAt", { header: "Certificate due" }),
  col.accessor((s) => s.certificate?.number ?? null, { id: "certificate", header: "Certificate" }),
  col.accessor((s) => s.certificate?.labName ?? null, { id: "lab", header: "Issuing lab" }),
  col.accessor((s) => (s.certificate ? `${len(s.certificate.expandedUncertainty, s.unit, 6)} (k = ${s.certificate.coverageFactor})` : null), { id: "u", header: "U", cell: (c) => <span className="whitespace-nowrap">{c.getValue()}</span> }),
  col.accessor("nominal", { header: "Nominal", cell: (c) => (c.getValue() == null ? "—" : len(c.getValue(), c.row.original.unit)) }),
  col.accessor("grade", { header: "Grade" }),
  col.accessor("location", { header: "Location" }),
];

export function StandardsPage() {
  const list = useListParams(["q", "kind", "inCalibration"] as const);
  const standards = useStandards({ q: list.filters.q, kind: list.filters.kind, inCalibration: list.filters.inCalibration, page: list.page });
  const canWrite = useCan("standards.write");
  return (
    <div>
      <PageHeader title="Reference standards" subtitle="Gauge blocks, setting standards and check blocks the shop calibrates with, and their certificates." />
      {standards.isError && <ErrorNote>{errorMessage(standards.error)}</ErrorNote>}
      <div className="grid gap-5 2xl:grid-cols-[1fr_32rem]">
        <DataTable
          label="Reference standards"
          columns={columns}
          {...pagedProps(standards, list, 50)}
          rowKey={(s) => s.id}
          initialHidden={["location", "grade"]}
          toolbar={
            <>
              <DebouncedInput aria-label="Search standards" placeholder="Search tag or name" className="rounded-md border border-paper-line px-3 py-1.5" value={list.filters.q} onValue={(v) => list.setFilter("q", v)} />
              <FilterSelect
                label="Filter by calibration state"
                all="In calibration or not"
                options={["true", "false"]}
                labels={{ true: "In calibration", false: "Not in calibration" }}
                value={list.filters.inCalibration}
                onChange={(v) => list.setFilter("inCalibration", v)}
              />
            </>
          }
        />
        {canWrite && <NewStandardCard />}
      </div>
    </div>
  );
}

function NewStandardCard() {
  const create = useCreateStandard();
  const [file, setFile] = useState<File | null>(null);
  const upload = useUploadCertificateFile();
  const form = useForm<CreateStandardInput>({
    resolver: zodResolver(CreateStandardSchema),
    defaultValues: { assetTag: "", name: "", kind: "gauge_block_set", unit: "in", certificate: { number: "", lab: "", issuedAt: "", dueAt: "", coverageFactor: 2 } as CreateStandardInput["certificate"] },
  });
  const e = form.formState.errors;
  const unit = form.watch("unit");
  return (
    <Card title="New reference standard">
      <form
        noValidate
        className="flex flex-col gap-3"
        onSubmit={form.handleSubmit((v) =>
          create.mutate(CreateStandardSchema.parse(v), {
            onSuccess: (std) => {
              const cert = std.certificates[0];
              if (file && cert) upload.mutate({ standardId: std.id, certificateId: cert.id, file }, { onSuccess: () => setFile(null) });
              form.reset();
            },
            onError: (err) => err instanceof ApiError && applyFieldErrors(err.fieldErrors(), form.setError),
          }),
        )}
      >
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Asset tag" error={e.assetTag?.message} {...form.register("assetTag")} />
          <TextField label="Name" error={e.name?.message} {...form.register("name")} />
          <SelectField label="Kind" error={e.kind?.message} {...form.register("kind")}>
            {STANDARD_KINDS.map((k) => (
              <option key={k} value={k}>
                {standardKindLabel(k)}
              </option>
            ))}
          </SelectField>
          <SelectField label="Unit" error={e.unit?.message} {...form.register("unit")}>
            <option value="in">inch</option>
            <option value="mm">millimetre</option>
          </SelectField>
          <TextField label={`Nominal (${unit}, single standards)`} {...decimalInput} error={e.nominal?.message} {...form.register("nominal", asNumber)} />
          <TextField label="Grade" error={e.grade?.message} {...form.register("grade")} />
          <TextField label="Location" error={e.location?.message} {...form.register("location")} />
        </div>
        <fieldset className="rounded-md border border-paper-line p-3">
          <legend className="px-1 text-sm font-semibold text-ink-soft">Certificate</legend>
          <CertificateFields register={form.register} errors={e} prefix="certificate." unit={unit} />
          <label className="mt-3 flex flex-col gap-1 text-sm font-semibold text-ink-soft">
            Certificate file (PDF or image, optional)
            <input type="file" className={fileInputClass} accept="application/pdf,image/*" onChange={(ev) => setFile(ev.target.files?.[0] ?? null)} />
          </label>
        </fieldset>
        {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
        {upload.isError && <ErrorNote>The standard was added, but its certificate file was not: {errorMessage(upload.error)}</ErrorNote>}
        {create.isSuccess && (
          <p role="status" className="text-sm text-go">
            Added <Link className="underline" to={`/standards/${create.data.id}`}>{create.data.assetTag}</Link>.
          </p>
        )}
        <Button type="submit" disabled={create.isPending}>
          Add standard
        </Button>
      </form>
    </Card>
  );
}
