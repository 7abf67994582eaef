import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = {
  routes: [
    { path: "jobs", lazy: async () => ({ Component: (await import("./components/jobs-page")).JobsPage }) },
    { path: "jobs/:id", lazy: async () => ({ Component: (await import("./components/check-sheet-page")).CheckSheetPage }) },
  ],
  nav: [{ to: "/jobs", label: "Check sheets", group: "work", order: 20 }],
};
