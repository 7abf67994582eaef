import { useEffect } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useNotificationPreferences, useUpdateNotificationPreferences } from "../api/reminders";
import { PageHeader, Card, ErrorNote, Loading } from "../../../components/ui/layout";
import { Button } from "../../../components/ui/button";
import { errorMessage } from "../../../lib/api-client";
import { UpdateNotificationPreferencesSchema, type UpdateNotificationPreferences } from "../../../../shared/reminders/reminders.schemas";

export function NotificationPreferencesPage() {
  const prefs = useNotificationPreferences();
  const save = useUpdateNotificationPreferences();
  const form = useForm<UpdateNotificationPreferences>({ resolver: zodResolver(UpdateNotificationPreferencesSchema) });
  useEffect(() => {
    if (prefs.data) form.reset(Object.fromEntries(prefs.data.digests.map((d) => [d.digest, d.enabled])));
  }, [prefs.data, form]);

  if (prefs.isPending) return <Loading />;
  if (prefs.isError) return <ErrorNote>{errorMessage(prefs.error)}</ErrorNote>;
  const digests = prefs.data.digests;

  return (
    <div className="max-w-2xl">
      <PageHeader title="My notifications" subtitle="Which reminder e-mails you receive. Each morning's reminders come as one digest, and each reminder is sent once." />
      <form
        noValidate
        onSubmit={form.handleSubmit((values) => {
          // Locked digests are not sent back: they cannot change.
          const patch = Object.fromEntries(Object.entries(values).filter(([k]) => !digests.find((d) => d.digest === k)?.locked));
          save.mutate(patch);
        })}
      >
        <Card title="Reminder digests">
          <ul className="flex flex-col gap-4">
            {digests.map((d) => (
              <li key={d.digest}>
                <label className="flex items-start gap-3">
                  <input type="checkbox" className="mt-1 h-5 w-5 shrink-0 accent-ink" disabled={d.locked} {...form.register(d.digest)} aria-describedby={`digest-${d.digest}`} />
                  <span>
                    <span className="font-semibold">{d.label}</span>
                    {d.locked && <span className="ml-2 rounded-full border border-paper-line bg-paper-sunk px-2 py-0.5 text-xs text-ink-soft">always on</span>}
                    <span id={`digest-${d.digest}`} className="block text-sm text-ink-soft">
                      {d.description}
                    </span>
                  </span>
                </label>
              </li>
            ))}
          </ul>
        </Card>
        <div className="mt-4 flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={save.isPending}>
            Save my notifications
          </Button>
          {save.isSuccess && !form.formState.isDirty && (
            <p role="status" className="text-go">
              Saved.
            </p>
          )}
        </div>
        {save.isError && (
          <div className="mt-3">
            <ErrorNote>{errorMessage(save.error)}</ErrorNote>
          </div>
        )}
      </form>
    </div>
  );
}
