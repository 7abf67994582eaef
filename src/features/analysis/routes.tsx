import type { FeatureModule } from "../../app/nav-types";

// Quality analysis: interval review per family, drift per tool, CSV import and export, the audit trail.
export const feature: FeatureModule = {
  routes: [
    { path: "analysis/intervals", lazy: async () => ({ Component: (await import("./components/intervals-page")).IntervalsPage }) },
    { path: "analysis/intervals/:familyId", lazy: async () => ({ Component: (await import("./components/family-interval-page")).FamilyIntervalPage }) },
    { path: "analysis/drift/:assetTag", lazy: async () => ({ Component: (await import("./components/drift-page")).DriftPage }) },
    { path: "analysis/transfers", lazy: async () => ({ Component: (await import("./components/transfers-page")).TransfersPage }) },
    { path: "analysis/audit", lazy: async () => ({ Component: (await import("./components/audit-page")).AuditPage }) },
  ],
  nav: [
    { to: "/analysis/intervals", label: "Interval analysis", group: "quality", order: 40, permission: "intervals.read" },
    { to: "/analysis/transfers", label: "Import and export", group: "quality", order: 50 },
    { to: "/analysis/audit", label: "Audit trail", group: "quality", order: 60, permission: "audit.read" },
  ],
};
