import type { FeatureModule } from "../../app/nav-types";

export const feature: FeatureModule = { routes: [], nav: [] };
