import type { FeatureModule } from "../../app/nav-types";

const page = (load: () => Promise<object>, name: string) => async () => ({ Component: (await load())[name as keyof object] as React.ComponentType });
const counter = () => import("./components/counter-page");
const custody = () => import("./components/custody-page");
const shipments = () => import("./components/shipments-page");
const labels = () => import("./components/labels-page");
const print = () => import("./components/print-views");
const mine = () => import("./components/my-tools-page");
const status = () => import("./components/tool-status-page");
const scan = () => import("./components/scan-page");

// Everyone who may hold tools sees "My tools"; auditors only read.
const TOOL_HOLDERS = ["mechanic", "inspector", "crib", "quality", "admin"] as const;

export const feature: FeatureModule = {
  routes: [
    { path: "crib", lazy: page(counter, "CounterPage") },
    { path: "crib/custody", lazy: page(custody, "CustodyPage") },
    { path: "crib/shipments", lazy: page(shipments, "ShipmentsPage") },
    { path: "crib/labels", lazy: page(labels, "LabelsPage") },
    { path: "my-tools", lazy: page(mine, "MyToolsPage") },
    { path: "scan", lazy: page(scan, "ScanPage") },
  ],
  bareRoutes: [
    { path: "/t/:assetTag", lazy: page(status, "ToolStatusPage") },
    { path: "/print/labels", lazy: page(print, "LabelsPrintView") },
    { path: "/print/do-not-use/:assetTag", lazy: page(print, "DoNotUsePrintView") },
  ],
  nav: [
    { to: "/crib", label: "Crib counter", group: "work", order: 20, permission: "checkouts.write" },
    // The auditor reads custody and shipments (the API lets every signed-in role read them) but changes nothing.
    { to: "/crib/custody", label: "Custody board", group: "work", order: 21, permission: "checkouts.write", roles: ["auditor"] },
    { to: "/crib/shipments", label: "Lab shipments", group: "work", order: 22, permission: "shipments.write", roles: ["auditor"] },
    { to: "/crib/labels", label: "Labels", group: "work", order: 23, permission: "labels.print" },
    { to: "/my-tools", label: "My tools", group: "work", order: 30, roles: TOOL_HOLDERS },
    { to: "/scan", label: "Scan a tool", group: "work", order: 31 },
  ],
};
