import { Router } from "express";
import { z } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { pageOf } from "../../../shared/common/lists.schemas";
import { CreateLimitTableSchema, LimitTableListQuerySchema, LimitTableSchema, LimitTableSummarySchema } from "../../../shared/limit-tables/limit-tables.schemas";
import { limitTablesRepository } from "./limit-tables.repository";
import { limitTablesService, toSummary } from "./limit-tables.service";

const Id = z.string().uuid("Not a limits table id.");

export function limitTablesRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "limit-tables");
  const service = limitTablesService(deps);

  route(
    { method: "get", path: "/api/limit-tables", summary: "Limits tables per engine model (filters q, engineModel, current)", access: "signedIn", query: LimitTableListQuerySchema, response: pageOf(LimitTableSummarySchema) },
    async ({ query }) => {
      const { items, total } = await limitTablesRepository.list(deps.db, query);
      return { items: items.map(toSummary), total };
    },
  );

  route(
    { method: "post", path: "/api/limit-tables", summary: "Create a limits table", access: "limitTables.write", body: CreateLimitTableSchema, response: LimitTableSchema },
    ({ body, user }) => service.create(body, user.id),
  );

  route({ method: "get", path: "/api/limit-tables/:id", summary: "One limits table revision with its items", access: "signedIn", response: LimitTableSchema }, ({ params }) =>
    service.get(Id.parse(params.id)),
  );

  route(
    {
      method: "post",
      path: "/api/limit-tables/:id/revisions",
      summary: "Revise a limits table: a new version that supersedes this one (open jobs keep theirs)",
      access: "limitTables.write",
      body: CreateLimitTableSchema,
      response: LimitTableSchema,
    },
    ({ params, body, user }) => service.revise(Id.parse(params.id), body, user.id),
  );

  return router;
}
