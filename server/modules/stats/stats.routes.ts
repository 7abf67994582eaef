import { Router } from "express";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { statsService } from "./stats.service";
import { StatsDashboardSchema, StatsInspectionSchema, StatsMineSchema, StatsOverviewSchema } from "../../../shared/stats/stats.schemas";

export function statsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "stats");
  const service = statsService({ db: deps.db, clock: deps.clock, timeZone: deps.config.SHOP_TIME_ZONE, logger: deps.logger });

  route(
    { method: "get", path: "/api/stats/overview", summary: "Tools by derived status, due within 30 days, overdue, open investigations", access: "signedIn", response: StatsOverviewSchema },
    () => service.overview(),
  );
  route(
    {
      method: "get",
      path: "/api/stats/dashboard",
      summary: "The overview plus due within 7 days, tools not returned, due per week for 12 weeks, in-tolerance rate by family",
      access: "signedIn",
      response: StatsDashboardSchema,
    },
    () => service.dashboard(),
  );
  route({ method: "get", path: "/api/stats/mine", summary: "My tools (checked out to me or my own) with due dates, and my open jobs", access: "signedIn", response: StatsMineSchema }, ({ user }) =>
    service.mine(user.id),
  );
  route(
    { method: "get", path: "/api/stats/inspection", summary: "Check sheets awaiting signature and investigations needing a disposition", access: "signedIn", response: StatsInspectionSchema },
    () => service.inspection(),
  );
  return router;
}
