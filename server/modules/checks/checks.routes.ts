import { Router } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { pageOf } from "../../../shared/common/lists.schemas";
import { CheckListQuerySchema, CheckResultSchema, CheckSchema, CreateCheckSchema } from "../../../shared/calibrations/calibrations.schemas";
import { checksService } from "./checks.service";
import { uuidParam } from "../tools/register.common";

export function checksRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "checks");
  const service = checksService({ ...deps, defaultTimeZone: deps.config.SHOP_TIME_ZONE });

  route(
    { method: "post", path: "/api/tools/:assetTag/checks", summary: "Record an intermediate (pre-use) check; a failure puts the tool out of tolerance at once", access: "checks.write", body: CreateCheckSchema, response: CheckResultSchema },
    ({ params, body, user }) => service.create(params.assetTag, body, user.id),
  );
  route({ method: "get", path: "/api/tools/:assetTag/checks", summary: "A tool's intermediate checks, newest first", access: "signedIn", query: CheckListQuerySchema, response: pageOf(CheckSchema) }, ({ params, query }) =>
    service.listForTool(params.assetTag, query.page, query.pageSize),
  );
  route({ method: "patch", path: "/api/checks/:id", summary: "Refused (409 record_signed): recorded checks are never changed", access: "checks.write" }, ({ params }) => service.refuseChange(uuidParam(params.id)));
  route({ method: "delete", path: "/api/checks/:id", summary: "Refused (409 record_signed): recorded checks are never deleted", access: "checks.write" }, ({ params }) => service.refuseChange(uuidParam(params.id)));
  return router;
}
