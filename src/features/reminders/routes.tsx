import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = {
  routes: [
    { path: "admin/outbox", lazy: async () => ({ Component: (await import("./components/outbox-page")).OutboxPage }) },
    { path: "admin/reminders", lazy: async () => ({ Component: (await import("./components/reminder-runs-page")).ReminderRunsPage }) },
    { path: "me/notifications", lazy: async () => ({ Component: (await import("./components/notification-preferences-page")).NotificationPreferencesPage }) },
  ],
  nav: [
    { to: "/me/notifications", label: "My notifications", group: "work", order: 90 },
    { to: "/admin/reminders", label: "Reminders", group: "admin", order: 30, permission: "reminders.run" },
    { to: "/admin/outbox", label: "Outbox", group: "admin", order: 31, permission: "outbox.read" },
  ],
};
