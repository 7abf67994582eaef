import { useEffect } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { ReminderCronSchema, ReminderStagesSchema, SettingsSchema, type Settings } from "../../../../shared/settings/settings.schemas";
import { api, errorMessage } from "../../../lib/api-client";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { TextField, SelectField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { RoleNotice } from "../../../components/ui/role-notice";
import { useCan, useRoleName } from "../../auth/api/auth";
import { describeCron } from "../../../../shared/settings/cron-words";

export const settingsKeys = { all: ["settings"] as const };
export const useSettings = () => useQuery({ queryKey: settingsKeys.all, queryFn: () => api.get<Settings>("/api/settings"), staleTime: 60_000 });

// The same rules the server applies to a change: five cron fields, each lead time once.
const FormSchema = SettingsSchema.extend({
  reminderCron: ReminderCronSchema,
  reminderStages: ReminderStagesSchema,
});

export function SettingsPage() {
  const settings = useSettings();
  const qc = useQueryClient();
  const save = useMutation({ mutationFn: (s: Settings) => api.patch<Settings>("/api/settings", s), onSuccess: () => qc.invalidateQueries({ queryKey: settingsKeys.all }) });
  const form = useForm<Settings>({ resolver: zodResolver(FormSchema) });
  const canWrite = useCan("settings.write");
  const roleName = useRoleName();
  const cron = form.watch("reminderCron");
  useEffect(() => {
    if (settings.data) form.reset(settings.data);
  }, [settings.data, form]);
  if (settings.isPending) return <Loading />;
  const e = form.formState.errors;
  return (
    <div className="max-w-3xl">
      <PageHeader title="Shop settings" subtitle="Time zone, warning windows, reminders and intervals." />
      {!canWrite && <RoleNotice roleName={roleName}>can read this page but not change settings; an administrator changes them.</RoleNotice>}
      <form noValidate onSubmit={form.handleSubmit((v) => save.mutate(v))} className="flex flex-col gap-4">
        <fieldset disabled={!canWrite} className="contents">
        <Card title="Shop">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Shop name" error={e.shopName?.message} {...form.register("shopName")} />
            <TextField label="Time zone (due dates are calendar dates here)" error={e.shopTimeZone?.message} {...form.register("shopTimeZone")} />
            <TextField label="End of shift (HH:MM)" error={e.endOfShift?.message} {...form.register("endOfShift")} />
            <SelectField label="Default length unit" {...form.register("defaultLengthUnit")}>
              <option value="in">inch</option>
              <option value="mm">millimetre</option>
            </SelectField>
            <TextField label="Keep records for (years)" type="number" error={e.recordRetentionYears?.message} {...form.register("recordRetentionYears", { valueAsNumber: true })} />
          </div>
        </Card>
        <Card title="Due dates and reminders">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Due-soon warning window (days)" type="number" error={e.dueSoonDays?.message} {...form.register("dueSoonDays", { valueAsNumber: true })} />
            <TextField
              label="Reminder schedule (cron: minute hour day month weekday)"
              error={e.reminderCron?.message}
              hint={cron ? `${describeCron(cron)}, shop time.` : undefined}
              {...form.register("reminderCron")}
            />
            <TextField
              label="Reminder stages (days before due, comma-separated)"
              error={e.reminderStages?.message}
              {...form.register("reminderStages", { setValueAs: (v: unknown) => (Array.isArray(v) ? v : String(v).split(",").map((x) => Number(x.trim())).filter((x) => !Number.isNaN(x))) })}
            />
            <TextField label="Escalate to quality after overdue (days)" type="number" error={e.escalationDays?.message} {...form.register("escalationDays", { valueAsNumber: true })} />
          </div>
        </Card>
        <Card title="Intervals and investigations">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Reliability target R* (end-of-period in-tolerance)" type="number" step="0.01" error={e.reliabilityTarget?.message} {...form.register("reliabilityTarget", { valueAsNumber: true })} />
            <TextField label="Largest interval change in one step (factor)" type="number" step="0.1" error={e.maxIntervalStepFactor?.message} {...form.register("maxIntervalStepFactor", { valueAsNumber: true })} />
            <TextField label="Confidence of the interval test (change an interval only when R* lies outside this interval of the observed rate)" type="number" step="0.01" error={e.intervalConfidence?.message} {...form.register("intervalConfidence", { valueAsNumber: true })} />
            <TextField label="Resolution ratio N (flag a reading whose tool reads coarser than 1/N of the tolerance; 10 is the common rule of thumb)" type="number" step="1" error={e.resolutionRatio?.message} {...form.register("resolutionRatio", { valueAsNumber: true })} />
            <TextField label="Guard-band multiplier r (rule “guarded, shop multiplier”: released within ± (MPE − r·U))" type="number" step="0.05" error={e.guardBandMultiplier?.message} {...form.register("guardBandMultiplier", { valueAsNumber: true })} />
            <label className="flex items-center gap-2 text-sm sm:col-span-2">
              <input type="checkbox" {...form.register("windowStartsAtPassingCheck")} />
              An investigation's window may start at the last passing intermediate check (otherwise at the last in-tolerance calibration)
            </label>
            <TextField
              label="Gauge studies: pool the appraiser × part interaction when its p-value is above"
              hint="0.25 is the usual choice; 0.05 pools more often. A study keeps the value in force when it was set up."
              type="number"
              step="0.01"
              error={e.studyPoolingAlpha?.message}
              {...form.register("studyPoolingAlpha", { valueAsNumber: true })}
            />
          </div>
        </Card>
        </fieldset>
        {save.isError && <ErrorNote>{errorMessage(save.error)}</ErrorNote>}
        {save.isSuccess && <p role="status" className="text-go">Settings saved.</p>}
        {canWrite && (
          <div>
            <Button type="submit" disabled={save.isPending}>
              Save settings
            </Button>
          </div>
        )}
      </form>
    </div>
  );
}
