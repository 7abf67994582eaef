import { Router } from "express";
import { z } from "zod";
import { defineRoutes, routeRunner, type RouteContext, type RouteSpec } from "../../http/route";
import type { QuickWrite } from "../../http/quick-get";
import type { AppDeps } from "../../app-deps";
import { CreateReadingSchema, type CreateReading, FeelerLeavesQuerySchema, FeelerLeavesSchema, ReadingResultSchema, SupersedeReadingSchema } from "../../../shared/readings/readings.schemas";
import { readingsService } from "./readings.service";

const JobId = z.string().uuid("Not a job id.");
const ReadingId = z.string().uuid("Not a reading id.");

const RECORD = {
  method: "post",
  path: "/api/jobs/:id/readings",
  summary: "Record a reading on a check sheet, tied to the tools that took it (409 tool_not_usable unless quality overrides)",
  access: "readings.write",
  body: CreateReadingSchema,
  response: ReadingResultSchema,
} satisfies RouteSpec<typeof CreateReadingSchema, undefined>;
const recordReading =
  (service: ReturnType<typeof readingsService>) =>
  ({ params, body, user }: RouteContext<CreateReading, undefined>) =>
    service.create(JobId.parse(params.id), body, user);

/**
 * Recording a reading, taken at the front when the caches hold the session (server/http/quick-get.ts): the route's
 * own runner, so the same role rule, validation and answer as through the router below.
 */
export function readingsQuickWrites(deps: AppDeps): QuickWrite[] {
  return [{ path: RECORD.path, run: routeRunner(RECORD, recordReading(readingsService(deps))) }];
}

export function readingsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "readings");
  const service = readingsService(deps);

  route(RECORD, recordReading(service));

  route(
    {
      method: "post",
      path: "/api/readings/:id/supersede",
      summary: "Correct a reading: a new reading supersedes it, with the reason; the old one stays on record",
      access: "readings.write",
      body: SupersedeReadingSchema,
      response: ReadingResultSchema,
    },
    ({ params, body, user }) => service.supersede(ReadingId.parse(params.id), body, user),
  );

  route(
    { method: "get", path: "/api/jobs/:id/feeler-leaves", summary: "The go and no-go leaves of a feeler set for a feeler item", access: "signedIn", query: FeelerLeavesQuerySchema, response: FeelerLeavesSchema },
    ({ params, query }) => service.leavesFor(JobId.parse(params.id), query.itemKey, query.setTag),
  );

  return router;
}
