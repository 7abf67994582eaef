import type { Router } from "express";
import type { AppDeps } from "../app-deps";
import type { QuickGet, QuickWrite } from "../http/quick-get";
import { usersRoutes } from "./users/users.routes";
import { settingsRoutes } from "./settings/settings.routes";
import { familiesRoutes } from "./families/families.routes";
import { toolsQuickGets, toolsRoutes } from "./tools/tools.routes";
import { standardsRoutes } from "./standards/standards.routes";
import { labsRoutes } from "./labs/labs.routes";
import { calibrationsRoutes } from "./calibrations/calibrations.routes";
import { checksRoutes } from "./checks/checks.routes";
import { checkoutsRoutes } from "./checkouts/checkouts.routes";
import { shipmentsRoutes } from "./shipments/shipments.routes";
import { labelsRoutes } from "./labels/labels.routes";
import { limitTablesRoutes } from "./limit-tables/limit-tables.routes";
import { jobsRoutes } from "./jobs/jobs.routes";
import { readingsQuickWrites, readingsRoutes } from "./readings/readings.routes";
import { investigationsRoutes } from "./investigations/investigations.routes";
import { remindersRoutes } from "./reminders/reminders.routes";
import { statsRoutes } from "./stats/stats.routes";
import { intervalsRoutes } from "./intervals/intervals.routes";
import { transfersRoutes } from "./transfers/transfers.routes";
import { auditRoutes } from "./audit/audit.routes";
import { studiesRoutes } from "./studies/studies.routes";

/** Every resource's router, in mounting order. */
export const moduleRouters: ((deps: AppDeps) => Router)[] = [
  usersRoutes,
  settingsRoutes,
  familiesRoutes,
  toolsRoutes,
  standardsRoutes,
  labsRoutes,
  calibrationsRoutes,
  checksRoutes,
  checkoutsRoutes,
  shipmentsRoutes,
  labelsRoutes,
  limitTablesRoutes,
  jobsRoutes,
  readingsRoutes,
  investigationsRoutes,
  remindersRoutes,
  statsRoutes,
  intervalsRoutes,
  transfersRoutes,
  auditRoutes,
  studiesRoutes,
];

/** The GETs answered before the middleware when the caches know the session (server/http/quick-get.ts). */
export const quickGetRoutes = (deps: AppDeps): QuickGet[] => [...toolsQuickGets(deps)];
export const quickWriteRoutes = (deps: AppDeps): QuickWrite[] => [...readingsQuickWrites(deps)];
