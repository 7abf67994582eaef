import type { RouteObject } from "react-router-dom";
import type { Permission, Role } from "../../shared/auth/roles";

/** One entry of the main navigation; shown only to roles that may use it. */
export interface NavItem {
  to: string;
  label: string;
  group: "work" | "register" | "quality" | "admin";
  order: number;
  /** Shown when the role holds this permission… */
  permission?: Permission;
  /** …or is one of these roles; with neither, everyone signed in sees it. */
  roles?: readonly Role[];
}

/** What a feature adds to the app: its pages (inside the signed-in layout) and its navigation. */
export interface FeatureModule {
  routes: RouteObject[];
  nav: NavItem[];
  /** Pages outside the layout chrome but still signed in (e.g. print views, the phone status page). */
  bareRoutes?: RouteObject[];
}
