import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Page } from "../../../../shared/common/lists.schemas";
import type {
  NotificationPreferences,
  OutboxMessage,
  OutboxMessageDetail,
  ReminderRun,
  ReminderRunDetail,
  RunRemindersResult,
  UpdateNotificationPreferences,
} from "../../../../shared/reminders/reminders.schemas";

export const reminderKeys = {
  outbox: ["outbox"] as const,
  message: (id: number) => ["outbox", id] as const,
  runs: ["reminder-runs"] as const,
  runList: (page: number) => ["reminder-runs", "list", page] as const,
  run: (id: string) => ["reminder-runs", "detail", id] as const,
  preferences: ["me", "notification-preferences"] as const,
};

export const outboxQueryOptions = () => queryOptions({ queryKey: reminderKeys.outbox, queryFn: () => api.get<OutboxMessage[]>("/api/admin/outbox") });
export const useOutbox = () => useQuery(outboxQueryOptions());

export const useOutboxMessage = (id: number | null) =>
  useQuery({ queryKey: reminderKeys.message(id ?? -1), queryFn: () => api.get<OutboxMessageDetail>(`/api/admin/outbox/${id}`), enabled: id !== null });

export const reminderRunsQueryOptions = (page: number) =>
  queryOptions({ queryKey: reminderKeys.runList(page), queryFn: () => api.get<Page<ReminderRun>>(`/api/admin/reminder-runs${qs({ page, pageSize: 20 })}`), placeholderData: keepPreviousData });
export const useReminderRuns = (page: number) => useQuery(reminderRunsQueryOptions(page));

export const useReminderRun = (id: string | null) =>
  useQuery({ queryKey: reminderKeys.run(id ?? ""), queryFn: () => api.get<ReminderRunDetail>(`/api/admin/reminder-runs/${id}`), enabled: !!id });

/** Runs the reminder job now; the runs list and the outbox change. */
export function useRunRemindersNow() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<RunRemindersResult>("/api/admin/jobs/reminders/run"),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: reminderKeys.runs }), qc.invalidateQueries({ queryKey: reminderKeys.outbox })]),
  });
}

export const useNotificationPreferences = () =>
  useQuery({ queryKey: reminderKeys.preferences, queryFn: () => api.get<NotificationPreferences>("/api/me/notification-preferences") });

export function useUpdateNotificationPreferences() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (patch: UpdateNotificationPreferences) => api.put<NotificationPreferences>("/api/me/notification-preferences", patch),
    onSuccess: (next) => qc.setQueryData(reminderKeys.preferences, next),
  });
}
