import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = {
  routes: [
    { path: "limit-tables", lazy: async () => ({ Component: (await import("./components/limit-tables-page")).LimitTablesPage }) },
    { path: "limit-tables/new", lazy: async () => ({ Component: (await import("./components/limit-table-editor")).NewLimitTablePage }) },
    { path: "limit-tables/:id/revise", lazy: async () => ({ Component: (await import("./components/limit-table-editor")).ReviseLimitTablePage }) },
    { path: "limit-tables/:id", lazy: async () => ({ Component: (await import("./components/limit-table-page")).LimitTablePage }) },
  ],
  nav: [{ to: "/limit-tables", label: "Limits tables", group: "quality", order: 30, roles: ["quality", "admin", "inspector", "auditor"] }],
};
