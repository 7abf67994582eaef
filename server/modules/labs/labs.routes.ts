import { Router } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { pageOf } from "../../../shared/common/lists.schemas";
import { CreateLabSchema, LabListQuerySchema, LabSchema } from "../../../shared/labs/labs.schemas";
import { labsService } from "./labs.service";
import { uuidParam } from "../tools/register.common";

export function labsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "labs");
  const service = labsService({ ...deps, defaultTimeZone: deps.config.SHOP_TIME_ZONE });

  route({ method: "get", path: "/api/labs", summary: "List outside calibration labs with their accreditation", access: "signedIn", query: LabListQuerySchema, response: pageOf(LabSchema) }, ({ query }) =>
    service.list(query),
  );
  route({ method: "post", path: "/api/labs", summary: "Add an outside calibration lab", access: "labs.write", body: CreateLabSchema, response: LabSchema }, ({ body, user }) =>
    service.create(body, user.id),
  );
  route({ method: "get", path: "/api/labs/:id", summary: "One outside calibration lab", access: "signedIn", response: LabSchema }, ({ params }) => service.get(uuidParam(params.id)));
  return router;
}
