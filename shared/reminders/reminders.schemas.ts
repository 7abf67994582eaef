import { z } from "zod";
import { PageQuerySchema, pageOf } from "../common/lists.schemas";
import { DIGESTS, type DigestKey } from "./reminder-plan";

export const DigestKeySchema = z.enum(DIGESTS);

/** What each digest holds, as a person reads it on their preferences page. */
export const DIGEST_INFO: Record<DigestKey, { label: string; description: string }> = {
  myTools: {
    label: "My tools",
    description: "Tools issued to me or that I own: coming due, overdue, near their usage limit, or not returned at the end of the shift.",
  },
  crib: {
    label: "Crib recall list",
    description: "Everything in the crib coming due, overdue, near its usage limit, or not returned.",
  },
  quality: {
    label: "Overdue tools",
    description: "Every tool that is overdue for calibration or has reached its usage limit.",
  },
  escalations: {
    label: "Escalations",
    description: "Tools still overdue after the escalation period, or overdue while issued. Always sent: escalations cannot be turned off.",
  },
};

/** One digest on the preferences page. */
export const DigestPreferenceSchema = z.object({
  digest: DigestKeySchema,
  label: z.string(),
  description: z.string(),
  enabled: z.boolean(),
  /** True where it cannot be turned off (escalations). */
  locked: z.boolean(),
});

/** GET /api/me/notification-preferences: the digests the person's role receives. */
export const NotificationPreferencesSchema = z.object({ digests: z.array(DigestPreferenceSchema) });
export type NotificationPreferences = z.infer<typeof NotificationPreferencesSchema>;

/** PUT /api/me/notification-preferences: which digests to receive. */
export const UpdateNotificationPreferencesSchema = z
  .object({
    myTools: z.boolean(),
    crib: z.boolean(),
    quality: z.boolean(),
    escalations: z.boolean(),
  })
  .partial()
  .strict();
export type UpdateNotificationPreferences = z.infer<typeof UpdateNotificationPreferencesSchema>;

/** Who started a run: the schedule, a person ("Run reminders now"), the shell command, or the first start that set up the demo shop. */
export const REMINDER_TRIGGERS = ["schedule", "manual", "cli", "setup"] as const;
export type ReminderTrigger = (typeof REMINDER_TRIGGERS)[number];
export const REMINDER_RUN_STATUSES = ["running", "finished", "failed", "skipped_locked"] as const;

/** One run of the reminder job. `sent` and `failed` count e-mails; `skipped` counts reminders already sent by an earlier run. */
export const ReminderRunSchema = z.object({
  id: z.string().uuid(),
  trigger: z.enum(REMINDER_TRIGGERS),
  /** The person who ran it from the Reminders page; null for the schedule and the shell command. */
  startedBy: z.string().nullable(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  status: z.enum(REMINDER_RUN_STATUSES),
  sent: z.number().int(),
  skipped: z.number().int(),
  failed: z.number().int(),
  error: z.string().nullable(),
});
export type ReminderRun = z.infer<typeof ReminderRunSchema>;

export const ReminderRunsQuerySchema = PageQuerySchema;
export const ReminderRunPageSchema = pageOf(ReminderRunSchema);

/** One reminder a run claimed: to whom, for which tool and stage, and what became of it. */
export const ReminderLogEntrySchema = z.object({
  assetTag: z.string(),
  dueAt: z.string(),
  stage: z.string(),
  recipientName: z.string(),
  recipientEmail: z.string(),
  status: z.enum(["claimed", "sent", "failed"]),
  attempts: z.number().int(),
  sentAt: z.string().nullable(),
  lastError: z.string().nullable(),
});
export const ReminderRunDetailSchema = ReminderRunSchema.extend({ entries: z.array(ReminderLogEntrySchema) });
export type ReminderRunDetail = z.infer<typeof ReminderRunDetailSchema>;

/** POST /api/admin/jobs/reminders/run (api.md: `{ sent }`; the rest describes the run). */
export const RunRemindersResultSchema = z.object({
  sent: z.number().int(),
  skipped: z.number().int(),
  failed: z.number().int(),
  reminders: z.number().int(),
  runId: z.string().uuid(),
  status: z.enum(REMINDER_RUN_STATUSES),
});
export type RunRemindersResult = z.infer<typeof RunRemindersResultSchema>;

/** GET /api/admin/outbox (api.md: `[{ to, subject, sentAt }]`), newest first; `id` opens the message. */
export const OutboxMessageSchema = z.object({
  id: z.number().int(),
  to: z.string(),
  subject: z.string(),
  sentAt: z.string(),
});
export const OutboxSchema = z.array(OutboxMessageSchema);
export type OutboxMessage = z.infer<typeof OutboxMessageSchema>;

export const OutboxMessageDetailSchema = OutboxMessageSchema.extend({ from: z.string(), text: z.string(), html: z.string().nullable() });
export type OutboxMessageDetail = z.infer<typeof OutboxMessageDetailSchema>;

export const OutboxIdParamSchema = z.object({ id: z.coerce.number().int().min(0) });
export const RunIdParamSchema = z.object({ id: z.string().uuid() });
