import type { FeatureModule } from "./nav-types";
import { feature as overview } from "../features/overview/routes";
import { feature as tools } from "../features/tools/routes";
import { feature as crib } from "../features/crib/routes";
import { feature as limitTables } from "../features/limit-tables/routes";
import { feature as jobs } from "../features/jobs/routes";
import { feature as investigations } from "../features/investigations/routes";
import { feature as reminders } from "../features/reminders/routes";
import { feature as analysis } from "../features/analysis/routes";
import { feature as users } from "../features/users/routes";
import { feature as settings } from "../features/settings/routes";
import { feature as studies } from "../features/studies/routes";

/** Every feature of the client; the router and the navigation are built from this list. */
export const features: FeatureModule[] = [overview, tools, crib, limitTables, jobs, investigations, reminders, analysis, users, settings, studies];
