import type { FeatureModule } from "../../app/nav-types";

// The whole register lives here: tools, families, reference standards, outside
// labs, calibration records and intermediate checks. Reading is for everyone;
// the pages hide writes a role would be refused (the server decides).
export const feature: FeatureModule = {
  routes: [
    { path: "tools", lazy: async () => ({ Component: (await import("./components/register-page")).RegisterPage }) },
    { path: "tools/new", lazy: async () => ({ Component: (await import("./components/new-tool-page")).NewToolPage }) },
    { path: "tools/:assetTag", lazy: async () => ({ Component: (await import("./components/tool-page")).ToolPage }) },
    { path: "tools/:assetTag/calibrate", lazy: async () => ({ Component: (await import("./calibrations/calibration-form-page")).CalibrationFormPage }) },
    { path: "tools/:assetTag/chain", lazy: async () => ({ Component: (await import("./calibrations/chain-page")).ChainPage }) },
    { path: "calibrations/conditional", lazy: async () => ({ Component: (await import("./calibrations/conditional-results-page")).ConditionalResultsPage }) },
    { path: "families", lazy: async () => ({ Component: (await import("./families/families-page")).FamiliesPage }) },
    { path: "standards", lazy: async () => ({ Component: (await import("./standards/standards-page")).StandardsPage }) },
    { path: "standards/:id", lazy: async () => ({ Component: (await import("./standards/standard-page")).StandardPage }) },
    { path: "labs", lazy: async () => ({ Component: (await import("./labs/labs-page")).LabsPage }) },
  ],
  nav: [
    { to: "/tools", label: "Tool register", group: "register", order: 10 },
    { to: "/families", label: "Families", group: "register", order: 20 },
    { to: "/standards", label: "Reference standards", group: "quality", order: 10 },
    { to: "/labs", label: "Outside labs", group: "quality", order: 20 },
    { to: "/calibrations/conditional", label: "Conditional results", group: "quality", order: 35, permission: "intervals.read" },
  ],
};
