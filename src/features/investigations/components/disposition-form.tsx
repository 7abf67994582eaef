import { useForm, useWatch, type UseFormRegisterReturn } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import {
  CreateDispositionSchema,
  DISPOSITION_KINDS,
  DISPOSITION_LABELS,
  READING_VERDICT_LABELS,
  type CreateDisposition,
  type CreateDispositionInput,
  type InvestigationItem,
} from "../../../../shared/investigations/investigations.schemas";
import { lengthWithUnit as length } from "../../../../shared/investigations/format";
import { useAddDisposition, useRemeasureCandidates } from "../api/investigations";
import { Button } from "../../../components/ui/button";
import { SelectField, TextAreaField, TextField } from "../../../components/ui/field";
import { ErrorNote } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format";

/**
 * Records a disposition for one affected item (`item`) or for the rows selected in the table (`itemIds`). An item
 * that already has one gets a new disposition that supersedes it; the old one stays in its history.
 */
export function DispositionForm({
  investigationId,
  itemIds,
  item,
  onDone,
  submitLabel = "Save disposition",
}: {
  investigationId: string;
  itemIds: string[];
  /** Set when the form answers one affected reading: it may then be remeasured. */
  item?: InvestigationItem;
  onDone: () => void;
  submitLabel?: string;
}) {
  const add = useAddDisposition(investigationId);
  const allowRemeasure = !!item && item.kind === "reading";
  const schemaResolver = zodResolver(CreateDispositionSchema);
  const form = useForm<CreateDispositionInput, unknown, CreateDisposition>({
    // The rows answered are the caller's, not a field of the form: they join the values only to be checked.
    resolver: (values, context, options) => schemaResolver({ ...values, itemIds, jobId: undefined }, context, options),
    // A field the chosen kind does not show is dropped, so switching from "Remeasured" to "No impact" saves cleanly.
    shouldUnregister: true,
    defaultValues: { itemIds, kind: "no_impact", rationale: "" },
  });
  const kind = useWatch({ control: form.control, name: "kind" });
  const e = form.formState.errors;
  return (
    <form
      noValidate
      className="flex flex-col gap-3"
      onSubmit={form.handleSubmit((v) =>
        add.mutate(
          { ...v, itemIds },
          {
            onSuccess: () => {
              form.reset({ itemIds, kind: "no_impact", rationale: "" });
              onDone();
            },
          },
        ),
      )}
    >
      <SelectField label="Disposition" error={e.kind?.message} {...form.register("kind")}>
        {DISPOSITION_KINDS.filter((k) => allowRemeasure || k !== "remeasure").map((k) => (
          <option key={k} value={k}>
            {DISPOSITION_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <TextAreaField label="Rationale" error={e.rationale?.message} hint="Why this disposition is right: what was checked, by whom, against what." {...form.register("rationale")} />
      {kind === "notify_owner" && (
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Who was notified" error={e.notifiedWhom?.message} {...form.register("notifiedWhom")} />
          <TextField label="How they were notified" error={e.notifiedHow?.message} placeholder="Telephone, e-mail, letter…" {...form.register("notifiedHow")} />
        </div>
      )}
      {kind === "remeasure" && item && <RemeasurePicker investigationId={investigationId} item={item} error={e.remeasureReadingId?.message} register={form.register("remeasureReadingId")} />}
      {e.itemIds?.message && <ErrorNote>{e.itemIds.message}</ErrorNote>}
      {add.isError && <ErrorNote>{errorMessage(add.error)}</ErrorNote>}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={add.isPending}>
          {submitLabel}
        </Button>
        <Button type="button" variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/** The new reading, picked from the later readings of the same place on the same check sheet. */
function RemeasurePicker({
  investigationId,
  item,
  error,
  register,
}: {
  investigationId: string;
  item: InvestigationItem;
  error?: string;
  register: UseFormRegisterReturn<"remeasureReadingId">;
}) {
  const q = useRemeasureCandidates(investigationId, item.id, true);
  if (q.isPending) return <p className="text-sm text-ink-soft">Looking for later readings of this place…</p>;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const candidates = q.data;
  if (candidates.length === 0) {
    return (
      <div className="text-sm">
        <p className="font-semibold text-stop">No later reading of this place on the check sheet yet.</p>
        <p className="text-ink-soft">Record the remeasurement on the check sheet{item.job ? ` of engine ${item.job.engineSerial}` : ""}, then come back and pick it here.</p>
        {/* Keeps the field registered so the form says what is missing. */}
        <input type="hidden" {...register} value="" />
        {error && <p className="text-sm font-semibold text-stop">{error}</p>}
      </div>
    );
  }
  return (
    <SelectField label="New reading of this place" error={error} hint="Later readings of the same place on the same check sheet, newest first." defaultValue="" {...register}>
      <option value="">Choose the remeasurement…</option>
      {candidates.map((c) => (
        <option key={c.id} value={c.id}>
          {formatDateTime(c.takenAt)} — {c.values.map((v) => length(v, c.unit)).join(" / ") || "no values"} — {READING_VERDICT_LABELS[c.verdict]}
          {c.takenBy ? ` — ${c.takenBy}` : ""}
          {c.toolAssetTags.length ? ` — ${c.toolAssetTags.join(", ")}` : ""}
          {c.correctsAffected ? " (correction of this reading)" : ""}
        </option>
      ))}
    </SelectField>
  );
}
