import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = {
  routes: [{ index: true, lazy: async () => ({ Component: (await import("./components/home-page")).HomePage }) }],
  nav: [{ to: "/", label: "Overview", group: "work", order: 0 }],
};
