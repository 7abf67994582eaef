import { Router } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { runReminders } from "./reminders.service";
import { listReminderRuns, reminderRunDetail } from "./reminder-runs.service";
import { listOutbox, outboxMessage } from "./outbox.service";
import { getNotificationPreferences, updateNotificationPreferences } from "./notification-preferences.service";
import {
  NotificationPreferencesSchema,
  OutboxIdParamSchema,
  OutboxMessageDetailSchema,
  OutboxSchema,
  ReminderRunDetailSchema,
  ReminderRunPageSchema,
  ReminderRunsQuerySchema,
  RunIdParamSchema,
  RunRemindersResultSchema,
  UpdateNotificationPreferencesSchema,
} from "../../../shared/reminders/reminders.schemas";

export function remindersRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "reminders");

  route(
    { method: "post", path: "/api/admin/jobs/reminders/run", summary: "Run the due-reminder job now", access: "reminders.run", response: RunRemindersResultSchema, status: 200 },
    ({ user }) => runReminders(deps, { trigger: "manual", actorId: user.id }),
  );
  route(
    { method: "get", path: "/api/admin/reminder-runs", summary: "Runs of the reminder job, newest first", access: "reminders.run", query: ReminderRunsQuerySchema, response: ReminderRunPageSchema },
    ({ query }) => listReminderRuns(deps.db, query.page, query.pageSize),
  );
  route(
    { method: "get", path: "/api/admin/reminder-runs/:id", summary: "One run of the reminder job with each reminder it claimed", access: "reminders.run", response: ReminderRunDetailSchema },
    ({ params }) => reminderRunDetail(deps.db, RunIdParamSchema.parse(params).id),
  );
  route(
    { method: "get", path: "/api/admin/outbox", summary: "Mail caught by the local mail service, newest first", access: "outbox.read", response: OutboxSchema },
    () => listOutbox(deps.config.MAIL_CATCHER_URL),
  );
  route(
    { method: "get", path: "/api/admin/outbox/:id", summary: "One caught message with its text", access: "outbox.read", response: OutboxMessageDetailSchema },
    ({ params }) => outboxMessage(deps.config.MAIL_CATCHER_URL, OutboxIdParamSchema.parse(params).id),
  );
  route(
    { method: "get", path: "/api/me/notification-preferences", summary: "Which reminder digests I receive", access: "signedIn", response: NotificationPreferencesSchema },
    ({ user }) => getNotificationPreferences(deps.db, user),
  );
  route(
    {
      method: "put",
      path: "/api/me/notification-preferences",
      summary: "Choose which reminder digests I receive (escalations cannot be turned off)",
      access: "signedIn",
      body: UpdateNotificationPreferencesSchema,
      response: NotificationPreferencesSchema,
      status: 200,
    },
    ({ user, body }) => deps.db.transaction((tx) => updateNotificationPreferences(tx, deps.clock, user, body)),
  );
  return router;
}
