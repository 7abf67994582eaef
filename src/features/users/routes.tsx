import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = {
  routes: [{ path: "admin/users", lazy: async () => ({ Component: (await import("./components/users-page")).UsersPage }) }],
  nav: [{ to: "/admin/users", label: "People", group: "admin", order: 10, permission: "users.manage" }],
};
