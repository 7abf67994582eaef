import type { FeatureModule } from "../../app/nav-types";

// Gauge studies: quality sets them up and reads the results; mechanics take them blind on the bench.
export const feature: FeatureModule = {
  routes: [
    { path: "studies", lazy: async () => ({ Component: (await import("./components/studies-page")).StudiesPage }) },
    { path: "studies/new", lazy: async () => ({ Component: (await import("./components/new-study-page")).NewStudyPage }) },
    { path: "studies/:id", lazy: async () => ({ Component: (await import("./components/study-page")).StudyPage }) },
    { path: "bench/studies", lazy: async () => ({ Component: (await import("./components/my-studies-page")).MyStudiesPage }) },
    { path: "bench/studies/:id", lazy: async () => ({ Component: (await import("./components/take-study-page")).TakeStudyPage }) },
  ],
  nav: [
    { to: "/bench/studies", label: "Gauge studies to take", group: "work", order: 25, permission: "studies.take" },
    { to: "/studies", label: "Gauge studies", group: "quality", order: 35, permission: "studies.read" },
  ],
};
