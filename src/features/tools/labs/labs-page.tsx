import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { createColumnHelper } from "@tanstack/react-table";
import { CreateLabSchema, type AccreditationState, type CreateLabInput, type Lab } from "../../../../shared/labs/labs.schemas";
import { useCan } from "../../auth/api/auth";
import { useCreateLab, useLabs } from "../api/labs";
import { PageHeader, Card, ErrorNote } from "../../../components/ui/layout";
import { DataTable, pagedProps } from "../../../components/ui/data-table";
import { TextField, TextAreaField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { cx } from "../../../components/ui/cx";
import { ApiError, errorMessage } from "../../../lib/api-client";
import { useListParams } from "../../../lib/use-list-params";
import { DebouncedInput } from "../components/debounced-input";
import { applyFieldErrors } from "../lib/form";

const ACCREDITATION: Record<AccreditationState, { words: string; cls: string }> = {
  valid: { words: "✓ Valid", cls: "bg-go-light text-go border-go/40" },
  expiring_soon: { words: "! Expiring soon", cls: "bg-caution-light text-caution border-caution/40" },
  expired: { words: "✕ Expired", cls: "bg-stop-light text-stop border-stop/40" },
  unknown: { words: "? No expiry recorded", cls: "bg-paper-sunk text-ink-soft border-paper-line" },
};

/** An outside lab's accreditation as a badge with words (expiring and expired stand out). */
export function AccreditationBadge({ state }: { state: AccreditationState }) {
  const a = ACCREDITATION[state];
  return <span className={cx("inline-flex whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold", a.cls)}>{a.words}</span>;
}

const col = createColumnHelper<Lab>();
const columns = [
  col.accessor("name", { header: "Lab", cell: (c) => <span className="font-semibold">{c.getValue()}</span> }),
  col.accessor("accreditation", { header: "Accreditation", cell: (c) => <AccreditationBadge state={c.getValue()} /> }),
  col.accessor("accreditationExpiresAt", {
    header: "Expires",
    cell: (c) => <span className={cx(c.row.original.accreditation !== "valid" && "font-bold text-stop")}>{c.getValue() ?? "—"}</span>,
  }),
  col.accessor("accreditationBody", { header: "Accreditation body" }),
  col.accessor("accreditationNumber", { header: "Number" }),
  col.accessor("scope", { header: "Scope" }),
  col.accessor("contact", { header: "Contact" }),
];

export function LabsPage() {
  const list = useListParams(["q"] as const);
  const labs = useLabs({ q: list.filters.q, page: list.page });
  const canWrite = useCan("labs.write");
  return (
    <div>
      <PageHeader title="Outside calibration labs" subtitle="Labs that calibrate tools and standards, with their accreditation and its expiry." />
      {labs.isError && <ErrorNote>{errorMessage(labs.error)}</ErrorNote>}
      <div className="grid gap-5 xl:grid-cols-[1fr_24rem]">
        <DataTable
          label="Outside labs"
          columns={columns}
          {...pagedProps(labs, list, 50)}
          rowKey={(l) => l.id}
          initialHidden={["contact"]}
          toolbar={<DebouncedInput aria-label="Search labs" placeholder="Search labs" className="rounded-md border border-paper-line px-3 py-1.5" value={list.filters.q} onValue={(v) => list.setFilter("q", v)} />}
        />
        {canWrite && <NewLabCard />}
      </div>
    </div>
  );
}

function NewLabCard() {
  const create = useCreateLab();
  const form = useForm<CreateLabInput>({ resolver: zodResolver(CreateLabSchema), defaultValues: { name: "" } });
  const e = form.formState.errors;
  return (
    <Card title="Add a lab">
      <form
        noValidate
        className="flex flex-col gap-3"
        onSubmit={form.handleSubmit((v) =>
          create.mutate(CreateLabSchema.parse(v), {
            onSuccess: () => form.reset(),
            onError: (err) => err instanceof ApiError && applyFieldErrors(err.fieldErrors(), form.setError),
          }),
        )}
      >
        <TextField label="Name" error={e.name?.message} {...form.register("name")} />
        <TextField label="Accreditation body" error={e.accreditationBody?.message} {...form.register("accreditationBody")} />
        <TextField label="Accreditation number" error={e.accreditationNumber?.message} {...form.register("accreditationNumber")} />
        <TextField label="Accreditation expires" type="date" error={e.accreditationExpiresAt?.message} {...form.register("accreditationExpiresAt", { setValueAs: (v) => v || undefined })} />
        <TextAreaField label="Scope" error={e.scope?.message} {...form.register("scope")} />
        <TextField label="Contact" error={e.contact?.message} {...form.register("contact")} />
        {create.isError && <ErrorNote>{errorMessage(create.error)}</ErrorNote>}
        {create.isSuccess && (
          <p role="status" className="text-sm text-go">
            Added {create.data.name}.
          </p>
        )}
        <Button type="submit" disabled={create.isPending}>
          Add lab
        </Button>
      </form>
    </Card>
  );
}
