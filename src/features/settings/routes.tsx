import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = {
  routes: [{ path: "admin/settings", lazy: async () => ({ Component: (await import("./components/settings-page")).SettingsPage }) }],
  nav: [{ to: "/admin/settings", label: "Settings", group: "admin", order: 20, permission: "settings.write" }],
};
