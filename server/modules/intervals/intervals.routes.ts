import { Router } from "express";
import { z } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { intervalsService } from "./intervals.service";
import { ApplyIntervalResultSchema, ApplyIntervalSchema, DriftSchema, IntervalAnalysisSchema, IntervalFamilySchema } from "../../../shared/intervals/intervals.schemas";

const FamilyId = z.string().uuid("A family id is a UUID.");
const AssetTag = z.string().trim().min(1).max(80);

export function intervalsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "intervals");
  const service = intervalsService({ db: deps.db, clock: deps.clock, timeZone: deps.config.SHOP_TIME_ZONE });

  route(
    { method: "get", path: "/api/intervals/families", summary: "Every family with its end-of-period in-tolerance rate, for the interval review", access: "intervals.read", response: z.array(IntervalFamilySchema) },
    () => service.families(),
  );

  route(
    {
      method: "get",
      path: "/api/families/:id/interval-analysis",
      summary: "End-of-period in-tolerance rate and recommended interval (exponential model, NCSL RP-1) with the staircase suggestion beside it",
      access: "intervals.read",
      response: IntervalAnalysisSchema,
    },
    ({ params }) => service.analyse(FamilyId.parse(params.id)),
  );

  route(
    {
      method: "post",
      path: "/api/families/:id/interval-decisions",
      summary: "Record an interval decision; the family and its tools get the new interval for calibrations from now on",
      access: "intervals.apply",
      body: ApplyIntervalSchema,
      response: ApplyIntervalResultSchema,
    },
    ({ params, body, user }) => service.apply(FamilyId.parse(params.id), body, user),
  );

  route(
    { method: "get", path: "/api/tools/:assetTag/drift", summary: "As-found error per check point over time, with a trend and the date it would reach the permissible error", access: "signedIn", response: DriftSchema },
    ({ params }) => service.drift(AssetTag.parse(params.assetTag)),
  );

  return router;
}
