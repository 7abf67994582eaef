import { Router } from "express";
import { z } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { CreateReadingSchema, FeelerLeavesQuerySchema, FeelerLeavesSchema, ReadingResultSchema, SupersedeReadingSchema } from "../../../shared/readings/readings.schemas";
import { readingsService } from "./readings.service";

const JobId = z.string().uuid("Not a job id.");
const ReadingId = z.string().uuid("Not a reading id.");

export function readingsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "readings");
  const service = readingsService(deps);

  route(
    {
      method: "post",
      path: "/api/jobs/:id/readings",
      summary: "Record a reading on a check sheet, tied to the tools that took it (409 tool_not_usable unless quality overrides)",
      access: "readings.write",
      body: CreateReadingSchema,
      response: ReadingResultSchema,
    },
    ({ params, body, user }) => service.create(JobId.parse(params.id), body, user),
  );

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
