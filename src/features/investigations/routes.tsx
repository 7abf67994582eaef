import type { FeatureModule } from "../../app/nav-types";

// Out-of-tolerance investigations: the list (open first) and the page a quality manager works through item by
// item. Everyone may read them; the server refuses dispositions and close-out to the roles that may not.
export const feature: FeatureModule = {
  routes: [
    { path: "investigations", lazy: async () => ({ Component: (await import("./components/investigations-page")).InvestigationsPage }) },
    { path: "investigations/:id", lazy: async () => ({ Component: (await import("./components/investigation-page")).InvestigationPage }) },
  ],
  nav: [{ to: "/investigations", label: "Investigations", group: "quality", order: 5 }],
};
