import { Router } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { pageOf } from "../../../shared/common/lists.schemas";
import { CreateFamilySchema, FamilyListQuerySchema, FamilySchema, UpdateFamilySchema } from "../../../shared/families/families.schemas";
import { familiesService } from "./families.service";
import { uuidParam } from "../tools/register.common";

export function familiesRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "families");
  const service = familiesService(deps);

  route({ method: "get", path: "/api/families", summary: "List tool families", access: "signedIn", query: FamilyListQuerySchema, response: pageOf(FamilySchema) }, ({ query }) =>
    service.list(query),
  );
  route({ method: "post", path: "/api/families", summary: "Create a tool family with its defaults", access: "families.write", body: CreateFamilySchema, response: FamilySchema }, ({ body, user }) =>
    service.create(body, user.id),
  );
  route({ method: "get", path: "/api/families/:id", summary: "One tool family", access: "signedIn", response: FamilySchema }, ({ params }) =>
    service.get(uuidParam(params.id)),
  );
  route(
    { method: "patch", path: "/api/families/:id", summary: "Change a family's defaults (kind and unit only while it has no tools)", access: "families.write", body: UpdateFamilySchema, response: FamilySchema, status: 200 },
    ({ params, body, user }) => service.update(uuidParam(params.id), body, user.id),
  );
  return router;
}
